package online

import (
	"math"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/tf"
)

// Update feeds one sample: x holds the inputs in the order of Inputs
// (x is not modified or kept), y the output. It computes the one-step
// prediction error with the current estimates and its gradient, and,
// after the warm-up, moves the estimates by the recursive
// prediction-error step (see the package doc), subject to the dead
// zone, the stability projection and the trace bound. It does not
// allocate unless it returns an error.
//
// Errors (Op "online.Estimator.Update"), after which the sample is not
// used and the state is unchanged: a *SeriesError (ErrLength) when
// len(x) differs from len(Inputs()); a *SampleError naming the series
// and the sample's index (the count of samples accepted before it) for
// a NaN or infinite sample or one above MaxMagnitude. A *tf.SimError
// (ErrOverflow) when the prediction error or its gradient comes out NaN
// or infinite stops the Estimator: this and every later Update return
// it (see Err), the estimates staying at their last finite values.
func (e *Estimator) Update(x []float64, y float64) error {
	if e.broken != nil {
		return e.broken
	}
	if err := e.checkSample(x, y); err != nil {
		return err
	}
	if e.counts.Samples == 0 {
		e.settle(x, y)
	}
	e.push(x, y)
	e.filter(true)
	eps := e.hist[e.e]
	e.gradient()
	if !finite(eps) || !finiteAll(e.psi) {
		e.broken = &tf.SimError{Op: "online.Estimator.Update", Part: "output " + e.output, Step: e.counts.Samples, Value: eps,
			Problem: "the one-step prediction error or its gradient is not finite (the samples or the estimates overflowed float64); start a new Estimator, with the series rescaled"}
		return e.broken
	}
	lam := e.set.Forgetting
	e.lastErr = eps
	sd := 0.0
	if e.set.DeadZone > 0 {
		sd = math.Sqrt(e.sumE2 / e.sumW)
	}
	e.sumE2 = lam*e.sumE2 + eps*eps
	e.sumW = lam*e.sumW + 1
	e.lamT *= lam
	e.counts.Samples++
	switch {
	case e.counts.Samples <= e.set.Warmup:
		e.gather()
		if e.counts.Samples == e.set.Warmup {
			e.startP()
		}
	case e.set.DeadZone > 0 && math.Abs(eps) <= e.set.DeadZone*sd:
		e.counts.DeadZone++
	default:
		e.step(eps)
	}
	return nil
}

// checkSample refuses a sample of the wrong width or with a bad value.
func (e *Estimator) checkSample(x []float64, y float64) error {
	return checkSample("online.Estimator.Update", "Estimator", e.series, e.output, e.counts.Samples, x, y)
}

// checkSample is the check of a sample of Estimator.Update and
// Refitter.Add (op; owner names the type whose Inputs give the order):
// len(x) must be len(series), and every value a number of magnitude at
// most MaxMagnitude. The *SampleError names the series and index (and
// the limit, for a finite value beyond it). It allocates only for an
// error.
func checkSample(op, owner string, series []string, output string, index int, x []float64, y float64) error {
	if len(x) != len(series) {
		return &SeriesError{Op: op, Series: "inputs", Kind: errs.ErrLength, Have: len(x), Need: len(series),
			Detail: "one value per input series, in the order of " + owner + ".Inputs()"}
	}
	// !(|v| <= MaxMagnitude) is true for NaN, infinities and too large.
	for i, v := range x {
		if !(math.Abs(v) <= MaxMagnitude) {
			return sampleErr(op, series[i], index, v)
		}
	}
	if !(math.Abs(y) <= MaxMagnitude) {
		return sampleErr(op, output, index, y)
	}
	return nil
}

// sampleErr is the *SampleError for the bad value v of series name at
// index, with the limit MaxMagnitude when v is finite.
func sampleErr(op, name string, index int, v float64) error {
	se := &SampleError{Op: op, Series: name, Index: index, Value: v}
	if !math.IsNaN(v) && !math.IsInf(v, 0) {
		se.Limit = MaxMagnitude
	}
	return se
}

// settle fills every history as if the record had been settled before
// its first sample: each input held at its first value, each filter at
// its steady state (DC gain times its input's level; zero where the
// gain does not exist, a pole at z = 1). This is the batch fit's
// start-up convention for inputs, extended to the gradient filters.
func (e *Estimator) settle(x []float64, y float64) {
	fill(e.yh, y)
	w := sum(e.outDiff) * y
	r := e.ar.sum() / e.ma.sum()
	ratio := func(a, b float64) float64 {
		if v := a / b; finite(v) {
			return v
		}
		return 0
	}
	nv := w - e.cval
	for i := range e.ins {
		it := &e.ins[i]
		fill(it.xh, x[it.col])
		z := sum(it.diff) * x[it.col]
		fill(it.ring, z)
		d := it.den.sum()
		s := ratio(z, d)
		u := it.num.sum() * s
		q := ratio(u, d)
		e.fillSig(it.u, u)
		e.fillSig(it.s, s)
		e.fillSig(it.st, r*s)
		e.fillSig(it.q, q)
		e.fillSig(it.qt, r*q)
		nv -= u
	}
	t1 := e.ma.sum()
	e.fillSig(e.n, nv)
	e.fillSig(e.e, r*nv)
	e.fillSig(e.nt, nv/t1)
	e.fillSig(e.et, r*nv/t1)
	e.fillSig(e.g, r)
}

func (e *Estimator) fillSig(s int, v float64) {
	for j := 0; j < e.h; j++ {
		e.hist[j*e.ns+s] = v
	}
}

// push shifts every history by one sample and stores the new raw
// values: the output, each input and its differenced value z.
func (e *Estimator) push(x []float64, y float64) {
	copy(e.hist[e.ns:], e.hist[:len(e.hist)-e.ns])
	copy(e.yh[1:], e.yh)
	e.yh[0] = y
	for i := range e.ins {
		it := &e.ins[i]
		copy(it.xh[1:], it.xh)
		it.xh[0] = x[it.col]
		z := 0.0
		for j, d := range it.diff {
			z += d * it.xh[j]
		}
		it.pos++
		if it.pos == len(it.ring) {
			it.pos = 0
		}
		it.ring[it.pos] = z
	}
}

// filter computes the current row of the history block from the raw
// values and the past rows, with the current estimates: each input
// term's output u, the noise n and the prediction error e, and, when
// grad is set, the gradient signals. The a posteriori pass after an
// update recomputes u, n and e only, as in Ljung & Soderstrom's
// algorithm, where the gradient filters run once per sample; the
// gradient signals of one sample then all come from one pass, so that
// for the tied ARX form they sum to the regressors exactly.
func (e *Estimator) filter(grad bool) {
	h := e.hist
	phi, theta := e.ar.c, e.ma.c
	w := 0.0
	for j, d := range e.outDiff {
		w += d * e.yh[j]
	}
	c := e.cval
	if e.constK >= 0 {
		c = e.x[e.constK]
	}
	nv := w - c
	for i := range e.ins {
		it := &e.ins[i]
		dc := it.den.c
		L := len(it.ring)
		acc := 0.0
		for j, v := range it.num.c {
			k := it.pos - it.b - j
			if k < 0 {
				k += L
			}
			acc += v * it.ring[k]
		}
		u := e.ar1(it.u, acc, dc)
		nv -= u
		if !grad {
			continue
		}
		if it.num.free() {
			k := it.pos - it.b
			if k < 0 {
				k += L
			}
			e.ar1(it.s, it.ring[k], dc)
			e.arma(it.st, it.s, phi, theta)
		}
		if it.den.free() {
			e.ar1(it.q, u, dc)
			e.arma(it.qt, it.q, phi, theta)
		}
	}
	h[e.n] = nv
	e.arma(e.e, e.n, phi, theta)
	if !grad {
		return
	}
	if e.ar.free() {
		e.ar1(e.nt, nv, theta)
	}
	if e.ma.free() {
		e.ar1(e.et, h[e.e], theta)
	}
	if e.constK >= 0 {
		e.ar1(e.g, e.ar.sum(), theta)
	}
}

// ar1 sets signal o's current value to (v - sum_(j>=1) a_j o_(t-j)) /
// a_0 and returns it.
func (e *Estimator) ar1(o int, v float64, a []float64) float64 {
	h, ns := e.hist, e.ns
	if len(a) == 2 { // first order, the usual case, without the loop
		v -= a[1] * h[ns+o]
	} else {
		for j := 1; j < len(a); j++ {
			v -= a[j] * h[j*ns+o]
		}
	}
	if a[0] != 1 {
		v /= a[0]
	}
	h[o] = v
	return v
}

// arma sets signal o's current value to (b(B) x)_t filtered by 1/a(B).
func (e *Estimator) arma(o, x int, b, a []float64) {
	h, ns := e.hist, e.ns
	var v float64
	if len(b) == 2 {
		v = b[0]*h[x] + b[1]*h[ns+x]
	} else {
		for j, c := range b {
			v += c * h[j*ns+x]
		}
	}
	e.ar1(o, v, a)
}

// gradient sets psi = -d eps_t / d x, the negative gradient of the
// prediction error, from the current and past rows of the history
// block and the derivatives of the expanded polynomials.
func (e *Estimator) gradient() {
	clear(e.psi)
	if e.constK >= 0 {
		e.psi[e.constK] += e.hist[e.g]
	}
	h := e.hist
	for _, g := range e.grads { // the affine polynomials: constant derivatives
		e.psi[g.k] += g.w * h[g.at]
	}
	for _, c := range e.chains { // the products: derivatives at the estimates
		e.chain(c.m, c.sig, c.sign)
	}
}

// gradTerm is one constant term of the gradient: psi_k += w hist[at].
type gradTerm struct {
	k, at int
	w     float64
}

// chainTerm is a product polynomial whose derivatives chain sums.
type chainTerm struct {
	m    *polyMap
	sig  int
	sign float64
}

// addGrad records how gradient sums the terms of polynomial m, whose
// coefficient of B^j multiplies signal sig at lag j with the sign.
func (e *Estimator) addGrad(m *polyMap, sig int, sign float64) {
	switch {
	case !m.free():
	case !m.affine:
		e.chains = append(e.chains, chainTerm{m, sig, sign})
	default:
		n := m.deg + 1
		for l, k := range m.params {
			for j, d := range m.d[l*n : (l+1)*n] {
				if d != 0 {
					e.grads = append(e.grads, gradTerm{k: k, at: j*e.ns + sig, w: sign * d})
				}
			}
		}
	}
}

// chain adds sign * sum_j (d c_j / d x_k) sig_(t-j) to psi_k for every
// parameter k of the polynomial.
func (e *Estimator) chain(m *polyMap, sig int, sign float64) {
	n := m.deg + 1
	h, ns := e.hist, e.ns
	for l, k := range m.params {
		d := m.d[l*n : (l+1)*n]
		s := 0.0
		for j, v := range d {
			s += v * h[j*ns+sig]
		}
		e.psi[k] += sign * s
	}
}

// gather adds psi psi' to the information held in p during the
// warm-up, with forgetting.
func (e *Estimator) gather() {
	k := len(e.psi)
	lam := e.set.Forgetting
	for i := range k {
		row := e.p[i*k : (i+1)*k]
		pi := e.psi[i]
		for j := range row {
			row[j] = lam*row[j] + pi*e.psi[j]
		}
	}
}

// startP turns the information gathered in p into P, its inverse (with
// a ridge of 1e-9 of the largest diagonal entry), keeps a copy as P0
// for resets and sets the default trace bound.
func (e *Estimator) startP() {
	k := len(e.psi)
	top := 0.0
	for i := range k {
		top = math.Max(top, e.p[i*k+i])
	}
	ridge := 1e-9 * top
	if !(ridge > 0) || !finite(ridge) {
		ridge = 1
	}
	for i := range k {
		e.p[i*k+i] += ridge
	}
	if !invertSPD(e.p, e.p0, k) {
		clear(e.p)
		for i := range k {
			e.p[i*k+i] = 1 / ridge
		}
	}
	copy(e.p0, e.p)
	if e.maxTrace == 0 {
		e.maxTrace = 10 * trace(e.p, k)
	}
}

// step is the recursive prediction-error update with forgetting
// lambda (Ljung & Soderstrom 1983, ch. 3, in its least-squares
// form, P = R^-1 / gamma):
//
//	L = P psi / (lambda + psi' P psi),  x += L eps,
//	P = (P - P psi psi' P / (lambda + psi' P psi)) / lambda,
//
// followed by the stability projection and the trace bound, and by the
// a posteriori recomputation of the current sample's u, n and e with the
// new estimates.
func (e *Estimator) step(eps float64) {
	k := len(e.psi)
	lam := e.lambda()
	den := e.gain(lam)
	if !(den > 0) || !finite(den) {
		copy(e.p, e.p0)
		e.counts.Resets++
		den = e.gain(lam)
	}
	copy(e.old, e.x)
	inv, il := 1/den, 1/lam
	pp := e.ppsi[:k]
	for i, v := range pp {
		e.x[i] += v * inv * eps
	}
	// The upper triangle, mirrored: P stays exactly symmetric.
	p := e.p[:k*k]
	for i := range k {
		a := pp[i] * inv
		row := p[i*k : (i+1)*k]
		row = row[:len(pp)]
		for j := i; j < len(row); j++ {
			v := (row[j] - a*pp[j]) * il
			row[j] = v
			p[j*k+i] = v
		}
	}
	if tr := trace(e.p, k); tr > e.maxTrace {
		f := e.maxTrace / tr
		for i := range e.p {
			e.p[i] *= f
		}
		e.counts.Bounded++
	}
	e.evalPolys()
	if !finiteAll(e.x) || !e.stableAll() {
		copy(e.x, e.old)
		e.evalPolys()
		e.counts.Rejected++
		return
	}
	e.counts.Updates++
	e.filter(false)
}

// lambda returns the forgetting factor of the next update (see
// Settings.Ramp).
func (e *Estimator) lambda() float64 {
	f := e.set.Forgetting
	if e.set.Ramp == 0 || f <= rampStart {
		return f
	}
	return f - (f-rampStart)*math.Exp(-float64(e.counts.Updates+e.counts.Rejected)/float64(e.set.Ramp))
}

// rampStart is the forgetting factor at the first update with a ramp.
const rampStart = 0.95

// gain sets ppsi = P psi and returns lambda + psi' P psi.
func (e *Estimator) gain(lam float64) float64 {
	psi := e.psi
	k := len(psi)
	pp := e.ppsi[:k]
	p := e.p[:k*k]
	i := 0
	for ; i+2 <= k; i += 2 { // two rows at a time: two independent sums
		r0, r1 := p[i*k:(i+1)*k], p[(i+1)*k:(i+2)*k]
		r0, r1 = r0[:len(psi)], r1[:len(psi)]
		var v0, v1 float64
		for j, q := range psi {
			v0 += r0[j] * q
			v1 += r1[j] * q
		}
		pp[i], pp[i+1] = v0, v1
	}
	if i < k {
		r0 := p[i*k : (i+1)*k]
		r0 = r0[:len(psi)]
		v0 := 0.0
		for j, q := range psi {
			v0 += r0[j] * q
		}
		pp[i] = v0
	}
	s := lam
	for i, v := range pp {
		s += psi[i] * v
	}
	return s
}

// evalPolys evaluates every polynomial with a free coefficient at the
// current estimates.
func (e *Estimator) evalPolys() {
	x := e.x
	for _, op := range e.affine {
		v := op.sign * x[op.k]
		if op.first {
			v += op.base
		} else {
			v += *op.c
		}
		*op.c = v
	}
	for _, m := range e.products {
		m.eval(x)
	}
}

// stableAll reports whether every guarded polynomial is stable.
func (e *Estimator) stableAll() bool {
	for _, m := range e.checks {
		if c := m.c; len(c) == 2 && c[1] != 0 { // first order, as in stable
			if !(math.Abs(c[1]) < math.Abs(c[0])) {
				return false
			}
			continue
		}
		if !stable(m.c, e.buf) {
			return false
		}
	}
	return true
}

// invertSPD writes the inverse of the symmetric positive definite k by
// k matrix a into a, by the Cholesky factorisation a = L L' (L kept in
// work), and reports false when a is not positive definite.
func invertSPD(a, work []float64, k int) bool {
	l := work
	clear(l)
	for j := range k {
		s := a[j*k+j]
		for m := range j {
			s -= l[j*k+m] * l[j*k+m]
		}
		if !(s > 0) || !finite(s) {
			return false
		}
		l[j*k+j] = math.Sqrt(s)
		for i := j + 1; i < k; i++ {
			v := a[i*k+j]
			for m := range j {
				v -= l[i*k+m] * l[j*k+m]
			}
			l[i*k+j] = v / l[j*k+j]
		}
	}
	// Columns of L^-1' L^-1: solve L y = e_c, then L' x = y, into a.
	for c := range k {
		col := a[c*k : (c+1)*k] // row c of the symmetric inverse
		for i := range k {
			v := 0.0
			if i == c {
				v = 1
			}
			for m := c; m < i; m++ {
				v -= l[i*k+m] * col[m]
			}
			if i < c {
				v = 0
			}
			col[i] = v / l[i*k+i]
		}
		for i := k - 1; i >= 0; i-- {
			v := col[i]
			for m := i + 1; m < k; m++ {
				v -= l[m*k+i] * col[m]
			}
			col[i] = v / l[i*k+i]
		}
	}
	return true
}

// finite reports whether v is neither NaN nor infinite: v - v is 0
// for every finite v and NaN otherwise.
func finite(v float64) bool { return v-v == 0 }

func finiteAll(x []float64) bool {
	for _, v := range x {
		if !finite(v) {
			return false
		}
	}
	return true
}

func fill(x []float64, v float64) {
	for i := range x {
		x[i] = v
	}
}

func sum(x []float64) float64 {
	s := 0.0
	for _, v := range x {
		s += v
	}
	return s
}
