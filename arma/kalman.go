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
	R := make([]float64, r)
	R[0] = 1
	for i := 1; i < r && i <= q; i++ {
		R[i] = ma[i] / ma[0]
	}
	// Stationary covariance by doubling: S <- S + A S A', A <- A A.
	S := square(r)
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
			return nil, nil, nil, false
		}
	}
	P = S
	alpha = make([]float64, r)
	pred := make([]float64, r)
	TP := square(r)
	Pp := square(r)
	steady := false
	for t, wt := range w {
		// Predict: alpha = T alpha, P = T P T' + R R' (skipped at t = 0,
		// where alpha = 0 and P = P0 already).
		if t > 0 {
			for i := 0; i < r; i++ {
				s := T[i][0] * alpha[0]
				if i+1 < r {
					s += alpha[i+1]
				}
				pred[i] = s
			}
			copy(alpha, pred)
			if !steady {
				mulInto(TP, T, P)
				for i := 0; i < r; i++ {
					for j := 0; j < r; j++ {
						s := 0.0
						for k := 0; k < r; k++ {
							s += TP[i][k] * T[j][k]
						}
						Pp[i][j] = s + R[i]*R[j]
					}
				}
			}
		} else {
			for i := range Pp {
				copy(Pp[i], P[i])
			}
		}
		// Update with w_t - mu (no observation noise).
		f := Pp[0][0]
		v := wt - mu - alpha[0]
		if !(f > 1e-300) {
			// State known exactly: w_t is determined by the past.
			if !steady {
				for i := range P {
					copy(P[i], Pp[i])
				}
			}
			continue
		}
		for i := 0; i < r; i++ {
			alpha[i] += Pp[i][0] / f * v
		}
		if !steady {
			change := 0.0
			for i := 0; i < r; i++ {
				for j := 0; j < r; j++ {
					nv := Pp[i][j] - Pp[i][0]*Pp[0][j]/f
					change = math.Max(change, math.Abs(nv-P[i][j]))
					P[i][j] = nv
				}
			}
			// Once P stops changing (to 1e-15 of the innovation variance)
			// the gains are constant: skip the covariance recursion.
			steady = change < 1e-15 && t > r
		}
	}
	for _, v := range alpha {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, nil, nil, false
		}
	}
	return alpha, P, T, true
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
	m := len(alpha)
	full := poly.Mul(r.AR, r.Diff)
	psi, err := poly.Divide(r.MA, full, steps)
	if err != nil {
		return nil, nil, false
	}
	// Rows Z T^j, j = 1..steps, and state forecasts.
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
	wf := make([]float64, steps)
	for j := 1; j <= steps; j++ {
		wf[j-1] = r.Model.Mean + dotN(rows[j], alpha)
	}
	// Integrate: z_t = (w_t - sum_{k>=1} Diff_k z_{t-k}) / Diff_0
	// (FitNoise accepts any non-zero Diff_0).
	d0 := r.Diff[0]
	hist := append([]float64(nil), r.z[max(0, len(r.z)-dd):]...)
	mean = make([]float64, steps)
	for h := 0; h < steps; h++ {
		s := wf[h]
		for k := 1; k <= dd; k++ {
			s -= r.Diff[k] * hist[len(hist)-k]
		}
		s /= d0
		hist = append(hist, s)
		mean[h] = s
	}
	vr = make([]float64, steps)
	// u_h = sum_{j=1}^h xi_{h-j} Z T^j, xi the coefficients of 1/Diff(B)
	// (integrating w forecasts into z). Since Diff(B) xi(B) = 1, u_h =
	// (Z T^h - sum_{i=1}^{dd} Diff_i u_{h-i}) / Diff_0 (u_h = 0 for h < 1):
	// O(m dd) per step instead of O(m h). us is a ring of the last dd+1
	// u's.
	us := make([][]float64, dd+1)
	for i := range us {
		us[i] = make([]float64, m)
	}
	acc := 0.0
	for h := 1; h <= steps; h++ {
		u := us[h%(dd+1)]
		copy(u, rows[h])
		for i := 1; i <= dd && i < h; i++ {
			c, prev := r.Diff[i], us[(h-i)%(dd+1)]
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
	return mean, vr, true
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
