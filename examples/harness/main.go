package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"

	"github.com/backshift/backshift/parse"
)

func main() {
	spec := flag.String("spec", PlantSpec, "plant model spec with inputs valve (%) and optionally outdoor (degC), e.g. the one examples/identify prints")
	noise := flag.Float64("noise", NoiseSD, "standard deviation of the plant's noise innovations (degC)")
	flag.Parse()
	if err := runWith(os.Stdout, *spec, *noise); err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
}

// Tuning under test: gain 8 %/degC, integral time 20 min (about the
// valve path's time constant, from the identified model).
const (
	tuneKc = 8.0
	tuneTi = 20.0
)

// SetpointStep is the morning setpoint change: 16 -> 20 degC at minute
// 60, outdoor steady at 2 degC.
func SetpointStep() Scenario {
	return Scenario{
		Name: "setpoint step 16 -> 20 degC", Minutes: 360, Seed: 1, NoiseSD: NoiseSD,
		Setpoint: func(k int) float64 {
			if k < 60 {
				return 16
			}
			return 20
		},
		Outdoor: func(int) float64 { return 2 },
	}
}

// DisturbanceStep is a cold front: the outdoor temperature falls from 4
// to -4 degC at minute 60 while the setpoint stays at 18 degC.
func DisturbanceStep() Scenario {
	return Scenario{
		Name: "outdoor step 4 -> -4 degC", Minutes: 360, Seed: 2, NoiseSD: NoiseSD,
		Setpoint: func(int) float64 { return 18 },
		Outdoor: func(k int) float64 {
			if k < 60 {
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

// newPI returns the controller under test, starting at valve u0 (%).
func newPI(u0 float64) (*PI, error) { return NewPI(tuneKc, tuneTi, 1, 0, 100, u0) }

// runWithPI runs sc with the PI under test starting at valve u0.
func runWithPI(sc Scenario, u0 float64) (Trace, error) {
	pi, err := newPI(u0)
	if err != nil {
		return Trace{}, err
	}
	return Run(sc, pi, u0)
}

// run runs both scenarios on PlantSpec and prints the summary.
func run(w io.Writer) error { return runWith(w, PlantSpec, NoiseSD) }

// runWith runs both scenarios on the plant spec with noise sd and prints
// the summary.
//
// Problems with the flags are reported before anything runs: a spec
// that does not parse (with its position), a noise standard deviation
// that is negative or not finite, and noise asked of a spec that has no
// noise term.
func runWith(w io.Writer, spec string, sd float64) error {
	if !(sd >= 0) || math.IsInf(sd, 1) {
		return fmt.Errorf("harness: -noise %v: the noise standard deviation must be a finite number >= 0 (degC)", sd)
	}
	p, err := NewProcess(spec, 0, 0)
	if err != nil {
		var pe *parse.Error
		if errors.As(err, &pe) {
			return fmt.Errorf("harness: -spec: %w", err)
		}
		return err
	}
	if sd > 0 && p.model.Noise == nil {
		return fmt.Errorf("harness: -noise %v but the plant spec has no noise term; end it with + a (or an ARMA term), or run with -noise 0", sd)
	}
	fmt.Fprintf(w, "plant: %s\n\n", spec)
	sc := SetpointStep()
	sc.Spec, sc.NoiseSD = spec, sd
	tr, err := runWithPI(sc, p.ValveFor(16, 2))
	if err != nil {
		return err
	}
	m := Measure(tr.Temp, 60, 16, 20, 0.2, 1)
	fmt.Fprintf(w, "%s (PI Kc %.1f %%/degC, Ti %.0f min):\n", sc.Name, tuneKc, tuneTi)
	if diverged(w, tr.Temp, 20) {
		fmt.Fprint(w, "\n"+caution)
		return fmt.Errorf("%s: the closed loop diverged", sc.Name)
	}
	fmt.Fprintf(w, "  settling to +-0.2 degC  %s\n", minutes(m.Settling))
	fmt.Fprintf(w, "  overshoot               %5.1f %%\n", 100*m.Overshoot)
	fmt.Fprintf(w, "  steady-state error      %+5.2f degC\n", noNegZero(m.SteadyError, 2))
	fmt.Fprintf(w, "  valve at its limit      %5d min\n", atLimit(tr.Valve))

	sc = DisturbanceStep()
	sc.Spec, sc.NoiseSD = spec, sd
	tr, err = runWithPI(sc, p.ValveFor(18, 4))
	if err != nil {
		return err
	}
	m = Measure(tr.Temp, 60, 18, 18, 0.2, 1)
	fmt.Fprintf(w, "%s:\n", sc.Name)
	if diverged(w, tr.Temp, 18) {
		fmt.Fprint(w, "\n"+caution)
		return fmt.Errorf("%s: the closed loop diverged", sc.Name)
	}
	fmt.Fprintf(w, "  peak deviation          %5.2f degC\n", m.PeakDeviation)
	fmt.Fprintf(w, "  back within +-0.2 degC  %s\n", minutes(m.Settling))
	fmt.Fprintf(w, "  steady-state error      %+5.2f degC\n", noNegZero(m.SteadyError, 2))
	fmt.Fprint(w, "\n"+caution)
	return nil
}

// caution closes the summary: passing these tests is not commissioning.
const caution = `These tests check the controller against a model, which is an approximation
valid near the operating conditions of the data it came from. Commission the
controller on site under the site's safety procedures, with independent safety
interlocks; defer to local codes and licensed practice.
`

// diverged reports, and says on w, when the temperature left any
// plausible range (1000 degC from the setpoint sp, or not finite): the
// loop is unstable with this controller or this plant, and settling
// figures would be meaningless.
func diverged(w io.Writer, temp []float64, sp float64) bool {
	for k, v := range temp {
		if !(math.Abs(v-sp) <= 1000) {
			fmt.Fprintf(w, "  the closed loop diverged: the temperature is %.3g degC at minute %d\n"+
				"  (an unstable plant, or a controller that destabilises it); no response figures\n", v, k)
			return true
		}
	}
	return false
}

// minutes formats a settling time, or says that the response did not
// settle within the run.
func minutes(v float64) string {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return "  not within the run"
	}
	return fmt.Sprintf("%5.0f min", v)
}

// noNegZero returns v, or +0 when v rounds to zero at the given decimals
// (so that a summary never shows -0.00).
func noNegZero(v float64, decimals int) float64 {
	if math.Abs(v) < 0.5*math.Pow(10, -float64(decimals)) {
		return 0
	}
	return v
}

func atLimit(u []float64) int {
	n := 0
	for _, v := range u {
		if v <= 0 || v >= 100 {
			n++
		}
	}
	return n
}
