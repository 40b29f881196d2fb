package tf

import (
	"fmt"
	"math"
	"strings"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/prewhiten"
	"gonum.org/v1/gonum/stat/distuv"
)

// CheckSettings tunes Check. The zero value (or nil) gives the defaults.
type CheckSettings struct {
	// Lags is the number K of residual autocorrelations in the Ljung-Box
	// test. Zero means min(24, N/4), raised to the number of noise
	// parameters + 1 when that is larger.
	Lags int
	// CrossLags is K for the residual-input cross-correlations at lags
	// 0..K. Zero means Lags.
	CrossLags int
	// Alpha is the significance level of every verdict: a check fails
	// when its p-value is below Alpha. Zero means 0.05.
	Alpha float64
}

// ResidualCheck is the whiteness check of the residuals.
type ResidualCheck struct {
	// ACF holds the residual autocorrelations at lags 1..Lags (index
	// k-1 = lag k; divisor N, mean removed); Band = 1.96/sqrt(N) is the
	// approximate 95 % limit for white noise.
	ACF  []float64
	Band float64
	// Q is the Ljung-Box statistic N(N+2) sum_k r_k^2/(N-k) with DF =
	// Lags - (number of free noise parameters) degrees of freedom, and P
	// its upper-tail chi-squared probability.
	Q    float64
	Lags int
	DF   int
	P    float64
	// Pass reports P >= Alpha.
	Pass bool
}

// CrossCheck is the check that the residuals are uncorrelated with one
// prewhitened input, which they are when the transfer function is
// adequate.
type CrossCheck struct {
	// Input names the input series; Prewhiten is the filter fitted to it
	// (an autoregression by Yule-Walker with AIC order choice after the
	// input's own differencing, package prewhiten).
	Input     string
	Prewhiten prewhiten.Filter
	// CCF holds r_alpha,a(k) for k = 0..Lags, the correlation of the
	// prewhitened input alpha_t with the residual a_{t+k} (input
	// leading), over the samples where both exist; M is their number and
	// Band = 1.96/sqrt(M).
	CCF  []float64
	M    int
	Band float64
	// S = M sum_{k=0}^{Lags} r_k^2 is referred to chi-squared with DF =
	// Lags + 1 - (r + s + 1) degrees of freedom, r + s + 1 being the
	// number of free coefficients of this input's transfer function
	// (DF at least 1); P is the upper-tail probability.
	S    float64
	Lags int
	DF   int
	P    float64
	// Pass reports P >= Alpha.
	Pass bool
}

// Diagnostics is the result of Check.
type Diagnostics struct {
	// Alpha is the significance level used.
	Alpha float64
	// Residual is the whiteness check of the residuals.
	Residual ResidualCheck
	// Cross holds one check per input, in the model's order.
	Cross []CrossCheck
	// Failures lists, in words, every reason the model must not be
	// trusted: the fit did not converge, a standard error is not
	// available, a serious warning of the estimate (WarningKind.Serious:
	// roots on or outside the unit circle, too few residuals, an
	// unexplained start-up transient, ...), and every failed check.
	// Empty when the model passes.
	Failures []string
	// Pass reports whether every check passed and the estimate itself
	// is sound: len(Failures) == 0.
	Pass bool
}

// Check runs the diagnostic checks of a fitted model on the data it was
// fitted to, or other data with the same series (the residuals are
// recomputed from data with the estimates and e's conditioning): the Ljung-Box
// test of the residual autocorrelations, with degrees of freedom reduced
// by the number of free noise parameters, and for each input the
// portmanteau test of the cross-correlations between the residuals and
// the prewhitened input at lags 0..K,
//
//	S = M sum_{k=0}^{K} r_alpha,a(k)^2 ~ chi-squared(K + 1 - (r + s + 1)),
//
// with a verdict per check and overall. data is not modified.
//
// Errors: the *FitError and *SampleError of Fit for missing, unequal or
// non-finite series; the errors of packages arma, prewhiten and ccf when
// a series is too short or constant for its check.
//
// References: Box, G. E. P., Jenkins, G. M., Reinsel, G. C. and Ljung,
// G. M. (2015). Time Series Analysis, 5th ed., Wiley: the chapter on
// diagnostic checking of transfer-function models. Ljung, G. M. and
// Box, G. E. P. (1978). Biometrika 65(2), 297-303.
func Check(e *Estimate, data map[string][]float64, s *CheckSettings) (*Diagnostics, error) {
	var set CheckSettings
	if s != nil {
		set = *s
	}
	if set.Alpha <= 0 {
		set.Alpha = 0.05
	}
	resid, first, err := chkResiduals(e, data)
	if err != nil {
		return nil, err
	}
	a := resid[first:]
	nres := len(a)
	noisePar := 0
	if e.Model.Noise != nil {
		noisePar = len(chkFreeNames(e.Model.Noise.MA, e.Model.Noise.AR))
	}
	lags := set.Lags
	if lags <= 0 {
		lags = max(min(24, nres/4), noisePar+1)
	}
	lags = max(lags, noisePar+1)
	d := &Diagnostics{Alpha: set.Alpha, Pass: true}
	acf, err := arma.ACF(a, lags)
	if err != nil {
		return nil, err
	}
	lb, err := arma.LjungBox(a, lags, noisePar)
	if err != nil {
		return nil, err
	}
	d.Residual = ResidualCheck{ACF: append([]float64(nil), acf.R[1:]...), Band: 1.96 / math.Sqrt(float64(nres)),
		Q: lb.Q, Lags: lags, DF: lb.DF, P: lb.P, Pass: lb.P >= set.Alpha}
	d.Pass = d.Pass && d.Residual.Pass
	kx := set.CrossLags
	if kx <= 0 {
		kx = lags
	}
	for _, in := range e.Model.Inputs {
		x := data[in.Series]
		f, err := prewhiten.Fit(x, &prewhiten.Settings{Diff: in.Diff.Coeffs(), Name: in.Series})
		if err != nil {
			return nil, err
		}
		alpha, start, err := f.Apply(x, in.Series)
		if err != nil {
			return nil, err
		}
		t0 := max(start, first)
		m := len(x) - t0
		k := min(kx, m-2)
		c, err := ccf.Cross(alpha[t0:], resid[t0:], k, &ccf.Settings{Names: [2]string{in.Series + " prewhitened", "residuals"}})
		if err != nil {
			return nil, err
		}
		cc := CrossCheck{Input: in.Series, Prewhiten: f, M: c.N, Lags: k, Band: 1.96 / math.Sqrt(float64(c.N))}
		cc.CCF = make([]float64, k+1)
		for j := 0; j <= k; j++ {
			cc.CCF[j] = c.At(j)
			cc.S += cc.CCF[j] * cc.CCF[j]
		}
		cc.S *= float64(c.N)
		cc.DF = max(k+1-len(chkFreeNames(in.Num, in.Den)), 1)
		cc.P = distuv.ChiSquared{K: float64(cc.DF)}.Survival(cc.S)
		cc.Pass = cc.P >= set.Alpha
		d.Pass = d.Pass && cc.Pass
		d.Cross = append(d.Cross, cc)
	}
	d.Failures = append(chkEstimateFailures(e), d.Failures...)
	if !d.Residual.Pass {
		d.Failures = append(d.Failures, fmt.Sprintf("the residuals are autocorrelated (Ljung-Box p = %s below %s)", fitNum(d.Residual.P, 3), fitNum(set.Alpha, 3)))
	}
	for _, cc := range d.Cross {
		if !cc.Pass {
			d.Failures = append(d.Failures, fmt.Sprintf("the residuals correlate with input %q (p = %s below %s)", cc.Input, fitNum(cc.P, 3), fitNum(set.Alpha, 3)))
		}
	}
	d.Pass = len(d.Failures) == 0
	return d, nil
}

// chkEstimateFailures lists what makes e itself untrustworthy, whatever
// its residuals look like: no convergence, standard errors that are not
// finite and positive, and the serious warnings.
func chkEstimateFailures(e *Estimate) []string {
	var out []string
	if !e.Converged {
		out = append(out, "the fit did not converge ("+e.Reason+")")
	}
	var bad []string
	for _, p := range e.Params {
		if !(p.SE > 0) || math.IsInf(p.SE, 0) {
			bad = append(bad, p.Name)
		}
	}
	if len(bad) > 0 {
		out = append(out, "no standard error for "+strings.Join(bad, ", "))
	}
	for _, w := range e.Warnings {
		if w.Kind.Serious() && w.Kind != NotConverged && w.Kind != BadStandardError {
			out = append(out, w.Message)
		}
	}
	return out
}

// chkFreeNames returns the distinct free parameter names of the polys.
func chkFreeNames(ps ...Poly) []string {
	seen := map[string]bool{}
	var out []string
	for _, p := range ps {
		p.Each(func(c *Coef) {
			if c.Free && c.Name != "" && !seen[c.Name] {
				seen[c.Name] = true
				out = append(out, c.Name)
			}
		})
	}
	return out
}

// chkResiduals returns the residuals of e's model on data (aligned to
// the data index, zero before first) and the first residual index.
func chkResiduals(e *Estimate, data map[string][]float64) ([]float64, int, error) {
	w, err := fitPrepare(e.Model, data, FitSettings{IgnoreExtra: true, First: e.Conditioning.First, ZeroPreSample: e.Conditioning.ZeroPreSample})
	if err != nil {
		return nil, 0, err
	}
	w.set(w.params())
	w.noiseSeries()
	w.resid()
	return w.a, w.cond.First, nil
}
