package arma

import (
	"math"
	"strconv"
)

// ARFit is an autoregression fitted by the Yule-Walker equations,
//
//	x_t - Mean = sum_{k=1}^{Order} Phi[k-1] (x_{t-k} - Mean) + e_t,  var(e_t) = Var.
type ARFit struct {
	// Order is the chosen order p (0 for white noise around the mean).
	Order int
	// Phi holds phi_1..phi_p (Box-Jenkins signs: phi(B) = 1 - sum phi_k B^k).
	Phi []float64
	// Var is the innovation variance: the one-step prediction-error
	// variance that the Durbin-Levinson recursion leaves at order p, the
	// lag-0 autocovariance c_0 shrunk by the factor 1 - pacf_k^2 at each
	// lag k = 1..p, then multiplied by n / (n - p - 1), because the p
	// coefficients and the mean were estimated from the same n samples
	// (the library's convention of dividing by the count less the
	// estimated quantities; see internal/est).
	Var float64
	// Mean is the sample mean removed before fitting.
	Mean float64
	// AIC[k] = n log(v_k) + 2k for k = 0..MaxOrder, v_k the uncorrected
	// prediction-error variance of order k. The chosen Order minimises it
	// (the lowest order on ties). Nil for YuleWalkerOrder.
	AIC []float64
	// PACF holds the partial autocorrelations at lags 1..MaxOrder (or
	// 1..Order for YuleWalkerOrder).
	PACF []float64
	// N is the number of samples.
	N int
}

// Poly returns phi(B) = {1, -phi_1, ..., -phi_p}, p = len(Phi) (the
// Order of a fitted ARFit; an ARFit built by hand with another Order
// still gets the polynomial of its coefficients).
func (f ARFit) Poly() []float64 {
	c := make([]float64, len(f.Phi)+1)
	c[0] = 1
	for k, v := range f.Phi {
		c[k+1] = -v
	}
	return c
}

// Residuals returns e_t = phi(B)(x_t - Mean) for a series x (the fitted
// one or another, as when prewhitening an output with an input's filter).
// The first Order values, which need samples before the start, are NaN.
// x is not modified; NaN in x propagates. (For an ARFit built by hand,
// the first max(Order, len(Phi)) values are NaN.)
func (f ARFit) Residuals(x []float64) []float64 {
	e := make([]float64, len(x))
	skip := max(f.Order, len(f.Phi))
	for t := range x {
		if t < skip {
			e[t] = math.NaN()
			continue
		}
		s := x[t] - f.Mean
		for k, v := range f.Phi {
			s -= v * (x[t-k-1] - f.Mean)
		}
		e[t] = s
	}
	return e
}

// YuleWalker fits autoregressions of orders 0..maxOrder to x by the
// Yule-Walker equations (sample autocovariances with divisor n, mean
// removed, solved by Durbin-Levinson) and keeps the order with the
// smallest AIC = n log(v_k) + 2k, v_k the prediction-error variance of
// order k. maxOrder = 0 means automatic: a bound that grows slowly with
// the record, ten orders per decade of samples, floor(10 log10 n) (20
// for 100 samples, 30 for 1000), and below n, so that long records may
// need long autoregressions while short ones keep enough samples per
// coefficient.
//
// Errors: *SettingError for maxOrder < 0, *SeriesError of kind ErrShort
// when maxOrder >= n, *SampleError for NaN/Inf samples, *SeriesError of
// kind ErrConstant for a constant series.
func YuleWalker(x []float64, maxOrder int) (f ARFit, err error) {
	defer withOp("arma.YuleWalker", &err)
	n := len(x)
	if maxOrder < 0 {
		return ARFit{}, settingErr("maxOrder", itoa(maxOrder), "must not be negative (zero means automatic)")
	}
	if maxOrder == 0 {
		maxOrder = min(n-1, int(math.Floor(10*math.Log10(float64(n)))))
		if maxOrder < 1 {
			return ARFit{}, shortErr("", n, 2, "a Yule-Walker fit")
		}
	}
	return ywFit(x, maxOrder, -1)
}

// YuleWalkerOrder fits an autoregression of the given order (>= 0) to x
// by the Yule-Walker equations, with the conventions of YuleWalker but no
// order search.
func YuleWalkerOrder(x []float64, order int) (f ARFit, err error) {
	defer withOp("arma.YuleWalkerOrder", &err)
	if order < 0 {
		return ARFit{}, settingErr("order", itoa(order), "must not be negative")
	}
	return ywFit(x, order, order)
}

func ywFit(x []float64, maxOrder, fixed int) (ARFit, error) {
	n := len(x)
	if maxOrder >= n {
		return ARFit{}, shortErr("", n, addSat(maxOrder, 1), "an autoregression of order "+strconv.Itoa(maxOrder))
	}
	c, err := acf(x, maxOrder)
	if err != nil {
		return ARFit{}, err
	}
	pa, v := durbinLevinson(c.Cov, maxOrder)
	f := ARFit{Mean: c.Mean, N: n, PACF: pa}
	order := fixed
	if fixed < 0 {
		f.AIC = make([]float64, maxOrder+1)
		order = 0
		for k := range f.AIC {
			f.AIC[k] = float64(n)*math.Log(v[k]) + 2*float64(k)
			if f.AIC[k] < f.AIC[order] {
				order = k
			}
		}
	}
	f.Order = order
	if order > 0 {
		_, _, f.Phi = levinson(c.Cov, order, order)
	}
	f.Var = v[order] * float64(n) / float64(n-(order+1))
	return f, nil
}
