package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"

	"github.com/backshift/backshift/examples/internal/modelinfo"
)

// resolve checks the options and returns the plant they give, or a
// *FlagError.
func resolve(o options) (*plant, error) {
	sd := o.noise
	if !(sd >= 0) || math.IsInf(sd, 1) {
		return nil, &FlagError{Flag: "noise", Value: fmt.Sprint(sd), Msg: "the noise standard deviation must be a finite number >= 0 (degC)"}
	}
	pl := &plant{spec: o.spec, pi: handTuning, fail: func(err error) error { return &FlagError{Flag: "spec", Err: err} }}
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
	pl.spec, pl.events = withoutEvents(pl.spec)
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
	if pl.u1, err = p.startValve(SetpointStep()); err != nil {
		return nil, pl.fail(err)
	}
	pl.u2 = math.NaN()
	if p.HasOutdoor() {
		if pl.u2, err = p.startValve(DisturbanceStep()); err != nil {
			return nil, pl.fail(err)
		}
	}
	return pl, checkLoopFlags(o)
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

// checkLoopFlags refuses what only the loop can do asked without it
// (-pictures with -spec or -config), and -noise 0 for the loop: its plant
// test needs noise (a noise-free record fits exactly and leaves no
// uncertainty to check the tuning against). It makes the -pictures
// folder, so that a folder that cannot be made is reported before the
// run.
func checkLoopFlags(o options) error {
	switch {
	case o.pictures != "" && !o.loop:
		return &FlagError{Flag: "pictures", Value: o.pictures, Msg: "draws the loop of the default run (test signal, identified model, tuning); run without -spec and -config to draw it"}
	case o.loop && o.noise == 0:
		return &FlagError{Flag: "noise", Value: "0", Msg: "the default run simulates a plant test, and a test without noise fits exactly and leaves no uncertainty " +
			"to check the tuning against; give a noise above 0 (the default is " + fmt.Sprint(NoiseSD) + " degC), or test a PI alone with -spec"}
	case o.pictures != "":
		if err := os.MkdirAll(o.pictures, 0o755); err != nil {
			return &FlagError{Flag: "pictures", Value: o.pictures, Msg: "cannot make the folder for the pictures", Err: err}
		}
	}
	return nil
}
