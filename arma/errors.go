package arma

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
)

// MaxAbs is the largest magnitude accepted for a sample: beyond it the
// squares and sums of squares that every correlation and fit computes
// could overflow to +Inf (1e140 squared is 1e280, leaving room for sums
// over 10^28 samples), and the results would be NaN without a word.
const MaxAbs = 1e140

// The error shapes of the library (internal/errs), re-exported so that
// callers of arma need no other import. Every error an exported function
// of arma returns is one of them (or wraps one) and matches one of the
// kinds below with errors.Is; Op names the exported function called
// ("arma.Fit", "arma.Result.Forecast").
type (
	// SampleError reports a NaN, infinite or too large (|v| > MaxAbs)
	// sample: the series (FitSettings.Name, "series" when empty; the
	// regressor's name; "innovations"), its 0-based index and value.
	SampleError = errs.SampleError
	// SeriesError reports a series too short (Kind ErrShort, with Have
	// and Need) or constant (ErrConstant), or whose fit overflows
	// (ErrOverflow).
	SeriesError = errs.SeriesError
	// SettingError reports an argument or settings field that breaks its
	// rule: Setting is the caller's name for it ("FitSettings.MaxIter",
	// "maxLag").
	SettingError = errs.SettingError
	// ModelError reports a model, polynomial or coefficient that cannot
	// be used, among them a polynomial whose roots cannot be computed.
	ModelError = errs.ModelError
	// ConvergenceError is returned by Fit together with a valid *Result
	// when the optimiser stopped before convergence; for a fit stopped
	// by the caller's context the error also matches the context's error
	// (errors.Is(err, context.Canceled)).
	ConvergenceError = errs.ConvergenceError
	// InternalError reports a panic (a fault of the library) recovered
	// on one of Select's worker goroutines.
	InternalError = errs.InternalError
)

// The kinds of error, for errors.Is (see internal/errs).
var (
	ErrSample      = errs.ErrSample
	ErrShort       = errs.ErrShort
	ErrConstant    = errs.ErrConstant
	ErrLength      = errs.ErrLength
	ErrSetting     = errs.ErrSetting
	ErrModel       = errs.ErrModel
	ErrConvergence = errs.ErrConvergence
	ErrOverflow    = errs.ErrOverflow
	ErrInternal    = errs.ErrInternal
)

// canceled is the error of a fit stopped by the caller's context: a
// *ConvergenceError that also matches the context's error.
type canceled struct {
	*ConvergenceError
	ctx error
}

func (e *canceled) Unwrap() []error { return []error{e.ConvergenceError, e.ctx} }

// settingErr returns a *SettingError (Op filled in by withOp).
func settingErr(setting, value, rule string) error {
	return &SettingError{Setting: setting, Value: value, Rule: rule}
}

// modelErr returns a *ModelError (Op filled in by withOp).
func modelErr(part, problem string) error {
	return &ModelError{Part: part, Problem: problem}
}

// shortErr returns a *SeriesError of kind ErrShort: have samples, need
// needed for what.
func shortErr(series string, have, need int, what string) error {
	return &SeriesError{Series: seriesName(series), Kind: ErrShort, Have: have, Need: need, Detail: "needed for " + what}
}

// withOp sets Op in *err's chain to op, the exported function the caller
// called (errs.SetOp); deferred at each exported entry point, so that the
// outermost function's name wins.
func withOp(op string, err *error) { errs.SetOp(op, *err) }

// checkFinite returns a *SampleError for the first NaN, infinite or
// too large (|v| > MaxAbs) sample.
func checkFinite(name string, x []float64) error {
	for i, v := range x {
		if !(math.Abs(v) <= MaxAbs) {
			return &SampleError{Series: seriesName(name), Index: i, Value: v, Limit: MaxAbs}
		}
	}
	return nil
}

// seriesName is the name errors print for a series: the caller's
// FitSettings.Name, or "series" when none was given.
func seriesName(s string) string {
	if s == "" {
		return "series"
	}
	return s
}

// addSat returns a+b for non-negative a and b, or math.MaxInt when the sum
// overflows, so that a SeriesError's Need for a huge lag or start stays
// positive.
func addSat(a, b int) int {
	if a > math.MaxInt-b {
		return math.MaxInt
	}
	return a + b
}

func itoa(k int) string { return strconv.Itoa(k) }
