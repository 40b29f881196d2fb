package predict

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// compile checks m for prediction and builds its plan.
func compile(m tf.Model, sigma2 float64, set Settings) (*plan, error) {
	if m.Output == "" {
		return nil, &errs.ModelError{Part: "model", Problem: "it names no output series (Model.Output is empty)"}
	}
	if err := m.Validate(); err != nil {
		return nil, err
	}
	if err := noFree(m); err != nil {
		return nil, err
	}
	pl := &plan{output: m.Output, zeroPre: set.ZeroPreSample, sd: math.Sqrt(sigma2), level: set.Level, z: quantile(set.Level)}
	pl.dc = m.Diff.Coeffs()
	if pl.dc[0] == 0 {
		return nil, &errs.ModelError{Part: "output " + m.Output + " differencing", Problem: "the constant term is zero; differencing is written as 1 - ..."}
	}
	pl.plainD = len(pl.dc) == 1 && pl.dc[0] == 1
	if m.Const != nil {
		pl.c = m.Const.Value
	}
	if err := pl.compileInputs(m, set); err != nil {
		return nil, err
	}
	if err := pl.compileNoise(m); err != nil {
		return nil, err
	}
	pl.first = max(pl.first, set.First)
	pl.smallKernel()
	pl.layout()
	pl.fp, pl.shape = fingerprint(pl, true), fingerprint(pl, false)
	return pl, nil
}

// noFree refuses a model with a free coefficient, naming it.
func noFree(m tf.Model) error {
	var err error
	visit := func(c *tf.Coef) {
		if err == nil && c.Free {
			err = &errs.ModelError{Part: "coefficient " + c.Name, Problem: "it is free (to be estimated); a predictor needs every coefficient set: build it from the fitted model with the estimates held (Estimate.Held())"}
		}
	}
	m.Diff.Each(visit)
	for _, in := range m.Inputs {
		in.Diff.Each(visit)
	}
	m.EachParam(visit)
	return err
}

// stable reports a polynomial c in B (a denominator) with a z-plane
// root on or outside the unit circle, by tf.Rational.Stable (the
// library's one stability test), as a *ModelError for part.
func stable(c []float64, part, why string) error {
	r, err := tf.NewRational([]float64{1}, c, 0)
	if err != nil {
		return &errs.ModelError{Part: part, Problem: "it cannot be used (" + err.Error() + ")", Err: err}
	}
	if !r.Stable() {
		return &errs.ModelError{Part: part, Problem: "it has a root on or outside the unit circle (largest |z| = " +
			strconv.FormatFloat(r.MaxPoleMagnitude(), 'g', 6, 64) + "): " + why}
	}
	return nil
}

// compileInputs builds the input terms: their series columns, the
// coefficient slices, gains and the start-up rule, refusing an unstable
// denominator.
func (pl *plan) compileInputs(m tf.Model, set Settings) error {
	col, evCol := map[string]int{}, map[string]int{}
	for _, in := range m.Inputs {
		part := "input " + strconv.Quote(in.Series)
		var k int
		if in.Event != nil {
			var err error
			if k, err = pl.compileEvent(m, in, set, evCol); err != nil {
				return err
			}
		} else if c, ok := col[in.Series]; ok {
			k = c
		} else {
			k = len(pl.names)
			col[in.Series] = k
			pl.names = append(pl.names, in.Series)
		}
		ip := inputPlan{col: k, diff: in.Diff.Coeffs(), num: in.Num.Coeffs(), den: in.Den.Coeffs(), delay: in.Delay}
		if ip.diff[0] == 0 {
			return &errs.ModelError{Part: part + " differencing", Problem: "the constant term is zero; differencing is written as 1 - ..."}
		}
		if err := stable(ip.den, part+" denominator", "the term is unstable, so its state would grow without bound; an integrating process is written as differencing of the output"); err != nil {
			return err
		}
		ip.d = len(ip.diff) - 1
		ip.plain = ip.d == 0 && ip.diff[0] == 1
		ip.hold = ip.d == 0 && !pl.zeroPre // events before sample 0: below
		ip.gain = sum(ip.num) / sum(ip.den)
		ip.ls = max(len(ip.den), len(ip.num)) - 1
		pl.ins = append(pl.ins, ip)
	}
	// The events' columns follow the series'; a step before sample 0 is
	// held at 1 before it, in its steady state.
	for i := range pl.ins {
		ip := &pl.ins[i]
		if c := ip.col; c < 0 {
			ip.col = len(pl.names) - 1 - c
		}
		ip.hold = ip.hold || ip.d == 0 && pl.past(ip.col)
	}
	return nil
}

// compileNoise builds the noise polynomials, the start-up indices and
// the psi weights' denominator, refusing a noise model that is not
// stationary or not invertible.
func (pl *plan) compileNoise(m tf.Model) error {
	pl.ar, pl.ma = []float64{1}, []float64{1}
	if m.Noise != nil {
		pl.ar, pl.ma = m.Noise.AR.Coeffs(), m.Noise.MA.Coeffs()
	}
	if err := stable(pl.ar, "noise AR", "the noise is not stationary; write differencing as the output's D(B) instead"); err != nil {
		return err
	}
	if err := stable(pl.ma, "noise MA", "the noise is not invertible, so the innovations would not forget their start-up values"); err != nil {
		return err
	}
	pl.maOne = len(pl.ma) == 1 && pl.ma[0] == 1
	ts := len(pl.dc) - 1
	for i, in := range m.Inputs {
		ts = max(ts, pl.ins[i].d+in.Delay+in.Num.Degree())
	}
	pl.ts = ts
	pl.first = max(ts+len(pl.ar)-1, 0)
	pl.cc = poly.Mul(pl.ar, pl.dc)
	pl.psi0 = pl.ma[0] / pl.cc[0]
	pl.se0 = pl.sd * math.Sqrt(pl.psi0*pl.psi0)
	return nil
}

// layout places every state value in one slice.
func (pl *plan) layout() {
	n := 0
	take := func(k int) int {
		o := n
		n += k
		return o
	}
	for i := range pl.ins {
		ip := &pl.ins[i]
		if pl.small {
			ip.ls = 2
		}
		ip.off = take(2)
		ip.sh = take(ip.ls) // right after off: the small kernel reads the four as one
		ip.xh = take(ip.d)
		ip.ring = take(ip.delay)
	}
	pl.lyh, pl.lnh, pl.lah = len(pl.dc)-1, len(pl.ar)-1, len(pl.ma)-1
	if pl.small {
		pl.lyh, pl.lnh, pl.lah = 2, 2, 2
	}
	pl.last = make([]int, len(pl.names))
	for i := len(pl.ins) - 1; i >= 0; i-- {
		if c := pl.ins[i].col; c < len(pl.names) {
			pl.last[c] = pl.ins[i].off
		}
	}
	if pl.small {
		pl.terms = make([]smallTerm, len(pl.ins))
		for i, ip := range pl.ins {
			pl.terms[i] = smallTerm{k: ip.k, off: ip.off, ring: ip.ring, delay: ip.delay, col: ip.col}
		}
	}
	pl.offC = take(1)
	pl.yh = take(pl.lyh)
	pl.nh = take(pl.lnh)
	pl.ah = take(pl.lah)
	pl.unc = take(1)
	m := len(pl.dc) - 1 + len(pl.ar) - 1 + len(pl.ma) - 1
	pl.cov = take(m * m)
	pl.size = n
	pl.compileGap()
}

// sum returns the sum of the coefficients, the polynomial at B = 1.
func sum(c []float64) float64 {
	s := 0.0
	for _, v := range c {
		s += v
	}
	return s
}

// smallKernel sets pl.small and the padded coefficients when every
// polynomial fits advanceSmall.
func (pl *plan) smallKernel() {
	fits := func(c []float64, one bool) bool { return len(c) <= 3 && (!one || c[0] == 1) }
	pl.small = fits(pl.dc, true) && fits(pl.ar, true) && fits(pl.ma, true)
	for i := range pl.ins {
		ip := &pl.ins[i]
		pl.small = pl.small && ip.plain && fits(ip.den, true) && fits(ip.num, false)
	}
	if !pl.small {
		return
	}
	for i := range pl.ins {
		ip := &pl.ins[i]
		copy(ip.k[:3], ip.num)
		copy(ip.k[3:], ip.den[1:])
	}
	copy(pl.nk[0:2], pl.dc[1:])
	copy(pl.nk[2:4], pl.ar[1:])
	copy(pl.nk[4:6], pl.ma[1:])
}
