package main

import (
	"flag"
	"fmt"
	"io"
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

Without -spec and -config it first walks the loop from plant test to tuning on
the greenhouse demo: it designs a test signal for the valve, simulates the test
on the plant, fits the model and checks it, tunes a PI by SIMC and by IMC,
checks each tuning over the model's uncertainty and a worst case, and then
tests both tunings on the plant. With -spec or -config it tests a hand-tuned
PI (Kc 8 %/degC, Ti 20 min) on the plant given.

Examples:
  go run ./examples/harness
  go run ./examples/harness -pictures pics
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
	// loop runs the default: the loop on the greenhouse demo (neither
	// -spec nor -config given).
	loop bool
	// pictures is the folder -pictures names ("" for none).
	pictures string
	// structure is the structure the loop fits to its test record; ""
	// means testStructure (the tests give others).
	structure string
}

// cli runs the program with the arguments args (without the program
// name) and returns the exit status: 0 done, 1 a problem with the plant
// or the run, 2 a command line that cannot be read.
func cli(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("harness", flag.ContinueOnError)
	fs.SetOutput(stderr)
	var o options
	fs.StringVar(&o.spec, "spec", PlantSpec, "plant model spec: output temp (degC), input valve (%) and optionally outdoor (degC), every coefficient a number, and its sample interval (every ...), e.g. the one examples/identify prints")
	fs.Float64Var(&o.noise, "noise", NoiseSD, "standard deviation of the plant's noise innovations (degC); 0 for noise-free runs with -spec or -config (the default run's plant test needs noise)")
	fs.StringVar(&o.config, "config", "", "read the plant from this JSON config file (as examples/identify -save writes it) instead of -spec")
	fs.StringVar(&o.model, "model", "", "the name of the model to use in the -config file (needed when it holds more than one)")
	fs.StringVar(&o.pictures, "pictures", "", "draw the default run's pictures into this folder (made if missing): the test signal and its spectrum, the closed-loop step responses with their uncertainty bands, the sensitivity magnitude with its peak")
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
	o.loop = !o.specSet && o.config == ""
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

// run runs the default: the loop on the greenhouse demo, with the
// plant's noise of NoiseSD.
func run(w io.Writer) error {
	return runWith(w, options{spec: PlantSpec, noise: NoiseSD, loop: true})
}

// plant is the plant a run uses and where it came from.
type plant struct {
	spec     string
	proc     *Process
	saved    *savedModel // nil for -spec
	validity *modelinfo.Validity
	// events are the event terms left out of spec (withoutEvents).
	events []leftOutEvent
	// pi is the PI under test.
	pi PITuning
	// u1 and u2 are the valve openings that hold the starting points of
	// the setpoint and the disturbance scenario (u2 NaN without an
	// outdoor input).
	u1, u2 float64
	// fail wraps a problem with the plant in the error of the flag that
	// gave it.
	fail func(err error) error
}

// runWith runs what the options ask and prints the summary on w: the
// loop on the greenhouse demo (o.loop, see runLoop), or the controller
// tests of the hand-tuned PI on the plant the options give.
//
// Every problem with the flags is reported before anything is printed
// (a *FlagError naming the flag): a noise standard deviation that is
// negative or not finite, noise asked of a spec without a noise term or
// with a noise model that has no steady state, -config together with
// -spec, -model or -use-failed-model without -config, a config file
// that cannot be read or has no such model, a model saved with a failed
// verdict (unless -use-failed-model) or with a record whose interval
// differs from its spec's, a spec that does not parse (with its
// position), a plant the scenarios cannot run (a *PlantError: see
// NewProcess, and a scenario whose starting point needs the valve
// outside 0..100 %), -pictures without the loop or naming a folder that
// cannot be made, and -noise 0 for the loop (its plant test needs noise).
func runWith(w io.Writer, o options) error {
	pl, err := resolve(o)
	if err != nil {
		return err
	}
	if o.loop {
		return runLoop(w, pl, o)
	}
	writePlant(w, pl, o)
	fmt.Fprintln(w)
	if err := runScenarios(w, pl, o.noise); err != nil {
		return err
	}
	fmt.Fprint(w, "\n"+caution)
	return nil
}

// writePlant heads the controller tests with the plant and where it
// came from.
func writePlant(w io.Writer, pl *plant, o options) {
	fmt.Fprintf(w, "plant: %s\n", pl.spec)
	writeLeftOut(w, pl.events)
	if pl.saved != nil {
		fmt.Fprintf(w, "  model %q of %s\n", pl.saved.Name, o.config)
		pl.validity.Write(w, "  ")
	}
	fmt.Fprintf(w, "  sampled every %s; the PI acts once a sample\n", pl.proc.model.Interval)
}

// runScenarios runs both scenarios with the PI pl.pi on the plant pl
// with noise of innovation SD sd and prints their figures.
func runScenarios(w io.Writer, pl *plant, sd float64) error {
	if err := setpointScenario(w, pl, pl.u1, sd); err != nil {
		return err
	}
	if !pl.proc.HasOutdoor() {
		fmt.Fprintf(w, "%s: not run, the plant has no input outdoor\n", DisturbanceStep().Name)
	} else if err := disturbanceScenario(w, pl, pl.u2, sd); err != nil {
		return err
	}
	return nil
}
