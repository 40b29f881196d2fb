package main

import (
	"fmt"
	"io"
	"math"
)

// The hand tuning that the scenarios test on a plant given with -spec or
// -config: gain 8 %/degC, integral time 20 min (about the valve path's
// time constant, from the identified model).
const (
	tuneKc = 8.0
	tuneTi = 20.0 // min
)

// PITuning is the settings of a PI under test: Kc in % valve per degC,
// Ti in minutes, and the name of where they came from ("hand tuning",
// "SIMC", ...).
type PITuning struct {
	Name   string
	Kc, Ti float64
}

// settings formats the settings with their units, such as "Kc 8.0
// %/degC, Ti 20 min": Kc to a tenth (three digits below 1), Ti to three
// digits.
func (t PITuning) settings() string {
	kc := fmt.Sprintf("%.1f", t.Kc)
	if math.Abs(t.Kc) < 1 {
		kc = fmt.Sprintf("%.3g", t.Kc)
	}
	return fmt.Sprintf("Kc %s %%/degC, Ti %.3g min", kc, t.Ti)
}

// handTuning is the PI the scenarios test on a given plant.
var handTuning = PITuning{Name: "hand tuning", Kc: tuneKc, Ti: tuneTi}

// The scenarios' times (min): each run lasts six hours with its step at
// the end of the first.
const (
	scenarioMinutes = 360.0
	stepMinute      = 60.0
)

// SetpointStep is the morning setpoint change: 16 -> 20 degC at minute
// 60, outdoor steady at 2 degC.
func SetpointStep() Scenario {
	return Scenario{
		Name: "setpoint step 16 -> 20 degC", Minutes: scenarioMinutes, StepAt: stepMinute, Seed: 1, NoiseSD: NoiseSD,
		Setpoint: func(t float64) float64 {
			if t < stepMinute {
				return 16
			}
			return 20
		},
		Outdoor: func(float64) float64 { return 2 },
	}
}

// DisturbanceStep is a cold front: the outdoor temperature falls from 4
// to -4 degC at minute 60 while the setpoint stays at 18 degC.
func DisturbanceStep() Scenario {
	return Scenario{
		Name: "outdoor step 4 -> -4 degC", Minutes: scenarioMinutes, StepAt: stepMinute, Seed: 2, NoiseSD: NoiseSD,
		Setpoint: func(float64) float64 { return 18 },
		Outdoor: func(t float64) float64 {
			if t < stepMinute {
				return 4
			}
			return -4
		},
	}
}

// steadyValve is the valve opening that holds temp at sp with outdoor
// temperature out, by PlantSpec's gains.
func steadyValve(sp, out float64) float64 {
	p, err := NewProcess(PlantSpec, 0, 0)
	if err != nil {
		panic(err) // PlantSpec is a constant: a programmer error
	}
	return p.ValveFor(sp, out)
}

// newPI returns the hand-tuned controller, starting at valve u0 (%), run
// every ts minutes.
func newPI(u0, ts float64) (*PI, error) { return handTuning.New(u0, ts) }

// New returns the PI with these settings, starting at valve u0 (%), run
// every ts minutes, its output limited to the valve's 0..100 %.
func (t PITuning) New(u0, ts float64) (*PI, error) { return NewPI(t.Kc, t.Ti, ts, 0, 100, u0) }

// runWithPI runs sc with the hand-tuned PI starting at valve u0, acting
// once a sample of the scenario's plant.
func runWithPI(sc Scenario, u0 float64) (Trace, error) { return runTuned(sc, handTuning, u0) }

// runTuned runs sc with the PI of tuning tu starting at valve u0, acting
// once a sample of the scenario's plant.
func runTuned(sc Scenario, tu PITuning, u0 float64) (Trace, error) {
	p, err := NewProcess(sc.spec(), 0, 0)
	if err != nil {
		return Trace{}, err
	}
	pi, err := tu.New(u0, p.Interval())
	if err != nil {
		return Trace{}, err
	}
	return Run(sc, pi, u0)
}

// run runs both scenarios on PlantSpec and prints the summary.

// setpointScenario runs the setpoint step from valve u0, without noise
// and with noise of innovation SD sd (when above 0), and writes its
// figures: settling, overshoot, steady state and time at the valve's
// limits.
func setpointScenario(w io.Writer, pl *plant, u0, sd float64) error {
	ts := pl.proc.Interval()
	band := pl.proc.noiseBand(sd)
	sc := SetpointStep()
	fmt.Fprintf(w, "%s (PI %s)\n", sc.Name, pl.pi.settings())
	clean, noisy, k0, m, err := pl.measure(w, sc, u0, sd, 16, 20)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "    settling to +-%.1f degC  %s\n", PlantSettleBand, timeText(m.Settling, ts))
	fmt.Fprintf(w, "    overshoot               %5.1f %%\n", 100*m.Overshoot)
	steadyLine(w, m, PlantSettleBand)
	fmt.Fprintf(w, "    valve at its limit      %s\n", minutesText(float64(atLimit(clean.Valve))*ts, ts))
	unsuitable(w, pl.pi, m)
	if noisy != nil {
		fmt.Fprintf(w, "  with the plant's noise (innovations SD %g degC, seed %d), band +-%.2g degC:\n", sd, sc.Seed, band)
		if band >= 20-16 {
			fmt.Fprintf(w, "    (the band is as wide as the 4 degC step: these figures say little)\n")
		}
		first := firstWithin(noisy.Temp[k0:], 20, band)
		fmt.Fprintf(w, "    first within the band   %s\n", timeText(entryTime(first, ts), ts))
		if first >= 0 {
			fmt.Fprintf(w, "    outside it afterwards   %5.1f %% of the time\n", 100*fractionOutside(noisy.Temp[k0+first:], 20, band))
		}
		fmt.Fprintf(w, "    valve at its limit      %s\n", minutesText(float64(atLimit(noisy.Valve))*ts, ts))
	}
	warnOutside(w, pl, clean, noisy)
	return nil
}

// disturbanceScenario runs the outdoor disturbance step from valve u0,
// without noise and with noise of innovation SD sd (when above 0), and
// writes its figures: peak deviation, time back within the band and
// steady state.
func disturbanceScenario(w io.Writer, pl *plant, u0, sd float64) error {
	ts := pl.proc.Interval()
	band := pl.proc.noiseBand(sd)
	sc := DisturbanceStep()
	fmt.Fprintf(w, "%s\n", sc.Name)
	clean, noisy, k0, m, err := pl.measure(w, sc, u0, sd, 18, 18)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "    peak deviation          %5.2f degC\n", m.PeakDeviation)
	back := timeText(m.Settling, ts)
	if m.Settling == 0 {
		back += " (never left the band)"
	}
	fmt.Fprintf(w, "    back within +-%.1f degC  %s\n", PlantSettleBand, back)
	steadyLine(w, m, PlantSettleBand)
	unsuitable(w, pl.pi, m)
	if noisy != nil {
		mn := Measure(noisy.Temp, k0, 18, 18, band, ts)
		fmt.Fprintf(w, "  with the plant's noise (innovations SD %g degC, seed %d), band +-%.2g degC:\n", sd, sc.Seed, band)
		fmt.Fprintf(w, "    peak deviation          %5.2f degC\n", mn.PeakDeviation)
		fmt.Fprintf(w, "    outside the band        %5.1f %% of the time after the step\n", 100*fractionOutside(noisy.Temp[k0:], 18, band))
	}
	warnOutside(w, pl, clean, noisy)
	return nil
}

// measure runs sc from valve u0 as runBoth does, measures the
// noise-free run from the step (the output going from before to after
// degC, within PlantSettleBand) and heads its figures. It returns both
// runs, the sample of the step and the figures.
func (pl *plant) measure(w io.Writer, sc Scenario, u0, sd, before, after float64) (clean Trace, noisy *Trace, k0 int, m StepMetrics, err error) {
	if clean, noisy, err = pl.runBoth(w, sc, u0, sd); err != nil {
		return clean, nil, 0, m, err
	}
	k0 = clean.Index(sc.StepAt)
	m = Measure(clean.Temp, k0, before, after, PlantSettleBand, pl.proc.Interval())
	fmt.Fprintf(w, "  without noise:\n")
	return clean, noisy, k0, m, nil
}

// runBoth runs sc with the PI under test from valve u0, without noise
// and, when sd > 0, with noise of innovation SD sd (noisy is then not
// nil). A run that diverges is said on w, followed by the caution, and
// returned as an error.
func (pl *plant) runBoth(w io.Writer, sc Scenario, u0, sd float64) (clean Trace, noisy *Trace, err error) {
	sc.Spec, sc.NoiseSD = pl.spec, 0
	if clean, err = runTuned(sc, pl.pi, u0); err != nil {
		return Trace{}, nil, err
	}
	final := sc.Setpoint(sc.Minutes)
	if diverged(w, clean, final, "an unstable plant, or a controller that destabilises it") {
		fmt.Fprint(w, "\n"+caution)
		return Trace{}, nil, fmt.Errorf("harness: %s: the closed loop diverged", sc.Name)
	}
	if sd == 0 {
		return clean, nil, nil
	}
	sc.NoiseSD = sd
	tr, err := runTuned(sc, pl.pi, u0)
	if err != nil {
		return Trace{}, nil, err
	}
	if diverged(w, tr, final, "the noise-free run did not: the noise asked with -noise is more than this loop can take") {
		fmt.Fprint(w, "\n"+caution)
		return Trace{}, nil, fmt.Errorf("harness: %s: the closed loop diverged with noise", sc.Name)
	}
	return clean, &tr, nil
}

// steadyLine prints the steady-state error of m, or, for a loop that
// does not settle (m.Unsettled), that it has none and why: the rule is
// a swing over the last quarter of the run wider than the band.
func steadyLine(w io.Writer, m StepMetrics, band float64) {
	if !m.Unsettled {
		fmt.Fprintf(w, "    steady-state error      %+5.2f degC\n", noNegZero(m.SteadyError, 2))
		return
	}
	fmt.Fprintf(w, "    steady-state error      none: the loop does not settle (over the last quarter of the run\n"+
		"                            the temperature still swings over %.2f degC, wider than the +-%.1f degC band)\n", m.Swing, band)
}

// unsuitable says on w that the tuning under test does not suit the
// plant when the loop does not settle.
func unsuitable(w io.Writer, tu PITuning, m StepMetrics) {
	if !m.Unsettled {
		return
	}
	fmt.Fprintf(w, "  WARNING: the tuning (%s) is unsuitable for this plant: the loop oscillates\n"+
		"  and does not settle, so these figures describe an oscillation, not a response; retune (a lower Kc\n"+
		"  or a longer Ti) before trying it on the plant\n", tu.settings())
}

// firstWithin returns the first index at which y is within band of
// target, or -1 when it never is.
func firstWithin(y []float64, target, band float64) int {
	for k, v := range y {
		if math.Abs(v-target) <= band {
			return k
		}
	}
	return -1
}

// entryTime returns the time of sample k (min) for an interval of ts
// min, or +Inf when k < 0 (the band was never reached: printed "not
// reached").
func entryTime(k int, ts float64) float64 {
	if k < 0 {
		return math.Inf(1)
	}
	return float64(k) * ts
}

// fractionOutside returns the fraction of y outside band of target (0
// for an empty y).
func fractionOutside(y []float64, target, band float64) float64 {
	if len(y) == 0 {
		return 0
	}
	n := 0
	for _, v := range y {
		if !(math.Abs(v-target) <= band) {
			n++
		}
	}
	return float64(n) / float64(len(y))
}

// caution closes the summary: passing these tests is not commissioning.
const caution = `These tests check the controller and its tuning against a model, which is an
approximation valid near the operating conditions of the data it came from.
Commission the tuning on the plant itself under the site's safety procedures,
with independent safety interlocks; defer to local codes and licensed practice.
`

// diverged reports, and says on w, when the temperature left any
// plausible range (1000 degC from the setpoint sp, or not finite): the
// loop is unstable with this controller or this plant (the likely cause
// is given by why), and response figures would be meaningless.
func diverged(w io.Writer, tr Trace, sp float64, why string) bool {
	for k, v := range tr.Temp {
		if !(math.Abs(v-sp) <= 1000) {
			fmt.Fprintf(w, "  the closed loop diverged: the temperature is %.3g degC at minute %s\n"+
				"  (%s); no response figures\n", v, trimmed(tr.Time[k]), why)
			return true
		}
	}
	return false
}

// trimmed formats a time in minutes with at most one decimal.
func trimmed(t float64) string { return fmt.Sprintf("%.4g", math.Round(10*t)/10) }

// timeText formats a settling time (min) at the resolution of the
// sample interval ts, or says that it was not reached.
func timeText(v, ts float64) string {
	switch {
	case math.IsInf(v, 1):
		return "  not reached within the run"
	case math.IsNaN(v):
		return "  not reached: no sample after the step"
	}
	return minutesText(v, ts)
}

// noNegZero returns v, or +0 when v rounds to zero at the given decimals
// (so that a summary never shows -0.00).
func noNegZero(v float64, decimals int) float64 {
	if math.Abs(v) < 0.5*math.Pow(10, -float64(decimals)) {
		return 0
	}
	return v
}

// atLimit counts the samples with the valve at a limit of its travel.
func atLimit(u []float64) int {
	n := 0
	for _, v := range u {
		if v <= 0 || v >= 100 {
			n++
		}
	}
	return n
}
