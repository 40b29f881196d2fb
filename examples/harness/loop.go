package main

import (
	"fmt"
	"math/rand/v2"

	"github.com/backshift/backshift/tf"
)

// Process is the simulated greenhouse: air temperature (degC) from valve
// opening (%) and outdoor temperature (degC), with ARMA noise drawn from
// a seeded generator.
type Process struct {
	c       float64
	valve   *tf.Plant
	outdoor *tf.Plant
	noise   *tf.Plant
	sigma   float64
	rng     *rand.Rand
}

// Step applies the valve opening and outdoor temperature of the current
// minute and returns the air temperature of that minute.
func (p *Process) Step(valve, outdoor float64) float64 {
	return p.c + p.valve.Step(valve) + p.outdoor.Step(outdoor) + p.noise.Step(p.sigma*p.rng.NormFloat64())
}

// Scenario is one closed-loop test.
type Scenario struct {
	Name    string
	Minutes int
	// Setpoint and Outdoor give the setpoint (degC) and the outdoor
	// temperature (degC) at minute k.
	Setpoint func(k int) float64
	Outdoor  func(k int) float64
	// Seed seeds the process noise.
	Seed uint64
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
	p, err := newProcess(sc.Outdoor(0), u0, sc.Seed)
	if err != nil {
		return Trace{}, err
	}
	tr := Trace{
		Setpoint: make([]float64, sc.Minutes),
		Temp:     make([]float64, sc.Minutes),
		Valve:    make([]float64, sc.Minutes),
		Outdoor:  make([]float64, sc.Minutes),
	}
	y := steadyTemp(u0, sc.Outdoor(0))
	for k := range sc.Minutes {
		sp := sc.Setpoint(k)
		u := min(max(c.Update(sp, y), 0), 100)
		out := sc.Outdoor(k)
		y = p.Step(u, out)
		tr.Setpoint[k], tr.Temp[k], tr.Valve[k], tr.Outdoor[k] = sp, y, u, out
	}
	return tr, nil
}

func steadyTemp(u, out float64) float64 { return plantConst + plantValveGain*u + plantOutdoorGain*out }

// The greenhouse model as identified from the demo data would be used
// here; the true one keeps the template self-contained.
const (
	plantConst       = 6.0
	plantValveGain   = 0.2
	plantOutdoorGain = 0.5
	plantSigma       = 0.03
)

func newProcess(out0, u0 float64, seed uint64) (*Process, error) {
	v, err := tf.NewRational([]float64{0.01}, []float64{1, -0.95}, 3)
	if err != nil {
		return nil, err
	}
	o, err := tf.NewRational([]float64{0.05}, []float64{1, -0.9}, 1)
	if err != nil {
		return nil, err
	}
	n, err := tf.NewRational([]float64{1, 0.3}, []float64{1, -0.8}, 0)
	if err != nil {
		return nil, err
	}
	p := &Process{c: plantConst, valve: tf.NewPlant(v), outdoor: tf.NewPlant(o), noise: tf.NewPlant(n),
		sigma: plantSigma, rng: rand.New(rand.NewPCG(seed, 1))}
	if err := p.valve.SetSteady(u0); err != nil {
		return nil, fmt.Errorf("harness: %w", err)
	}
	if err := p.outdoor.SetSteady(out0); err != nil {
		return nil, fmt.Errorf("harness: %w", err)
	}
	return p, nil
}
