package tf

import (
	"errors"
	"fmt"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
)

// The shared shapes this package returns besides those of errkinds.go.
type (
	// SampleError reports one NaN, infinite or too large sample: the
	// caller's name for the series ("input", "past output", "valve"), the
	// 0-based index and the value. It matches ErrSample.
	SampleError = errs.SampleError
	// ModelError reports a model, polynomial or term that cannot be used:
	// Part names the place ("input valve denominator, factor 1"), Problem
	// says what is wrong and how to fix it, Err is a more precise cause
	// when there is one (a *GainError, ErrZeroConstant, ...). It matches
	// ErrModel as well as Err.
	ModelError = errs.ModelError
)

// Precise causes of a *CoefError, for errors.Is; every *CoefError also
// matches ErrModel.
var (
	// ErrEmpty says a polynomial has no coefficients at all.
	ErrEmpty = errors.New("no coefficients")
	// ErrZeroConstant says a denominator's constant term (the coefficient
	// of B^0) is zero, so the term is not causal and has no power series.
	ErrZeroConstant = errors.New("constant term is zero")
	// ErrNotFinite says a coefficient is NaN or infinite. (A NaN or
	// infinite sample of a series is a *SampleError, matching ErrSample.)
	ErrNotFinite = errors.New("value is NaN or infinite")
	// ErrDegree says a polynomial's degree is above MaxDegree.
	ErrDegree = errors.New("degree above tf.MaxDegree")
)

// CoefError reports a bad polynomial given to a constructor: which
// polynomial ("num" for omega(B), "den" for delta(B)), the index of the
// offending coefficient (power of B; -1 when the polynomial as a whole is
// at fault, such as an empty one), its value, and the precise cause, one
// of ErrEmpty, ErrZeroConstant, ErrNotFinite, ErrDegree and ErrNormalise.
// It matches ErrModel as well as its cause. Op is the exported function
// called ("tf.NewRational").
type CoefError struct {
	Op    string
	Poly  string
	Index int
	Value float64
	Err   error
}

// Error describes the problem in one line, e.g.
// "tf.NewRational: den coefficient 0 (B^0) = 0: constant term is zero".
func (e *CoefError) Error() string {
	p := opPrefix(e.Op)
	if e.Index < 0 {
		return p + e.Poly + ": " + e.Err.Error()
	}
	if e.Err == ErrDegree {
		return fmt.Sprintf("%s%s has degree %d: %v (%d)", p, e.Poly, e.Index, e.Err, MaxDegree)
	}
	return fmt.Sprintf("%s%s coefficient %d (B^%d) = %v: %v", p, e.Poly, e.Index, e.Index, e.Value, e.Err)
}

// Unwrap returns the precise cause.
func (e *CoefError) Unwrap() error { return e.Err }

// Is reports whether target is ErrModel (whatever the cause).
func (e *CoefError) Is(target error) bool { return target == ErrModel }

// DelayError reports a dead time outside 0..MaxDelay samples. It matches
// ErrModel.
type DelayError struct {
	Op    string
	Delay int
}

// Error describes the problem in one line.
func (e *DelayError) Error() string {
	return opPrefix(e.Op) + "dead time " + strconv.Itoa(e.Delay) + " samples outside 0.." + strconv.Itoa(MaxDelay)
}

// Unwrap returns ErrModel.
func (e *DelayError) Unwrap() error { return ErrModel }

// GainError reports that a steady-state gain does not exist because the
// denominator vanishes at B = 1 (a pole at z = 1, an integrator): Den1 is
// delta(1) and Num1 is omega(1). It matches ErrModel.
type GainError struct {
	Op         string
	Num1, Den1 float64
}

// Error describes the problem in one line.
func (e *GainError) Error() string {
	return fmt.Sprintf("%sno steady-state gain: denominator at B = 1 is %v (pole at z = 1), numerator %v", opPrefix(e.Op), e.Den1, e.Num1)
}

// Unwrap returns ErrModel.
func (e *GainError) Unwrap() error { return ErrModel }

// opPrefix returns "op: " or "" for an empty op.
func opPrefix(op string) string {
	if op == "" {
		return ""
	}
	return op + ": "
}

// withOp names op in the errors of err's chain that no inner exported
// function has named (errs.FillOp) and returns err.
func withOp(op string, err error) error { return errs.FillOp(op, err) }

// setting returns a *SettingError for the field setting with the value v.
func setting(op, field string, v float64, rule string) *SettingError {
	return &SettingError{Op: op, Setting: field, Value: strconv.FormatFloat(v, 'g', -1, 64), Rule: rule}
}

// intSetting returns a *SettingError for the count field with the value v.
func intSetting(op, field string, v int, rule string) *SettingError {
	return &SettingError{Op: op, Setting: field, Value: strconv.Itoa(v), Rule: rule}
}
