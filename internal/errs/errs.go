package errs

import (
	"errors"
	"fmt"
	"math"
	"runtime/debug"
	"strconv"
)

// The kinds of error, for errors.Is. Every shape of this package
// unwraps to one of them.
var (
	// ErrSample: a sample is NaN, infinite or beyond the magnitude a
	// computation accepts.
	ErrSample = errors.New("bad sample")
	// ErrShort: a series (or the residuals left after differencing and
	// conditioning) is too short for the computation.
	ErrShort = errors.New("too few samples")
	// ErrConstant: a series is constant, so correlations and fits are
	// undefined.
	ErrConstant = errors.New("constant series")
	// ErrLength: series that must have one length do not.
	ErrLength = errors.New("series lengths differ")
	// ErrName: a series or input named by the caller is missing, unknown
	// or not a name the spec language can hold.
	ErrName = errors.New("unknown or missing name")
	// ErrSetting: a setting breaks its documented rule.
	ErrSetting = errors.New("bad setting")
	// ErrModel: a model, polynomial or coefficient cannot be used.
	ErrModel = errors.New("unusable model")
	// ErrConvergence: an iterative method stopped without converging.
	ErrConvergence = errors.New("no convergence")
	// ErrOverflow: a result leaves the range of float64.
	ErrOverflow = errors.New("result out of float64 range")
	// ErrInternal: a fault of the library itself (a recovered panic).
	ErrInternal = errors.New("internal fault")
	// ErrFormat: text (a spec, a record file, a config) that does not
	// follow its format.
	ErrFormat = errors.New("malformed text")
)

// kinds lists every kind, for IsKind.
var kinds = []error{ErrSample, ErrShort, ErrConstant, ErrLength, ErrName, ErrSetting, ErrModel, ErrConvergence, ErrOverflow, ErrInternal, ErrFormat}

// IsKind reports whether e is one of the kinds itself (a sentinel, at
// the end of an error chain), not an error that matches one.
func IsKind(e error) bool {
	for _, k := range kinds {
		if e == k {
			return true
		}
	}
	return false
}

// Prefix returns "op: ", or "" for an empty op: the start of every
// message of an error that names the exported function called.
func Prefix(op string) string {
	if op == "" {
		return ""
	}
	return op + ": "
}

// SampleError reports one bad sample: the caller's name for the series,
// the 0-based index and the value. Limit, when positive, is the largest
// magnitude accepted (the sample is finite but beyond it); zero means the
// sample is NaN or infinite. It unwraps to ErrSample.
type SampleError struct {
	Op     string
	Series string
	Index  int
	Value  float64
	Limit  float64
}

// Error describes the sample and the rule it breaks in one line.
func (e *SampleError) Error() string {
	s := fmt.Sprintf("%sseries %q sample %d is %v", Prefix(e.Op), e.Series, e.Index, e.Value)
	if e.Limit > 0 && !math.IsNaN(e.Value) && !math.IsInf(e.Value, 0) {
		return s + ", beyond the largest magnitude accepted, " + strconv.FormatFloat(e.Limit, 'g', -1, 64) + " (rescale the series: change its units)"
	}
	return s + ": samples must be finite numbers"
}

// Unwrap returns ErrSample.
func (e *SampleError) Unwrap() error { return ErrSample }

// SeriesError reports a problem with a whole series: Kind is one of
// ErrShort, ErrConstant, ErrLength, ErrName and ErrOverflow. Have and
// Need carry the counts of ErrShort (samples or residuals available and
// needed) and ErrLength (this series' length and the one expected);
// Detail is a sentence with the facts and the likely fix.
type SeriesError struct {
	Op     string
	Series string
	Kind   error
	Have   int
	Need   int
	Detail string
}

// Error describes the problem in one line.
func (e *SeriesError) Error() string {
	s := fmt.Sprintf("%sseries %q", Prefix(e.Op), e.Series)
	switch e.Kind {
	case ErrShort:
		s += fmt.Sprintf(": %d samples, at least %d needed", e.Have, e.Need)
	case ErrLength:
		s += fmt.Sprintf(" has %d samples against %d", e.Have, e.Need)
	case ErrConstant:
		s += " is constant"
	case ErrName:
		if e.Detail != "" {
			return s + ": " + e.Detail
		}
		s += " is not known"
	default:
		s += ": " + e.kind().Error()
	}
	if e.Detail != "" {
		s += " (" + e.Detail + ")"
	}
	return s
}

func (e *SeriesError) kind() error {
	if e.Kind == nil {
		return ErrSample
	}
	return e.Kind
}

// Unwrap returns Kind.
func (e *SeriesError) Unwrap() error { return e.kind() }

// SettingError reports a setting that breaks its rule: Setting is the
// field as the caller wrote it ("FitSettings.MaxIter"), Value the value
// given, formatted, and Rule the rule with the default. It unwraps to
// ErrSetting.
type SettingError struct {
	Op      string
	Setting string
	Value   string
	Rule    string
}

// Error describes the setting and its rule in one line.
func (e *SettingError) Error() string {
	return Prefix(e.Op) + e.Setting + " = " + e.Value + ": " + e.Rule
}

// Unwrap returns ErrSetting.
func (e *SettingError) Unwrap() error { return ErrSetting }

// ModelError reports a model, polynomial or coefficient that cannot be
// used: Part names the place ("input valve denominator, factor 1"),
// Problem says what is wrong and how to fix it, and Err, when not nil, is
// a more precise cause (for errors.Is). It matches ErrModel as well as
// Err.
type ModelError struct {
	Op      string
	Part    string
	Problem string
	Err     error
}

// Error describes the problem in one line.
func (e *ModelError) Error() string {
	return Prefix(e.Op) + e.Part + ": " + e.Problem
}

// Unwrap returns Err, or ErrModel when Err is nil.
func (e *ModelError) Unwrap() error {
	if e.Err == nil {
		return ErrModel
	}
	return e.Err
}

// Is reports whether target is ErrModel (whatever Err is).
func (e *ModelError) Is(target error) bool { return target == ErrModel }

// ConvergenceError reports an iterative method that stopped without
// converging after Iter iterations, Reason saying why. It unwraps to
// ErrConvergence.
type ConvergenceError struct {
	Op     string
	Iter   int
	Reason string
}

// Error describes the stop in one line.
func (e *ConvergenceError) Error() string {
	return fmt.Sprintf("%sno convergence after %d iterations: %s", Prefix(e.Op), e.Iter, e.Reason)
}

// Unwrap returns ErrConvergence.
func (e *ConvergenceError) Unwrap() error { return ErrConvergence }

// InternalError reports a fault of the library itself, a panic recovered
// at a goroutine boundary or an entry point: Value is what the panic
// carried and Stack the goroutine's stack when it was recovered. It
// unwraps to ErrInternal.
type InternalError struct {
	Op    string
	Value any
	Stack []byte
}

// Error describes the fault in one line (the stack is in Stack).
func (e *InternalError) Error() string {
	return fmt.Sprintf("%sinternal fault: %v (a fault of the library; please report it with this message)", Prefix(e.Op), e.Value)
}

// Unwrap returns ErrInternal.
func (e *InternalError) Unwrap() error { return ErrInternal }

// Recover turns a panic into an *InternalError stored in *err; use it as
// `defer errs.Recover("identify.Candidates", &err)` at the top of a goroutine or
// of a function whose result is returned to the caller. Without a panic
// it does nothing.
func Recover(op string, err *error) {
	if v := recover(); v != nil {
		*err = &InternalError{Op: op, Value: v, Stack: debug.Stack()}
	}
}

// Count applies the settings rule to a count: zero means the default,
// a negative value is a *SettingError. rule describes the default, as in
// "0 means 200".
func Count(op, setting string, v int, rule string) error {
	if v < 0 {
		return &SettingError{Op: op, Setting: setting, Value: strconv.Itoa(v), Rule: "must be zero or positive (" + rule + ")"}
	}
	return nil
}

// NonNegative applies the settings rule to a scale or tolerance: zero
// means the default; a negative, NaN or infinite value is a
// *SettingError.
func NonNegative(op, setting string, v float64, rule string) error {
	if !(v >= 0) || math.IsInf(v, 0) {
		return &SettingError{Op: op, Setting: setting, Value: strconv.FormatFloat(v, 'g', -1, 64), Rule: "must be a finite number, zero or positive (" + rule + ")"}
	}
	return nil
}

// Probability applies the settings rule to a probability or level: zero
// means the default; anything outside (0, 1) is a *SettingError.
func Probability(op, setting string, v float64, rule string) error {
	if v != 0 && !(v > 0 && v < 1) {
		return &SettingError{Op: op, Setting: setting, Value: strconv.FormatFloat(v, 'g', -1, 64), Rule: "must lie strictly between 0 and 1 (" + rule + ")"}
	}
	return nil
}
