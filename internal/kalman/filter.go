package kalman

import (
	"math"

	"github.com/backshift/backshift/internal/errs"
)

// Stats sums up one pass of the filter: the terms of the exact
// log-likelihood with sigma^2 concentrated out.
type Stats struct {
	// SSQ is sum v_t^2 / F_t over the observed samples that enter the
	// likelihood, v_t the innovation and F_t its variance in units of
	// sigma^2.
	SSQ float64
	// SumLogF is sum log F_t over the same samples.
	SumLogF float64
	// NObs counts those samples: the observed samples from Start on.
	NObs int
	// Start is the first index of the likelihood: 0 without
	// differencing, otherwise the index after the first deg(diff)
	// consecutive observed samples (the conditioning samples).
	Start int
}

// Sigma2 returns the maximum-likelihood innovation variance SSQ/NObs.
func (s Stats) Sigma2() float64 { return s.SSQ / float64(s.NObs) }

// LogLik returns the exact Gaussian log-likelihood at sigma^2 = Sigma2:
//
//	-NObs/2 (log(2 pi Sigma2) + 1) - SumLogF/2.
func (s Stats) LogLik() float64 {
	n := float64(s.NObs)
	return -0.5*n*(math.Log(2*math.Pi*s.SSQ/n)+1) - 0.5*s.SumLogF
}

// Objective returns Sigma2 exp(SumLogF/NObs), the quantity whose
// minimum is the maximum of the likelihood (LogLik = -NObs/2 (log(2 pi
// Objective) + 1)): the sum of squares of the scaled innovations v_t
// F_t^(-1/2) (prod F)^(1/(2 NObs)), divided by NObs.
func (s Stats) Objective() float64 {
	n := float64(s.NObs)
	return s.SSQ / n * math.Exp(s.SumLogF/n)
}

// steadyTol is the change of the predicted covariance (relative to the
// innovation variance F) below which the covariance recursion is taken
// as settled and frozen until the next missing sample.
const steadyTol = 1e-15

// Run filters z (NaN where missing) with the constant mu (the mean of
// the differenced series) and returns the likelihood terms. When std is
// not nil (length len(z)) it receives the standardised innovations v_t
// F_t^(-1/2), NaN where z is missing and before Start; fvar (may be nil)
// receives F_t, the one-step prediction variance in units of sigma^2
// (also at missing samples; NaN before Start). Run does not modify z
// and does not allocate. It returns a *errs.SeriesError of kind
// errs.ErrShort when no observed sample enters the likelihood (or no
// deg(diff) consecutive observed samples exist to condition on).
func (f *Filter) Run(z []float64, mu float64, std, fvar []float64) (Stats, error) {
	return f.run(z, mu, std, fvar, nil)
}

// start returns the first index of the likelihood (see Stats.Start), -1
// when there is none.
func (f *Filter) start(z []float64) int {
	run := 0
	for t, v := range z {
		if run == f.dd {
			return t
		}
		if math.IsNaN(v) {
			run = 0
		} else {
			run++
		}
	}
	return -1
}

// initState sets the state at t0: the ARMA block at its stationary
// distribution, the lag block at the conditioning samples.
func (f *Filter) initState(z []float64, t0 int) {
	r, m := f.r, f.m
	clear(f.a)
	clear(f.P)
	for i := 0; i < r; i++ {
		copy(f.P[i*m:i*m+r], f.p0[i*r:(i+1)*r])
	}
	for k := 1; k <= f.dd; k++ {
		f.a[r+k-1] = z[t0-k]
	}
}

// recorder keeps what the smoother needs from a forward pass.
type recorder struct {
	vf, finv []float64 // v_t/F_t and 1/F_t (0 where missing)
	g        []float64 // gain P_t Z'/F_t, m per sample
	miss     []int     // missing indices from Start on, ascending
	za, zpz  []float64 // Z a_t and Z P_t Z' at each missing index
	pz       []float64 // P_t Z' at each missing index, m each
}

// run is Run, recording for the smoother when rec is not nil.
func (f *Filter) run(z []float64, mu float64, std, fvar []float64, rec *recorder) (Stats, error) {
	n := len(z)
	t0 := f.start(z)
	if t0 < 0 {
		return Stats{}, &errs.SeriesError{Kind: errs.ErrShort, Have: n, Detail: "no " + itoa(f.dd) + " consecutive observed samples to condition the differencing on"}
	}
	for t := 0; t < t0 && t < n; t++ {
		if std != nil {
			std[t] = math.NaN()
		}
		if fvar != nil {
			fvar[t] = math.NaN()
		}
	}
	f.initState(z, t0)
	st := Stats{Start: t0}
	c0 := mu * f.z[0]
	steady := false
	F := 0.0
	for t := t0; t < n; t++ {
		if steady && f.dd == 0 && rec == nil {
			t = f.steadyStretch(z, t, c0, F, std, fvar, &st)
			if t >= n {
				break
			}
		}
		if !steady {
			F = f.gain(f.pz)
		}
		if fvar != nil {
			fvar[t] = F
		}
		if math.IsNaN(z[t]) {
			f.skip(t, F, c0, std, rec)
			steady = false
			continue
		}
		if !(F > 0) {
			return st, &errs.ModelError{Part: "noise model", Problem: "the one-step prediction variance is not positive at sample " + itoa(t)}
		}
		steady = f.observe(t, z[t], F, c0, steady, std, rec, &st)
	}
	if st.NObs == 0 {
		return st, &errs.SeriesError{Kind: errs.ErrShort, Have: n, Detail: "no observed sample enters the likelihood"}
	}
	return st, nil
}

// za returns Z a, the prediction of the current sample less the
// constant.
func (f *Filter) za() float64 {
	s := f.a[0] * f.z[0]
	for j := f.r; j < f.m; j++ {
		s += f.z[j] * f.a[j]
	}
	return s
}

// skip carries the state across the missing sample t (prediction
// variance F): predict only.
func (f *Filter) skip(t int, F, c0 float64, std []float64, rec *recorder) {
	if std != nil {
		std[t] = math.NaN()
	}
	if rec != nil {
		rec.missing(t, f.za(), F, f.pz)
	}
	f.predict(c0)
	f.sandwichAdd(nil, 1)
}

// observe updates the state with the observed sample y at t (prediction
// variance F > 0, gain f.pz), adds its terms to st and predicts the
// next state; it returns whether the covariance has settled (it stays
// frozen once steady).
func (f *Filter) observe(t int, y, F, c0 float64, steady bool, std []float64, rec *recorder, st *Stats) bool {
	a, pz, P, m := f.a, f.pz, f.P, f.m
	v := y - f.za() - c0
	st.SSQ += v * v / F
	st.SumLogF += math.Log(F)
	st.NObs++
	if std != nil {
		std[t] = v / math.Sqrt(F)
	}
	k := v / F
	if rec != nil {
		rec.observed(t, k, F, pz)
	}
	for i := range a {
		a[i] += pz[i] * k
	}
	f.predict(c0)
	if steady {
		return true
	}
	// Filtered covariance P - pz pz'/F, then T P T' + R R'.
	for i := 0; i < m; i++ {
		pi := pz[i] / F
		row := P[i*m : (i+1)*m]
		for j := range row {
			row[j] -= pi * pz[j]
		}
	}
	return f.sandwichAdd(pz, F) <= steadyTol*F
}

// steadyStretch carries the state of a model without differencing over
// the observed samples from t on with the settled gain pz/F, until a
// missing sample or the end, adds their terms to st and returns the
// index where it stopped. It is the hot loop of a long record: O(r) per
// sample, no calls.
func (f *Filter) steadyStretch(z []float64, t int, c0, F float64, std, fvar []float64, st *Stats) int {
	r := f.r
	a, pz, tc := f.a[:r], f.pz[:r], f.tc[:r]
	g := f.tmp2[:r]
	for i := range g {
		g[i] = pz[i] / F
	}
	start := t
	var ssq float64
	switch {
	case r == 2 && fvar == nil:
		t, ssq = stretch2(z, t, a, g, tc, c0, 1/math.Sqrt(F), std)
	default:
		t, ssq = f.stretchN(z, t, a, g, tc, c0, 1/math.Sqrt(F), std)
		if fvar != nil {
			for i := start; i < t; i++ {
				fvar[i] = F
			}
		}
	}
	cnt := t - start
	st.SSQ += ssq / F
	st.SumLogF += float64(cnt) * math.Log(F)
	st.NObs += cnt
	return t
}

// stretch2 is the settled loop for a state of dimension 2 (AR order up
// to 2, MA order up to 1) with the state held in registers; it returns
// where it stopped and the sum of squared innovations. The update
// a' = T (a + g v), v = y - c0 - a_0, is regrouped so that the
// dependence from one step to the next is one multiply-add:
//
//	a_0' = (t_0 - k) a_0 + a_1 + k (y - c0),  k = t_0 g_0 + g_1
//	a_1' = t_1 (1 - g_0) a_0 + t_1 g_0 (y - c0)
func stretch2(z []float64, t int, a, g, tc []float64, c0, isq float64, std []float64) (int, float64) {
	a0, a1 := a[0], a[1]
	k := tc[0]*g[0] + g[1]
	A, B, D := tc[0]-k, tc[1]*(1-g[0]), tc[1]*g[0]
	ssq := 0.0
	if std != nil {
		std = std[:len(z)]
	}
	for ; t < len(z); t++ {
		y := z[t]
		if y != y {
			break
		}
		yc := y - c0
		v := yc - a0
		ssq += v * v
		if std != nil {
			std[t] = v * isq
		}
		a0, a1 = A*a0+(a1+k*yc), B*a0+D*yc
	}
	a[0], a[1] = a0, a1
	return t, ssq
}

// stretchN is the settled loop for any state dimension.
func (f *Filter) stretchN(z []float64, t int, a, g, tc []float64, c0, isq float64, std []float64) (int, float64) {
	r := len(a)
	ssq := 0.0
	for ; t < len(z); t++ {
		y := z[t]
		if y != y {
			break
		}
		v := y - a[0] - c0
		ssq += v * v
		if std != nil {
			std[t] = v * isq
		}
		a0 := a[0] + g[0]*v
		for i := 0; i < r-1; i++ {
			a[i] = tc[i]*a0 + a[i+1] + g[i+1]*v
		}
		a[r-1] = tc[r-1] * a0
	}
	return t, ssq
}

// gain sets pz = P Z' and returns F = Z P Z'.
func (f *Filter) gain(pz []float64) float64 {
	m, r := f.m, f.r
	P, zv := f.P, f.z
	for i := 0; i < m; i++ {
		row := P[i*m : (i+1)*m]
		s := row[0] * zv[0]
		for j := r; j < m; j++ {
			s += row[j] * zv[j]
		}
		pz[i] = s
	}
	F := pz[0] * zv[0]
	for j := r; j < m; j++ {
		F += pz[j] * zv[j]
	}
	return F
}

// predict moves the state one step: a = T a + c, c the intercept c0 of
// the first lag slot.
func (f *Filter) predict(c0 float64) {
	f.applyT(f.tmp, f.a)
	copy(f.a, f.tmp)
	if f.dd > 0 {
		f.a[f.r] += c0
	}
}

// sandwichAdd sets P = T P T' + R R' and returns the largest change of
// an entry against the previous prediction, P + pz pz'/F (P being the
// filtered covariance; pz nil after a missing sample, where the change
// is not needed).
func (f *Filter) sandwichAdd(pz []float64, F float64) float64 {
	m, r := f.m, f.r
	P, Y := f.P, f.Y
	f.sandwich(f.X, P, f.applyT)
	change := 0.0
	for i := 0; i < m; i++ {
		for j := 0; j < m; j++ {
			v := f.X[i*m+j]
			if i < r && j < r {
				v += f.rr[i] * f.rr[j]
			}
			if pz != nil {
				if d := math.Abs(v - P[i*m+j] - pz[i]*pz[j]/F); d > change || d != d {
					change = d
				}
			}
			Y[i*m+j] = v
		}
	}
	copy(P, Y)
	return change
}

func itoa(v int) string {
	if v == 0 {
		return "0"
	}
	neg := v < 0
	if neg {
		v = -v
	}
	var b [20]byte
	i := len(b)
	for v > 0 {
		i--
		b[i] = byte('0' + v%10)
		v /= 10
	}
	if neg {
		i--
		b[i] = '-'
	}
	return string(b[i:])
}

// Scaled writes into dst, for the observed samples from Start on in
// their order, the scaled innovations
//
//	e_t = v_t F_t^(-1/2) (prod_s F_s)^(1/(2 NObs)),
//
// whose sum of squares is NObs Stats.Objective: minimising it by least
// squares (Gauss-Newton, Levenberg-Marquardt) maximises the exact
// likelihood (the approach of Gardner, Harvey & Phillips 1980). dst needs
// at least as many entries as observed samples from Start on (it is not
// written beyond them). It returns the Stats of the pass; errors as for
// Run. Scaled allocates a buffer of len(z) on its first call (and when z
// grows), nothing after.
func (f *Filter) Scaled(dst, z []float64, mu float64) (Stats, error) {
	if cap(f.std) < len(z) {
		f.std = make([]float64, len(z))
	}
	std := f.std[:len(z)]
	st, err := f.run(z, mu, std, nil, nil)
	if err != nil {
		return st, err
	}
	g := math.Exp(st.SumLogF / float64(2*st.NObs))
	if st.NObs == len(z)-st.Start {
		src := std[st.Start:]
		d := dst[:len(src)]
		for i, v := range src {
			d[i] = v * g
		}
		return st, nil
	}
	i := 0
	for _, v := range std[st.Start:] {
		if v == v {
			dst[i] = v * g
			i++
		}
	}
	return st, nil
}
