package arma

import (
	"fmt"
	"math"
	"strconv"
)

// MaxAbs is the largest magnitude accepted for a sample: beyond it the
// squares and sums of squares that every correlation and fit computes
// could overflow to +Inf (1e140 squared is 1e280, leaving room for sums
// over 10^28 samples), and the results would be NaN without a word.
const MaxAbs = 1e140

// DataError reports a sample that is NaN, infinite or larger in magnitude
// than MaxAbs. Index is the 0-based position in the series; Series names
// it when the caller gave a name (Options.Name), and is empty otherwise.
type DataError struct {
	Series string
	Index  int
	Value  float64
}

// Error implements the error interface.
func (e *DataError) Error() string {
	name := seriesName(e.Series)
	if !math.IsNaN(e.Value) && !math.IsInf(e.Value, 0) {
		return fmt.Sprintf("arma: %s sample %d is %v, beyond MaxAbs = %v", name, e.Index, e.Value, MaxAbs)
	}
	return fmt.Sprintf("arma: %s sample %d is %v", name, e.Index, e.Value)
}

// ShortError reports a series too short for the requested computation:
// N samples were given, Need are required, What says for what.
type ShortError struct {
	Series string
	N      int
	Need   int
	What   string
}

// Error implements the error interface.
func (e *ShortError) Error() string {
	name := seriesName(e.Series)
	return fmt.Sprintf("arma: %s has %d samples, %s needs at least %d", name, e.N, e.What, e.Need)
}

// ConstantError reports a series whose samples are all equal (zero
// variance after removing the mean), or all equal after the model's
// differencing Diff (a straight line under (1 - B)), so that
// correlations and fits are undefined. Value is the common value (of
// the differenced series when Diff is not empty).
type ConstantError struct {
	Series string
	N      int
	Value  float64
	// Diff is the differencing as text, "(1 - B)", empty for none.
	Diff string
}

// Error implements the error interface.
func (e *ConstantError) Error() string {
	name := seriesName(e.Series)
	v := strconv.FormatFloat(e.Value, 'g', 6, 64)
	if e.Diff != "" {
		return fmt.Sprintf("arma: %s is constant after the differencing %s (every differenced sample is %s over its %d samples): its levels lie on a line or repeat; use less differencing", name, e.Diff, v, e.N)
	}
	return fmt.Sprintf("arma: %s is constant (every sample is %s over its %d samples)", name, v, e.N)
}

// ArgError reports an invalid argument that depends on the caller's
// configuration rather than the data: a negative order or lag, an
// unknown parameter name, a regressor of the wrong length.
type ArgError struct {
	Arg string
	Msg string
}

// Error implements the error interface.
func (e *ArgError) Error() string { return fmt.Sprintf("arma: %s: %s", e.Arg, e.Msg) }

// ConvergenceError is returned by Fit together with a valid *Result when
// the optimiser stopped before convergence. The result holds the best
// point reached; Reason says why the optimiser stopped and Iter after how
// many iterations. When the stop was the caller's context, Err holds the
// context's error (context.Canceled or context.DeadlineExceeded), so that
// errors.Is(err, context.Canceled) works; otherwise Err is nil.
type ConvergenceError struct {
	Reason string
	Iter   int
	Err    error
}

// Unwrap returns the context's error for a cancelled fit, nil otherwise.
func (e *ConvergenceError) Unwrap() error { return e.Err }

// Error implements the error interface.
func (e *ConvergenceError) Error() string {
	return fmt.Sprintf("arma: fit not converged after %d iterations: %s", e.Iter, e.Reason)
}

// InternalError reports a panic inside a goroutine that the library
// started (Select runs its fits on worker goroutines). A panic there
// would end the caller's whole process, so each worker recovers it into
// this error as a last line of defence. It is always a bug in backshift,
// never a problem of the data: please report it with the call that
// caused it. Op says what was running, Value is the recovered panic
// value and Stack the goroutine's stack at the panic.
type InternalError struct {
	Op    string
	Value any
	Stack string
}

// Error implements the error interface.
func (e *InternalError) Error() string {
	return fmt.Sprintf("arma: internal error in %s: %v (a bug in backshift, not a problem of the data: please report it with the call that caused it)", e.Op, e.Value)
}

// RootError reports that the roots of a model polynomial could not be
// computed, so that its stationarity (Part "AR") or invertibility (Part
// "MA") cannot be judged. Poly writes the polynomial's factor ("phi(B)"
// or the seasonal "Phi(B^s)", "theta(B)", "Theta(B^s)") and Reason says
// what failed. It comes from coefficients of extreme size (beyond about
// 1e150, where the root finder's arithmetic overflows); no stationary or
// invertible polynomial has them.
type RootError struct {
	Part   string
	Poly   string
	Reason string
}

// Error implements the error interface.
func (e *RootError) Error() string {
	what := "stationarity"
	if e.Part == "MA" {
		what = "invertibility"
	}
	return fmt.Sprintf("arma: the roots of the %s polynomial %s could not be computed (%s), so its %s cannot be judged; coefficients of this size belong to no stationary or invertible model: check their scale", e.Part, e.Poly, e.Reason, what)
}

// checkFinite returns a *DataError for the first NaN, infinite or
// too large (|v| > MaxAbs) sample.
func checkFinite(name string, x []float64) error {
	for i, v := range x {
		if !(math.Abs(v) <= MaxAbs) {
			return &DataError{Series: name, Index: i, Value: v}
		}
	}
	return nil
}

// seriesName is the name errors print for a series: the caller's
// Options.Name, or "series" when none was given.
func seriesName(s string) string {
	if s == "" {
		return "series"
	}
	return s
}

// addSat returns a+b for non-negative a and b, or math.MaxInt when the sum
// overflows, so that a ShortError's Need for a huge lag or start stays
// positive.
func addSat(a, b int) int {
	if a > math.MaxInt-b {
		return math.MaxInt
	}
	return a + b
}

func itoa(k int) string { return strconv.Itoa(k) }
