package main

import (
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
func run(w io.Writer) error        { return runWith(w, options{spec: PlantSpec, noise: NoiseSD}) }

// plant is the plant a run uses and where it came from.
type plant struct {
	spec     string
	proc     *Process
	saved    *savedModel // nil for -spec
	validity *modelinfo.Validity
	// pi is the PI under test.
	pi PITuning
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
