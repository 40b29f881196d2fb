package fit

import (
	"context"
	"math"
	"math/cmplx"

	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
	"gonum.org/v1/gonum/mat"
)

// startWindow caps the samples used for computed start values.
const startWindow = 20000

// needsStart reports whether p has free coefficients that are all zero.
func (w *work) needsStart(p tf.Poly) bool {
	free, nonzero := false, false
	p.Each(func(c *tf.Coef) {
		if w.idx(c.Name) >= 0 {
			free = true
			if c.Value != 0 {
				nonzero = true
			}
		}
	})
	return free && !nonzero
}

// startCandidates returns the candidate start vectors, the primary first.
func (w *work) startCandidates() [][]float64 {
	constStart := w.m.Const != nil && w.idx(w.m.Const.Name) >= 0 && w.m.Const.Value == 0
	needIn := constStart
	for i := range w.ins {
		in := w.ins[i].in
		if w.needsStart(in.Num) || w.needsStart(in.Den) {
			needIn = true
		}
	}
	if needIn {
		w.startInputs(constStart)
	}
	noiseFree := false
	w.ma.Each(func(c *tf.Coef) { noiseFree = noiseFree || w.idx(c.Name) >= 0 })
	w.ar.Each(func(c *tf.Coef) { noiseFree = noiseFree || w.idx(c.Name) >= 0 })
	if w.needsStart(w.ar) || w.needsStart(w.ma) {
		w.startNoise()
	}
	primary := w.params()
	cands := [][]float64{primary}
	if noiseFree {
		x := append([]float64(nil), primary...)
		zero := func(c *tf.Coef) {
			if k := w.idx(c.Name); k >= 0 {
				x[k] = 0
			}
		}
		w.ma.Each(zero)
		w.ar.Each(zero)
		cands = append(cands, x)
	}
	for _, f := range []float64{0.5, 1.5} {
		if x := w.scaledDenominators(primary, f); x != nil {
			cands = append(cands, x)
		}
	}
	w.set(primary)
	return cands
}

// scaledDenominators returns primary with the free denominator
// coefficients scaled by f, or nil when that changes nothing or leaves a
// pole at |z| >= 0.99. It leaves the values of w set to the result.
func (w *work) scaledDenominators(primary []float64, f float64) []float64 {
	x := append([]float64(nil), primary...)
	changed := false
	for i := range w.ins {
		if !w.ins[i].denFree {
			continue
		}
		w.ins[i].in.Den.Each(func(c *tf.Coef) {
			if k := w.idx(c.Name); k >= 0 {
				x[k] = primary[k] * f
				changed = changed || primary[k] != 0
			}
		})
	}
	if !changed {
		return nil
	}
	w.set(x)
	ok := true
	for i := range w.ins {
		if maxZ(w.ins[i].in.Den.Coeffs()) >= 0.99 {
			ok = false
		}
	}
	if !ok {
		return nil
	}
	return x
}

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

// startInputs sets start values of the inputs' polynomials (and the
// constant) from least-squares impulse-response weights.
func (w *work) startInputs(constStart bool) {
	n := w.n
	lags := make([]int, len(w.ins))
	for attempt := 0; attempt < 2; attempt++ {
		tr := w.cond.OutputDiff
		p := 0
		if w.m.Const != nil {
			p = 1
		}
		for i := range w.ins {
			in := w.ins[i].in
			s, r := in.Num.Degree(), in.Den.Degree()
			if attempt == 0 {
				lags[i] = min(s+3*r+2, 40)
			} else {
				lags[i] = s + r
			}
			tr = max(tr, w.ins[i].d+in.Delay+lags[i])
			p += lags[i] + 1
		}
		tr = max(tr, n-startWindow)
		if n-tr < p+5 {
			continue
		}
		coef, ok := ols(w, tr, lags, p)
		if !ok {
			continue
		}
		off := 0
		if w.m.Const != nil {
			if constStart {
				w.set(w.withValue(w.m.Const.Name, coef[0]))
			}
			off = 1
		}
		for i := range w.ins {
			in := w.ins[i].in
			v := coef[off : off+lags[i]+1]
			off += lags[i] + 1
			num, den := pade(v, in.Num.Degree(), in.Den.Degree())
			if w.needsStart(in.Den) {
				w.matchTarget(in.Den, den)
			}
			if w.needsStart(in.Num) {
				w.matchTarget(in.Num, num)
			}
		}
		return
	}
}

// withValue returns the parameter vector with parameter name set to v.
func (w *work) withValue(name string, v float64) []float64 {
	x := w.params()
	if k := w.idx(name); k >= 0 {
		x[k] = v
	}
	return x
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

// startNoise sets the noise polynomials' start values by
// Hannan-Rissanen on n_t implied by the current input values.
func (w *work) startNoise() {
	w.noiseSeries()
	lo := max(w.cond.NoiseStart, w.n-startWindow)
	x := w.nn[lo:w.n]
	mean := 0.0
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	xc := make([]float64, len(x))
	for i, v := range x {
		xc[i] = v - mean
	}
	phi, theta, err := hannanRissanen(xc, w.ar.Degree(), w.ma.Degree())
	if err != nil {
		return
	}
	before := w.params()
	if w.needsStart(w.ar) {
		w.matchTarget(w.ar, phi)
	}
	if w.needsStart(w.ma) {
		w.matchTarget(w.ma, theta)
	}
	if maxZ(w.ar.Coeffs()) >= 0.99 || maxZ(w.ma.Coeffs()) >= 0.99 {
		w.set(before)
	}
}

// matchTarget sets the free coefficients of p so that its expanded
// coefficients match target (index k = B^k) in least squares. Parameters
// not in p are unchanged.
func (w *work) matchTarget(p tf.Poly, target []float64) {
	local, ids := w.polyParams(p)
	if len(ids) == 0 {
		return
	}
	orig := w.params()
	x := w.params()
	x0 := make([]float64, len(ids))
	for j, k := range ids {
		x0[j] = x[k]
	}
	li := func(name string) int {
		if j, ok := local[name]; ok {
			return j
		}
		return -1
	}
	prob := lm.Problem{M: p.Degree() + 1, N: len(ids), Eval: func(xl, r []float64, jac [][]float64) error {
		for j, k := range ids {
			x[k] = xl[j]
		}
		w.set(x)
		c, d := p.Grad(li, len(ids))
		matchResiduals(r, jac, c, d, target)
		return nil
	}}
	res, err := lm.Minimize(context.Background(), prob, x0, &lm.Settings{MaxIter: 100})
	if err != nil {
		w.set(orig)
		return
	}
	for j, k := range ids {
		x[k] = res.X[j]
	}
	w.set(x)
}

// polyParams returns the parameter indices of the free coefficients of
// p in order of first appearance, and each name's position among them.
func (w *work) polyParams(p tf.Poly) (local map[string]int, ids []int) {
	local = map[string]int{}
	p.Each(func(c *tf.Coef) {
		k := w.idx(c.Name)
		if k < 0 {
			return
		}
		if _, ok := local[c.Name]; !ok {
			local[c.Name] = len(ids)
			ids = append(ids, k)
		}
	})
	return local, ids
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
