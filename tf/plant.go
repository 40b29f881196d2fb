package tf

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/filter"
)

// Plant is a streaming simulator of a Rational for controller tests: fed
// one input sample u_t per call to Step, it returns the output y_t of
//
//	delta(B) y_t = omega(B) B^b u_t.
//
// A Plant starts at rest (all past inputs and outputs zero) or, after
// SetSteady, at the steady state of a constant input. A Step does no
// allocation and costs O(r + s) operations; it reproduces Rational.Filter
// bit for bit.
//
// # Algebraic loops
//
// When the dead time b is 0 and omega_0 != 0, y_t depends on u_t (direct
// feedthrough; see Feedthrough). A feedback loop that computes u_t from
// y_t then has an algebraic loop: the controller must use y_{t-1}, or
// the plant must have b >= 1, which is the usual situation for sampled
// processes (the output is read before the new input is applied).
//
// A Plant is not safe for concurrent use; use Clone to give each
// goroutine its own copy.
type Plant struct {
	st  filter.Stream // by value: one pointer less per step
	r   Rational
	t   int // steps since NewPlant, Reset, SetSteady or SetHistory
	bad int // 1 + the step of the first non-finite output, 0 for none (Err)
	// badU and badY are the input and output of that step.
	badU, badY float64
}

// NewPlant returns a Plant for r at rest.
func NewPlant(r Rational) *Plant {
	num, den := r.coefs()
	return &Plant{r: r, st: *filter.NewStream(num, den, r.delay)}
}

// Rational returns the transfer function the plant simulates.
func (p *Plant) Rational() Rational { return p.r }

// Step applies the input u at the current sample and returns the output
// at that sample, then advances time by one sample. Inputs are not
// checked here (that would cost time in a hot loop); a non-finite input,
// or an unstable term or large inputs that overflow float64, propagate
// into the output and the state until Reset, SetSteady or SetHistory.
// The first output that is NaN or infinite is recorded for Err (one
// comparison a step).
func (p *Plant) Step(u float64) float64 {
	y := p.st.Step(u)
	p.t++
	if y-y != 0 && p.bad == 0 { // NaN or infinite (Inf - Inf is NaN)
		p.bad, p.badU, p.badY = p.t, u, y
	}
	return y
}

// Err returns nil while every output of Step has been finite since
// NewPlant, Reset, SetSteady or SetHistory (which clear it), and
// otherwise a *SimError for the first that was not (Part "plant", a
// Problem naming the 0-based step counted from the last of those, the
// value and the cause: a non-finite input, an unstable term, or inputs
// too large for float64).
func (p *Plant) Err() error {
	if p.bad == 0 {
		return nil
	}
	u, y := p.badU, p.badY
	why := "float64 overflowed: the inputs are too large"
	switch {
	case u-u != 0:
		why = "the input sample is " + strconv.FormatFloat(u, 'g', -1, 64)
	case !p.r.Stable():
		why = "float64 overflowed: the term is unstable (a pole on or outside the unit circle) and grew without bound"
	}
	return &SimError{Op: "tf.Plant.Step", Part: "plant", Step: p.bad - 1, Value: y, Problem: why, sample: u-u != 0}
}

// Reset returns the plant to rest: all past inputs and outputs zero. It
// clears Err and the step count.
func (p *Plant) Reset() {
	p.st.Reset()
	p.t, p.bad = 0, 0
}

// SetSteady puts the plant at the steady state of the constant input u:
// every past input equal to u and every past output equal to Gain()*u, so
// that feeding u keeps the output constant. It returns a *GainError when
// the gain does not exist (pole at z = 1; the plant is then left as it
// was), and a *SampleError for a non-finite u. For an unstable term the
// state is an equilibrium that any disturbance leaves.
func (p *Plant) SetSteady(u float64) error {
	if math.IsNaN(u) || math.IsInf(u, 0) {
		return &SampleError{Op: "tf.Plant.SetSteady", Series: "steady input", Index: 0, Value: u}
	}
	g, err := p.r.gain()
	if err != nil {
		return withOp("tf.Plant.SetSteady", err)
	}
	xh, yh := steadyHistory(p.r, u, g*u)
	p.st.SetHistory(xh, yh)
	p.t, p.bad = 0, 0
	return nil
}

// SetHistory sets the past explicitly: pastInput and pastOutput hold the
// inputs and outputs before the next Step, oldest first (the last element
// is the most recent sample). Older values that are not given are zero;
// the plant uses the last b+s inputs and the last r outputs. It returns a
// *SampleError (Series "past input" or "past output") for a NaN or
// infinite value, leaving the plant as it was.
func (p *Plant) SetHistory(pastInput, pastOutput []float64) error {
	if err := checkSeries("past input", pastInput); err != nil {
		return withOp("tf.Plant.SetHistory", err)
	}
	if err := checkSeries("past output", pastOutput); err != nil {
		return withOp("tf.Plant.SetHistory", err)
	}
	p.st.SetHistory(pastInput, pastOutput)
	p.t, p.bad = 0, 0
	return nil
}

// Feedthrough reports whether the output at t depends on the input at t:
// dead time 0 and a non-zero omega_0.
func (p *Plant) Feedthrough() bool {
	num, _ := p.r.coefs()
	return p.r.delay == 0 && num[0] != 0
}

// Clone returns an independent copy of p in its current state (one
// allocation of the state buffers).
func (p *Plant) Clone() *Plant {
	return &Plant{r: p.r, st: *p.st.Clone(), t: p.t, bad: p.bad, badU: p.badU, badY: p.badY}
}

// steadyHistory returns the b+s past inputs equal to u and r past
// outputs equal to y.
func steadyHistory(r Rational, u, y float64) (xh, yh []float64) {
	xh = make([]float64, r.delay+r.NumDegree())
	for i := range xh {
		xh[i] = u
	}
	yh = make([]float64, r.DenDegree())
	for i := range yh {
		yh[i] = y
	}
	return xh, yh
}
