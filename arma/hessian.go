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

// curvature returns H, J'J, the gradient J'r and the sum of squares at x
// (ok false when x has no parameter or the residuals cannot be
// computed there).
func (e *engine) curvature(x []float64) (H, jtj *mat.SymDense, g []float64, f float64, ok bool) {
	np := len(x)
	if np == 0 {
		return nil, nil, nil, 0, false
	}
	na := e.narma
	d2phi, d2th := e.polySecond(x)
	e.curvatureScratch(np)
	r, jac := e.hr, e.hjac
	if err := e.eval(x, r, jac); err != nil {
		return nil, nil, nil, 0, false
	}
	_, dphi := e.ar.Grad(e.lookup, na)
	theta, dtheta := e.ma.Grad(e.lookup, na)
	adj := e.adjointOf(r, theta)
	H = mat.NewSymDense(np, nil)
	jtj = mat.NewSymDense(np, nil)
	g = make([]float64, np)
	for j := 0; j < np; j++ {
		g[j] = vec.Dot(jac[j], r)
		for k := j; k < np; k++ {
			q := 0.0
			if j < na && k < na {
				if c := d2phi[k][j]; c != nil {
					q += adj.full(c, e.w)
				}
				if c := d2th[k][j]; c != nil {
					q -= adj.win(c, r)
				}
			}
			if j < na && dphi[j] != nil {
				q += adj.regression(dphi[j], k)
			}
			if k < na && dphi[k] != nil {
				q += adj.regression(dphi[k], j)
			}
			if j < na && dtheta[j] != nil {
				q -= adj.win(dtheta[j], jac[k])
			}
			if k < na && dtheta[k] != nil {
				q -= adj.win(dtheta[k], jac[j])
			}
			jj := vec.Dot(jac[j], jac[k])
			jtj.SetSym(j, k, jj)
			H.SetSym(j, k, jj+q)
		}
	}
	return H, jtj, g, vec.Dot(r, r), true
}

// polySecond returns the second derivatives of the AR and MA polynomials
// with respect to each pair of ARMA coefficients at x, d2phi[k][j] and
// d2th[k][j] (nil when zero), by central differences of the analytic
// first derivatives with step 1e-5 max(1, |x_k|). The engine's
// coefficient values are left at the last difference point (eval sets
// them again).
func (e *engine) polySecond(x []float64) (d2phi, d2th [][][]float64) {
	na := e.narma
	d2phi = make([][][]float64, na)
	d2th = make([][][]float64, na)
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
	return d2phi, d2th
}

// curvatureScratch allocates, on first use, the residual, adjoint and
// Jacobian buffers of curvature for np parameters.
func (e *engine) curvatureScratch(np int) {
	if e.hr != nil {
		return
	}
	m := e.m
	e.hr = make([]float64, m)
	e.hlam = make([]float64, m)
	e.hjac = make([][]float64, np)
	back := make([]float64, np*m)
	for j := range e.hjac {
		e.hjac[j] = back[j*m : (j+1)*m]
	}
}

// adjoint is lambda = T^-T r, the residuals r filtered backwards in time
// by the MA filter T, with what its inner products with the right sides
// of the second-derivative recursion need.
type adjoint struct {
	lam    []float64
	t0, m  int
	sumLam float64
	// vk[k] is the series whose negative is the derivative of v = w - mu
	// - X beta with respect to regressor parameter k (its differenced
	// column); isMean[k] marks the mean, whose derivative is the
	// constant -1; both are empty for ARMA coefficients.
	vk     [][]float64
	isMean []bool
}

// adjointOf computes the adjoint of the residuals r for the MA
// polynomial theta into e.hlam (one backward filtering pass).
func (e *engine) adjointOf(r, theta []float64) adjoint {
	m := e.m
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
	np := len(e.names)
	adj := adjoint{lam: lam, t0: e.t0, m: m, vk: make([][]float64, np), isMean: make([]bool, np)}
	if e.kmu >= 0 {
		adj.isMean[e.kmu] = true
	}
	for k, b := range e.kb {
		if b >= 0 {
			adj.vk[b] = e.wx[k]
		}
	}
	for _, l := range lam {
		adj.sumLam += l
	}
	return adj
}

// full returns <lambda, c(B) s> for a series s indexed like the data
// (the window of lambda starts at t0).
func (a *adjoint) full(c, s []float64) float64 {
	tot := 0.0
	for l, cl := range c {
		if cl != 0 {
			tot += cl * vec.Dot(a.lam, s[a.t0-l:a.t0-l+a.m])
		}
	}
	return tot
}

// win returns <lambda, c(B) s> for a series s of the window (zero before
// it), such as the residuals or a Jacobian column.
func (a *adjoint) win(c, s []float64) float64 {
	tot := 0.0
	for l, cl := range c {
		if cl != 0 && l < a.m {
			tot += cl * vec.Dot(a.lam[l:], s[:a.m-l])
		}
	}
	return tot
}

// regression returns <lambda, c(B) v_k>, v_k the derivative of v with
// respect to parameter k: -sum(c) sum(lambda) for the mean, minus full()
// of the column for a regressor, 0 for an ARMA coefficient.
func (a *adjoint) regression(c []float64, k int) float64 {
	if a.isMean[k] {
		s := 0.0
		for _, cl := range c {
			s += cl
		}
		return -s * a.sumLam
	}
	if a.vk[k] == nil {
		return 0
	}
	return -a.full(c, a.vk[k])
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
