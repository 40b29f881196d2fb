package prewhiten

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"slices"
	"strconv"
	"strings"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/poly"
)

// Settings tunes Fit and Pair. The zero value gives the defaults.
type Settings struct {
	// MaxOrder bounds the autoregression order searched by AIC; zero
	// means min(n-1, floor(10 log10 n)) for n differenced samples (a
	// bound growing with the log of the record length); negative is a
	// *SettingError.
	MaxOrder int
	// Diff is the differencing of the input, ascending powers of B, for
	// example {1, -1} for (1 - B); nil for none. It overrides AutoDiff.
	Diff []float64
	// AutoDiff differences the input once when the autoregression fitted
	// to the levels has phi(1) = 1 - sum phi_k below 0.1, that is when its
	// spectrum at frequency zero is more than 100 times the innovation
	// level: a near-integrated input (common practice, a heuristic rather
	// than a unit-root test).
	AutoDiff bool
	// Order, when not nil, fits an ARIMA model of these orders to the
	// input by conditional least squares (arma.Fit) and uses it as the
	// filter, instead of the autoregression by AIC: for inputs that an AR
	// of moderate order does not whiten, such as an integrated input
	// under feedback, for which ARIMA(1,1,1) is a common choice. The
	// differencing may be written either in Order (D, SD) or in Diff, not
	// in both (a *SettingError): Settings{Order: {D: 1, Q: 1}} and
	// Settings{Diff: {1, -1}, Order: {Q: 1}} are the same filter. In
	// either spelling the mean of the differenced input is estimated
	// with the coefficients (arma.ConstantFree, a drift for D = 1), as the
	// autoregression does, so that Filter.Mean is the level removed.
	Order *arma.Order
	// ARMA, when not nil, is used as the filter instead of fitting one:
	// phi(B) = ARMA.ARPoly(), theta(B) = ARMA.MAPoly(), the differencing
	// ARMA.DiffPoly(), or Diff when ARMA has none (both with different
	// differencing is a *SettingError). Its Mean and Sigma2 are kept.
	// Setting both Order and ARMA is a *SettingError.
	ARMA *arma.Model
	// Name names the input in errors and in the filter's text; empty
	// means "x".
	Name string
	// Lags is the number of autocorrelations in the Ljung-Box check of
	// the prewhitened input; zero means min(20, n/5), negative is an
	// *SettingError.
	Lags int
	// Level is the p-value below which the check reports a
	// *NotWhiteError; zero means 0.01, otherwise it must lie in (0, 1).
	Level float64
	// KeepAR stops Pair from trying ARIMA filters when the
	// autoregression does not whiten the input.
	KeepAR bool
}

// Validate checks every field of s on its own (nil is the defaults)
// and returns a *SettingError naming the first bad field: MaxOrder or Lags
// negative, Diff without constant term 1 or with a NaN or infinite
// coefficient, an invalid Order (negative orders, a seasonal part
// without Period >= 2, a degree above arma.MaxLag), an ARMA model with
// invalid orders or a NaN or infinite coefficient, mean or variance, a
// negative ARMA.Sigma2, both Order and ARMA set, differencing written
// twice (Diff with Order's D or SD, or Diff with a different ARMA
// differencing), and Level outside [0, 1) (zero is the default).
// Name, AutoDiff and KeepAR accept every value. Fit and Pair call it
// first; what depends on the series (its length against MaxOrder, Lags
// and the differencing) is checked there.
func (s *Settings) Validate() error {
	if s == nil {
		return nil
	}
	if err := errs.Count("", "Settings.MaxOrder", s.MaxOrder, "0 means min(n-1, floor(10 log10 n))"); err != nil {
		return err
	}
	if err := checkPoly("Settings.Diff", s.Diff); err != nil {
		return err
	}
	if s.Order != nil {
		if err := s.Order.Validate(); err != nil {
			return settingError("Settings.Order", s.Order.String(), "must be non-negative orders, Period >= 2 with a seasonal part, degrees up to arma.MaxLag")
		}
		if s.ARMA != nil {
			return settingError("Settings.Order", s.Order.String()+" together with Settings.ARMA", "must be one of Order (fit a filter) and ARMA (use a given one)")
		}
		if s.Diff != nil && (s.Order.D > 0 || s.Order.SD > 0) {
			return settingError("Settings.Order", s.Order.String()+" together with Settings.Diff "+strconv.Quote(polyText(s.Diff)), "must give the differencing written once: in Diff, or in Order's D and SD")
		}
	}
	if m := s.ARMA; m != nil {
		if m.ARPoly() == nil {
			return settingError("Settings.ARMA", m.Order().String(), "must be valid orders (D, SD >= 0, Period >= 2 with a seasonal part, degrees up to arma.MaxLag)")
		}
		for _, c := range [][]float64{m.AR, m.MA, m.SAR, m.SMA, {m.Mean, m.Sigma2}} {
			for _, v := range c {
				if v-v != 0 {
					return settingError("Settings.ARMA", "a NaN or infinite coefficient, Mean or Sigma2", "must be finite values")
				}
			}
		}
		if m.Sigma2 < 0 {
			return settingError("Settings.ARMA.Sigma2", strconv.FormatFloat(m.Sigma2, 'g', -1, 64), "must be zero or positive")
		}
		if d := normPoly(m.DiffPoly()); s.Diff != nil && len(d) > 1 && !slices.Equal(d, normPoly(s.Diff)) {
			return settingError("Settings.Diff", strconv.Quote(polyText(s.Diff))+" while Settings.ARMA differences by "+strconv.Quote(polyText(d)), "must give the differencing written once, or the same in both")
		}
	}
	if err := errs.Count("", "Settings.Lags", s.Lags, "0 means min(20, n/5)"); err != nil {
		return err
	}
	return errs.Probability("", "Settings.Level", s.Level, "0 means 0.01")
}

func maxAbs(zs []complex128) float64 {
	m := 0.0
	for _, z := range zs {
		m = math.Max(m, cmplx.Abs(z))
	}
	return m
}

func (s *Settings) name() string {
	if s == nil || s.Name == "" {
		return "x"
	}
	return s.Name
}

// Filter is a prewhitening filter alpha_t = phi(B)/theta(B) (D(B) x_t - m).
// It is an immutable value: the slices must not be modified.
type Filter struct {
	// Input names the series the filter was fitted to.
	Input string
	// Diff is D(B), AR is phi(B), MA is theta(B): ascending powers of B,
	// signs as stored, constant terms 1 ({1} for none).
	Diff, AR, MA []float64
	// Mean is m, the level of the differenced input that the filter
	// removes: ApplyInput and Pair's Alpha filter D(B) x_t - Mean. Apply,
	// meant for other series (Pair's Beta, the output), removes each
	// series' own mean instead, since their level is not the input's.
	Mean float64
	// Sigma2 is the innovation variance of the fit: for an
	// autoregression of order p fitted to n samples, the lag-0
	// autocovariance times prod_{k<=p} (1 - pacf_k^2) times n/(n-p-1)
	// (the prediction-error variance corrected for the p coefficients
	// and the mean); for s.Order the fit's estimate; for a given ARMA its
	// Sigma2.
	Sigma2 float64
}

// Order returns the degree of phi(B); a nil AR counts as {1}, order 0.
func (f Filter) Order() int { return degree(f.AR) }

// Start returns the first index of a filtered series that does not
// depend on samples before the start: deg D + deg phi. A nil polynomial
// counts as {1} (degree 0), so the zero Filter gives 0; Apply still
// rejects such a filter with a *SettingError.
func (f Filter) Start() int { return degree(f.Diff) + degree(f.AR) }

// degree returns len(c) - 1, or 0 for an empty c.
func degree(c []float64) int { return max(len(c)-1, 0) }

// String returns the filter for reading, with the coefficients at 4
// significant digits (a display of the numbers, not a model spec), for example "(1 - 0.6431 B + 0.3558 B^2) (1 - B) x",
// with "/ (1 + ...)" for an MA part.
func (f Filter) String() string {
	var sb strings.Builder
	sb.WriteString(polyText(f.AR))
	if len(f.MA) > 1 {
		sb.WriteString(" / ")
		sb.WriteString(polyText(f.MA))
	}
	if len(f.Diff) > 1 {
		sb.WriteString(" ")
		sb.WriteString(polyText(f.Diff))
	}
	name := f.Input
	if name == "" {
		name = "x"
	}
	sb.WriteString(" " + name)
	return strings.TrimPrefix(sb.String(), " ")
}

// polyText writes a polynomial with numeric coefficients, "(1 - 0.5 B)";
// the constant 1 alone gives "".
func polyText(c []float64) string {
	if len(c) <= 1 {
		return ""
	}
	var sb strings.Builder
	sb.WriteString("(")
	sb.WriteString(num(c[0]))
	for k := 1; k < len(c); k++ {
		v := c[k]
		if v == 0 {
			continue
		}
		if v < 0 {
			sb.WriteString(" - ")
		} else {
			sb.WriteString(" + ")
		}
		a := math.Abs(v)
		if a != 1 {
			sb.WriteString(num(a) + " ")
		}
		sb.WriteString("B")
		if k > 1 {
			sb.WriteString("^" + strconv.Itoa(k))
		}
	}
	sb.WriteString(")")
	return sb.String()
}

func num(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }

// Fit fits a prewhitening filter to the input x: the differencing
// s.Diff (or the automatic choice of AutoDiff), then an autoregression of
// order 0..MaxOrder chosen by AIC with the Yule-Walker equations
// (arma.YuleWalker: the order with the smallest n log(v_p) + 2p), or an
// ARIMA model of s.Order fitted by
// arma.Fit, or the caller's s.ARMA. Filter.Mean is the level removed
// from the differenced input: its sample mean for the autoregression
// (the mean of the differenced samples), the estimated mean for s.Order,
// ARMA.Mean for s.ARMA.
//
// Errors: *SettingError for bad settings (see Settings.Validate),
// *SampleError for NaN/Inf (with the index), *SeriesError (ErrShort) when the
// differenced series has fewer than MaxOrder+2 samples (at least 3),
// *SeriesError (ErrConstant) when x is constant, or constant after its
// differencing; the errors of arma.Fit for s.Order otherwise. When the
// fit of s.Order stopped without converging, the filter from its best
// point is returned together with the *arma.ConvergenceError. x is not
// modified.
func Fit(x []float64, s *Settings) (Filter, error) {
	r0, err := fit(x, s)
	return r0, withOp("prewhiten.Fit", err)
}

// fit is Fit without the Op.
func fit(x []float64, s *Settings) (Filter, error) {
	if err := s.Validate(); err != nil {
		return Filter{}, err
	}
	name := s.name()
	if err := checkSeries(name, x); err != nil {
		return Filter{}, err
	}
	var set Settings
	if s != nil {
		set = *s
	}
	if d := len(set.Diff) - 1; d > 0 && d+3 > len(x) {
		return Filter{}, shortError(name, len(x), d+3, "for the differencing "+polyText(set.Diff))
	}
	if len(x) < 3 {
		return Filter{}, shortError(name, len(x), 3, "for a prewhitening filter")
	}
	if isConstant(x) {
		return Filter{}, constantError(name, x[0], "")
	}
	if set.Order != nil {
		return fitOrder(x, name, set)
	}
	if set.ARMA != nil {
		return fromARMA(x, name, set, "Settings.ARMA")
	}
	diff := normPoly(set.Diff)
	f, err := fitAR(x, name, diff, set.MaxOrder)
	if err != nil {
		return Filter{}, err
	}
	if set.Diff == nil && set.AutoDiff {
		sum := 0.0
		for _, v := range f.AR {
			sum += v
		}
		if sum < 0.1 {
			g, err := fitAR(x, name, []float64{1, -1}, set.MaxOrder)
			if err == nil {
				return g, nil
			}
		}
	}
	return f, nil
}

// fitOrder fits the filter of Settings.Order: the differencing, in
// either spelling (Diff or Order's D and SD), is applied here, and the
// ARMA part is fitted to the differenced input with its mean, so that
// both spellings give the same filter. Errors of the fit are reported
// in lengths and indexes of x itself.
func fitOrder(x []float64, name string, set Settings) (Filter, error) {
	ord := *set.Order
	diff := normPoly(set.Diff)
	if set.Diff == nil {
		diff = normPoly(arma.Model{D: ord.D, SD: ord.SD, Period: ord.Period}.DiffPoly())
	}
	d := len(diff) - 1
	if d+3 > len(x) {
		return Filter{}, shortError(name, len(x), d+3, "for the differencing "+polyText(diff))
	}
	w := applyFIR(x, diff)[d:]
	if isConstant(w) {
		return Filter{}, constantError(name, w[0], polyText(diff))
	}
	ord.D, ord.SD = 0, 0
	if ord.SP == 0 && ord.SQ == 0 {
		ord.Period = 0
	}
	res, err := arma.Fit(context.Background(), w, ord, &arma.FitSettings{Name: name, Constant: arma.ConstantFree})
	if res == nil {
		// The fit saw the differenced series: report lengths and
		// indexes of x itself.
		var sse *SeriesError
		var sae *SampleError
		why := "for the filter of Settings.Order " + set.Order.String() + " after the differencing " + polyText(diff)
		// The differenced sample beyond the limit is reported at
		// the index of x it ends at.
		series := name + " after the differencing " + polyText(diff)
		switch {
		case errors.As(err, &sse) && sse.Kind == ErrShort:
			return Filter{}, shortError(name, len(x), sse.Need+d, why)
		case errors.As(err, &sae):
			return Filter{}, &SampleError{Series: series, Index: sae.Index + d, Value: sae.Value, Limit: sae.Limit}
		}
		return Filter{}, err
	}
	m := res.Model
	set.ARMA, set.Diff = &m, diff
	f, ferr := fromARMA(x, name, set, "Settings.Order")
	if ferr != nil {
		return Filter{}, ferr
	}
	return f, err // nil, or the fit's *arma.ConvergenceError
}

// fitAR fits the autoregressive filter of the series x after the
// differencing diff, its order chosen up to maxOrder.
func fitAR(x []float64, name string, diff []float64, maxOrder int) (Filter, error) {
	d := len(diff) - 1
	w := applyFIR(x, diff)[d:]
	if len(w) < 3 || maxOrder > len(w)-2 {
		need := max(3, min(maxOrder, math.MaxInt-2-d)+2) // no overflow for huge MaxOrder
		return Filter{}, shortError(name, len(x), need+d, "for the prewhitening autoregression")
	}
	if isConstant(w) {
		return Filter{}, constantError(name, w[0], polyText(diff))
	}
	ar, err := arma.YuleWalker(w, maxOrder)
	if err != nil {
		var ce *SeriesError
		if errors.As(err, &ce) && ce.Kind == ErrConstant {
			return Filter{}, constantError(name, w[0], polyText(diff))
		}
		return Filter{}, err
	}
	return Filter{Input: name, Diff: diff, AR: ar.Poly(), MA: []float64{1}, Mean: ar.Mean, Sigma2: ar.Var}, nil
}

// fromARMA builds the filter of set.ARMA; arg names the setting that
// gave the model in errors (Settings.Order for a fitted one).
func fromARMA(x []float64, name string, set Settings, arg string) (Filter, error) {
	m := set.ARMA
	diff := normPoly(m.DiffPoly())
	if len(diff) == 1 && set.Diff != nil {
		diff = normPoly(set.Diff)
	}
	f := Filter{Input: name, Diff: diff, AR: normPoly(m.ARPoly()), MA: normPoly(m.MAPoly()), Mean: m.Mean, Sigma2: m.Sigma2}
	for _, c := range [][]float64{f.Diff, f.AR, f.MA} {
		if err := checkPoly(arg, c); err != nil {
			return Filter{}, err
		}
	}
	if ok, roots, err := m.Invertible(); err != nil || !ok {
		what := "a non-invertible MA part"
		if arg == "Settings.Order" {
			what = "the fitted filter " + strconv.Quote(f.String()) + " with a non-invertible MA part"
		}
		if len(roots) > 0 {
			what += fmt.Sprintf(" (largest z-plane root modulus %.4g)", maxAbs(roots))
		}
		return Filter{}, settingError(arg, what, "must be an invertible model (its inverse filters the input); for a fitted one try a smaller Q or less differencing")
	}
	if len(x) <= f.Start()+1 {
		return Filter{}, shortError(name, len(x), f.Start()+2, "for the given filter")
	}
	return f, nil
}

// checkPoly checks that a polynomial given in settings starts with 1 and
// is finite.
func checkPoly(arg string, c []float64) error {
	if c == nil {
		return nil
	}
	if len(c) == 0 || c[0] != 1 {
		return settingError(arg, strconv.Quote(polyText(c)), "must be a polynomial with constant term 1")
	}
	for _, v := range c {
		if v-v != 0 {
			return settingError(arg, "NaN or Inf coefficient", "must be finite coefficients")
		}
	}
	return nil
}

func normPoly(c []float64) []float64 {
	if len(c) == 0 {
		return []float64{1}
	}
	n := len(c)
	for n > 1 && c[n-1] == 0 {
		n--
	}
	return append([]float64(nil), c[:n]...)
}

func isConstant(x []float64) bool {
	for _, v := range x[1:] {
		if v != x[0] {
			return false
		}
	}
	return true
}

// applyFIR returns c(B) x with NaN where samples before the start would
// be needed (the first deg c values).
func applyFIR(x, c []float64) []float64 {
	d := len(c) - 1
	out := make([]float64, len(x))
	for t := 0; t < min(d, len(x)); t++ {
		out[t] = math.NaN()
	}
	if d == 0 {
		copy(out, x)
		return out
	}
	for t := d; t < len(x); t++ {
		s := x[t]
		for k := 1; k <= d; k++ {
			s += c[k] * x[t-k]
		}
		out[t] = s
	}
	return out
}

// Apply filters y with f: w = D(B) y, then phi(B)/theta(B) (w - mean(w)),
// mean(w) being y's own mean over the differenced samples (the level of
// another series, such as the output, is not the input's; ApplyInput
// removes f.Mean instead). out has len(y) values, NaN before start =
// f.Start(); the MA part runs with zero pre-sample values from start.
// For the series f was fitted by autoregression to, out equals the
// autoregression residuals e_t = phi(B)(D(B) x_t - mean) and ApplyInput's
// result.
//
// Errors: *SettingError for a filter that is not valid (see Filter),
// *SampleError for NaN/Inf, *SeriesError (ErrShort) when y has no more than start+1
// samples. y is not modified.
func (f Filter) Apply(y []float64, name string) (out []float64, start int, err error) {
	if name == "" {
		name = "y"
	}
	out, start, err = f.apply(y, name, 0, true)
	return out, start, withOp("prewhiten.Filter.Apply", err)
}

// ApplyInput filters the input x the filter was fitted to as the filter
// is written: alpha_t = phi(B)/theta(B) (D(B) x_t - f.Mean), NaN before
// start = f.Start(), the MA part from zero pre-sample values at start.
// Pair's Alpha is this series. Errors and naming (f.Input, or "x") as
// for Apply.
func (f Filter) ApplyInput(x []float64) (out []float64, start int, err error) {
	name := f.Input
	if name == "" {
		name = "x"
	}
	if f.Mean-f.Mean != 0 {
		return nil, 0, withOp("prewhiten.Filter.ApplyInput", settingError("Filter.Mean", strconv.FormatFloat(f.Mean, 'g', -1, 64), "must be a finite number"))
	}
	out, start, err = f.apply(x, name, f.Mean, false)
	return out, start, withOp("prewhiten.Filter.ApplyInput", err)
}

// apply is Apply (own true: remove y's own mean) and ApplyInput (remove
// mean).
func (f Filter) apply(y []float64, name string, mean float64, own bool) (out []float64, start int, err error) {
	if err := f.check(); err != nil {
		return nil, 0, err
	}
	if err := checkSeries(name, y); err != nil {
		return nil, 0, err
	}
	start = f.Start()
	if len(y) < start+2 {
		return nil, 0, shortError(name, len(y), start+2, "for the prewhitening filter")
	}
	// out holds w = D(B) y from index d, then phi(B)(w - mean) in place,
	// computed from the end backwards so that every w_{t-k} is still
	// unfiltered when it is read.
	d := len(f.Diff) - 1
	out = make([]float64, len(y))
	if d == 0 {
		copy(out, y)
	} else {
		for t := d; t < len(y); t++ {
			v := y[t]
			for k := 1; k <= d; k++ {
				v += f.Diff[k] * y[t-k]
			}
			out[t] = v
		}
	}
	w := out[d:]
	m := mean
	if own {
		m = meanOf(w)
	}
	p := len(f.AR) - 1
	ar := f.AR
	// phi(B)(w_t - m) = phi(B) w_t - m phi(1).
	shift := 0.0
	for _, a := range ar {
		shift += a
	}
	shift *= m
	for t := len(w) - 1; t >= p; t-- {
		v := w[t] - shift
		h := w[t-p : t : t]
		for k, a := range ar[1:] {
			v += a * h[p-1-k]
		}
		w[t] = v
	}
	for t := 0; t < start; t++ {
		out[t] = math.NaN()
	}
	dst := out[start:]
	if len(f.MA) > 1 {
		filter.Run(dst, []float64{1}, f.MA, dst)
	}
	return out, start, nil
}

// check validates a filter built by hand (Fit's filters always pass):
// Diff, AR and MA present with constant term 1 and finite coefficients,
// and an invertible MA part (every root of theta(B) outside the unit
// circle), without which its inverse grows without bound.
func (f Filter) check() error {
	for _, p := range []struct {
		arg string
		c   []float64
	}{{"Filter.Diff", f.Diff}, {"Filter.AR", f.AR}, {"Filter.MA", f.MA}} {
		if p.c == nil {
			return settingError(p.arg, "nil", "must be a polynomial with constant term 1 ({1} for none)")
		}
		if err := checkPoly(p.arg, p.c); err != nil {
			return err
		}
	}
	if len(f.MA) > 1 {
		roots, err := poly.Roots(f.MA)
		if err != nil {
			return settingError("Filter.MA", strconv.Quote(polyText(f.MA)), "must be an invertible MA part (its roots could not be computed: coefficients of extreme size)")
		}
		for _, r := range roots {
			if cmplx.Abs(r) <= 1 {
				return settingError("Filter.MA", strconv.Quote(polyText(f.MA)), "must be an invertible MA part (roots in B outside the unit circle)")
			}
		}
	}
	return nil
}

// meanOf returns the mean of x with a correction pass (accurate for
// series with a large offset), four accumulators each.
func meanOf(x []float64) float64 {
	sum := func(x []float64, c float64) float64 {
		var s0, s1, s2, s3 float64
		i := 0
		for ; i+4 <= len(x); i += 4 {
			s0 += x[i] - c
			s1 += x[i+1] - c
			s2 += x[i+2] - c
			s3 += x[i+3] - c
		}
		for ; i < len(x); i++ {
			s0 += x[i] - c
		}
		return (s0 + s1) + (s2 + s3)
	}
	n := float64(len(x))
	m := sum(x, 0) / n
	return m + sum(x, m)/n
}
