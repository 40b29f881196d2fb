package fit

import (
	"strconv"

	"github.com/backshift/backshift/internal/errs"
)

// InternalError reports a fault of the library itself: a panic recovered
// at the boundary of a goroutine of Model or identify.Candidates, or of an exported
// function, so that the caller's process survives. Value is what the
// panic carried and Stack where it happened; please report it with the
// model and data. It matches ErrInternal.
type InternalError = errs.InternalError

// InterruptedError reports a fit whose context was done before it
// converged: Series is the output, Iter the iterations done, and Err the
// context's error. Model returns the best point so far with it (not a
// fitted model). It matches ErrConvergence and Err, so that
// errors.Is(err, context.Canceled) (or context.DeadlineExceeded) holds.
type InterruptedError struct {
	Op     string
	Series string
	Iter   int
	Err    error
}

// Error describes the stop in one line.
func (e *InterruptedError) Error() string {
	s := "fit of " + strconv.Quote(e.Series) + " interrupted after " + strconv.Itoa(e.Iter) +
		" iterations, not converged (the estimate returned is the best point so far; do not use it as a fitted model)"
	if e.Op != "" {
		s = e.Op + ": " + s
	}
	if e.Err != nil {
		s += ": " + e.Err.Error()
	}
	return s
}

// Unwrap returns ErrConvergence and the context's error.
func (e *InterruptedError) Unwrap() []error { return []error{errs.ErrConvergence, e.Err} }

// setOp names the exported function op in *err's chain (errs.SetOp);
// deferred at each exported entry point.
func setOp(op string, err *error) { errs.SetOp(op, *err) }
