package arma

import (
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/filter"

	"github.com/backshift/backshift/internal/vec"
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
	h, _, _, _, ok := e.curvature(x)
	return h, ok
}

// curvature returns H, J'J, the gradient J'r and the sum of squares at x.
func (e *engine) curvature(x []float64) (H, jtj *mat.SymDense, g []float64, f float64, ok bool) {
	np := len(x)
	if np == 0 {
		return nil, nil, nil, 0, false
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
	if e.hr == nil {
		e.hr = make([]float64, m)
		e.hlam = make([]float64, m)
		e.hjac = make([][]float64, np)
		back := make([]float64, np*m)
		for j := range e.hjac {
			e.hjac[j] = back[j*m : (j+1)*m]
		}
	}
	r, jac := e.hr, e.hjac
	if err := e.eval(x, r, jac); err != nil {
		return nil, nil, nil, 0, false
	}
	phi, dphi := e.ar.Grad(e.lookup, na)
	theta, dtheta := e.ma.Grad(e.lookup, na)
	v := e.w
	t0 := e.t0
	// lambda = T^-T r: the MA filter run backwards in time.
	lam := e.hlam
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
				tot += cl * vec.Dot(lam, s[t0-l:t0-l+m])
			}
		}
		return tot
	}
	win := func(c, s []float64) float64 {
		tot := 0.0
		for l, cl := range c {
			if cl != 0 && l < m {
				tot += cl * vec.Dot(lam[l:], s[:m-l])
			}
		}
		return tot
	}
	// v_k: derivative of v with respect to a regression parameter k:
	// -1 for the mean, -wx for a regressor (nil for ARMA parameters).
	// (full() of a constant -1 is -sum(c) sum(lambda); of -wx it is
	// minus full() of wx.)
	vk := make([][]float64, np)
	vsign := make([]bool, np) // true: the series is the constant -1
	if e.kmu >= 0 {
		vsign[e.kmu] = true
	}
	for k, b := range e.kb {
		if b >= 0 {
			vk[b] = e.wx[k]
		}
	}
	sumLam := 0.0
	for _, l := range lam {
		sumLam += l
	}
	vfull := func(c []float64, k int) float64 {
		if vsign[k] {
			s := 0.0
			for _, cl := range c {
				s += cl
			}
			return -s * sumLam
		}
		if vk[k] == nil {
			return 0
		}
		return -full(c, vk[k])
	}
	H = mat.NewSymDense(np, nil)
	jtj = mat.NewSymDense(np, nil)
	g = make([]float64, np)
	for j := 0; j < np; j++ {
		g[j] = vec.Dot(jac[j], r)
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
			if j < na && dphi[j] != nil {
				q += vfull(dphi[j], k)
			}
			if k < na && dphi[k] != nil {
				q += vfull(dphi[k], j)
			}
			if j < na && dtheta[j] != nil {
				q -= win(dtheta[j], jac[k])
			}
			if k < na && dtheta[k] != nil {
				q -= win(dtheta[k], jac[j])
			}
			jj := vec.Dot(jac[j], jac[k])
			jtj.SetSym(j, k, jj)
			H.SetSym(j, k, jj+q)
		}
	}
	_ = phi
	return H, jtj, g, vec.Dot(r, r), true
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
