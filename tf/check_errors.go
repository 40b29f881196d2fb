package tf

import (
	"fmt"
	"strconv"
)

// EstimateError reports an estimate that Check or Forecast cannot use:
// Func names the call ("Check", "Forecast"), Field the part of the
// estimate at fault ("estimate" for a nil pointer, "Sigma2", a
// coefficient's name) with its Value, and Problem says what is wrong
// and what to do.
type EstimateError struct {
	Func    string
	Field   string
	Value   float64
	Problem string
}

// Error describes the problem in one line.
func (e *EstimateError) Error() string {
	if e.Field == "estimate" {
		return "tf: " + e.Func + ": " + e.Problem
	}
	return fmt.Sprintf("tf: %s: estimate's %s = %v: %s", e.Func, e.Field, e.Value, e.Problem)
}

// NonFiniteResultError reports a series computed by Check or Forecast
// that left the finite range of float64: Series names it ("residuals",
// "forecast mean", "forecast standard error", "forecast of input x"),
// Index is the data index (index n = the first forecast step), Value
// the value there, and Hint the likely cause and remedy.
type NonFiniteResultError struct {
	Func   string
	Series string
	Index  int
	Value  float64
	Hint   string
}

// Error describes the problem in one line.
func (e *NonFiniteResultError) Error() string {
	s := fmt.Sprintf("tf: %s: the %s at index %d is %v", e.Func, e.Series, e.Index, e.Value)
	if e.Hint != "" {
		s += ": " + e.Hint
	}
	return s
}

// ConstantSeriesError reports a series (named as the caller named it)
// that is constant, so that it carries no response to identify or check:
// Role is "output" or "input", Value its constant value and Diff the
// differencing after which it is constant ("" when constant as given,
// "1 - B" when for example a straight line was differenced).
type ConstantSeriesError struct {
	Func   string
	Series string
	Role   string
	Value  float64
	Diff   string
}

// Error describes the problem in one line.
func (e *ConstantSeriesError) Error() string {
	if e.Diff == "" {
		return fmt.Sprintf("tf: %s: %s series %q is constant (every sample is %s): it carries no response; check that the right column was chosen",
			e.Func, e.Role, e.Series, strconv.FormatFloat(e.Value, 'g', 6, 64))
	}
	return fmt.Sprintf("tf: %s: %s series %q is constant after its differencing %s (every differenced sample is %s): it carries no response; check the column, or ask for less differencing",
		e.Func, e.Role, e.Series, e.Diff, strconv.FormatFloat(e.Value, 'g', 6, 64))
}

// StageError reports the failure of one stage of Check, Forecast or
// Identify done by another package of the library (prewhitening,
// cross-correlation, ARMA fitting): Func names the call, Stage says in
// the caller's words what was being done and to which series, and Err is
// the underlying error (errors.As reaches it).
type StageError struct {
	Func  string
	Stage string
	Err   error
}

// Error describes the problem in one line.
func (e *StageError) Error() string {
	return "tf: " + e.Func + ": " + e.Stage + ": " + e.Err.Error()
}

// Unwrap returns the underlying error.
func (e *StageError) Unwrap() error { return e.Err }
