package predict

import "math"

// After a missing output the predictor no longer knows its history
// exactly: the outputs it filled in with their predictions, the noise
// values and the innovations of the gap are uncertain. gap.go keeps the
// covariance P of the errors of that history, the vector
//
//	v = (ey_{t-1..t-d}, en_{t-1..t-p}, ea_{t-1..t-q})
//
// of the errors of the output, noise and innovation values held in the
// state (true less held), and updates it as the Kalman filter of the
// model would (Harvey 1989, Forecasting, Structural Time Series Models
// and the Kalman Filter, ch. 3; Box, Jenkins, Reinsel and Ljung 2015,
// the chapter on missing values): P is zero while every output is
// observed (the held values are then exact, the fit's conditioning);
// each sample maps v and the new innovation a_t to the errors of the
// sample's own values,
//
//	en_t = (theta_0 a_t + sum_k theta_k ea_{t-k} - sum_k phi_k en_{t-k}) / phi_0
//	ey_t = (en_t - sum_k d_k ey_{t-k}) / d_0,
//
// so that Var(ey_t) is the prediction's variance; an observed output
// conditions them on the prediction error e = ey_t: every held value
// moves by Cov(., ey_t)/Var(ey_t) e (the innovation a_t becomes its
// conditional mean) and P loses the part explained by e. The prediction
// errors are then independent with variances Var(ey_t), exactly, so
// that e/sqrt(Var(ey_t)) (Step.Z) is standard normal under the model
// whatever the gaps. Once P has decayed below covEps sigma^2 (in trace)
// it is set to zero and the predictor is back on its exact recursion.

// covEps is the trace of P, relative to sigma^2, below which P is set
// to zero after an observed output: the standard errors then differ
// from their steady values by less than 1e-14 relative, and the state
// corrections by less than 1e-14 of an error, below what the
// recursions round away.
const covEps = 1e-14

// gapPlan holds the constant parts of the covariance update: the
// dimension m of v, the coefficients alpha (en_t on v) and beta (ey_t on
// v), the loads of a_t on en_t and ey_t, the state slot of each element
// of v, and src, where each element of v after the sample comes from in
// the augmented vector (v, ey_t, en_t, ea_t).
type gapPlan struct {
	m           int
	alpha, beta []float64
	gn, gy      float64
	slot, src   []int
}

// compileGap fills pl.gp once the state layout is known.
func (pl *plan) compileGap() {
	dd, pp, qq := len(pl.dc)-1, len(pl.ar)-1, len(pl.ma)-1
	m := dd + pp + qq
	g := gapPlan{m: m, alpha: make([]float64, m), beta: make([]float64, m), slot: make([]int, m), src: make([]int, m)}
	g.gn = pl.ma[0] / pl.ar[0]
	g.gy = g.gn / pl.dc[0]
	for k := 1; k <= pp; k++ {
		g.alpha[dd+k-1] = -pl.ar[k] / pl.ar[0]
		g.slot[dd+k-1] = pl.nh + k - 1
	}
	for k := 1; k <= qq; k++ {
		g.alpha[dd+pp+k-1] = pl.ma[k] / pl.ar[0]
		g.slot[dd+pp+k-1] = pl.ah + k - 1
	}
	for k := 1; k <= dd; k++ {
		g.slot[k-1] = pl.yh + k - 1
	}
	for i := range m {
		g.beta[i] = g.alpha[i]
		if i < dd {
			g.beta[i] -= pl.dc[i+1]
		}
		g.beta[i] /= pl.dc[0]
	}
	// v after the sample: ey_t then the older output errors, en_t then
	// the older noise errors, ea_t then the older innovation errors.
	for k := 1; k <= dd; k++ {
		g.src[k-1] = k - 2
	}
	for k := 1; k <= pp; k++ {
		g.src[dd+k-1] = dd + k - 2
	}
	for k := 1; k <= qq; k++ {
		g.src[dd+pp+k-1] = dd + pp + k - 2
	}
	if dd > 0 {
		g.src[0] = m
	}
	if pp > 0 {
		g.src[dd] = m + 1
	}
	if qq > 0 {
		g.src[dd+pp] = m + 2
	}
	pl.gp = g
}

// kfSize is the scratch a predictor needs for the covariance update:
// the augmented covariance and two vectors.
func (pl *plan) kfSize() int {
	M := pl.gp.m + 3
	return M*M + 2*pl.gp.m
}

// spread forms in kf the covariance C of the augmented error vector
// (v, ey_t, en_t, ea_t) from P (in st) and returns Var(ey_t).
func (pl *plan) spread(st, kf []float64) float64 {
	g := &pl.gp
	m := g.m
	M := m + 3
	P := st[pl.cov : pl.cov+m*m]
	C := kf[:M*M]
	pa, pb := kf[M*M:M*M+m], kf[M*M+m:M*M+2*m]
	s2 := pl.sd * pl.sd
	for i := range m {
		va, vb := 0.0, 0.0
		for j := range m {
			va += P[i*m+j] * g.alpha[j]
			vb += P[i*m+j] * g.beta[j]
		}
		pa[i], pb[i] = va, vb
		copy(C[i*M:i*M+m], P[i*m:i*m+m])
		C[i*M+m], C[i*M+m+1], C[i*M+m+2] = vb, va, 0
		C[m*M+i], C[(m+1)*M+i], C[(m+2)*M+i] = vb, va, 0
	}
	bPb, bPa, aPa := 0.0, 0.0, 0.0
	for i := range m {
		bPb += g.beta[i] * pb[i]
		bPa += g.beta[i] * pa[i]
		aPa += g.alpha[i] * pa[i]
	}
	y, n, a := m, m+1, m+2
	C[y*M+y] = bPb + s2*g.gy*g.gy
	C[y*M+n] = bPa + s2*g.gy*g.gn
	C[n*M+y] = C[y*M+n]
	C[y*M+a], C[a*M+y] = s2*g.gy, s2*g.gy
	C[n*M+n] = aPa + s2*g.gn*g.gn
	C[n*M+a], C[a*M+n] = s2*g.gn, s2*g.gn
	C[a*M+a] = s2
	return C[y*M+y]
}

// gain returns, for a prediction error e of an observed output, the
// conditional means of the sample's noise and innovation errors
// (dn, da), from C in kf.
func (pl *plan) gain(kf []float64, e float64) (dn, da float64) {
	m := pl.gp.m
	M := m + 3
	v := kf[m*M+m]
	return kf[(m+1)*M+m] / v * e, kf[(m+2)*M+m] / v * e
}

// condition moves the held history in st by the conditional means of
// its errors given the prediction error e, Cov(., ey_t)/Var(ey_t) e,
// and makes C in kf the covariance given e.
func (pl *plan) condition(st, kf []float64, e float64) {
	m := pl.gp.m
	M := m + 3
	y := m
	v := kf[y*M+y]
	for i, s := range pl.gp.slot {
		st[s] += kf[i*M+y] / v * e
	}
	// C_ij -= C_iy C_yj / v for i, j != y, formed once per pair so that
	// C stays exactly symmetric; row and column y become zero.
	for i := range M {
		ci := kf[i*M+y] / v
		if ci == 0 || i == y {
			continue
		}
		for j := i; j < M; j++ {
			if j == y {
				continue
			}
			c := kf[i*M+j] - ci*kf[y*M+j]
			kf[i*M+j], kf[j*M+i] = c, c
		}
	}
	for i := range M {
		kf[y*M+i], kf[i*M+y] = 0, 0
	}
}

// shift writes into st the covariance of v after the sample, taken from
// C in kf, and returns its trace.
func (pl *plan) shift(st, kf []float64) float64 {
	g := &pl.gp
	m := g.m
	M := m + 3
	P := st[pl.cov : pl.cov+m*m]
	tr := 0.0
	for i, si := range g.src {
		for j, sj := range g.src {
			P[i*m+j] = kf[si*M+sj]
		}
		tr += P[i*m+i]
	}
	return tr
}

// settle ends the covariance tracking when P is negligible (see covEps):
// it clears P and the flag. Otherwise it sets the flag.
func (pl *plan) settle(st []float64, tr float64) {
	if tr <= covEps*pl.sd*pl.sd || math.IsNaN(tr) {
		clear(st[pl.cov : pl.cov+pl.gp.m*pl.gp.m])
		st[pl.unc] = 0
		return
	}
	st[pl.unc] = 1
}
