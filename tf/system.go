package tf

import (
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"time"

	"github.com/backshift/backshift/internal/errs"
)

// SimSettings tunes Model.Simulate and NewSystem. The zero value (or a
// nil pointer) gives a noise-free run of a record that starts settled
// (Model.Simulate) or a system at rest (NewSystem); see FromRest.
//
// Rule for the numbers (the library's settings rule): zero means the
// default and a negative value is an error (Validate names the field),
// except BurnIn, whose negative value means none, as its doc says.
type SimSettings struct {
	// Start is the time of sample 0, used only to place event inputs
	// given as times (step(2026-03-01T08:00)); events given as sample
	// indices need none.
	Start time.Time
	// Seed1 and Seed2 seed the PCG source (math/rand/v2) of the Gaussian
	// innovations a_t; equal seeds give equal series. Every value is
	// valid.
	Seed1, Seed2 uint64
	// Sigma is the standard deviation of the innovations a_t. Zero (the
	// default) draws no noise: the output is the deterministic part of
	// the model. A positive Sigma needs a model with a noise term. It
	// must be finite.
	Sigma float64
	// BurnIn is the number of innovations drawn and run through the
	// noise filter theta(B)/phi(B) before the first sample, so that the
	// noise starts near its stationary state instead of from rest (the
	// library's one meaning of a burn-in, as in arma.SimSettings).
	// Zero means automatic: enough draws for the slowest mode of the
	// noise filter to decay below 1e-12 of its start, that is
	// ceil(ln 1e-12 / ln rho) + p + q draws with rho the largest
	// magnitude of the roots of phi in the z-plane (its poles), p and q
	// the AR and MA degrees, at least 100 + p + q and at most 10^6; none
	// for a noise model with a pole on or outside the unit circle (it has
	// no stationary state to approach) and none without noise (Sigma 0).
	// 1e-12 puts the left-over start-up transient far below any noise
	// a record can show. A positive value is that many draws, at most
	// MaxBurnIn, and needs a stationary noise model (poles strictly
	// inside the unit circle). A negative value means none: the noise
	// starts from rest.
	BurnIn int
	// FromRest, for Model.Simulate, starts every input path from rest:
	// inputs before the record are zero, which gives a start-up
	// transient when an input is far from zero. By default (FromRest
	// false) Model.Simulate starts each input path at the steady state
	// of its first sample x_0, as if the input had been held at x_0
	// before the record (see System.SetSteady): an undifferenced input's
	// term starts at its steady output Gain() x_0, and a differenced
	// input's pre-sample values are x_0, so that its difference starts
	// at zero. That is the record fit.Model assumes by default (see
	// Conditioning in the doc of package tf/fit), so that simulating and then fitting
	// with the defaults agree; FromRest matches fit.Model with
	// fit.Settings.ZeroPreSample only for inputs without differencing. A
	// System from NewSystem always starts at rest (it does not know the
	// first input before the first Step); call System.SetSteady with the
	// first input samples to start it settled.
	FromRest bool
	// Innovations, for Model.Simulate, when not nil, is the innovation
	// series a_t itself (one value per sample), used instead of Gaussian
	// draws; Sigma, the seeds and BurnIn are then ignored. Every value
	// must be finite. NewSystem ignores it.
	Innovations []float64
}

// Validate checks the settings by the rules documented on each field and
// returns a *SettingError naming the field ("SimSettings.Sigma") or a
// *SampleError for a NaN or infinite innovation (Series "innovations"),
// or nil.
func (s SimSettings) Validate() error {
	return s.validate("tf.SimSettings.Validate")
}

func (s SimSettings) validate(op string) error {
	if err := errs.NonNegative(op, "SimSettings.Sigma", s.Sigma, "0, the default, draws no noise"); err != nil {
		return err
	}
	if s.BurnIn > MaxBurnIn && s.Innovations == nil {
		return intSetting(op, "SimSettings.BurnIn", s.BurnIn, "must be at most tf.MaxBurnIn ("+strconv.Itoa(MaxBurnIn)+" draws); 0 means automatic, a negative value none")
	}
	return withOp(op, simCheck("innovations", s.Innovations))
}

// autoBurnIn is the automatic burn-in of SimSettings.BurnIn for the noise
// filter r = theta(B)/phi(B): 0 when r has no stationary state.
func autoBurnIn(r Rational) int {
	rho := r.MaxPoleMagnitude()
	if !(rho < 1) {
		return 0
	}
	num, den := r.coefs()
	pq := len(num) - 1 + len(den) - 1
	b := 100 + pq
	if rho > 0 {
		b = max(b, int(math.Ceil(math.Log(1e-12)/math.Log(rho)))+pq)
	}
	return min(b, 1_000_000)
}

// SimError reports a simulation whose output stopped being finite: Part
// is "plant" or "output <name>", Step the 0-based step (sample) counted
// from the start, Value the output there and Problem the cause. It matches
// ErrSample when the cause is a NaN or infinite input sample or
// innovation, and ErrOverflow otherwise (an unstable term, or inputs or a
// noise scale too large for float64).
type SimError struct {
	Op      string
	Part    string
	Step    int
	Value   float64
	Problem string
	sample  bool
}

// Error describes the problem in one line.
func (e *SimError) Error() string {
	return opPrefix(e.Op) + e.Part + ": step " + strconv.Itoa(e.Step) + " gave " + strconv.FormatFloat(e.Value, 'g', -1, 64) + ": " + e.Problem
}

// Unwrap returns ErrSample or ErrOverflow, as documented on SimError.
func (e *SimError) Unwrap() error {
	if e.sample {
		return ErrSample
	}
	return ErrOverflow
}

// System is a streaming simulator of a whole model,
//
//	D(B) y_t = c + sum_i Num_i(B)/Den_i(B) B^b_i D_i(B) x_i,t + theta(B)/phi(B) a_t,
//
// fed one sample of every input per Step. Each input path is a Plant
// (the differencing D_i as one Plant, then the rational term as
// another), the noise is a Plant on seeded Gaussian innovations, and the
// output differencing is undone by integrating through 1/D(B), all from
// rest unless SetSteady is called. (Model.Simulate and fit.Model start each
// input path settled at its first sample by default; a System cannot know
// the first sample before the first Step, so it starts at rest, and
// SetSteady with the first samples gives their settled start.) Every
// coefficient is taken at its Value. A Step does no allocation and costs
// O(total degree) operations; Model.Simulate gives the same numbers in
// one call.
//
// Step has no error result: a step whose output is NaN or infinite
// (a non-finite input sample, an unstable term or large inputs or noise
// that overflow float64) is recorded, and Err reports the first one with
// its step index. Check Err after a run, or whenever an output is not
// finite.
//
// A System is not safe for concurrent use; use Clone to give each
// goroutine its own copy.
type System struct {
	names  []string
	output string
	diff   []*Plant // nil where the input is not differenced
	path   []*Plant
	noise  *Plant // nil for a noise-free model
	integ  *Plant // nil when the output is not differenced
	c      float64
	sigma  float64
	burn   int
	seed1  uint64
	seed2  uint64
	src    *rand.PCG
	rng    *rand.Rand
	t      int   // steps since NewSystem or Reset
	err    error // the first non-finite output (Err)
}

// NewSystem returns a System for m at rest (after the noise burn-in, when
// s asks for one); s may be nil for the defaults. The model is copied.
//
// Errors (Op "tf.NewSystem"): a *ModelError for a model that
// Model.Validate refuses (a factor power below 1, a negative dead time,
// ...), a model with no inputs, a coefficient that makes a polynomial
// invalid (its Err is NewRational's *CoefError or *DelayError), Sigma > 0
// without a noise term, or BurnIn > 0 with a noise model that is not
// stationary; a *SettingError from SimSettings.Validate (a negative or
// non-finite Sigma, a BurnIn above MaxBurnIn).
func NewSystem(m Model, s *SimSettings) (*System, error) {
	return newSystem("tf.NewSystem", m, s)
}

func newSystem(op string, m Model, s *SimSettings) (*System, error) {
	var set SimSettings
	if s != nil {
		set = *s
	}
	set.Innovations = nil // not used by a System
	if err := set.validate(op); err != nil {
		return nil, err
	}
	if err := m.validate(); err != nil {
		return nil, withOp(op, err)
	}
	if len(m.Inputs) == 0 {
		return nil, &ModelError{Op: op, Part: "model " + m.Output, Problem: "has no input term (a System simulates the response to inputs)"}
	}
	sys := &System{
		names:  make([]string, len(m.Inputs)),
		output: m.Output,
		diff:   make([]*Plant, len(m.Inputs)),
		path:   make([]*Plant, len(m.Inputs)),
		c:      m.ConstValue(),
		sigma:  set.Sigma,
		burn:   set.BurnIn,
		seed1:  set.Seed1,
		seed2:  set.Seed2,
	}
	if math.IsNaN(sys.c) || math.IsInf(sys.c, 0) {
		return nil, &ModelError{Op: op, Part: "constant", Problem: "is " + strconv.FormatFloat(sys.c, 'g', -1, 64) + ", not a finite number"}
	}
	if err := sys.buildPlants(op, m); err != nil {
		return nil, err
	}
	if err := sys.buildNoise(op, m, set); err != nil {
		return nil, err
	}
	sys.Reset()
	return sys, nil
}

// buildPlants makes the streaming plants of each input's path and
// differencing, and the integration of the output's differencing.
func (sys *System) buildPlants(op string, m Model) error {
	for i, in := range m.Inputs {
		part := "input " + in.Series
		sys.names[i] = in.Series
		r, err := in.rational()
		if err != nil {
			return &ModelError{Op: op, Part: part, Problem: "invalid transfer function: " + err.Error(), Err: err}
		}
		sys.path[i] = NewPlant(r)
		if !in.Diff.IsOne() {
			d, err := newRational(in.DiffCoeffs(), []float64{1}, 0)
			if err != nil {
				return &ModelError{Op: op, Part: part, Problem: "invalid differencing: " + err.Error(), Err: err}
			}
			sys.diff[i] = NewPlant(d)
		}
	}
	if !m.Diff.IsOne() {
		d, err := newRational([]float64{1}, m.DiffCoeffs(), 0)
		if err != nil {
			return &ModelError{Op: op, Part: "output " + m.Output, Problem: "invalid differencing: " + err.Error(), Err: err}
		}
		sys.integ = NewPlant(d)
	}
	return nil
}

// buildNoise makes the noise plant and sets the burn-in (automatic for
// BurnIn 0, none for -1), refusing a burn-in with a non-stationary noise
// model and a Sigma without a noise term.
func (sys *System) buildNoise(op string, m Model, set SimSettings) error {
	if m.Noise != nil {
		r, err := m.noiseRational()
		if err != nil {
			return &ModelError{Op: op, Part: "noise", Problem: "invalid noise model: " + err.Error(), Err: err}
		}
		sys.noise = NewPlant(r)
		switch {
		case set.BurnIn > 0 && !r.Stable():
			return &ModelError{Op: op, Part: "noise", Problem: "a burn-in needs a stationary noise model, and phi(B) has a root on or inside the unit circle (set SimSettings.BurnIn to -1 for none)"}
		case set.BurnIn == 0:
			sys.burn = autoBurnIn(r)
		case set.BurnIn < 0:
			sys.burn = 0
		}
	} else if set.Sigma > 0 {
		return &ModelError{Op: op, Part: "noise", Problem: "Sigma > 0 but the model has no noise term (add a, or AR/MA/ARMA, to the spec)"}
	}
	return nil
}

// Inputs returns the input series names in the order Step expects their
// samples (the model's order).
func (s *System) Inputs() []string { return append([]string(nil), s.names...) }

// Step applies the input samples u (one per input, in the order of
// Inputs) at the current sample, draws the innovation a_t = Sigma * N(0,
// 1) and returns the output y_t, then advances time by one sample. It
// panics when len(u) differs from the number of inputs (a programmer
// error). Inputs are not checked one by one (that would cost time in a
// control loop), but an output that is NaN or infinite is: the first such
// step is kept for Err, and the output is returned as it is.
func (s *System) Step(u []float64) float64 {
	a := 0.0
	if s.sigma > 0 {
		a = s.sigma * s.rng.NormFloat64()
	}
	return s.StepWith(u, a)
}

// StepWith is Step with the innovation a_t given (ignored by a
// noise-free model); the seeded source is not used.
func (s *System) StepWith(u []float64, a float64) float64 {
	if len(u) != len(s.path) {
		panic("tf: System.Step: got " + strconv.Itoa(len(u)) + " input samples for " + strconv.Itoa(len(s.path)) + " inputs")
	}
	// The plants' streams are stepped directly: the System checks its
	// own output once instead of each plant its own.
	w := s.c
	for i, p := range s.path {
		x := u[i]
		if d := s.diff[i]; d != nil {
			x = d.st.Step(x)
		}
		w += p.st.Step(x)
	}
	if s.noise != nil {
		w += s.noise.st.Step(a)
	}
	if s.integ != nil {
		w = s.integ.st.Step(w)
	}
	if w-w != 0 && s.err == nil { // NaN or infinite (Inf - Inf is NaN)
		s.err = s.overflow(u, a, w)
	}
	s.t++
	return w
}

// Err returns nil while every output since NewSystem or the last Reset
// has been finite, and otherwise a *SimError for the first that was not:
// Part "output <name>", and a Problem naming the step (0-based, counted
// from NewSystem or Reset), the value, and what overflowed (a non-finite
// input sample or innovation, an unstable input or noise term, or inputs
// or a noise scale too large for float64). The error stays until Reset;
// the outputs after it are not meaningful.
func (s *System) Err() error { return s.err }

// overflow describes the non-finite output y of step s.t for Err.
func (s *System) overflow(u []float64, a, y float64) error {
	why := ""
	for i, x := range u {
		if x-x != 0 {
			why = "input sample of " + strconv.Quote(s.names[i]) + " is " + strconv.FormatFloat(x, 'g', -1, 64)
			break
		}
	}
	if why == "" && a-a != 0 {
		why = "the innovation is " + strconv.FormatFloat(a, 'g', -1, 64)
	}
	sample := why != ""
	if why == "" {
		var unstable []string
		for i, p := range s.path {
			if !p.Rational().Stable() {
				unstable = append(unstable, "input "+strconv.Quote(s.names[i]))
			}
		}
		if s.noise != nil && !s.noise.Rational().Stable() {
			unstable = append(unstable, "the noise")
		}
		switch {
		case len(unstable) > 0:
			why = "float64 overflowed: the term of " + strings.Join(unstable, ", ") + " is unstable (a pole on or outside the unit circle) and grew without bound"
		case s.sigma > 0:
			why = "float64 overflowed: the inputs or the noise scale Sigma = " + strconv.FormatFloat(s.sigma, 'g', -1, 64) + " are too large"
		default:
			why = "float64 overflowed: the inputs are too large"
		}
	}
	return &SimError{Op: "tf.System.Step", Part: "output " + s.output, Step: s.t, Value: y, Problem: why, sample: sample}
}

// Reset returns the system to its state after NewSystem: every plant at
// rest, the innovation source reseeded and the burn-in run again, the
// step count and Err cleared, so that the same inputs give the same
// outputs.
func (s *System) Reset() {
	for i, p := range s.path {
		p.Reset()
		if d := s.diff[i]; d != nil {
			d.Reset()
		}
	}
	if s.integ != nil {
		s.integ.Reset()
	}
	s.t, s.err = 0, nil
	s.src = rand.NewPCG(s.seed1, s.seed2)
	s.rng = rand.New(s.src)
	if s.noise != nil {
		s.noise.Reset()
		if s.sigma > 0 {
			for range s.burn {
				s.noise.Step(s.sigma * s.rng.NormFloat64())
			}
		}
	}
}

// SetSteady puts every input path at the steady state of the constant
// input samples u (one per input, in the order of Inputs): the
// differencing plant at rest on u_i, the rational term at rest on the
// differenced value D_i(1) u_i (which is 0 for differencing with a unit
// root). The noise and the output integration are left as they are.
// It returns a *ModelError whose Err is a *GainError when a path with a
// pole at z = 1 would need a non-zero steady input, a *SampleError for a
// non-finite sample, and a *SeriesError (ErrLength, Series "u") when
// len(u) differs from the number of inputs; the system is then left as
// it was (every path is set on a copy first).
func (s *System) SetSteady(u []float64) error {
	_, err := s.setSteady("tf.System.SetSteady", u)
	return err
}

// setSteady is SetSteady, also returning the index of the input at fault
// for a *ModelError.
func (s *System) setSteady(op string, u []float64) (int, error) {
	if len(u) != len(s.path) {
		return -1, &SeriesError{Op: op, Series: "u", Kind: ErrLength, Have: len(u), Need: len(s.path), Detail: "one steady sample per input, in the order of Inputs"}
	}
	level := make([]float64, len(u))
	for i, x := range u {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return i, &SampleError{Op: op, Series: s.names[i], Index: 0, Value: x}
		}
		level[i] = x
		if d := s.diff[i]; d != nil {
			g, _ := d.Rational().gain() // a differencing plant has denominator 1
			level[i] = g * x
		}
		if level[i] != 0 {
			if _, err := s.path[i].Rational().gain(); err != nil {
				return i, &ModelError{Op: op, Part: "input " + s.names[i], Problem: "has a pole at z = 1 (an integrator), so no steady state for a non-zero input", Err: err}
			}
		}
	}
	// Set copies and keep them only when every path succeeds, so that an
	// error leaves s unchanged.
	diff := make([]*Plant, len(u))
	path := make([]*Plant, len(u))
	for i, x := range u {
		if d := s.diff[i]; d != nil {
			diff[i] = d.Clone()
			if err := diff[i].SetSteady(x); err != nil {
				return i, withOp(op, err)
			}
		}
		path[i] = s.path[i].Clone()
		if level[i] == 0 {
			path[i].Reset()
		} else if err := path[i].SetSteady(level[i]); err != nil {
			return i, withOp(op, err)
		}
	}
	for i := range u {
		if diff[i] != nil {
			s.diff[i] = diff[i]
		}
		s.path[i] = path[i]
	}
	return -1, nil
}

// Clone returns an independent copy of s in its current state, including
// the state of its innovation source, so that both give the same future
// outputs for the same inputs.
func (s *System) Clone() *System {
	c := *s
	c.names = append([]string(nil), s.names...)
	c.diff = make([]*Plant, len(s.diff))
	c.path = make([]*Plant, len(s.path))
	for i := range s.path {
		c.path[i] = s.path[i].Clone()
		if s.diff[i] != nil {
			c.diff[i] = s.diff[i].Clone()
		}
	}
	if s.noise != nil {
		c.noise = s.noise.Clone()
	}
	if s.integ != nil {
		c.integ = s.integ.Clone()
	}
	src := *s.src
	c.src = &src
	c.rng = rand.New(c.src)
	return &c
}
