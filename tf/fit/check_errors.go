package fit

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/backshift/backshift/internal/errs"
)

// StageError reports the failure of one stage of Check, Forecast or
// identify.Candidates done by another package of the library (prewhitening,
// cross-correlation, ARMA fitting): Op names the function the caller
// called, Stage says in the caller's words what was being done and to
// which series, and Err is the underlying error, one of the shared
// shapes (errors.As reaches it, and errors.Is its kind). Hints, when not
// empty, are faults of the record found by screening it (a stuck output,
// a spike) that may explain the failure.
type StageError struct {
	Op    string
	Stage string
	Err   error
	Hints []string
}

// Error describes the problem in one line.
func (e *StageError) Error() string {
	inner := e.Err.Error()
	s := e.Stage + ": " + inner
	if e.Op != "" {
		s = e.Op + ": " + e.Stage + ": " + strings.TrimPrefix(inner, e.Op+": ")
	}
	if len(e.Hints) > 0 {
		s += "; the record may explain it: " + strings.Join(e.Hints, "; ")
	}
	return s
}

// Unwrap returns the underlying error.
func (e *StageError) Unwrap() error { return e.Err }

// estimateErr reports an estimate that Check or Forecast cannot use, as
// a *ModelError naming the part at fault.
func estimateErr(part string, v float64, problem string) error {
	if part == "" {
		return errs.Model("estimate", problem)
	}
	return errs.Model("estimate's "+part+" = "+errs.Num(v), problem)
}

// overflowErr reports a series computed by Check or Forecast that left
// the finite range of float64 at data index t (index n = the first
// forecast step), as a *SeriesError of kind ErrOverflow.
func overflowErr(series string, t int, v float64, hint string) error {
	d := fmt.Sprintf("at index %d it is %v", t, v)
	if hint != "" {
		d += ": " + hint
	}
	return errs.Series(series, errs.ErrOverflow, 0, 0, d)
}

// constantErr reports a series (named as the caller named it) that is
// constant, so that it carries no response to identify or check: role
// is "output" or "input", v its constant value and diff the differencing
// after which it is constant ("" when constant as given). It is a
// *SeriesError of kind ErrConstant.
func constantErr(series, role string, v float64, diff string) error {
	val := strconv.FormatFloat(v, 'g', 6, 64)
	if diff == "" {
		return errs.Series(series, errs.ErrConstant, 0, 0, "the "+role+": every sample is "+val+
			", so it carries no response; check that the right column was chosen")
	}
	return errs.Series(series, errs.ErrConstant, 0, 0, "the "+role+", after its differencing "+diff+": every differenced sample is "+val+
		", so it carries no response; check the column, or ask for less differencing")
}
