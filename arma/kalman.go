package arma

import (
	"math"

	"github.com/backshift/backshift/internal/poly"
)

// exactState runs the Kalman filter of the stationary ARMA model
// ar(B) (w_t - mu) = ma(B) a_t (unit innovation variance) over w and
// returns the filtered state at the last sample, its error covariance
// (in units of sigma^2) and the transition matrix, in the state-space
// form
//
//	alpha_t = T alpha_{t-1} + R a_t,  w_t - mu = alpha_t[0],
//
// with T holding -ar[1..] in its first column and ones on the
// superdiagonal, R = (1, ma[1], ..., ma[r-1]), r = max(p, q+1). The
// filter starts from the stationary distribution (P0 = sum_k T^k R R'
// T'^k, by doubling). ok is false when the AR part is not stationary or
// the filter breaks down; callers then use the conditional recursion.
//
// References: Harvey, A. C. (1989). Forecasting, Structural Time Series
// Models and the Kalman Filter, sec. 3.4 (ARMA in state-space form).
func exactState(ar, ma, w []float64, mu float64) (alpha []float64, P [][]float64, T [][]float64, ok bool) {
	T, R := stateSpace(ar, ma)
	P0, ok := stationaryCov(T, R)
	if !ok {
		return nil, nil, nil, false
	}
	kf := newKalman(T, R, P0)
	for t, wt := range w {
		kf.predict(t)
		kf.update(wt-mu, t)
	}
	for _, v := range kf.alpha {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, nil, nil, false
		}
	}
	return kf.alpha, kf.P, T, true
}

// stateSpace returns the transition matrix T and the innovation loading
// R of the state-space form of exactState.
func stateSpace(ar, ma []float64) (T [][]float64, R []float64) {
	p, q := len(ar)-1, len(ma)-1
	r := max(p, q+1)
	T = square(r)
	for i := 0; i < r; i++ {
		if i+1 <= p {
			T[i][0] = -ar[i+1] / ar[0]
		}
		if i+1 < r {
			T[i][i+1] = 1
		}
	}
	R = make([]float64, r)
	R[0] = 1
	for i := 1; i < r && i <= q; i++ {
		R[i] = ma[i] / ma[0]
	}
	return T, R
}

// stationaryCov returns the stationary state covariance sum_k T^k R R'
// T'^k by doubling (S <- S + A S A', A <- A A, at most 200 times, until
// the largest entry of A is below 1e-30); ok is false when the powers of
// T do not die out (an AR part that is not stationary).
func stationaryCov(T [][]float64, R []float64) ([][]float64, bool) {
	S := square(len(R))
	for i := range S {
		for j := range S {
			S[i][j] = R[i] * R[j]
		}
	}
	A := clone(T)
	for it := 0; it < 200; it++ {
		S = addTo(S, mulABt(mul(A, S), A))
		A = mul(A, A)
		m := 0.0
		for i := range A {
			for _, v := range A[i] {
				m = math.Max(m, math.Abs(v))
			}
		}
		if m < 1e-30 {
			break
		}
		if math.IsNaN(m) || math.IsInf(m, 0) || it == 199 {
			return nil, false
		}
	}
	return S, true
}

// kalman is the Kalman filter of exactState: the filtered state alpha
// and its covariance P, the predicted covariance Pp, and scratch. Once
// steady, the covariance recursion has converged and is skipped.
type kalman struct {
	T         [][]float64
	R         []float64
	alpha     []float64
	pred      []float64
	P, Pp, TP [][]float64
	steady    bool
}

// newKalman starts the filter at alpha = 0 with covariance P0 (used in
// place).
func newKalman(T [][]float64, R []float64, P0 [][]float64) *kalman {
	r := len(R)
	return &kalman{T: T, R: R, alpha: make([]float64, r), pred: make([]float64, r), P: P0, Pp: square(r), TP: square(r)}
}

// predict moves the state to sample t: alpha = T alpha, Pp = T P T' +
// R R'; at t = 0 the prediction is the start (Pp = P0).
func (k *kalman) predict(t int) {
	r := len(k.R)
	if t == 0 {
		for i := range k.Pp {
			copy(k.Pp[i], k.P[i])
		}
		return
	}
	T := k.T
	for i := 0; i < r; i++ {
		s := T[i][0] * k.alpha[0]
		if i+1 < r {
			s += k.alpha[i+1]
		}
		k.pred[i] = s
	}
	copy(k.alpha, k.pred)
	if k.steady {
		return
	}
	mulInto(k.TP, T, k.P)
	for i := 0; i < r; i++ {
		for j := 0; j < r; j++ {
			s := 0.0
			for l := 0; l < r; l++ {
				s += k.TP[i][l] * T[j][l]
			}
			k.Pp[i][j] = s + k.R[i]*k.R[j]
		}
	}
}

// update corrects the state with the observation y = w_t - mu of sample
// t (no observation noise). When the predicted variance of y is zero
// (below 1e-300) the state is known exactly and y carries nothing new.
// Once P stops changing (to 1e-15 of the innovation variance, after the
// first r samples) the gains are constant and the filter is steady.
func (k *kalman) update(y float64, t int) {
	r := len(k.R)
	Pp, P := k.Pp, k.P
	f := Pp[0][0]
	v := y - k.alpha[0]
	if !(f > 1e-300) {
		if !k.steady {
			for i := range P {
				copy(P[i], Pp[i])
			}
		}
		return
	}
	for i := 0; i < r; i++ {
		k.alpha[i] += Pp[i][0] / f * v
	}
	if k.steady {
		return
	}
	change := 0.0
	for i := 0; i < r; i++ {
		for j := 0; j < r; j++ {
			nv := Pp[i][j] - Pp[i][0]*Pp[0][j]/f
			change = math.Max(change, math.Abs(nv-P[i][j]))
			P[i][j] = nv
		}
	}
	k.steady = change < 1e-15 && t > r
}

// exactForecast returns forecasts of z (mean and variance in units of
// sigma^2, before adding the regression part) for h = 1..steps using the
// exact state of the differenced series. ok is false when exactState is.
func (r *Result) exactForecast(steps int) (mean, vr []float64, ok bool) {
	dd := poly.Degree(r.Diff)
	if len(r.z) <= dd {
		return nil, nil, false
	}
	w := applyDiff(r.Diff, r.z)[dd:]
	alpha, P, T, ok := exactState(r.AR, r.MA, w, r.Model.Mean)
	if !ok {
		return nil, nil, false
	}
	full := poly.Mul(r.AR, r.Diff)
	psi, err := poly.Divide(r.MA, full, steps)
	if err != nil {
		return nil, nil, false
	}
	rows := stateRows(T, steps)
	wf := make([]float64, steps)
	for j := 1; j <= steps; j++ {
		wf[j-1] = r.Model.Mean + dotN(rows[j], alpha)
	}
	mean = integrate(r.Diff, r.z[max(0, len(r.z)-dd):], wf)
	return mean, forecastVariance(r.Diff, rows, P, psi), true
}

// stateRows returns the rows Z T^j, j = 0..steps, Z = (1, 0, ..., 0):
// row j maps the state to the forecast j steps ahead.
func stateRows(T [][]float64, steps int) [][]float64 {
	m := len(T)
	rows := make([][]float64, steps+1)
	rows[0] = make([]float64, m)
	rows[0][0] = 1
	for j := 1; j <= steps; j++ {
		rows[j] = make([]float64, m)
		for k := 0; k < m; k++ {
			s := 0.0
			for i := 0; i < m; i++ {
				s += rows[j-1][i] * T[i][k]
			}
			rows[j][k] = s
		}
	}
	return rows
}

// integrate returns the forecasts of z from those of the differenced
// series, wf, and the last deg(diff) values of z, hist (not modified):
// z_t = (w_t - sum_{k>=1} diff_k z_{t-k}) / diff_0 (FitNoise accepts any
// non-zero diff_0).
func integrate(diff, hist, wf []float64) []float64 {
	dd := poly.Degree(diff)
	hist = append([]float64(nil), hist...)
	mean := make([]float64, len(wf))
	for h := range wf {
		s := wf[h]
		for k := 1; k <= dd; k++ {
			s -= diff[k] * hist[len(hist)-k]
		}
		s /= diff[0]
		hist = append(hist, s)
		mean[h] = s
	}
	return mean
}

// forecastVariance returns the forecast variances of z (units of
// sigma^2) for h = 1..len(psi): u_h' P u_h from the state's uncertainty
// plus sum_{j<h} psi_j^2 from the future innovations. u_h = sum_{j=1}^h
// xi_{h-j} Z T^j, xi the coefficients of 1/diff(B) (integrating w
// forecasts into z). Since diff(B) xi(B) = 1, u_h = (Z T^h - sum_{i=1}^dd
// diff_i u_{h-i}) / diff_0 (u_h = 0 for h < 1): O(m dd) per step instead
// of O(m h). A ring holds the last dd+1 u's.
func forecastVariance(diff []float64, rows, P [][]float64, psi []float64) []float64 {
	dd := poly.Degree(diff)
	d0 := diff[0]
	m := len(P)
	steps := len(psi)
	vr := make([]float64, steps)
	us := make([][]float64, dd+1)
	for i := range us {
		us[i] = make([]float64, m)
	}
	acc := 0.0
	for h := 1; h <= steps; h++ {
		u := us[h%(dd+1)]
		copy(u, rows[h])
		for i := 1; i <= dd && i < h; i++ {
			c, prev := diff[i], us[(h-i)%(dd+1)]
			for k := range u {
				u[k] -= c * prev[k]
			}
		}
		if d0 != 1 {
			for k := range u {
				u[k] /= d0
			}
		}
		quad := 0.0
		for i := 0; i < m; i++ {
			for k := 0; k < m; k++ {
				quad += u[i] * P[i][k] * u[k]
			}
		}
		acc += psi[h-1] * psi[h-1]
		vr[h-1] = math.Max(quad, 0) + acc
	}
	return vr
}

func square(r int) [][]float64 {
	back := make([]float64, r*r)
	m := make([][]float64, r)
	for i := range m {
		m[i] = back[i*r : (i+1)*r]
	}
	return m
}

func clone(a [][]float64) [][]float64 {
	m := square(len(a))
	for i := range a {
		copy(m[i], a[i])
	}
	return m
}

func mul(a, b [][]float64) [][]float64 {
	m := square(len(a))
	mulInto(m, a, b)
	return m
}

func mulInto(dst, a, b [][]float64) {
	r := len(a)
	for i := 0; i < r; i++ {
		for j := 0; j < r; j++ {
			s := 0.0
			for k := 0; k < r; k++ {
				s += a[i][k] * b[k][j]
			}
			dst[i][j] = s
		}
	}
}

// mulABt returns a b'.
func mulABt(a, b [][]float64) [][]float64 {
	r := len(a)
	m := square(r)
	for i := 0; i < r; i++ {
		for j := 0; j < r; j++ {
			s := 0.0
			for k := 0; k < r; k++ {
				s += a[i][k] * b[j][k]
			}
			m[i][j] = s
		}
	}
	return m
}

func addTo(a, b [][]float64) [][]float64 {
	for i := range a {
		for j := range a[i] {
			a[i][j] += b[i][j]
		}
	}
	return a
}

func dotN(a, b []float64) float64 {
	s := 0.0
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}
