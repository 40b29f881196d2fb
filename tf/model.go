package tf

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/sym"
)

// Pos is a position in a spec text: 1-based Line and Column (bytes) and a
// 0-based byte Offset. The zero Pos means the value was built in code.
type Pos = sym.Pos

// Coef is one coefficient of a model polynomial: a fixed number (empty
// Name), a free named parameter to be estimated (Value is its start value
// or estimate), or a named parameter held at Value.
type Coef = sym.Coef

// Noise is the noise term theta(B)/phi(B) a_t of a model: MA is theta,
// AR is phi, each with constant term 1 (the zero Noise is white noise).
// It is arma's type under tf's name, so that a program builds a model
// from tf's exports alone.
type Noise = arma.Noise

// Term is one signed summand Coef B^Power of a factor.
type Term = sym.Term

// Factor is a sum of terms raised to a whole power.
type Factor = sym.Factor

// Poly is a polynomial in B written as a product of factors.
type Poly = sym.Poly

// Input is one input term of a model,
//
//	Num(B) / Den(B) * B^Delay * Diff(B) x_t
//
// with x the series named Series: Num is omega(B), Den is delta(B) with
// constant term 1, Delay the dead time b in samples, Diff the differencing
// applied to the input (empty for none).
type Input struct {
	Series string
	Diff   Poly
	Num    Poly
	Den    Poly
	Delay  int
	Pos    Pos
}

// Interval is the sample interval of a model: Value in Unit, one of the
// clock units "s", "min", "h", "d", "wk" (7 days) or the calendar units
// "mo" (a month), "qtr" (3 months), "yr" (12 months); see ValidUnit. The
// zero Interval means the interval is not given and times are reported
// in samples only.
//
// Time figures (dead times, time constants, rise and settling times) are
// reported in the interval's own unit: samples times Value, in Unit. For
// a clock unit they convert to seconds with Seconds. A calendar unit is
// not a fixed number of seconds (a month has 28 to 31 days), so for it
// Seconds returns ok = false and figures stay in the calendar unit
// (Months converts between mo, qtr and yr).
type Interval struct {
	Value float64
	Unit  string
}

// Model is a whole transfer-function-noise model,
//
//	Diff(B) y_t = c + sum_i Num_i(B)/Den_i(B) B^b_i Diff_i(B) x_i,t + theta(B)/phi(B) a_t
//
// Output names y; Const is the constant c (nil for none); Noise is the
// noise term (nil for a noise-free model, the zero Noise for white
// noise).
type Model struct {
	Output   string
	Diff     Poly
	Const    *Coef
	Inputs   []Input
	Noise    *Noise
	Interval Interval
}

// Clone returns a deep copy of m that shares nothing with it.
func (m Model) Clone() Model {
	c := Model{Output: m.Output, Diff: m.Diff.Clone(), Interval: m.Interval}
	if m.Const != nil {
		k := *m.Const
		c.Const = &k
	}
	if m.Inputs != nil {
		c.Inputs = make([]Input, len(m.Inputs))
		for i, in := range m.Inputs {
			c.Inputs[i] = Input{Series: in.Series, Diff: in.Diff.Clone(), Num: in.Num.Clone(),
				Den: in.Den.Clone(), Delay: in.Delay, Pos: in.Pos}
		}
	}
	if m.Noise != nil {
		n := m.Noise.Clone()
		c.Noise = &n
	}
	return c
}

// Equal reports whether m and o are the same model as written: names,
// structure, coefficients (values exactly), freedom and interval,
// ignoring positions in the spec text.
func (m Model) Equal(o Model) bool {
	if m.Output != o.Output || m.Interval != o.Interval || !m.Diff.Equal(o.Diff) ||
		len(m.Inputs) != len(o.Inputs) || (m.Const == nil) != (o.Const == nil) ||
		(m.Noise == nil) != (o.Noise == nil) {
		return false
	}
	if m.Const != nil && !m.Const.Equal(*o.Const) {
		return false
	}
	if m.Noise != nil && !m.Noise.Equal(*o.Noise) {
		return false
	}
	for i, a := range m.Inputs {
		b := o.Inputs[i]
		if a.Series != b.Series || a.Delay != b.Delay || !a.Diff.Equal(b.Diff) ||
			!a.Num.Equal(b.Num) || !a.Den.Equal(b.Den) {
			return false
		}
	}
	return true
}

// Validate checks the structure of m as a spec would have it, so that a
// model built in code cannot reach the numerical code with a shape it
// does not handle: every input named (Series not empty), every factor's
// power Exp in 1..MaxDegree, every power
// of B in 0..MaxDegree, every polynomial (differencing, numerator,
// denominator, noise MA and AR) of degree at most MaxDegree, every dead
// time in 0..MaxDelay and every coefficient value finite. It returns a
// *ModelError naming the first part at fault, or nil. It does not check
// what depends on the values' meaning (a zero constant term of a
// denominator, stability); Fit, Model.Simulate and NewSystem report
// those themselves, and call Validate first (their errors carry their
// own Op; Validate's carry "tf.Model.Validate").
func (m Model) Validate() error {
	if err := m.validate(); err != nil {
		return withOp("tf.Model.Validate", err)
	}
	return nil
}

// validate is Validate with errors carrying no Op, for the exported
// functions that check a model and set their own.
func (m Model) validate() error {
	if err := modelCheckPoly(m.Diff, "output "+m.Output+" differencing"); err != nil {
		return err
	}
	if m.Const != nil {
		if v := m.Const.Value; math.IsNaN(v) || math.IsInf(v, 0) {
			return &ModelError{Part: "constant " + modelCoefName(*m.Const), Problem: "value " + strconv.FormatFloat(v, 'g', -1, 64) + " is not finite"}
		}
	}
	for i, in := range m.Inputs {
		part := "input " + strconv.Quote(in.Series)
		if in.Series == "" {
			return &ModelError{Part: "input " + strconv.Itoa(i+1), Problem: "has no series name (Input.Series names the data series the term acts on)"}
		}
		if in.Delay < 0 || in.Delay > MaxDelay {
			return &ModelError{Part: part + " dead time", Problem: strconv.Itoa(in.Delay) + " samples is outside 0.." + strconv.Itoa(MaxDelay) + " (a dead time counts whole samples of delay, B^b with b >= 0)"}
		}
		for _, p := range []struct {
			p    Poly
			what string
		}{{in.Diff, "differencing"}, {in.Num, "numerator"}, {in.Den, "denominator"}} {
			if err := modelCheckPoly(p.p, part+" "+p.what); err != nil {
				return err
			}
		}
	}
	if m.Noise != nil {
		if err := modelCheckPoly(m.Noise.MA, "noise MA"); err != nil {
			return err
		}
		if err := modelCheckPoly(m.Noise.AR, "noise AR"); err != nil {
			return err
		}
	}
	return nil
}

// modelCheckPoly checks one polynomial for Validate.
func modelCheckPoly(p Poly, part string) error {
	deg := 0
	for i, f := range p.Factors {
		fp := part + ", factor " + strconv.Itoa(i+1)
		if f.Exp < 1 || f.Exp > MaxDegree {
			return &ModelError{Part: fp, Problem: "power " + strconv.Itoa(f.Exp) + " is outside 1.." + strconv.Itoa(MaxDegree) +
				" (a factor written once has Exp 1; leave a factor out rather than give it power 0)"}
		}
		top := 0
		for _, t := range f.Terms {
			if t.Power < 0 || t.Power > MaxDegree {
				return &ModelError{Part: fp, Problem: "power of B " + strconv.Itoa(t.Power) + " is outside 0.." + strconv.Itoa(MaxDegree)}
			}
			if v := t.Coef.Value; math.IsNaN(v) || math.IsInf(v, 0) {
				return &ModelError{Part: fp, Problem: "coefficient " + modelCoefName(t.Coef) + " of B^" + strconv.Itoa(t.Power) +
					" is " + strconv.FormatFloat(v, 'g', -1, 64) + ", not finite"}
			}
			top = max(top, t.Power)
		}
		deg += top * f.Exp
		if deg > MaxDegree {
			return &ModelError{Part: part, Problem: "degree " + strconv.Itoa(deg) + " (up to factor " + strconv.Itoa(i+1) + ") is over the limit of " + strconv.Itoa(MaxDegree)}
		}
	}
	return nil
}

// modelCoefName names a coefficient for a message: its name, or "(a
// number)" for a fixed one.
func modelCoefName(c Coef) string {
	if c.Name != "" {
		return c.Name
	}
	return "(a number)"
}
