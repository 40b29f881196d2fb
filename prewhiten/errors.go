package prewhiten

import (
	"fmt"
	"math"
	"strconv"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
)

// The library's error vocabulary (package internal/errs, shared by every
// package): shapes to use with errors.As and kinds to use with
// errors.Is. Every error an exported function of prewhiten returns
// matches one kind, and its Op names that function ("prewhiten.Pair").
type (
	// SampleError reports one bad sample: NaN, infinite, or beyond the
	// largest magnitude accepted (Limit), naming the series and index.
	SampleError = errs.SampleError
	// SeriesError reports a problem with a whole series: too short
	// (ErrShort), constant (ErrConstant, also after the differencing or
	// the filter, which Detail names), or of the wrong length
	// (ErrLength).
	SeriesError = errs.SeriesError
	// SettingError reports a setting that breaks its rule, naming the
	// field as the caller wrote it ("Settings.MaxOrder").
	SettingError = errs.SettingError
)

// Kinds of error, for errors.Is; every error of the package matches one.
var (
	ErrSample      = errs.ErrSample      // a sample is NaN, infinite or too large
	ErrShort       = errs.ErrShort       // too few samples
	ErrConstant    = errs.ErrConstant    // a series is constant (after its differencing)
	ErrLength      = errs.ErrLength      // series lengths differ
	ErrSetting     = errs.ErrSetting     // a setting breaks its rule
	ErrModel       = errs.ErrModel       // the filter does not whiten the input
	ErrConvergence = errs.ErrConvergence // the fit of Settings.Order did not converge
	ErrInternal    = errs.ErrInternal    // a fault of the library (a fit that panicked, recovered)
)

// NotWhiteError is returned together with a valid result when the
// prewhitened input still fails the Ljung-Box test: the filter did not
// whiten it, and cross-correlations computed from it can mislead. Try a
// larger MaxOrder, differencing, or an ARMA filter. It carries the test's
// figures, which no shared shape holds, and matches ErrModel (the filter
// is not usable as a whitening filter).
type NotWhiteError struct {
	// Op is the exported function called ("prewhiten.Pair").
	Op   string
	Name string
	// Q, DF and P are the Ljung-Box statistic, its degrees of freedom and
	// p-value; Lags the number of autocorrelations tested; Level the
	// threshold P fell below.
	Q     float64
	DF    int
	P     float64
	Lags  int
	Level float64
}

// Error describes the problem in one line, naming the series and the test's figures.
func (e *NotWhiteError) Error() string {
	return fmt.Sprintf("%sseries %q is not white after prewhitening: Ljung-Box Q = %.4g on %d df over %d lags, p = %.3g < %g; try a larger MaxOrder, differencing or an ARMA filter",
		errs.Prefix(e.Op), e.Name, e.Q, e.DF, e.Lags, e.P, e.Level)
}

// Unwrap returns ErrModel.
func (e *NotWhiteError) Unwrap() error { return ErrModel }

// withOp names the exported function op in the errors of err's chain
// (errs.SetOp) and returns err; an exported function calling another
// applies it last, so its own name wins.
func withOp(op string, err error) error { return errs.SetOp(op, err) }

// roundText prints v to 6 significant digits for messages.
func roundText(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

// lengthError reports the output y of length ny where the input x's
// length nx is expected.
func lengthError(x, y string, nx, ny int) error {
	return &SeriesError{Series: y, Kind: ErrLength, Have: ny, Need: nx,
		Detail: "the length of input " + strconv.Quote(x) + "; input and output must be of equal length"}
}

// shortError reports a series of have samples where need are required
// for the reason why.
func shortError(name string, have, need int, why string) error {
	return &SeriesError{Series: name, Kind: ErrShort, Have: have, Need: need, Detail: why}
}

// constantError reports a series whose every sample is v: diff, when not
// empty, is the differencing applied first ("(1 - B)").
func constantError(name string, v float64, diff string) error {
	d := "every sample is " + roundText(v) + "; a constant series carries no information to prewhiten or correlate"
	if diff != "" {
		d = "after the differencing " + diff + " every sample is " + roundText(v) + ": its levels lie on a straight line or repeat; use less differencing"
	}
	return &SeriesError{Series: name, Kind: ErrConstant, Detail: d}
}

// settingError reports a setting that breaks its rule.
func settingError(setting, value, rule string) error {
	return &SettingError{Setting: setting, Value: value, Rule: rule}
}

// checkSeries returns a *SampleError for the first NaN, infinite or too
// large sample (|v| > arma.MaxAbs, whose squares in the correlations and
// fits could overflow).
func checkSeries(name string, x []float64) error {
	for i, v := range x {
		if v-v != 0 {
			return &SampleError{Series: name, Index: i, Value: v}
		}
		if math.Abs(v) > arma.MaxAbs {
			return &SampleError{Series: name, Index: i, Value: v, Limit: arma.MaxAbs}
		}
	}
	return nil
}

func itoa(k int) string { return strconv.Itoa(k) }
