package kalman

import "math"

func (rc *recorder) observed(t int, vf, F float64, pz []float64) {
	rc.vf[t] = vf
	rc.finv[t] = 1 / F
	m := len(pz)
	g := rc.g[t*m : (t+1)*m]
	for i := range g {
		g[i] = pz[i] / F
	}
}

func (rc *recorder) missing(t int, za, F float64, pz []float64) {
	rc.miss = append(rc.miss, t)
	rc.za = append(rc.za, za)
	rc.zpz = append(rc.zpz, F)
	rc.pz = append(rc.pz, pz...)
}

// Smooth returns the fixed-interval smoothed estimates of the missing
// samples of z given every observed sample: fill holds z with each NaN
// from Start on replaced by E(z_t | observed samples), and vr the
// variances of those estimates in units of sigma^2 (0 at observed
// samples). Missing samples before Start (with differencing: before the
// conditioning samples) stay NaN in fill and vr. It also returns the
// filter's Stats. Smooth allocates O(n m) for the pass; errors as for
// Run.
//
// The recursion (Durbin & Koopman 2012, eq. 4.44 and 4.69, sec. 4.10 for
// missing samples) runs backward from the last sample to the first
// missing one, with r_n = 0, N_n = 0:
//
//	observed:  r_{t-1} = Z' v_t/F_t + L_t' r_t,  N_{t-1} = Z'Z/F_t + L_t' N_t L_t,  L_t = T (I - P_t Z' Z / F_t)
//	missing:   r_{t-1} = T' r_t,                 N_{t-1} = T' N_t T
//
// and at a missing t: E(z_t) = Z (a_t + P_t r_{t-1}) + mu/diff_0,
// var = Z P_t Z' - (P_t Z')' N_{t-1} (P_t Z').
func (f *Filter) Smooth(z []float64, mu float64) (fill, vr []float64, st Stats, err error) {
	n, m := len(z), f.m
	rc := &recorder{vf: make([]float64, n), finv: make([]float64, n), g: make([]float64, n*m)}
	st, err = f.run(z, mu, nil, nil, rc)
	if err != nil {
		return nil, nil, st, err
	}
	fill = append([]float64(nil), z...)
	vr = make([]float64, n)
	for t := range z {
		if math.IsNaN(z[t]) {
			vr[t] = math.NaN()
		}
	}
	if len(rc.miss) == 0 {
		return fill, vr, st, nil
	}
	c0 := mu * f.z[0]
	r := make([]float64, m)
	u := make([]float64, m)
	N := make([]float64, m*m)
	W := make([]float64, m*m)
	wg := make([]float64, m)
	k := len(rc.miss) - 1
	for t := n - 1; t >= rc.miss[0]; t-- {
		if k >= 0 && rc.miss[k] == t {
			f.applyTt(u, r)
			copy(r, u)
			f.sandwich(N, N, f.applyTt)
			pz := rc.pz[k*m : (k+1)*m]
			fill[t] = rc.za[k] + dot(pz, r) + c0
			vr[t] = math.Max(rc.zpz[k]-quad(pz, N, m), 0)
			k--
			continue
		}
		g := rc.g[t*m : (t+1)*m]
		f.applyTt(u, r)
		e := rc.vf[t] - dot(g, u)
		for j := range r {
			r[j] = u[j] + f.z[j]*e
		}
		f.sandwich(W, N, f.applyTt)
		for i := 0; i < m; i++ {
			wg[i] = dot(W[i*m:(i+1)*m], g)
		}
		gwg := dot(g, wg) + rc.finv[t]
		for i := 0; i < m; i++ {
			for j := 0; j < m; j++ {
				N[i*m+j] = W[i*m+j] - f.z[i]*wg[j] - wg[i]*f.z[j] + gwg*f.z[i]*f.z[j]
			}
		}
	}
	return fill, vr, st, nil
}

func dot(a, b []float64) float64 {
	s := 0.0
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}

// quad returns x' A x for an m x m row-major A.
func quad(x, A []float64, m int) float64 {
	s := 0.0
	for i := 0; i < m; i++ {
		s += x[i] * dot(A[i*m:(i+1)*m], x)
	}
	return s
}
