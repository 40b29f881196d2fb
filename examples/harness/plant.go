package main

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/backshift/backshift/examples/internal/suggest"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// PlantSpec is the process under test: the greenhouse air temperature
// (degC) from the valve opening (%) and the outdoor temperature (degC),
// as identified from data (here the demo's true model), sampled once a
// minute. Put your own identified spec here.
const PlantSpec = "temp = 6 + 0.01 / (1 - 0.95 B) B^3 valve + 0.05 / (1 - 0.9 B) B outdoor + (1 + 0.3 B) / (1 - 0.8 B) a; every 1 min"

// NoiseSD is the standard deviation of the innovations a_t of the
// plant's noise term (degC), as estimated with the model.
const NoiseSD = 0.03

// PlantSettleBand is how far (degC) the noisy plant wanders from a
// steady setpoint: about 3 standard deviations of the noise term
// (1 + 0.3 B)/(1 - 0.8 B) a with sd(a) = NoiseSD, whose own standard
// deviation is 2.09 NoiseSD (from the ARMA(1,1) variance formula).
const PlantSettleBand = 0.2

// The names the harness gives the plant's series: the scenarios are
// written for the greenhouse air temperature driven by the heating valve
// and the outdoor temperature.
const (
	outputName  = "temp"    // degC
	valveName   = "valve"   // %
	outdoorName = "outdoor" // degC
)

// The sample intervals the harness accepts, in minutes. The longest is a
// tenth of the integral time of the PI under test (20 min): common
// practice samples a PI loop at least ten times per integral time, and
// the scenarios' step at 60 min then falls at sample 30 or later. The
// shortest, 0.1 s, keeps a 360-minute scenario at 216 000 samples (a few
// MB of trace and well under a second of simulation).
const (
	minInterval = 0.1 / 60
	maxInterval = tuneTi / 10
)

// PlantError is a plant spec that the harness cannot run as the
// greenhouse of its scenarios. Part names the part of the spec ("input
// vlave", "coefficient d1", "output", "sample interval", "valve path",
// ...), Pos is its place in the spec text (zero when the spec has no
// such place, as for a missing clause), Problem says what is wrong and
// the likely fix, and Err is the underlying error, if any.
type PlantError struct {
	Part    string
	Pos     tf.Pos
	Problem string
	Err     error
	inline  bool // Problem already says what Err says
}

// Error describes the problem in one line.
func (e *PlantError) Error() string {
	s := e.Part
	if e.Pos.IsValid() {
		s += fmt.Sprintf(" (at %d:%d)", e.Pos.Line, e.Pos.Column)
	}
	s += ": " + e.Problem
	if e.Err != nil && !e.inline {
		s += ": " + e.Err.Error()
	}
	return s
}

// Unwrap returns the underlying error.
func (e *PlantError) Unwrap() error { return e.Err }

// Process is the simulated plant: a streaming tf.System built from a
// spec with seeded noise, plus the model's numbers the tests need. The
// spec must be a plant the scenarios fit (see NewProcess).
type Process struct {
	sys          *tf.System
	model        tf.Model
	u            []float64 // input samples in the model's order
	valve, out   int       // indices of valve and outdoor in u (-1: absent)
	gainV, gainO float64
	c            float64
	ts           float64 // sample interval (min)
}

// NewProcess parses spec and returns the process at rest, its noise of
// innovation standard deviation sd (degC, 0 for none) drawn from seed
// after a burn-in.
//
// The spec must describe the greenhouse of the scenarios: an output
// named temp that is not differenced (the scenarios start from a steady
// state, which an integrating plant does not have at a fixed valve), a
// sample interval ("every 1 min") from 0.1 s to 2 min, an input named
// valve and optionally one named outdoor and no other (an event term is
// refused here; resolve leaves it out first), every coefficient
// a number or held at a value (a free coefficient has no known value),
// a stable valve path with a positive steady-state gain (the PI is
// direct acting: more valve, more heat), and a stable outdoor path (an
// unstable path, a pole outside the unit circle, has no steady state to
// start from, and a PI test on it is not meaningful). Anything else is a *PlantError
// naming the part and the likely fix; a spec that does not parse gives
// parse's error list.
func NewProcess(spec string, seed uint64, sd float64) (*Process, error) {
	m, err := parse.Model(spec)
	if err != nil {
		return nil, err
	}
	p := &Process{model: m, valve: -1, out: -1, u: make([]float64, len(m.Inputs))}
	if err := p.check(); err != nil {
		return nil, err
	}
	set := &tf.SimSettings{Seed1: seed, Seed2: 1, Sigma: sd}
	if sd > 0 {
		set.BurnIn = 500
	}
	if p.sys, err = tf.NewSystem(m, set); err != nil {
		// The library's error names the part of the model; its text is
		// said in the harness's own words, without the package prefix.
		pe := &PlantError{Part: "model", Problem: "cannot be simulated", Err: err}
		var me *tf.ModelError
		if errors.As(err, &me) {
			pe.Part, pe.Problem, pe.inline = me.Part, me.Problem, true
			// The library's hints name its own settings, which the
			// harness sets itself: they are no help to its user.
			if i := strings.Index(pe.Problem, " (set SimSettings."); i >= 0 {
				pe.Problem = pe.Problem[:i]
			}
			if me.Part == "noise" {
				pe.Part = "noise term"
			}
		}
		return nil, pe
	}
	return p, nil
}

// check validates p.model as a plant of the scenarios and fills in the
// indices, gains, constant and interval.
func (p *Process) check() error {
	m := p.model
	if m.Output != outputName {
		fix := suggest.DidYouMean(m.Output, outputName)
		if fix == "" {
			fix = "rename the output to " + outputName + " if it is that temperature"
		}
		return &PlantError{Part: "output " + m.Output, Problem: fmt.Sprintf(
			"the scenarios are written for the greenhouse air temperature, named %s (degC); %s", outputName, fix)}
	}
	if !m.Diff.IsOne() {
		return &PlantError{Part: "output " + m.Output, Problem: fmt.Sprintf(
			"is differenced (%s %s): the plant integrates, so it has no steady state at a fixed valve, and every scenario starts from one; "+
				"the harness runs self-regulating plants only (write the model without differencing on the output)", tf.FormatPoly(m.Diff), m.Output)}
	}
	if err := p.checkInterval(); err != nil {
		return err
	}
	for i, in := range m.Inputs {
		switch in.Series {
		case valveName:
			p.valve = i
		case outdoorName:
			p.out = i
		default:
			if in.Event != nil {
				return &PlantError{Part: "input " + in.Series, Pos: in.Pos, Problem: fmt.Sprintf(
					"is an event (a known intervention in the record the model was fitted to), not an input the harness drives (%s and %s); leave its term out, as -spec and -config do", valveName, outdoorName)}
			}
			fix := suggest.DidYouMean(in.Series, valveName, outdoorName)
			if fix == "" {
				fix = "rename it to one of those, or remove its term"
			}
			return &PlantError{Part: "input " + in.Series, Pos: in.Pos, Problem: fmt.Sprintf(
				"the harness drives only %s (%%) and %s (degC), and would hold any other input at 0; %s", valveName, outdoorName, fix)}
		}
	}
	if p.valve < 0 {
		return &PlantError{Part: "input " + valveName, Problem: "the plant spec has no input named valve, the heating valve (%) that the controller moves"}
	}
	for _, c := range m.Params() {
		if c.Free {
			return &PlantError{Part: "coefficient " + c.Name, Pos: c.Pos, Problem: fmt.Sprintf(
				"is free (to be estimated), so the plant has no known value for it; write its number, or hold it with \"where %s = <value>\" (the estimate examples/identify prints)", c.Name)}
		}
	}
	p.c = m.ConstValue()
	var err error
	if p.gainV, err = p.pathGain(p.valve); err != nil {
		return err
	}
	if p.out >= 0 {
		if p.gainO, err = p.pathGain(p.out); err != nil {
			return err
		}
	}
	return nil
}

// checkInterval requires a sample interval within the harness's limits
// and sets p.ts.
func (p *Process) checkInterval() error {
	iv := p.model.Interval
	if iv == (tf.Interval{}) {
		return &PlantError{Part: "sample interval", Problem: "the spec has none, and the harness needs it to run the scenarios in minutes; " +
			"end the spec with the interval of the record the model came from, such as \"; every 1 min\" or \"; every 10 s\""}
	}
	sec, ok := iv.Seconds()
	if !ok || !(sec > 0) {
		why := "it has no length in seconds"
		if iv.Calendar() {
			why = "a calendar interval (months, quarters, years) has no fixed length, and the harness runs a PI loop in minutes"
		}
		return &PlantError{Part: "sample interval", Problem: fmt.Sprintf("every %s is not an interval the harness can use: %s; the harness tests loops sampled every 0.1 s to 2 min", iv, why)}
	}
	p.ts = sec / 60
	if p.ts < minInterval*(1-1e-12) || p.ts > maxInterval*(1+1e-12) {
		return &PlantError{Part: "sample interval", Problem: fmt.Sprintf(
			"every %s is outside 0.1 s .. 2 min, the intervals the harness runs (at most a tenth of the PI's integral time of %.0f min, "+
				"and few enough samples for a %g-minute scenario)", iv, tuneTi, scenarioMinutes)}
	}
	return nil
}

// pathGain returns the steady-state gain of input i, its differencing
// included, and checks the valve path's sign.
func (p *Process) pathGain(i int) (float64, error) {
	in := p.model.Inputs[i]
	part := in.Series + " path"
	r, err := in.Rational()
	if err != nil {
		return 0, &PlantError{Part: part, Pos: in.Pos, Problem: "is not a valid transfer function", Err: err}
	}
	g, err := r.Gain()
	if err != nil {
		return 0, &PlantError{Part: part, Pos: in.Pos, Problem: "has no steady-state gain (a pole at z = 1: it integrates), " +
			"and every scenario starts from a steady state; the harness runs self-regulating plants only", Err: err}
	}
	if mp := r.MaxPoleMagnitude(); mp > 1 {
		// Its steady-state gain is a number, but no steady state is ever
		// reached: the scenarios' starting point and a PI test at fixed
		// settings say nothing about such a plant.
		return 0, &PlantError{Part: part, Pos: in.Pos, Problem: fmt.Sprintf(
			"is unstable (a pole outside the unit circle, |z| = %.4g): it has no steady state to start a scenario from, "+
				"so a test of the fixed PI on it is not meaningful; an unstable plant needs a controller designed to stabilise it, checked with control.Analyze", mp)}
	}
	d := 0.0
	for _, v := range in.DiffCoeffs() {
		d += v
	}
	g *= d
	if i == p.valve && !(g > 0) {
		return 0, &PlantError{Part: part, Pos: in.Pos, Problem: fmt.Sprintf(
			"has a steady-state gain of %.4g degC per %%: the PI under test is direct acting (more valve, more heat) and needs a positive gain; "+
				"check the sign of the numerator and any differencing of valve", g)}
	}
	return g, nil
}

// Interval returns the sample interval in minutes.
func (p *Process) Interval() float64 { return p.ts }

// HasOutdoor reports whether the plant has an outdoor input.
func (p *Process) HasOutdoor() bool { return p.out >= 0 }

// inputs fills p.u with the valve and outdoor samples.
func (p *Process) inputs(valve, outdoor float64) []float64 {
	p.u[p.valve] = valve
	if p.out >= 0 {
		p.u[p.out] = outdoor
	}
	return p.u
}

// SetSteady puts the plant at the steady state of constant inputs.
func (p *Process) SetSteady(valve, outdoor float64) error {
	return p.sys.SetSteady(p.inputs(valve, outdoor))
}

// Step applies the valve opening and outdoor temperature of the current
// sample and returns the air temperature of that sample.
func (p *Process) Step(valve, outdoor float64) float64 {
	return p.sys.Step(p.inputs(valve, outdoor))
}

// Steady returns the noise-free steady-state temperature for constant
// inputs.
func (p *Process) Steady(valve, outdoor float64) float64 {
	return p.c + p.gainV*valve + p.gainO*outdoor
}

// ValveFor returns the valve opening that holds temp at sp with the
// outdoor temperature out, by the model's gains (it may lie outside
// 0..100 % when the heating cannot do it).
func (p *Process) ValveFor(sp, out float64) float64 {
	return (sp - p.c - p.gainO*out) / p.gainV
}

// noiseBand returns the half-width (degC) of the band that the plant's
// noise, of innovation SD sd, keeps the temperature in at a steady
// setpoint: three standard deviations of the noise term theta(B)/phi(B)
// a_t (sd times the root of the sum of its squared psi weights, the
// variance of a linear process: Box, Jenkins, Reinsel & Ljung, 2015,
// sec. 3.1), and at least PlantSettleBand. The psi weights are summed
// until the slowest pole's have decayed below 1e-8 (their squares below
// 1e-16 of the first), at most a million.
func (p *Process) noiseBand(sd float64) float64 {
	if sd == 0 || p.model.Noise == nil {
		return PlantSettleBand
	}
	r, err := p.model.NoiseRational()
	if err != nil || !r.Stable() {
		return PlantSettleBand // refused earlier: no burn-in without a stationary noise model
	}
	n := 1000
	if rho := r.MaxPoleMagnitude(); rho > 0 {
		n = max(n, min(int(math.Ceil(math.Log(1e-8)/math.Log(rho))), 1_000_000))
	}
	ss := 0.0
	for _, v := range r.Impulse(n) {
		ss += v * v
	}
	return max(PlantSettleBand, 3*sd*math.Sqrt(ss))
}

// startValve returns the valve opening that holds the scenario's
// starting point, or a *PlantError when that opening lies outside the
// valve's travel (the plant cannot be at the starting point, and the
// run would begin from a state the plant cannot reach).
func (p *Process) startValve(sc Scenario) (float64, error) {
	sp, out := sc.Setpoint(0), sc.Outdoor(0)
	u := p.ValveFor(sp, out)
	if !(u >= 0 && u <= 100) {
		return 0, &PlantError{Part: "valve path", Problem: fmt.Sprintf(
			"scenario %q starts at %g degC with %g degC outside, which by the plant's gains (constant %.4g, valve %.4g degC/%%, outdoor %.4g) "+
				"needs the valve at %.4g %%, outside its 0..100 %% travel; check the constant and the gains of the spec",
			sc.Name, sp, out, p.c, p.gainV, p.gainO, u)}
	}
	return u, nil
}

// minutesText formats a time in minutes with the resolution of the
// sample interval ts (min): whole minutes for ts >= 1 min, tenths below.
func minutesText(t, ts float64) string {
	if ts >= 1 {
		return fmt.Sprintf("%5.0f min", t)
	}
	return fmt.Sprintf("%5.1f min", t)
}

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
