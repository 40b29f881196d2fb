package statespace

import (
	"math"
	"strconv"
	"strings"

	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// MaxStates is the largest number of states Realise builds, 1000. The
// matrices are dense: A of 1000 states takes 8 MB and one simulation
// step 10^6 multiply-adds. A model that needs more (most often a dead
// time of hundreds of samples, each an explicit delay state) is refused
// with a *ModelError; shift the input series by the dead time instead.
const MaxStates = 1000

// Part says where one part of the model sits in the state vector and
// which transfer function its states realise.
type Part struct {
	// Name is the input's series name, "noise" for the noise term (with
	// the output differencing and the constant), or "constant" for the
	// constant state.
	Name string
	// First is the index of the part's first state; its states are
	// First .. First+States-1.
	First, States int
	// DelayStates is the number of explicit delay states at the start of
	// the part: state First+j holds the input j+1 samples back,
	// u_{t-1-j}, for j = 0..DelayStates-1. Zero for the noise and the
	// constant.
	DelayStates int
	// Num, Den and Delay are the transfer function the part realises,
	// Num(B)/Den(B) B^Delay in ascending powers of B with Den[0] = 1:
	// for an input, omega(B) D_i(B) / (delta(B) D(B)) after cancelling the
	// factors its differencing D_i shares with the output's D; for the
	// noise, theta(B) / (phi(B) D(B)) (Num {1} and Den D(B) for a model
	// with a constant but no noise term). Nil for the constant.
	Num, Den []float64
	Delay    int
}

// Realise returns the state-space realisation of the whole model m,
//
//	x_{t+1} = A x_t + B u_t + G a_t
//	y_t     = C x_t + D u_t + a_t,
//
// with u_t the model's inputs in the order of m.Inputs and a_t the
// innovation (zero for a model without noise). The state ordering, the
// forms and the meaning of minimal are set out in the package doc. Every
// coefficient is taken at its Value; m is not modified.
//
// Errors (all *ModelError, Op "statespace.Realise"): a model that
// Model.Validate refuses; a free coefficient (the message names every
// one: realise a fitted model's Held() form, or fix the values); an
// input term or noise term that tf refuses (Err holds tf's error, for
// errors.As); an output differencing whose constant term is zero; more
// than MaxStates states; an event input (step(T), pulse(T)), whose
// indicator this package does not build (the message names the input
// and the remedies: tf/predict builds events, or feed the indicator as
// an input series).
func Realise(m tf.Model) (*Realisation, error) {
	const op = "statespace.Realise"
	if err := m.Validate(); err != nil {
		return nil, &ModelError{Op: op, Part: "model", Problem: err.Error(), Err: err}
	}
	if err := checkFree(m); err != nil {
		err.Op = op
		return nil, err
	}
	if err := checkEvents(m); err != nil {
		err.Op = op
		return nil, err
	}
	parts, err := planParts(m)
	if err != nil {
		err.Op = op
		return nil, err
	}
	r := build(m, parts)
	if err := r.checkFinite(); err != nil {
		err.Op = op
		return nil, err
	}
	return r, nil
}

// checkFinite refuses a realisation with a NaN or infinite entry (a
// coefficient product or a normalisation by a tiny constant term that
// left float64 range).
func (r *Realisation) checkFinite() *ModelError {
	for _, m := range []struct {
		name string
		v    []float64
	}{{"A", r.a}, {"B", r.b}, {"C", r.c}, {"D", r.d}, {"G", r.g}} {
		for i, v := range m.v {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return &ModelError{Part: "matrix " + m.name, Problem: "entry " + strconv.Itoa(i) + " is " + strconv.FormatFloat(v, 'g', -1, 64) + ": the coefficients are too large for float64 once multiplied out; rescale the series (change their units)"}
			}
		}
	}
	return nil
}

// checkEvents refuses a model with an event input (step(T), pulse(T)),
// naming it: a realisation's inputs are fed by the caller, and an
// event's indicator depends on where the record starts, which a
// realisation does not know.
func checkEvents(m tf.Model) *ModelError {
	for _, in := range m.Inputs {
		if in.Event != nil {
			return &ModelError{Part: "input " + strconv.Quote(in.Series),
				Problem: "it is an event, whose indicator this package does not build (it depends on where the record starts); " +
					"use tf/predict, which builds event indicators from the sample count, or make the event an input series " +
					"that carries its indicator (tf.Model.EventData) and feed it"}
		}
	}
	return nil
}

// checkFree refuses a model with free coefficients, naming them.
func checkFree(m tf.Model) *ModelError {
	var names []string
	for _, c := range m.Params() {
		if c.Free {
			names = append(names, c.Name)
		}
	}
	if len(names) == 0 {
		return nil
	}
	return &ModelError{Part: "coefficients " + strings.Join(names, ", "),
		Problem: "free (to be estimated), so the model has no numbers to realise; realise a fitted model's Held() form, or hold each at a value"}
}

// planned is one part before it is placed: its transfer function and,
// for an input, its column of u.
type planned struct {
	Part
	input  int // column of u; -1 for the noise part
	order  int // states of the rational part (after the delay states)
	absorb int
	noise  bool // the model has a noise term (the noise part only)
	cnum   []float64
}

// planParts works out every part's transfer function and state count.
func planParts(m tf.Model) ([]planned, *ModelError) {
	dOut := m.DiffCoeffs()
	if dOut[0] == 0 {
		return nil, &ModelError{Part: "output " + strconv.Quote(m.Output) + " differencing", Problem: "its constant term (the coefficient of B^0) is zero, so the output cannot be recovered from its difference; write the differencing with constant term 1, as (1 - B)"}
	}
	var parts []planned
	total := 0
	for i, in := range m.Inputs {
		r, err := in.Rational()
		if err != nil {
			return nil, &ModelError{Part: "input " + strconv.Quote(in.Series), Problem: err.Error(), Err: err}
		}
		extraNum, extraDen := cancelDiff(in, dOut)
		num := trim(poly.Mul(r.Num(), extraNum))
		den := trim(poly.Mul(r.Den(), extraDen))
		num, den = normalise(num, den)
		p := planned{Part: Part{Name: in.Series, Num: num, Den: den, Delay: r.Delay()}, input: i}
		if !(len(num) == 1 && num[0] == 0) {
			mDeg, rDeg := len(num)-1, len(den)-1
			p.absorb = min(p.Delay, max(rDeg-mDeg, 0))
			p.order = max(mDeg+p.absorb, rDeg)
			p.DelayStates = p.Delay - p.absorb
			p.States = p.DelayStates + p.order
		}
		total += p.States
		parts = append(parts, p)
	}
	if m.Noise != nil || m.Const != nil {
		p, err := planNoise(m, dOut)
		if err != nil {
			return nil, err
		}
		total += p.States
		parts = append(parts, p)
	}
	if m.Const != nil {
		total++
	}
	if total > MaxStates {
		return nil, &ModelError{Part: "model", Problem: "needs " + strconv.Itoa(total) + " states, more than statespace.MaxStates = " + strconv.Itoa(MaxStates) + " (" + largest(parts) + "); shift an input series by its dead time instead of realising the delay"}
	}
	return parts, nil
}

// planNoise plans the noise part: theta/(phi D) driven by a_t, and the
// constant c/D = c phi/(phi D) driven by the constant state.
func planNoise(m tf.Model, dOut []float64) (planned, *ModelError) {
	theta, phi := []float64{1}, []float64{1}
	if m.Noise != nil {
		r, err := m.NoiseRational()
		if err != nil {
			return planned{}, &ModelError{Part: "noise", Problem: err.Error(), Err: err}
		}
		theta, phi = r.Num(), r.Den()
	}
	den := trim(poly.Mul(phi, dOut))
	num := append([]float64(nil), theta...)
	var cnum []float64
	if m.Const != nil {
		cnum = scale(m.Const.Value, phi)
	}
	d0 := den[0]
	if d0 != 1 {
		num, den = normalise(num, den)
		cnum = scale(1/d0, cnum)
	}
	order := max(len(den), len(num), len(cnum)) - 1
	p := planned{Part: Part{Name: "noise", Num: num, Den: den, States: order}, input: -1, order: order, noise: m.Noise != nil, cnum: cnum}
	if m.Noise == nil {
		p.Num = []float64{1}
	}
	return p, nil
}

// largest names the part with the most states, for the MaxStates error.
func largest(parts []planned) string {
	best := 0
	for i, p := range parts {
		if p.States > parts[best].States {
			best = i
		}
	}
	p := parts[best]
	s := p.Name + " has " + strconv.Itoa(p.States) + " states"
	if p.Delay > 0 {
		s += ", dead time " + strconv.Itoa(p.Delay) + " samples"
	}
	return s
}

// cancelDiff returns the input's differencing and the output's with
// every factor of the input's written differencing that divides both
// exactly divided out, so that an input differenced as the output
// (the usual transfer-function-noise model) keeps no differencing at all.
func cancelDiff(in tf.Input, dOut []float64) (num, den []float64) {
	num, den = in.DiffCoeffs(), dOut
	for _, f := range in.Diff.Factors {
		base := tf.Poly{Factors: []tf.Factor{{Terms: f.Terms, Exp: 1}}}.Coeffs()
		for range f.Exp {
			qn, ok1 := divExact(num, base)
			qd, ok2 := divExact(den, base)
			if !ok1 || !ok2 {
				break
			}
			num, den = qn, qd
		}
	}
	return num, den
}

// divExact divides p by f (ascending powers, f[0] != 0) and reports
// whether the remainder is zero to 1e-12 of p's largest coefficient
// (differencing has small whole coefficients, so an exact division
// leaves a remainder of rounding size or exactly zero).
func divExact(p, f []float64) ([]float64, bool) {
	p, f = trim(p), trim(f)
	if f[0] == 0 || len(f) > len(p) {
		return nil, false
	}
	q := make([]float64, len(p)-len(f)+1)
	r := append([]float64(nil), p...)
	for k := range q {
		q[k] = r[k] / f[0]
		for j, v := range f {
			r[k+j] -= q[k] * v
		}
	}
	scaleP := 0.0
	for _, v := range p {
		scaleP = max(scaleP, math.Abs(v))
	}
	for _, v := range r {
		if !(math.Abs(v) <= 1e-12*scaleP) {
			return nil, false
		}
	}
	return q, true
}

// scale returns s times a (nil for nil a).
func scale(s float64, a []float64) []float64 {
	if a == nil {
		return nil
	}
	c := make([]float64, len(a))
	for i, v := range a {
		c[i] = s * v
	}
	return c
}

// trim drops trailing zero coefficients, keeping at least one.
func trim(a []float64) []float64 {
	n := len(a)
	for n > 1 && a[n-1] == 0 {
		n--
	}
	return a[:n:n]
}

// normalise divides num and den by den[0] (not zero: every denominator
// here is a product of polynomials with nonzero constant terms).
func normalise(num, den []float64) ([]float64, []float64) {
	d0 := den[0]
	if d0 == 1 {
		return num, den
	}
	return scale(1/d0, num), scale(1/d0, den)
}
