package prewhiten

import (
	"errors"
	"math"
	"strconv"

	"github.com/backshift/backshift/arma"
)

// Result is a prewhitened input-output pair.
type Result struct {
	// Filter is the filter fitted to the input.
	Filter Filter
	// Alpha is the prewhitened input and Beta the output through the same
	// filter, both of the original length with NaN before Start.
	Alpha, Beta []float64
	// Start is the first valid index of Alpha and Beta.
	Start int
	// Check is the Ljung-Box test of Alpha[Start:], its degrees of freedom
	// reduced by the p + q fitted filter coefficients.
	Check arma.Portmanteau
	// White reports whether Check.P is at least the settings' Level.
	White bool
}

// Pair fits a filter to the input x (see Fit) and applies it to x (as
// ApplyInput: the filter's Mean removed) and to the output y (as Apply:
// y's own mean removed), which must have the same length. It then tests
// Alpha[Start:] for whiteness with Ljung-Box.
//
// When the autoregression leaves the input autocorrelated and the filter
// was not given (Settings.ARMA, Settings.Order) and Settings.KeepAR is
// false, Pair also fits ARIMA(1,1,1) and ARIMA(1,0,1) filters (arma.Fit;
// with Settings.Diff, ARMA(1,1) after that differencing) and keeps the
// filter whose prewhitened input has the largest Ljung-Box p-value. A
// near-integrated input under feedback, which no AR of moderate order
// whitens, is the common case.
//
// When the final filter still fails the test, Pair returns the complete
// result together with a *NotWhiteError (use errors.As); when it is the
// filter of Settings.Order and its fit did not converge, the result comes
// with the *arma.ConvergenceError (joined with a *NotWhiteError when
// both apply); all other errors
// come with a nil result: *SeriesError of kind ErrLength, ErrShort or
// ErrConstant (x or y constant, x constant after its differencing or its
// filter), *SampleError naming "x"/"y" or the names given (Settings.Name
// for x, yName for y), *SettingError (Settings.Validate).
func Pair(x, y []float64, yName string, s *Settings) (*Result, error) {
	r0, err := pair(x, y, yName, s)
	return r0, withOp("prewhiten.Pair", err)
}

// pair is Pair without the Op.
func pair(x, y []float64, yName string, s *Settings) (*Result, error) {
	name := s.name()
	if yName == "" {
		yName = "y"
	}
	if len(x) != len(y) {
		return nil, lengthError(name, yName, len(x), len(y))
	}
	if err := s.Validate(); err != nil {
		return nil, err
	}
	if err := checkSeries(yName, y); err != nil {
		return nil, err
	}
	var set Settings
	if s != nil {
		set = *s
	}
	level := set.Level
	if level == 0 {
		level = 0.01
	}
	f, err := Fit(x, s)
	var convErr error // the caller's Order fitted without converging
	if err != nil {
		var cv *arma.ConvergenceError
		if !errors.As(err, &cv) {
			return nil, err
		}
		convErr = err
	}
	if isConstant(y) {
		return nil, constantError(yName, y[0], "")
	}
	res, err := pairWith(f, x, y, name, yName, set.Lags, level)
	if err != nil {
		return nil, err
	}
	if !res.White && set.ARMA == nil && set.Order == nil && !set.KeepAR {
		if r := tryARMAFilters(x, y, name, yName, set, level); r != nil && r.Check.P > res.Check.P {
			res, convErr = r, nil
		}
	}
	if !res.White {
		nw := &NotWhiteError{Name: name, Q: res.Check.Q, DF: res.Check.DF, P: res.Check.P, Lags: res.Check.Lags, Level: level}
		if convErr != nil {
			return res, errors.Join(nw, convErr)
		}
		return res, nw
	}
	return res, convErr
}

// tryARMAFilters fits the ARMA filters tried when the autoregressive
// one leaves the filtered input autocorrelated (ARIMA(1,1,1), skipped
// when Settings.Diff is given, then ARMA(1,1)) and returns the result of
// the one whose filtered input is whitest by the check's p-value, nil
// when none could be fitted.
func tryARMAFilters(x, y []float64, name, yName string, set Settings, level float64) *Result {
	orders := []arma.Order{{P: 1, D: 1, Q: 1}, {P: 1, Q: 1}}
	if set.Diff != nil {
		orders = orders[1:]
	}
	var best *Result
	for _, o := range orders {
		alt := set
		alt.Order = &o
		g, err := Fit(x, &alt)
		if err != nil {
			continue
		}
		r, err := pairWith(g, x, y, name, yName, set.Lags, level)
		if err != nil {
			continue
		}
		if best == nil || r.Check.P > best.Check.P {
			best = r
		}
	}
	return best
}

// pairWith applies f to x and y and tests the filtered x.
func pairWith(f Filter, x, y []float64, name, yName string, lags int, level float64) (*Result, error) {
	alpha, start, err := f.apply(x, name, f.Mean, false)
	if err != nil {
		return nil, err
	}
	beta, _, err := f.Apply(y, yName)
	if err != nil {
		return nil, err
	}
	res := &Result{Filter: f, Alpha: alpha, Beta: beta, Start: start}
	m := len(alpha) - start
	if lags == 0 {
		lags = min(20, m/5)
	}
	fitted := len(f.AR) - 1 + len(f.MA) - 1
	if lags <= fitted {
		// Too few lags to test beyond the fitted coefficients: test with
		// the smallest meaningful number.
		lags = fitted + 1
	}
	if lags >= m {
		return nil, shortError(name, len(x), start+min(lags, math.MaxInt-start-1)+1, "to check the prewhitened input for whiteness")
	}
	if isConstant(alpha[start:]) {
		return nil, &SeriesError{Series: name, Kind: ErrConstant, Detail: "after the filter " + strconv.Quote(f.String()) + "; check that it varies"}
	}
	res.Check, err = arma.LjungBox(alpha[start:], lags, fitted)
	if err != nil {
		return nil, err
	}
	res.White = res.Check.P >= level
	return res, nil
}
