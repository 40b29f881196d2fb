package main

import (
	"fmt"
	"math"
)

// maxRunSamples bounds the length of a run (five traces of 8-byte
// samples: 400 MB at the bound), so that a mistyped length fails at once
// instead of exhausting memory.
const maxRunSamples = 10_000_000

// Scenario is one closed-loop test. Its times are in minutes; Run turns
// them into samples with the plant's sample interval (the spec's
// "every"), so that a plant sampled every 10 s runs the same hours as
// one sampled every minute, in six times as many samples.
type Scenario struct {
	Name string
	// Minutes is the length of the run (min).
	Minutes float64
	// StepAt is the time (min) of the scenario's step; the response is
	// measured from the first sample at or after it (Trace.Index).
	StepAt float64
	// Setpoint and Outdoor give the setpoint (degC) and the outdoor
	// temperature (degC) at time t (min from the start of the run).
	Setpoint func(t float64) float64
	Outdoor  func(t float64) float64
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

// Controller is what the harness tests: anything that, once a sample,
// turns the setpoint and the latest measurement (degC) into a valve
// opening (%).
type Controller interface {
	Update(setpoint, measurement float64) float64
}

// Trace is the record of a closed-loop run, one value a sample.
type Trace struct {
	// Interval is the sample interval (min).
	Interval float64
	// Time is the time of each sample (min from the start of the run).
	Time                           []float64
	Setpoint, Temp, Valve, Outdoor []float64
}

// Index returns the first sample at or after time t (min), or len(Time)
// when the run ends before t.
func (tr Trace) Index(t float64) int {
	for k, v := range tr.Time {
		if v >= t {
			return k
		}
	}
	return len(tr.Time)
}

// sampleTime returns the time (min) of sample k for a sample interval of
// sec seconds. It multiplies in seconds and divides by 60 last, so that
// a time that is a whole number of minutes is exact (k*10 s = 3600 s
// gives 60 min exactly, where k*(10/60) min gives 59.99999999999999)
// and the scenario's step falls on the sample Trace.Index finds.
func sampleTime(k int, sec float64) float64 { return float64(k) * sec / 60 }

// Run closes the loop for sc.Minutes minutes: at each sample the
// controller sets the valve from the setpoint and the previous sample's
// measurement, then the process advances one sample of the spec's
// interval. The process starts at steady state with the valve at u0 and
// the outdoor temperature of time 0; the controller should start at u0
// too. The valve is clamped to 0..100 % whatever the controller asks
// (the actuator's travel). Errors are NewProcess's, SetSteady's for a
// starting point the plant has no steady state for, and an error for a
// length that is not positive or above maxRunSamples samples.
func Run(sc Scenario, c Controller, u0 float64) (Trace, error) {
	p, err := NewProcess(sc.spec(), sc.Seed, sc.NoiseSD)
	if err != nil {
		return Trace{}, err
	}
	if err := p.SetSteady(u0, sc.Outdoor(0)); err != nil {
		return Trace{}, err
	}
	if !(sc.Minutes > 0) || sc.Minutes/p.ts > maxRunSamples {
		return Trace{}, fmt.Errorf("harness: scenario %q: Minutes = %v, want a length above 0 of at most %d samples (%.4g min at this plant's interval)",
			sc.Name, sc.Minutes, maxRunSamples, maxRunSamples*p.ts)
	}
	sec := p.ts * 60
	n := 0
	for sampleTime(n, sec) < sc.Minutes {
		n++
	}
	tr := Trace{
		Interval: p.ts,
		Time:     make([]float64, n),
		Setpoint: make([]float64, n),
		Temp:     make([]float64, n),
		Valve:    make([]float64, n),
		Outdoor:  make([]float64, n),
	}
	y := p.Steady(u0, sc.Outdoor(0))
	for k := range n {
		t := sampleTime(k, sec)
		sp := sc.Setpoint(t)
		u := min(max(c.Update(sp, y), 0), 100)
		out := sc.Outdoor(t)
		y = p.Step(u, out)
		tr.Time[k], tr.Setpoint[k], tr.Temp[k], tr.Valve[k], tr.Outdoor[k] = t, sp, y, u, out
	}
	return tr, nil
}

// span returns the smallest and largest of x (NaN, NaN for none).
func span(x []float64) (lo, hi float64) {
	if len(x) == 0 {
		return math.NaN(), math.NaN()
	}
	lo, hi = x[0], x[0]
	for _, v := range x[1:] {
		lo, hi = min(lo, v), max(hi, v)
	}
	return lo, hi
}
