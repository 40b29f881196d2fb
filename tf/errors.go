package tf

import (
	"errors"
	"fmt"
	"strconv"
)

// Sentinel problems carried by CoefError, for use with errors.Is.
var (
	// ErrEmpty says a polynomial has no coefficients at all.
	ErrEmpty = errors.New("no coefficients")
	// ErrZeroConstant says a denominator's constant term (the coefficient
	// of B^0) is zero, so the term is not causal and has no power series.
	ErrZeroConstant = errors.New("constant term is zero")
	// ErrNotFinite says a coefficient or sample is NaN or infinite.
	ErrNotFinite = errors.New("value is NaN or infinite")
	// ErrDegree says a polynomial's degree is above MaxDegree.
	ErrDegree = errors.New("degree above tf.MaxDegree")
)

// CoefError reports a bad polynomial given to a constructor: which
// polynomial ("num" for omega(B), "den" for delta(B)), the index of the
// offending coefficient (power of B; -1 when the polynomial as a whole is
// at fault, such as an empty one), its value, and the problem, one of
// ErrEmpty, ErrZeroConstant, ErrNotFinite, ErrDegree and ErrNormalise.
type CoefError struct {
	Poly  string
	Index int
	Value float64
	Err   error
}

// Error describes the problem in one line, e.g.
// "tf: den coefficient 0 (B^0) = 0: constant term is zero".
func (e *CoefError) Error() string {
	if e.Index < 0 {
		return "tf: " + e.Poly + ": " + e.Err.Error()
	}
	if e.Err == ErrDegree {
		return fmt.Sprintf("tf: %s has degree %d: %v (%d)", e.Poly, e.Index, e.Err, MaxDegree)
	}
	return fmt.Sprintf("tf: %s coefficient %d (B^%d) = %v: %v", e.Poly, e.Index, e.Index, e.Value, e.Err)
}

// Unwrap returns the problem sentinel.
func (e *CoefError) Unwrap() error { return e.Err }

// DelayError reports a dead time outside 0..MaxDelay samples.
type DelayError struct {
	Delay int
}

// Error describes the problem in one line.
func (e *DelayError) Error() string {
	return "tf: dead time " + strconv.Itoa(e.Delay) + " samples outside 0.." + strconv.Itoa(MaxDelay)
}

// SampleError reports a NaN or infinite sample in a series: the series'
// name (for example "input", "initial output"), the 0-based index and the
// value. It unwraps to ErrNotFinite.
type SampleError struct {
	Series string
	Index  int
	Value  float64
}

// Error describes the problem in one line.
func (e *SampleError) Error() string {
	return fmt.Sprintf("tf: %s sample %d = %v: %v", e.Series, e.Index, e.Value, ErrNotFinite)
}

// Unwrap returns ErrNotFinite.
func (e *SampleError) Unwrap() error { return ErrNotFinite }

// GainError reports that a steady-state gain does not exist because the
// denominator vanishes at B = 1 (a pole at z = 1, an integrator): Den1 is
// delta(1) and Num1 is omega(1).
type GainError struct {
	Num1, Den1 float64
}

// Error describes the problem in one line.
func (e *GainError) Error() string {
	return fmt.Sprintf("tf: no steady-state gain: denominator at B = 1 is %v (pole at z = 1), numerator %v", e.Den1, e.Num1)
}

// ArgError reports an argument outside its documented range: the
// argument's name, its value and the rule it breaks.
type ArgError struct {
	Arg   string
	Value float64
	Rule  string
}

// Error describes the problem in one line.
func (e *ArgError) Error() string {
	return fmt.Sprintf("tf: %s = %v: %s", e.Arg, e.Value, e.Rule)
}

// ModelError reports a model built in code whose structure no spec could
// produce: a factor power below 1, a power of B below 0, a polynomial or
// dead time over its limit, or a coefficient that is NaN or infinite.
// Part names the place ("input valve denominator, factor 1", "input
// valve dead time", ...), Problem says what is wrong and how to fix it.
// Fit, Model.Simulate and NewSystem check every model with
// Model.Validate before using it.
type ModelError struct {
	Part    string
	Problem string
}

// Error describes the problem in one line.
func (e *ModelError) Error() string {
	return "tf: model: " + e.Part + ": " + e.Problem
}
