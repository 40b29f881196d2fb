package fit

import (
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// gradStep is the relative step of the central differences of
// residualGradient: 1e-6 max(|x_k|, 1e-3). The residuals are smooth
// (rational) functions of the coefficients, so the truncation error is
// O(step^2), about 1e-12 relative, and the rounding error about 1e-16 /
// 1e-6 = 1e-10 relative (common practice: the step near the cube root of
// the machine epsilon for central differences, taken a little smaller).
const gradStep = 1e-6

// residualGradient returns, for every free parameter k of e (in the
// order of e.Params), the derivative d a_t / d x_k of the residuals that
// Check uses (residualsOf on data, indexed as they are), by central
// differences. An estimate whose residuals overflow at a step is
// reported as residualsOf reports it.
func residualGradient(e *Estimate, data map[string][]float64) ([][]float64, error) {
	b, err := bindModel(e.Model)
	if err != nil {
		return nil, err
	}
	probe := *e
	probe.Model = b.m
	set := func(k int, v float64) {
		for _, c := range b.coefs[k] {
			c.Value = v
		}
	}
	grad := make([][]float64, len(b.names))
	for k := range b.names {
		x := b.coefs[k][0].Value
		h := gradStep * math.Max(math.Abs(x), 1e-3)
		set(k, x+h)
		up, _, err := residualsOf("Check", &probe, data)
		if err != nil {
			set(k, x)
			return nil, err
		}
		set(k, x-h)
		down, _, err := residualsOf("Check", &probe, data)
		set(k, x)
		if err != nil {
			return nil, err
		}
		g := make([]float64, len(up))
		for t := range g {
			g[t] = (up[t] - down[t]) / (2 * h)
		}
		grad[k] = g
	}
	return grad, nil
}

// crossReference returns the distribution that the cross-check statistic
// S = M sum_{k=0}^{K} r_k^2 of the prewhitened input ax and the
// residuals (their derivatives grad, rows aligned with ax, NaN rows
// left out as in the residuals) follows under an adequate model, given
// the input: approximately sum_i lambda_i chi-squared(1), lambda_i the
// eigenvalues of
//
//	V = R - G H^-1 G' / c_0,
//
// R the (K+1)x(K+1) autocorrelation matrix of ax at lags |i - j|, c_0
// its variance, G_kj = (1/M) sum_t ax_t da_{t+k}/dx_j (ax centred),
// H = (1/M) sum_t da_t/dx da_t/dx' (see Cross-correlation check in the
// package doc). It returns V's moments tr V and tr V^2 as the scale c =
// tr V^2 / tr V and degrees of freedom nu = (tr V)^2 / tr V^2 of the
// scaled chi-squared c chi-squared(nu) with the same mean and variance,
// and ok false when H is singular (the estimate is not determined; the
// caller keeps the plain reference).
func crossReference(ax []float64, grad [][]float64, k int) (scale, df float64, ok bool) {
	m := len(ax)
	p := len(grad)
	xc, acv := centredAutocov(ax, k)
	g := mat.NewDense(k+1, p, nil)
	hm := mat.NewSymDense(p, nil)
	for j := range p {
		for lag := 0; lag <= k; lag++ {
			s := 0.0
			for t := 0; t+lag < m; t++ {
				s += xc[t] * grad[j][t+lag]
			}
			g.Set(lag, j, s/float64(m))
		}
		for i := 0; i <= j; i++ {
			hm.SetSym(i, j, dotN(grad[i], grad[j])/float64(m))
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(hm) {
		return 1, 0, false
	}
	var hg mat.Dense // H^-1 G'
	if err := ch.SolveTo(&hg, g.T()); err != nil {
		return 1, 0, false
	}
	var v mat.Dense
	v.Mul(g, &hg)
	tr, tr2 := 0.0, 0.0
	for i := 0; i <= k; i++ {
		for j := 0; j <= k; j++ {
			lag := i - j
			if lag < 0 {
				lag = -lag
			}
			vij := acv[lag]/acv[0] - v.At(i, j)/acv[0]
			if i == j {
				tr += vij
			}
			tr2 += vij * vij
		}
	}
	if !(tr > 0) || !(tr2 > 0) {
		return 1, 0, false
	}
	return tr2 / tr, tr * tr / tr2, true
}

// centredAutocov returns x less its mean and its autocovariances at lags
// 0..k (divisor len(x)).
func centredAutocov(x []float64, k int) (xc, acv []float64) {
	m := len(x)
	mean := 0.0
	for _, v := range x {
		mean += v
	}
	mean /= float64(m)
	xc = make([]float64, m)
	for t, v := range x {
		xc[t] = v - mean
	}
	acv = make([]float64, k+1)
	for h := range acv {
		for t := 0; t+h < m; t++ {
			acv[h] += xc[t] * xc[t+h]
		}
		acv[h] /= float64(m)
	}
	return xc, acv
}

// dotN is the dot product of x and y over their common length.
func dotN(x, y []float64) float64 {
	s := 0.0
	for i := range min(len(x), len(y)) {
		s += x[i] * y[i]
	}
	return s
}

// scaledChiSquareSurvival is P(c chi-squared(nu) > s).
func scaledChiSquareSurvival(s, c, nu float64) float64 {
	return distuv.ChiSquared{K: nu}.Survival(s / c)
}
