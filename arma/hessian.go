package arma

import (
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/filter"
)

// hessian returns H = J'J + Q at x, half the Hessian of the sum of
// squares, with Q_jk = sum_i r_i d^2 r_i / dx_j dx_k. The second
// derivatives of the residual recursion theta*(B) a = phi*(B) v satisfy
//
//	theta* g_jk = phi*_jk v + phi*_j v_k + phi*_k v_j - theta*_jk a - theta*_j g_k - theta*_k g_j
//
// (g_j = da/dx_j, v = w - mu - X beta, subscripts derivatives), so Q_jk =
// <lambda, right side> with lambda = T^-T r the adjoint of the MA filter
// T (one backward filtering pass): no second-derivative series are
// filtered. Second derivatives of the polynomials (non-zero only across
// factors of a product, or for powers) are taken by central differences
// of Grad, exact for factors of degree <= 2 in each coefficient.
func (e *engine) hessian(x []float64) (*mat.SymDense, bool) {
	np := len(x)
	if np == 0 {
		return nil, false
	}
	na := e.narma
	// Second derivatives of the AR and MA polynomials by differences of
	// the analytic first derivatives.
	d2phi := make([][][]float64, na)
	d2th := make([][][]float64, na)
	xp := append([]float64(nil), x...)
	for k := 0; k < na; k++ {
		h := 1e-5 * math.Max(1, math.Abs(x[k]))
		xp[k] = x[k] + h
		e.set(xp)
		_, pp := e.ar.Grad(e.lookup, na)
		_, tp := e.ma.Grad(e.lookup, na)
		xp[k] = x[k] - h
		e.set(xp)
		_, pm := e.ar.Grad(e.lookup, na)
		_, tm := e.ma.Grad(e.lookup, na)
		xp[k] = x[k]
		d2phi[k] = diffPolys(pp, pm, 2*h)
		d2th[k] = diffPolys(tp, tm, 2*h)
	}
	m := e.m
	r := make([]float64, m)
	jac := make([][]float64, np)
	back := make([]float64, np*m)
	for j := range jac {
		jac[j] = back[j*m : (j+1)*m]
	}
	if err := e.eval(x, r, jac); err != nil {
		return nil, false
	}
	phi, dphi := e.ar.Grad(e.lookup, na)
	theta, dtheta := e.ma.Grad(e.lookup, na)
	v := e.w
	t0 := e.t0
	// lambda = T^-T r: the MA filter run backwards in time.
	lam := make([]float64, m)
	for i := range r {
		lam[i] = r[m-1-i]
	}
	if !(len(theta) == 1 && theta[0] == 1) {
		filter.Run(lam, e.one, theta, lam)
	}
	for i, j := 0, m-1; i < j; i, j = i+1, j-1 {
		lam[i], lam[j] = lam[j], lam[i]
	}
	// <lambda, c(B) s> for a full-index series s (window starts at t0) and
	// for a window series s (zero before the window).
	full := func(c, s []float64) float64 {
		tot := 0.0
		for l, cl := range c {
			if cl != 0 {
				tot += cl * dot(lam, s[t0-l:t0-l+m])
			}
		}
		return tot
	}
	win := func(c, s []float64) float64 {
		tot := 0.0
		for l, cl := range c {
			if cl != 0 && l < m {
				tot += cl * dot(lam[l:], s[:m-l])
			}
		}
		return tot
	}
	// v_k: derivative of v with respect to a regression parameter k:
	// -1 for the mean, -wx for a regressor (nil for ARMA parameters).
	vk := make([][]float64, np)
	if e.kmu >= 0 {
		ones := make([]float64, len(v))
		for i := range ones {
			ones[i] = -1
		}
		vk[e.kmu] = ones
	}
	for k, b := range e.kb {
		if b >= 0 {
			c := make([]float64, len(v))
			for i, val := range e.wx[k] {
				c[i] = -val
			}
			vk[b] = c
		}
	}
	H := mat.NewSymDense(np, nil)
	for j := 0; j < np; j++ {
		for k := j; k < np; k++ {
			q := 0.0
			if j < na && k < na {
				if c := d2phi[k][j]; c != nil {
					q += full(c, v)
				}
				if c := d2th[k][j]; c != nil {
					q -= win(c, r)
				}
			}
			if j < na && dphi[j] != nil && vk[k] != nil {
				q += full(dphi[j], vk[k])
			}
			if k < na && dphi[k] != nil && vk[j] != nil {
				q += full(dphi[k], vk[j])
			}
			if j < na && dtheta[j] != nil {
				q -= win(dtheta[j], jac[k])
			}
			if k < na && dtheta[k] != nil {
				q -= win(dtheta[k], jac[j])
			}
			H.SetSym(j, k, dot(jac[j], jac[k])+q)
		}
	}
	_ = phi
	return H, true
}

// diffPolys returns (a[k] - b[k]) / h for each parameter k (nil when
// both are nil).
func diffPolys(a, b [][]float64, h float64) [][]float64 {
	out := make([][]float64, len(a))
	for k := range a {
		if a[k] == nil && b[k] == nil {
			continue
		}
		n := max(len(a[k]), len(b[k]))
		d := make([]float64, n)
		nz := false
		for i := 0; i < n; i++ {
			var x, y float64
			if i < len(a[k]) {
				x = a[k][i]
			}
			if i < len(b[k]) {
				y = b[k][i]
			}
			d[i] = (x - y) / h
			if math.Abs(d[i]) > 1e-9 {
				nz = true
			} else {
				d[i] = 0
			}
		}
		if nz {
			out[k] = d
		}
	}
	return out
}
