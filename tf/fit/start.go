package fit

import (
	"math"
	"math/cmplx"

	"github.com/backshift/backshift/internal/poly"
	"gonum.org/v1/gonum/mat"
)

// startWindow caps the samples used for computed start values.
const startWindow = 20000

// maxZ returns the largest magnitude of the z-plane roots (1/roots in
// B) of the polynomial c, 0 for a constant.
func maxZ(c []float64) float64 {
	m := 0.0
	for _, z := range zRoots(c) {
		m = math.Max(m, cmplx.Abs(z))
	}
	return m
}

// zRoots returns the z-plane roots of c: the roots of B^deg c(1/B).
func zRoots(c []float64) []complex128 {
	c = poly.Trim(c, 0)
	if len(c) <= 1 {
		return nil
	}
	zs, err := poly.Roots(poly.Reciprocal(c))
	if err != nil {
		return nil
	}
	return zs
}

// ols regresses w_t on [1,] z_i,t-b_i-k (k = 0..lags[i]) over t in
// [tr, n) and returns the coefficients.
func ols(w *work, tr int, lags []int, p int) ([]float64, bool) {
	n := w.n
	acc := make([]float64, p*p)
	xty := make([]float64, p)
	row := make([]float64, p)
	for t := tr; t < n; t++ {
		j := 0
		if w.m.Const != nil {
			row[0] = 1
			j = 1
		}
		for i := range w.ins {
			z := w.ins[i].z
			b := w.ins[i].in.Delay
			for k := 0; k <= lags[i]; k++ {
				row[j] = z[t-b-k]
				j++
			}
		}
		y := w.w[t]
		for a := 0; a < p; a++ {
			ra := row[a]
			xty[a] += ra * y
			ac := acc[a*p : a*p+p]
			for b := a; b < p; b++ {
				ac[b] += ra * row[b]
			}
		}
	}
	xtx := mat.NewSymDense(p, nil)
	for a := 0; a < p; a++ {
		for b := a; b < p; b++ {
			xtx.SetSym(a, b, acc[a*p+b])
		}
	}
	// A small ridge keeps collinear lag sets solvable.
	for a := 0; a < p; a++ {
		xtx.SetSym(a, a, xtx.At(a, a)*(1+1e-9)+1e-300)
	}
	var ch mat.Cholesky
	if !ch.Factorize(xtx) {
		return nil, false
	}
	sol := mat.NewVecDense(p, nil)
	if err := ch.SolveVecTo(sol, mat.NewVecDense(p, xty)); err != nil {
		return nil, false
	}
	out := make([]float64, p)
	for a := range out {
		out[a] = sol.AtVec(a)
		if math.IsNaN(out[a]) || math.IsInf(out[a], 0) {
			return nil, false
		}
	}
	return out, true
}

// pade turns impulse-response weights v_0..v_K (from the dead time on)
// into numerator (degree s) and denominator (degree r) coefficients as
// stored: sum_{l=0..r} den_l v_{j-l} = 0 for j > s (least squares over
// j = s+1..K), num_j = sum_{l=0..min(j,r)} den_l v_{j-l} for j <= s. An
// unstable or unsolvable denominator falls back to 1.
func pade(v []float64, s, r int) (num, den []float64) {
	den = make([]float64, r+1)
	den[0] = 1
	vk := func(j int) float64 {
		if j < 0 || j >= len(v) {
			return 0
		}
		return v[j]
	}
	if r > 0 && len(v) > s+1 {
		a := mat.NewSymDense(r, nil)
		g := make([]float64, r)
		for j := s + 1; j < len(v); j++ {
			for l := 1; l <= r; l++ {
				g[l-1] -= vk(j-l) * vk(j)
				for m := l; m <= r; m++ {
					a.SetSym(l-1, m-1, a.At(l-1, m-1)+vk(j-l)*vk(j-m))
				}
			}
		}
		var ch mat.Cholesky
		sol := mat.NewVecDense(r, nil)
		if ch.Factorize(a) && ch.SolveVecTo(sol, mat.NewVecDense(r, g)) == nil {
			for l := 1; l <= r; l++ {
				den[l] = sol.AtVec(l - 1)
			}
			if maxZ(den) >= 0.98 || math.IsNaN(den[1]) {
				clear(den[1:])
			}
		}
	}
	num = make([]float64, s+1)
	for j := 0; j <= s; j++ {
		for l := 0; l <= min(j, r); l++ {
			num[j] += den[l] * vk(j-l)
		}
	}
	return num, den
}

// matchResiduals sets r to the coefficients c less the target (both
// taken as 0 beyond their length) and the columns of jac to the
// derivatives d (nil for none).
func matchResiduals(r []float64, jac [][]float64, c []float64, d [][]float64, target []float64) {
	for i := range r {
		t := 0.0
		if i < len(target) {
			t = target[i]
		}
		r[i] = 0
		if i < len(c) {
			r[i] = c[i]
		}
		r[i] -= t
	}
	for j := range jac {
		for i := range jac[j] {
			jac[j][i] = 0
			if d[j] != nil && i < len(d[j]) {
				jac[j][i] = d[j][i]
			}
		}
	}
}
