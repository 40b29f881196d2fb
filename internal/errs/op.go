package errs

import (
	"reflect"
	"strings"
)

// modulePath is the import path every package of the project starts
// with: only error types of the project get their Op set.
const modulePath = "github.com/backshift/backshift/"

// SetOp names the exported function op in every error of err's chain
// (through Unwrap() error and Unwrap() []error) that is a pointer to a
// struct of this project with a string field Op, and returns err. An
// exported function calling another applies it last, so its own name
// wins. Errors of other modules (an *fs.PathError also has an Op) and
// the sentinel kinds are left alone.
func SetOp(op string, err error) error {
	walkOp(err, func(p *string) { *p = op })
	return err
}

// FillOp is SetOp for errors whose Op is still empty: a function that
// may be called by another exported function of its package names
// itself only where nobody has.
func FillOp(op string, err error) error {
	walkOp(err, func(p *string) {
		if *p == "" {
			*p = op
		}
	})
	return err
}

// walkOp calls set with the Op field of every project error in err's
// chain.
func walkOp(err error, set func(*string)) {
	for err != nil {
		if p := opField(err); p != nil {
			set(p)
		}
		switch u := err.(type) {
		case interface{ Unwrap() error }:
			err = u.Unwrap()
		case interface{ Unwrap() []error }:
			for _, e := range u.Unwrap() {
				walkOp(e, set)
			}
			return
		default:
			return
		}
	}
}

// opField returns a pointer to err's Op field when err is a non-nil
// pointer to a struct of this project with a settable string field Op
// (promoted fields of embedded shapes included), or nil.
func opField(err error) *string {
	if IsKind(err) {
		return nil
	}
	v := reflect.ValueOf(err)
	if v.Kind() != reflect.Pointer || v.IsNil() || v.Elem().Kind() != reflect.Struct {
		return nil
	}
	v = v.Elem()
	if !strings.HasPrefix(v.Type().PkgPath()+"/", modulePath) {
		return nil
	}
	sf, ok := v.Type().FieldByName("Op")
	if !ok || sf.Type.Kind() != reflect.String {
		return nil
	}
	f, e := v.FieldByIndexErr(sf.Index)
	if e != nil || !f.CanSet() {
		return nil
	}
	return f.Addr().Interface().(*string)
}
