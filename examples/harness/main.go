package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"

	"github.com/backshift/backshift/examples/internal/cmdline"
	"github.com/backshift/backshift/examples/internal/modelinfo"
)

func main() { os.Exit(cli(os.Args[1:], os.Stdout, os.Stderr)) }

// usage opens the -h text, before the flag list.
const usage = `harness tests a PI controller in closed loop against a simulated plant: a
transfer-function model with seeded noise, the greenhouse of the demo unless
another model is given. It runs a setpoint step and an outdoor-temperature step
and prints settling time, overshoot, steady-state error and peak deviation,
with times in minutes from the spec's sample interval.

Examples:
  go run ./examples/harness
  go run ./examples/harness -noise 0.02 -spec 'temp = 6 + 0.01 / (1 - 0.95 B) B^3 valve + (1 + 0.3 B) / (1 - 0.8 B) a; every 10 s'
  go run ./examples/harness -config fitted.json -model 'temp (identified)'

Flags:
`

// options are the command line's settings.
type options struct {
	spec      string
	specSet   bool // -spec was given
	noise     float64
	noiseSet  bool // -noise was given (else noise is the default NoiseSD)
	config    string
	model     string
	useFailed bool
}

// cli runs the program with the arguments args (without the program
// name) and returns the exit status: 0 done, 1 a problem with the plant
// or the run, 2 a command line that cannot be read.
func cli(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("harness", flag.ContinueOnError)
	fs.SetOutput(stderr)
	var o options
	fs.StringVar(&o.spec, "spec", PlantSpec, "plant model spec: output temp (degC), input valve (%) and optionally outdoor (degC), every coefficient a number, and its sample interval (every ...), e.g. the one examples/identify prints")
	fs.Float64Var(&o.noise, "noise", NoiseSD, "standard deviation of the plant's noise innovations (degC); 0 for a noise-free run")
	fs.StringVar(&o.config, "config", "", "read the plant from this JSON config file (as examples/identify -save writes it) instead of -spec")
	fs.StringVar(&o.model, "model", "", "the name of the model to use in the -config file (needed when it holds more than one)")
	fs.BoolVar(&o.useFailed, "use-failed-model", false, "run on a -config model whose checks failed when it was saved (its results then prove nothing about the real plant)")
	if status, stop := cmdline.Parse(fs, usage, args); stop {
		return status
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "harness: unexpected argument %q: the harness takes flags only; give a plant with -spec '...' or -config FILE (see -h)\n", fs.Arg(0))
		return 2
	}
	fs.Visit(func(f *flag.Flag) {
		o.specSet = o.specSet || f.Name == "spec"
		o.noiseSet = o.noiseSet || f.Name == "noise"
	})
	if err := runWith(stdout, o); err != nil {
		fmt.Fprintln(stderr, err)
		return 1
	}
	return 0
}

// FlagError is a problem with what the command line asked: Flag names
// the flag (without its dash), Value is its value as given (empty when
// too long to repeat, as for a spec), Msg says what is wrong and the
// likely fix, and Err is the underlying error, if any (a parse error
// list for a spec that does not parse, a *PlantError for a plant the
// scenarios cannot run, ...).
type FlagError struct {
	Flag  string
	Value string
	Msg   string
	Err   error
}

// Error describes the problem, starting with the flag.
func (e *FlagError) Error() string {
	s := "harness: -" + e.Flag
	if e.Value != "" {
		s += " " + e.Value
	}
	if e.Msg != "" {
		s += ": " + e.Msg
	}
	if e.Err != nil {
		s += ": " + e.Err.Error()
	}
	return s
}

// Unwrap returns the underlying error.
func (e *FlagError) Unwrap() error { return e.Err }

// Tuning under test: gain 8 %/degC, integral time 20 min (about the
// valve path's time constant, from the identified model).
const (
	tuneKc = 8.0
	tuneTi = 20.0 // min
)

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

// newPI returns the controller under test, starting at valve u0 (%), run
// every ts minutes.
func newPI(u0, ts float64) (*PI, error) { return NewPI(tuneKc, tuneTi, ts, 0, 100, u0) }

// runWithPI runs sc with the PI under test starting at valve u0, acting
// once a sample of the scenario's plant.
func runWithPI(sc Scenario, u0 float64) (Trace, error) {
	p, err := NewProcess(sc.spec(), 0, 0)
	if err != nil {
		return Trace{}, err
	}
	pi, err := newPI(u0, p.Interval())
	if err != nil {
		return Trace{}, err
	}
	return Run(sc, pi, u0)
}

// run runs both scenarios on PlantSpec and prints the summary.
func run(w io.Writer) error { return runWith(w, options{spec: PlantSpec, noise: NoiseSD}) }

// plant is the plant a run uses and where it came from.
type plant struct {
	spec     string
	proc     *Process
	saved    *savedModel // nil for -spec
	validity *modelinfo.Validity
	// fail wraps a problem with the plant in the error of the flag that
	// gave it.
	fail func(err error) error
}

// runWith runs both scenarios on the plant the options give and prints
// the summary on w.
//
// Every problem with the flags is reported before anything is printed
// (a *FlagError naming the flag): a noise standard deviation that is
// negative or not finite, noise asked of a spec without a noise term or
// with a noise model that has no steady state, -config together with
// -spec, -model or -use-failed-model without -config, a config file
// that cannot be read or has no such model, a model saved with a failed
// verdict (unless -use-failed-model) or with a record whose interval
// differs from its spec's, a spec that does not parse (with its
// position), and a plant the scenarios cannot run (a *PlantError: see
// NewProcess, and a scenario whose starting point needs the valve
// outside 0..100 %).
func runWith(w io.Writer, o options) error {
	pl, err := resolve(o)
	if err != nil {
		return err
	}
	u1, err := pl.proc.startValve(SetpointStep())
	if err != nil {
		return pl.fail(err)
	}
	u2 := math.NaN()
	if pl.proc.HasOutdoor() {
		if u2, err = pl.proc.startValve(DisturbanceStep()); err != nil {
			return pl.fail(err)
		}
	}
	fmt.Fprintf(w, "plant: %s\n", pl.spec)
	if pl.saved != nil {
		fmt.Fprintf(w, "  model %q of %s\n", pl.saved.Name, o.config)
		pl.validity.Write(w, "  ")
	}
	fmt.Fprintf(w, "  sampled every %s; the PI acts once a sample\n\n", pl.proc.model.Interval)
	if err := setpointScenario(w, pl, u1, o.noise); err != nil {
		return err
	}
	if !pl.proc.HasOutdoor() {
		fmt.Fprintf(w, "%s: not run, the plant has no input outdoor\n", DisturbanceStep().Name)
	} else if err := disturbanceScenario(w, pl, u2, o.noise); err != nil {
		return err
	}
	fmt.Fprint(w, "\n"+caution)
	return nil
}

// setpointScenario runs the setpoint step from valve u0, without noise
// and with noise of innovation SD sd (when above 0), and writes its
// figures: settling, overshoot, steady state and time at the valve's
// limits.
func setpointScenario(w io.Writer, pl *plant, u0, sd float64) error {
	ts := pl.proc.Interval()
	band := pl.proc.noiseBand(sd)
	sc := SetpointStep()
	fmt.Fprintf(w, "%s (PI Kc %.1f %%/degC, Ti %.0f min)\n", sc.Name, tuneKc, tuneTi)
	clean, noisy, k0, m, err := pl.measure(w, sc, u0, sd, 16, 20)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "    settling to +-%.1f degC  %s\n", PlantSettleBand, timeText(m.Settling, ts))
	fmt.Fprintf(w, "    overshoot               %5.1f %%\n", 100*m.Overshoot)
	steadyLine(w, m, PlantSettleBand)
	fmt.Fprintf(w, "    valve at its limit      %s\n", minutesText(float64(atLimit(clean.Valve))*ts, ts))
	unsuitable(w, m)
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
	unsuitable(w, m)
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
	if clean, err = runWithPI(sc, u0); err != nil {
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
	tr, err := runWithPI(sc, u0)
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
func unsuitable(w io.Writer, m StepMetrics) {
	if !m.Unsettled {
		return
	}
	fmt.Fprintf(w, "  WARNING: the tuning (Kc %.1f %%/degC, Ti %.0f min) is unsuitable for this plant: the loop oscillates\n"+
		"  and does not settle, so these figures describe an oscillation, not a response; retune (a lower Kc\n"+
		"  or a longer Ti) before trying it on the plant\n", tuneKc, tuneTi)
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

// resolve checks the options and returns the plant they give, or a
// *FlagError.
func resolve(o options) (*plant, error) {
	sd := o.noise
	if !(sd >= 0) || math.IsInf(sd, 1) {
		return nil, &FlagError{Flag: "noise", Value: fmt.Sprint(sd), Msg: "the noise standard deviation must be a finite number >= 0 (degC)"}
	}
	pl := &plant{spec: o.spec, fail: func(err error) error { return &FlagError{Flag: "spec", Err: err} }}
	switch {
	case o.config != "" && o.specSet:
		return nil, &FlagError{Flag: "spec", Msg: "give the plant either with -spec or with -config, not both"}
	case o.config == "" && o.model != "":
		return nil, &FlagError{Flag: "model", Value: fmt.Sprintf("%q", o.model), Msg: "names a model of a config file; give the file with -config too"}
	case o.config == "" && o.useFailed:
		return nil, &FlagError{Flag: "use-failed-model", Msg: "applies to a model loaded with -config (a -spec carries no verdict)"}
	case o.config != "":
		sm, err := loadModel(o.config, o.model)
		if err != nil {
			return nil, &FlagError{Flag: "config", Value: o.config, Err: err}
		}
		where := fmt.Sprintf("model %q", sm.Name)
		pl.spec, pl.saved, pl.validity = sm.Spec, sm, sm.Validity
		pl.fail = func(err error) error { return &FlagError{Flag: "config", Value: o.config, Msg: where, Err: err} }
	}
	// A saved model's verdict comes first: a model that failed its checks
	// is refused for that, whatever else is wrong with it.
	if err := checkVerdict(pl.validity, o.useFailed); err != nil {
		return nil, pl.fail(err)
	}
	p, err := NewProcess(pl.spec, 0, 0)
	if err != nil {
		return nil, pl.fail(err)
	}
	pl.proc = p
	if err := checkNoise(pl, o); err != nil {
		return nil, err
	}
	if err := checkInterval(pl); err != nil {
		return nil, pl.fail(err)
	}
	return pl, nil
}

// checkNoise refuses noise asked of a plant that cannot give it: a spec
// without a noise term, or one whose noise model has no steady state to
// draw it from. When -noise was given the flag is blamed; with the
// default the model's noise term is, and -noise 0 is offered.
func checkNoise(pl *plant, o options) error {
	sd := o.noise
	if sd == 0 {
		return nil
	}
	problem := ""
	var cause error
	if pl.proc.model.Noise == nil {
		problem = "the plant has none"
	} else if _, err := NewProcess(pl.spec, 0, sd); err != nil {
		problem, cause = "its noise cannot be drawn from a steady state", err
		var pe *PlantError
		if errors.As(err, &pe) && pe.Part == "noise term" {
			problem += " (" + pe.Problem + ")"
		} else {
			problem += ": " + err.Error()
		}
	} else {
		return nil
	}
	if o.noiseSet {
		fix := "end the spec with + a (or a stationary ARMA term), or run with -noise 0"
		return &FlagError{Flag: "noise", Value: fmt.Sprint(sd), Msg: "the runs with noise need the plant's noise term, and " + problem + "; " + fix}
	}
	return pl.fail(&PlantError{Part: "noise term", Problem: fmt.Sprintf("%s, and the runs with the plant's noise (by default SD %g degC) need one that is stationary; "+
		"give the model a stationary noise term (+ a, or an ARMA term with its roots outside the unit circle), or run without noise: -noise 0", problem, sd), Err: cause, inline: true})
}

// checkVerdict refuses a saved model whose verdict failed (unless
// forced) or is unknown. v may be nil (a -spec plant).
func checkVerdict(v *modelinfo.Validity, force bool) error {
	if v == nil {
		return nil
	}
	switch v.Verdict {
	case modelinfo.VerdictPassed:
	case modelinfo.VerdictFailed:
		if !force {
			return fmt.Errorf("the model failed its checks when it was saved (%s), so a controller that passes on it proves nothing; "+
				"identify it again, or run on it anyway with -use-failed-model", failures(v))
		}
	default:
		return fmt.Errorf("its validity record has verdict %q, neither %q nor %q", v.Verdict, modelinfo.VerdictPassed, modelinfo.VerdictFailed)
	}
	return nil
}

// checkInterval refuses a saved model whose record's interval differs
// from its spec's.
func checkInterval(pl *plant) error {
	v := pl.validity
	if v == nil {
		return nil
	}
	if iv := pl.proc.model.Interval.String(); v.Interval != "" && v.Interval != iv {
		return fmt.Errorf("its validity record says the data was sampled every %s but its spec says every %s; the two must agree", v.Interval, iv)
	}
	return nil
}

// failures lists a record's failures for a message.
func failures(v *modelinfo.Validity) string {
	if len(v.Failures) == 0 {
		return "no reason recorded"
	}
	s := v.Failures[0]
	for _, f := range v.Failures[1:] {
		s += "; " + f
	}
	return s
}

// warnOutside says on w when a run took the valve, the outdoor
// temperature or the output outside the ranges of the record the model
// was fitted to (a model loaded with a validity record), and says once
// more that a model run on after failing its checks proves nothing.
// noisy may be nil.
func warnOutside(w io.Writer, pl *plant, clean Trace, noisy *Trace) {
	if pl.validity == nil {
		return
	}
	runs := []Trace{clean}
	if noisy != nil {
		runs = append(runs, *noisy)
	}
	for _, name := range []string{valveName, outdoorName, outputName} {
		if name == outdoorName && !pl.proc.HasOutdoor() {
			continue
		}
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, tr := range runs {
			x := map[string][]float64{valveName: tr.Valve, outdoorName: tr.Outdoor, outputName: tr.Temp}[name]
			a, b := span(x)
			lo, hi = min(lo, a), max(hi, b)
		}
		if msg := pl.validity.Outside(name, lo, hi); msg != "" {
			fmt.Fprintf(w, "  WARNING: %s\n", msg)
		}
	}
	if pl.validity.Verdict == modelinfo.VerdictFailed {
		fmt.Fprintf(w, "  WARNING: run on a model that failed its checks (-use-failed-model): these figures prove nothing about the plant\n")
	}
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
