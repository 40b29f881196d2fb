package prewhiten

import (
	"context"
	"errors"
	"math"
	"math/cmplx"
	"strconv"
	"strings"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/poly"
)

// Settings tunes Fit and Pair. The zero value gives the defaults.
type Settings struct {
	// MaxOrder bounds the autoregression order searched by AIC; zero
	// means min(n-1, floor(10 log10 n)) for n differenced samples, as R's
	// ar().
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
	// Order, when not nil (and ARMA is nil), fits an ARIMA model of these
	// orders to the input by conditional least squares (arma.Fit) and
	// uses it as the filter, instead of the autoregression by AIC: for
	// inputs that an AR of moderate order does not whiten, such as an
	// integrated input under feedback, for which ARIMA(1,1,1) is a common
	// choice. Its differencing is used unless Diff is set.
	Order *arma.Order
	// ARMA, when not nil, is used as the filter instead of fitting one:
	// phi(B) = ARMA.ARPoly(), theta(B) = ARMA.MAPoly(), the differencing
	// ARMA.DiffPoly() (unless Diff is set). Its Mean and Sigma2 are kept.
	ARMA *arma.Model
	// Name names the input in errors and in the filter's text; empty
	// means "x".
	Name string
	// Lags is the number of autocorrelations in the Ljung-Box check of
	// the prewhitened input; zero means min(20, n/5).
	Lags int
	// Level is the p-value below which the check reports a
	// *NotWhiteError; zero means 0.01.
	Level float64
	// KeepAR stops Pair from trying ARIMA filters when the
	// autoregression does not whiten the input.
	KeepAR bool
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
	// Mean is the mean of the differenced input removed before
	// filtering it. Apply removes each series' own mean instead.
	Mean float64
	// Sigma2 is the innovation variance of the fit (R's var.pred for a
	// fitted autoregression, the model's Sigma2 for a given ARMA).
	Sigma2 float64
}

// Order returns the degree of phi(B); a nil AR counts as {1}, order 0.
func (f Filter) Order() int { return degree(f.AR) }

// Start returns the first index of a filtered series that does not
// depend on samples before the start: deg D + deg phi. A nil polynomial
// counts as {1} (degree 0), so the zero Filter gives 0; Apply still
// rejects such a filter with an *ArgError.
func (f Filter) Start() int { return degree(f.Diff) + degree(f.AR) }

// degree returns len(c) - 1, or 0 for an empty c.
func degree(c []float64) int { return max(len(c)-1, 0) }

// String returns the filter as a spec fragment with the coefficients at
// 4 significant digits, for example "(1 - 0.6431 B + 0.3558 B^2) (1 - B) x",
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
// (arma.YuleWalker, whose order and coefficients agree with R's
// ar(method = "yule-walker")), or the caller's s.ARMA.
//
// Errors: *ValueError for NaN/Inf (with the index), *ShortError when the
// differenced series has fewer than MaxOrder+2 samples (at least 3),
// *ConstantError when it is constant, *ArgError for bad settings. x is
// not modified.
func Fit(x []float64, s *Settings) (Filter, error) {
	name := s.name()
	if err := checkSeries(name, x); err != nil {
		return Filter{}, err
	}
	var set Settings
	if s != nil {
		set = *s
	}
	if set.MaxOrder < 0 {
		return Filter{}, &ArgError{Arg: "Settings.MaxOrder", Value: itoa(set.MaxOrder), Want: ">= 0"}
	}
	if err := checkPoly("Settings.Diff", set.Diff); err != nil {
		return Filter{}, err
	}
	if d := len(set.Diff) - 1; d > 0 && d+3 > len(x) {
		return Filter{}, &ShortError{Name: name, Len: len(x), Need: d + 3, Why: "for the differencing " + strconv.Quote(polyText(set.Diff))}
	}
	if set.ARMA == nil && set.Order != nil {
		ord := *set.Order
		if set.Diff != nil {
			ord.D, ord.SD = 0, 0
		}
		w := x
		if set.Diff != nil {
			d := len(set.Diff) - 1
			w = applyFIR(x, set.Diff)[d:]
		}
		res, err := arma.Fit(context.Background(), w, ord, &arma.Options{Name: name})
		if res == nil {
			return Filter{}, err
		}
		m := res.Model
		set.ARMA = &m
	}
	if set.ARMA != nil {
		return fromARMA(x, name, set)
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

func fitAR(x []float64, name string, diff []float64, maxOrder int) (Filter, error) {
	d := len(diff) - 1
	w := applyFIR(x, diff)[d:]
	if len(w) < 3 || maxOrder > len(w)-2 {
		need := max(3, min(maxOrder, math.MaxInt-2-d)+2) // no overflow for huge MaxOrder
		return Filter{}, &ShortError{Name: name, Len: len(x), Need: need + d, Why: "for the prewhitening autoregression"}
	}
	if isConstant(w) {
		return Filter{}, &ConstantError{Name: name}
	}
	ar, err := arma.YuleWalker(w, maxOrder)
	if err != nil {
		var ce *arma.ConstantError
		if errors.As(err, &ce) {
			return Filter{}, &ConstantError{Name: name}
		}
		return Filter{}, err
	}
	return Filter{Input: name, Diff: diff, AR: ar.Poly(), MA: []float64{1}, Mean: ar.Mean, Sigma2: ar.Var}, nil
}

func fromARMA(x []float64, name string, set Settings) (Filter, error) {
	m := set.ARMA
	diff := normPoly(set.Diff)
	if set.Diff == nil {
		diff = normPoly(m.DiffPoly())
	}
	f := Filter{Input: name, Diff: diff, AR: normPoly(m.ARPoly()), MA: normPoly(m.MAPoly()), Mean: m.Mean, Sigma2: m.Sigma2}
	for _, c := range [][]float64{f.Diff, f.AR, f.MA, {1, f.Mean}} {
		if err := checkPoly("Settings.ARMA", c); err != nil {
			return Filter{}, err
		}
	}
	if ok, _, err := m.Invertible(); err != nil || !ok {
		return Filter{}, &ArgError{Arg: "Settings.ARMA", Value: "a non-invertible MA part", Want: "an invertible model (its inverse filters the input)"}
	}
	if len(x) <= f.Start()+1 {
		return Filter{}, &ShortError{Name: name, Len: len(x), Need: f.Start() + 2, Why: "for the given filter"}
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
		return &ArgError{Arg: arg, Value: strconv.Quote(polyText(c)), Want: "a polynomial with constant term 1"}
	}
	for _, v := range c {
		if v-v != 0 {
			return &ArgError{Arg: arg, Value: "NaN or Inf coefficient", Want: "finite coefficients"}
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
// mean(w) being y's own mean over the differenced samples. out has
// len(y) values, NaN before start = f.Start(); the MA part runs with zero
// pre-sample values from start. For the series f was fitted to, out
// equals the autoregression residuals (R's ar()$resid).
//
// Errors: *ValueError for NaN/Inf, *ShortError when y has no more than
// start+1 samples. y is not modified.
func (f Filter) Apply(y []float64, name string) (out []float64, start int, err error) {
	if name == "" {
		name = "y"
	}
	if err := f.check(); err != nil {
		return nil, 0, err
	}
	if err := checkSeries(name, y); err != nil {
		return nil, 0, err
	}
	start = f.Start()
	if len(y) < start+2 {
		return nil, 0, &ShortError{Name: name, Len: len(y), Need: start + 2, Why: "for the prewhitening filter"}
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
	m := meanOf(w)
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
			return &ArgError{Arg: p.arg, Value: "nil", Want: "a polynomial with constant term 1 ({1} for none)"}
		}
		if err := checkPoly(p.arg, p.c); err != nil {
			return err
		}
	}
	if len(f.MA) > 1 {
		roots, err := poly.Roots(f.MA)
		if err != nil {
			return &ArgError{Arg: "Filter.MA", Value: strconv.Quote(polyText(f.MA)), Want: "an invertible MA part: " + err.Error()}
		}
		for _, r := range roots {
			if cmplx.Abs(r) <= 1 {
				return &ArgError{Arg: "Filter.MA", Value: strconv.Quote(polyText(f.MA)), Want: "an invertible MA part (roots in B outside the unit circle)"}
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
