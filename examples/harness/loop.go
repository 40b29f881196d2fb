package main

import (
	"fmt"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// PlantSpec is the process under test: the greenhouse air temperature
// (degC) from the valve opening (%) and the outdoor temperature (degC),
// as identified from data (here the demo's true model). Put your own
// identified spec here.
const PlantSpec = "temp = 6 + 0.01 / (1 - 0.95 B) B^3 valve + 0.05 / (1 - 0.9 B) B outdoor + (1 + 0.3 B) / (1 - 0.8 B) a; every 1 min"

// NoiseSD is the standard deviation of the innovations a_t of the
// plant's noise term (degC), as estimated with the model.
const NoiseSD = 0.03

// PlantSettleBand is how far (degC) the noisy plant wanders from a
// steady setpoint: about 3 standard deviations of the noise term
// (1 + 0.3 B)/(1 - 0.8 B) a with sd(a) = NoiseSD, whose own standard
// deviation is 2.09 NoiseSD (from the ARMA(1,1) variance formula).
const PlantSettleBand = 0.2

// Process is the simulated plant: a streaming tf.System built from a
// spec with seeded noise, plus the model's numbers the tests need. The
// spec must have an input named valve (%); an input named outdoor (degC)
// is fed the scenario's outdoor temperature, and any other input is held
// at 0.
type Process struct {
	sys          *tf.System
	model        tf.Model
	u            []float64 // input samples in the model's order
	valve, out   int       // indices of valve and outdoor in u (-1: absent)
	gainV, gainO float64
	c            float64
}

// NewProcess parses spec and returns the process at rest, its noise of
// innovation standard deviation sd (degC, 0 for none) drawn from seed
// after a burn-in. It returns an error when the spec does not parse, has
// no valve input, or has a path without a steady-state gain.
func NewProcess(spec string, seed uint64, sd float64) (*Process, error) {
	m, err := parse.Model(spec)
	if err != nil {
		return nil, err
	}
	p := &Process{model: m, valve: -1, out: -1, u: make([]float64, len(m.Inputs))}
	if m.Const != nil {
		p.c = m.Const.Value
	}
	for i, in := range m.Inputs {
		r, err := in.Rational()
		if err != nil {
			return nil, err
		}
		g, err := r.Gain()
		if err != nil {
			return nil, fmt.Errorf("harness: input %s: %w", in.Series, err)
		}
		switch in.Series {
		case "valve":
			p.valve, p.gainV = i, g
		case "outdoor":
			p.out, p.gainO = i, g
		}
	}
	if p.valve < 0 {
		return nil, fmt.Errorf("harness: the plant spec has no input named valve: %s", spec)
	}
	set := &tf.SimSettings{Seed1: seed, Seed2: 1, Sigma: sd}
	if sd > 0 {
		set.BurnIn = 500
	}
	if p.sys, err = tf.NewSystem(m, set); err != nil {
		return nil, err
	}
	return p, nil
}

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
// minute and returns the air temperature of that minute.
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

// Scenario is one closed-loop test.
type Scenario struct {
	Name    string
	Minutes int
	// Setpoint and Outdoor give the setpoint (degC) and the outdoor
	// temperature (degC) at minute k.
	Setpoint func(k int) float64
	Outdoor  func(k int) float64
	// Seed seeds the process noise and NoiseSD is the standard deviation
	// of its innovations (degC); zero NoiseSD gives a noise-free run.
	Seed    uint64
	NoiseSD float64
	// Spec is the plant model; empty means PlantSpec.
	Spec string
}

func (sc Scenario) spec() string {
	if sc.Spec == "" {
		return PlantSpec
	}
	return sc.Spec
}

// Controller is what the harness tests: anything that, once a minute,
// turns the setpoint and the latest measurement (degC) into a valve
// opening (%).
type Controller interface {
	Update(setpoint, measurement float64) float64
}

// Trace is the record of a closed-loop run, one value a minute.
type Trace struct {
	Setpoint, Temp, Valve, Outdoor []float64
}

// Run closes the loop for sc.Minutes minutes: at each minute the
// controller sets the valve from the setpoint and the previous minute's
// measurement, then the process advances one minute. The process starts
// at steady state with the valve at u0 and the outdoor temperature of
// minute 0; the controller should start at u0 too. The valve is clamped
// to 0..100 % whatever the controller asks (the actuator's travel).
func Run(sc Scenario, c Controller, u0 float64) (Trace, error) {
	p, err := NewProcess(sc.spec(), sc.Seed, sc.NoiseSD)
	if err != nil {
		return Trace{}, err
	}
	if err := p.SetSteady(u0, sc.Outdoor(0)); err != nil {
		return Trace{}, err
	}
	tr := Trace{
		Setpoint: make([]float64, sc.Minutes),
		Temp:     make([]float64, sc.Minutes),
		Valve:    make([]float64, sc.Minutes),
		Outdoor:  make([]float64, sc.Minutes),
	}
	y := p.Steady(u0, sc.Outdoor(0))
	for k := range sc.Minutes {
		sp := sc.Setpoint(k)
		u := min(max(c.Update(sp, y), 0), 100)
		out := sc.Outdoor(k)
		y = p.Step(u, out)
		tr.Setpoint[k], tr.Temp[k], tr.Valve[k], tr.Outdoor[k] = sp, y, u, out
	}
	return tr, nil
}
