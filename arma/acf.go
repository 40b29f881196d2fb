package arma

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/vec"
)

// Correlogram is the sample autocorrelation function of a series.
type Correlogram struct {
	// N is the number of samples.
	N int
	// Mean is the sample mean that was removed.
	Mean float64
	// Cov[k] is the sample autocovariance at lag k, k = 0..MaxLag:
	//
	//	c_k = (1/n) sum_{t=0}^{n-1-k} (x_t - xbar)(x_{t+k} - xbar)
	//
	// (divisor n, not n-k, so that the sequence is positive semi-definite).
	Cov []float64
	// R[k] = c_k / c_0 is the sample autocorrelation at lag k; R[0] = 1.
	R []float64
	// Bartlett[k] is Bartlett's large-sample standard error of R[k] under
	// the hypothesis that the series is a moving average of order k-1:
	//
	//	se_k = sqrt((1 + 2 sum_{j=1}^{k-1} r_j^2) / n)
	//
	// Bartlett[0] is 0.
	Bartlett []float64
	// White is 1/sqrt(n), the standard error of every R[k], k >= 1, for
	// white noise; +-1.96 White is the usual 95 % band.
	White float64
}

// ACF returns the sample autocovariances and autocorrelations of x at lags
// 0..maxLag, with the mean removed and divisor n (see Correlogram.Cov).
//
// It returns a *SettingError for maxLag < 0, a *SeriesError of kind
// ErrShort when maxLag >= n or n < 2, a *SampleError for NaN or infinite
// samples and a *SeriesError of kind ErrConstant for a constant series.
func ACF(x []float64, maxLag int) (c Correlogram, err error) {
	defer withOp("arma.ACF", &err)
	return acf(x, maxLag)
}

func acf(x []float64, maxLag int) (Correlogram, error) {
	n := len(x)
	if maxLag < 0 {
		return Correlogram{}, settingErr("maxLag", itoa(maxLag), "must not be negative")
	}
	if n < 2 || maxLag >= n {
		return Correlogram{}, shortErr("", n, max(2, addSat(maxLag, 1)), "an autocorrelation to lag "+strconv.Itoa(maxLag))
	}
	if err := checkFinite("", x); err != nil {
		return Correlogram{}, err
	}
	c := Correlogram{N: n, Cov: make([]float64, maxLag+1)}
	c.Mean = AutocovTo(c.Cov, x)
	if !(c.Cov[0] > 0) {
		return Correlogram{}, &SeriesError{Series: seriesName(""), Kind: ErrConstant, Detail: "every sample is " + strconv.FormatFloat(x[0], 'g', 6, 64) + " over its " + itoa(n) + " samples"}
	}
	c.R = make([]float64, maxLag+1)
	for k, v := range c.Cov {
		c.R[k] = v / c.Cov[0]
	}
	c.R[0] = 1
	c.Bartlett = make([]float64, maxLag+1)
	s := 1.0
	for k := 1; k <= maxLag; k++ {
		c.Bartlett[k] = math.Sqrt(s / float64(n))
		s += 2 * c.R[k] * c.R[k]
	}
	c.White = 1 / math.Sqrt(float64(n))
	return c, nil
}

// AutocovTo writes the sample autocovariances of x at lags 0..len(dst)-1
// into dst (divisor n, mean removed) and returns the mean. It allocates
// one scratch slice of len(x) and does not check its input: callers
// validate x (finite, len(dst) <= len(x)); AutocovTo panics when
// len(dst) > len(x), a programmer error.
func AutocovTo(dst, x []float64) float64 {
	n := len(x)
	if len(dst) > n {
		panic("arma: AutocovTo: more lags than samples")
	}
	if n == 0 {
		return math.NaN()
	}
	m := meanOf(x)
	d := make([]float64, n)
	for i, v := range x {
		d[i] = v - m
	}
	inv := 1 / float64(n)
	for k := range dst {
		dst[k] = vec.Dot(d[:n-k], d[k:]) * inv
	}
	return m
}

// meanOf returns the mean of x by a two-pass sum (the second pass corrects
// the rounding of the first).
func meanOf(x []float64) float64 {
	s := 0.0
	for _, v := range x {
		s += v
	}
	m := s / float64(len(x))
	c := 0.0
	for _, v := range x {
		c += v - m
	}
	return m + c/float64(len(x))
}

// Partial is the sample partial autocorrelation function.
type Partial struct {
	// N is the number of samples.
	N int
	// R[k-1] is the partial autocorrelation at lag k, k = 1..maxLag.
	R []float64
	// Band is 1/sqrt(n), the large-sample standard error of each R[k]
	// for white noise (and, beyond lag p, for an AR(p) series).
	Band float64
}

// PACF returns the sample partial autocorrelations of x at lags
// 1..maxLag, computed by the Durbin-Levinson recursion from the ACF
// (divisor n, mean removed). Errors are those of ACF, plus a *SettingError
// for maxLag < 1.
func PACF(x []float64, maxLag int) (p Partial, err error) {
	defer withOp("arma.PACF", &err)
	if maxLag < 1 {
		return Partial{}, settingErr("maxLag", itoa(maxLag), "must be at least 1")
	}
	c, err := acf(x, maxLag)
	if err != nil {
		return Partial{}, err
	}
	pa, _ := durbinLevinson(c.R, maxLag)
	return Partial{N: c.N, R: pa, Band: c.White}, nil
}

// PACFFromACF returns the partial autocorrelations at lags 1..len(r)-1
// from autocorrelations r (r[0] = 1) by the Durbin-Levinson recursion.
// Autocovariances work as well: the result is scale free. It returns nil
// for len(r) < 2. r is not checked: values that are not the
// autocorrelations of some series (r[0] <= 0, NaN, a sequence that is not
// positive definite) give NaN or values outside [-1, 1] from the lag
// where the recursion breaks down; PACF validates its series.
func PACFFromACF(r []float64) []float64 {
	if len(r) < 2 {
		return nil
	}
	pa, _ := durbinLevinson(r, len(r)-1)
	return pa
}

// durbinLevinson solves the Yule-Walker equations of orders 1..m from
// autocovariances r[0..m]. It returns the partial autocorrelations
// pa[k-1] and the prediction-error variances v[k] (v[0] = r[0]), so that
// v[k] = r[0] prod_{j<=k} (1 - pa_j^2). Once a variance is zero (a
// perfectly predictable series) the remaining values are NaN.
//
// References: Durbin, J. (1960). The fitting of time-series models. Rev.
// Int. Stat. Inst. 28, 233-244.
func durbinLevinson(r []float64, m int) (pa, v []float64) {
	pa, v, _ = levinson(r, m, 0)
	return pa, v
}

// levinson is durbinLevinson that also returns the AR coefficients of
// order keep (phi[0..keep-1], x_t = sum phi_j x_{t-j} + e); keep = 0 skips it.
func levinson(r []float64, m, keep int) (pa, v, phiKeep []float64) {
	pa = make([]float64, m)
	v = make([]float64, m+1)
	phi := make([]float64, m)
	prev := make([]float64, m)
	v[0] = r[0]
	for k := 1; k <= m; k++ {
		num := r[k]
		for j := 1; j < k; j++ {
			num -= phi[j-1] * r[k-j]
		}
		a := num / v[k-1]
		copy(prev, phi[:k-1])
		for j := 1; j < k; j++ {
			phi[j-1] = prev[j-1] - a*prev[k-j-1]
		}
		phi[k-1] = a
		pa[k-1] = a
		v[k] = v[k-1] * (1 - a*a)
		if k == keep {
			phiKeep = append([]float64(nil), phi[:k]...)
		}
	}
	return pa, v, phiKeep
}
