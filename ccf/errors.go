package ccf

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/backshift/backshift/internal/errs"
)

// The library's error vocabulary (package internal/errs, shared by every
// package): shapes to use with errors.As and kinds to use with
// errors.Is. Every error an exported function of ccf returns matches one
// kind, and its Op names that function ("ccf.Cross").
type (
	// SampleError reports one bad sample: NaN, infinite, or beyond the
	// largest magnitude accepted (Limit), naming the series and index.
	SampleError = errs.SampleError
	// SeriesError reports a problem with a whole series: too short
	// (ErrShort), constant (ErrConstant), of the wrong length
	// (ErrLength), overflowing (ErrOverflow) or with an unusable value
	// (ErrSample, Detail says which).
	SeriesError = errs.SeriesError
	// SettingError reports a setting or argument that breaks its rule,
	// naming the field as the caller wrote it.
	SettingError = errs.SettingError
	// ModelError reports a regression or model that cannot be used
	// (a singular distributed-lag regression).
	ModelError = errs.ModelError
)

// Kinds of error, for errors.Is; every error of the package matches one.
var (
	ErrSample   = errs.ErrSample   // a sample is NaN, infinite or too large
	ErrShort    = errs.ErrShort    // too few samples or weights
	ErrConstant = errs.ErrConstant // a series is constant
	ErrLength   = errs.ErrLength   // series lengths differ
	ErrSetting  = errs.ErrSetting  // a setting or argument breaks its rule
	ErrModel    = errs.ErrModel    // no usable model: no response found, singular regression
	ErrOverflow = errs.ErrOverflow // sums leave float64 range
)

// NoResponseError is returned by Identify when no non-negative lag up to
// MaxLag carries a significant weight at the level used: the data show
// no effect of the input on the output that the method can find. It
// carries the evidence (the largest |t| and its lag), which no shared
// shape holds, and matches ErrModel (no input term can be proposed).
type NoResponseError struct {
	// Op is the exported function called ("ccf.Identify").
	Op     string
	Input  string
	MaxLag int
	Level  float64
	// Largest is the largest |weight / standard error| seen, and Lag
	// where it occurred.
	Largest float64
	Lag     int
}

// Error describes the problem in one line, naming the input and the evidence.
func (e *NoResponseError) Error() string {
	return fmt.Sprintf("%sno significant response of the output to input %q at lags 0..%d (level %g; largest |t| = %.2f at lag %d); check that the input moved during the record, or lengthen the lags",
		errs.Prefix(e.Op), e.Input, e.MaxLag, e.Level, e.Largest, e.Lag)
}

// Unwrap returns ErrModel.
func (e *NoResponseError) Unwrap() error { return ErrModel }

// withOp names the exported function op in the errors of err's chain
// (errs.SetOp) and returns err; an exported function calling another
// applies it last, so its own name wins.
func withOp(op string, err error) error { return errs.SetOp(op, err) }

// lengthError reports series b of length nb where a's length na is
// expected.
func lengthError(a, b string, na, nb int) error {
	return &SeriesError{Series: b, Kind: ErrLength, Have: nb, Need: na, Detail: "the length of " + strconv.Quote(a) + "; the series must be of equal length"}
}

// shortError reports a series of have samples where need are required
// for the reason why.
func shortError(name string, have, need int, why string) error {
	return &SeriesError{Series: name, Kind: ErrShort, Have: have, Need: need, Detail: why}
}

// constantError reports a constant series (every sample v).
func constantError(name string, v float64) error {
	return &SeriesError{Series: name, Kind: ErrConstant,
		Detail: "every sample is " + strconv.FormatFloat(v, 'g', 6, 64) + "; its correlations are undefined"}
}

// singularError reports a rank-deficient distributed-lag regression.
func singularError(inputs []string) error {
	return &ModelError{Part: "the distributed-lag regression on inputs " + strings.Join(inputs, ", "),
		Problem: "singular: an input is a linear combination of the lags of the others; drop one of them"}
}

// undeterminedError reports a distributed-lag regression whose estimates
// or standard errors are not finite numbers, as a *ModelError.
func undeterminedError(inputs []string) error {
	return &ModelError{Part: "the distributed-lag regression on inputs " + strings.Join(inputs, ", "),
		Problem: "the weights or their standard errors are not determined by the data (an input that barely moves, or one that nearly repeats another's lags); give inputs that vary independently, or fewer lags"}
}

// checkSeries returns a *SampleError for the first NaN or infinite sample.
func checkSeries(name string, x []float64) error {
	for i, v := range x {
		if v-v != 0 { // NaN or +-Inf
			return &SampleError{Series: name, Index: i, Value: v}
		}
	}
	return nil
}
