package prewhiten

import (
	"fmt"
	"math"
	"strconv"

	"github.com/backshift/backshift/arma"
)

// ValueError reports a NaN or infinite sample, or one larger in
// magnitude than arma.MaxAbs (Want then says so): series Name at Index
// (0 = oldest) holds Value.
type ValueError struct {
	Name  string
	Index int
	Value float64
	// Want, when not empty, says what the series allows; it is empty for
	// a NaN or infinite sample.
	Want string
}

// Error describes the problem in one line, naming the series and values involved.
func (e *ValueError) Error() string {
	if e.Want != "" {
		return fmt.Sprintf("prewhiten: series %q has %v at index %d, want %s", e.Name, e.Value, e.Index, e.Want)
	}
	return fmt.Sprintf("prewhiten: series %q has %v at index %d", e.Name, e.Value, e.Index)
}

// LengthError reports two series that must have equal lengths but do not.
type LengthError struct {
	Names [2]string
	Lens  [2]int
}

// Error describes the problem in one line, naming the series and values involved.
func (e *LengthError) Error() string {
	return fmt.Sprintf("prewhiten: series %q has %d samples but %q has %d; they must be of equal length",
		e.Names[0], e.Lens[0], e.Names[1], e.Lens[1])
}

// ShortError reports a series of Len samples where Need are required for
// the reason Why.
type ShortError struct {
	Name string
	Len  int
	Need int
	Why  string
}

// Error describes the problem in one line, naming the series and values involved.
func (e *ShortError) Error() string {
	return fmt.Sprintf("prewhiten: series %q has %d samples, need at least %d %s", e.Name, e.Len, e.Need, e.Why)
}

// ConstantError reports a series with no variation left to work with:
// every sample equal (Diff empty), or every sample equal after the
// differencing Diff (for example "(1 - B)": the series is a straight
// line), or, After naming a filter, every sample of the filtered series
// equal. Value is that common value.
type ConstantError struct {
	Name  string
	Value float64
	// Diff is the differencing applied first as text, empty for none.
	Diff string
	// After, when not empty, names the filter after which the series is
	// constant (the filter fitted to the input).
	After string
}

// Error describes the problem in one line, naming the series and values involved.
func (e *ConstantError) Error() string {
	v := roundText(e.Value)
	switch {
	case e.After != "":
		return fmt.Sprintf("prewhiten: series %q is constant after the filter %s; check that it varies", e.Name, e.After)
	case e.Diff != "":
		return fmt.Sprintf("prewhiten: series %q is constant after the differencing %s (every differenced sample is %s): its levels lie on a straight line or repeat; use less differencing", e.Name, e.Diff, v)
	}
	return fmt.Sprintf("prewhiten: series %q is constant (every sample is %s); a constant series carries no information to prewhiten or correlate", e.Name, v)
}

// roundText prints v to 6 significant digits for messages.
func roundText(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

// ArgError reports a setting out of range.
type ArgError struct {
	Arg, Value, Want string
}

// Error describes the problem in one line, naming the series and values involved.
func (e *ArgError) Error() string {
	return fmt.Sprintf("prewhiten: %s = %s, want %s", e.Arg, e.Value, e.Want)
}

// NotWhiteError is returned together with a valid result when the
// prewhitened input still fails the Ljung-Box test: the filter did not
// whiten it, and cross-correlations computed from it can mislead. Try a
// larger MaxOrder, differencing, or an ARMA filter.
type NotWhiteError struct {
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

// Error describes the problem in one line, naming the series and values involved.
func (e *NotWhiteError) Error() string {
	return fmt.Sprintf("prewhiten: series %q is not white after prewhitening: Ljung-Box Q = %.4g on %d df over %d lags, p = %.3g < %g",
		e.Name, e.Q, e.DF, e.Lags, e.P, e.Level)
}

// checkSeries returns a *ValueError for the first NaN, infinite or too
// large sample (|v| > arma.MaxAbs, whose squares in the correlations and
// fits could overflow).
func checkSeries(name string, x []float64) error {
	for i, v := range x {
		if v-v != 0 {
			return &ValueError{Name: name, Index: i, Value: v}
		}
		if math.Abs(v) > arma.MaxAbs {
			return &ValueError{Name: name, Index: i, Value: v, Want: "a magnitude at most arma.MaxAbs = 1e140 (larger squares can overflow); rescale the series"}
		}
	}
	return nil
}

func itoa(k int) string { return strconv.Itoa(k) }
