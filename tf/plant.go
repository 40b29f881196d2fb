package tf

import (
	"math"

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
	st filter.Stream // by value: one pointer less per step
	r  Rational
}

// NewPlant returns a Plant for r at rest.
func NewPlant(r Rational) *Plant {
	num, den := r.coefs()
	return &Plant{r: r, st: *filter.NewStream(num, den, r.delay)}
}

// Rational returns the transfer function the plant simulates.
func (p *Plant) Rational() Rational { return p.r }

// Step applies the input u at the current sample and returns the output
// at that sample, then advances time by one sample. Non-finite inputs are
// not checked here (that would cost time in a hot loop); they propagate
// into the output and the state until Reset or SetSteady.
func (p *Plant) Step(u float64) float64 { return p.st.Step(u) }

// Reset returns the plant to rest: all past inputs and outputs zero.
func (p *Plant) Reset() { p.st.Reset() }

// SetSteady puts the plant at the steady state of the constant input u:
// every past input equal to u and every past output equal to Gain()*u, so
// that feeding u keeps the output constant. It returns a *GainError when
// the gain does not exist (pole at z = 1; the plant is then left as it
// was), and a *SampleError for a non-finite u. For an unstable term the
// state is an equilibrium that any disturbance leaves.
func (p *Plant) SetSteady(u float64) error {
	if math.IsNaN(u) || math.IsInf(u, 0) {
		return &SampleError{Series: "steady input", Index: 0, Value: u}
	}
	g, err := p.r.Gain()
	if err != nil {
		return err
	}
	xh, yh := ratSteadyHistory(p.r, u, g*u)
	p.st.SetHistory(xh, yh)
	return nil
}

// SetHistory sets the past explicitly: pastInput and pastOutput hold the
// inputs and outputs before the next Step, oldest first (the last element
// is the most recent sample). Older values that are not given are zero;
// the plant uses the last b+s inputs and the last r outputs. It returns a
// *SampleError (Series "past input" or "past output") for a NaN or
// infinite value, leaving the plant as it was.
func (p *Plant) SetHistory(pastInput, pastOutput []float64) error {
	if err := ratCheckSeries("past input", pastInput); err != nil {
		return err
	}
	if err := ratCheckSeries("past output", pastOutput); err != nil {
		return err
	}
	p.st.SetHistory(pastInput, pastOutput)
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
	return &Plant{r: p.r, st: *p.st.Clone()}
}

// ratSteadyHistory returns the b+s past inputs equal to u and r past
// outputs equal to y.
func ratSteadyHistory(r Rational, u, y float64) (xh, yh []float64) {
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
