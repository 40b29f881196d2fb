package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"time"

	"github.com/backshift/backshift/examples/internal/greenhouse"
	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// Outcome is what one run found, for tests and for callers that embed
// the program.
type Outcome struct {
	// Estimate is the chosen (or the given spec's) fitted model.
	Estimate *tf.Estimate
	// Paths summarises each input path of the fitted model.
	Paths []modelinfo.Path
	// Recovery compares each path with the truth (built-in data only).
	Recovery []Recovery
	// Pictures lists the files written.
	Pictures []string
	// Simulation is the chosen model's noise-free simulation from the
	// inputs alone, and how well it follows the output.
	Simulation *Simulation
	// Diagnostics are the checks of the chosen model.
	Diagnostics *tf.Diagnostics
	// Elapsed is the wall time of the run.
	Elapsed time.Duration

	forecast *forecastResult
}

// Recovery compares an identified input path with the true one.
type Recovery struct {
	Input                string
	TrueDelay, Delay     int
	TrueGain, Gain       float64
	TrueTau, Tau         float64 // minutes; NaN when the fitted path has no real pole
	GainErr              float64 // relative
	DelayExact, GainIn10 bool
}

// dataset is the record being worked on.
type dataset struct {
	name     string
	data     map[string][]float64
	output   string
	inputs   []string
	interval float64 // in unit; 0 when only samples are known
	unit     string
	builtin  bool
	n        int
}

// Run does the whole job described in the package documentation and
// writes results to stdout and progress to stderr (nil for none).
func Run(ctx context.Context, o Options, stdout, stderr io.Writer) (*Outcome, error) {
	start := time.Now()
	pr := &progress{w: stderr, start: start}
	if o.Quiet {
		pr.w = nil
	}
	if o.WriteData != "" {
		return &Outcome{}, writeBuiltin(o.WriteData, stdout)
	}
	ds, err := load(o)
	if err != nil {
		return nil, err
	}
	// The forecast settings are checked before the fit, which takes
	// seconds: a mistyped flag should not wait for it.
	if o.Horizon < 0 || o.Horizon > ds.n {
		return nil, fmt.Errorf("horizon %d: want 0 (no forecast) to %d samples (the record's length; a forecast beyond it says nothing the data supports)", o.Horizon, ds.n)
	}
	if _, err := parsePlan(o.Plan); err != nil {
		return nil, err
	}
	pr.say("data: %s, %d samples of %s from %v", ds.name, ds.n, ds.output, ds.inputs)
	fmt.Fprintf(stdout, "Data: %s: %d samples, output %s, inputs %v, interval %s\n", ds.name, ds.n, ds.output, ds.inputs, intervalText(ds))

	skip := o.Skip
	if skip < 0 {
		skip = min(ds.n/20, 500)
	}
	if skip >= ds.n {
		return nil, fmt.Errorf("-skip %d: want fewer samples than the record's %d (-1: automatic)", o.Skip, ds.n)
	}
	var est *tf.Estimate
	if o.Spec != "" {
		est, err = fitSpec(ctx, o.Spec, ds, skip, pr)
	} else {
		est, err = identify(ctx, ds, skip, stdout, pr)
	}
	if err != nil {
		return nil, err
	}
	if est.Model.Interval.Value == 0 && ds.interval > 0 {
		est.Model.Interval = tf.Interval{Value: ds.interval, Unit: ds.unit}
	}
	out := &Outcome{Estimate: est}
	if err := report(ctx, est, ds, stdout, pr, out); err != nil {
		return nil, err
	}
	if out.Simulation, err = simulate(est, ds, skip, stdout); err != nil {
		return nil, err
	}
	pr.say("checking the model")
	if out.Diagnostics, err = diagnostics(est, ds, stdout); err != nil {
		return nil, err
	}
	if err := forecast(est, ds, o, stdout, out); err != nil {
		return nil, err
	}
	if ds.builtin {
		out.Recovery = recovery(out.Paths)
		writeRecovery(stdout, out.Recovery)
		fmt.Fprintf(stdout, "\nTo test a controller on the identified model:\n  go run ./examples/harness -noise %.3g -spec '%s'\n",
			math.Sqrt(est.Sigma2), rounded(est.Model))
	}
	fmt.Fprint(stdout, "\n"+caution)
	if o.Save != "" {
		if err := saveConfig(o.Save, est, ds); err != nil {
			return nil, fmt.Errorf("save: %w", err)
		}
		fmt.Fprintf(stdout, "\nFitted model saved to %s (go run ./examples/config -file %s)\n", o.Save, o.Save)
	}
	if o.Pictures != "" {
		pr.say("writing pictures to %s", o.Pictures)
		files, err := pictures(o.Pictures, est, ds, out)
		if err != nil {
			return nil, fmt.Errorf("pictures: %w", err)
		}
		out.Pictures = files
		fmt.Fprintf(stdout, "\nPictures written to %s:\n", o.Pictures)
		for _, f := range files {
			fmt.Fprintf(stdout, "  %s\n", f)
		}
	}
	out.Elapsed = time.Since(start)
	pr.say("done in %.1f s", out.Elapsed.Seconds())
	return out, nil
}

func writeBuiltin(path string, stdout io.Writer) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	if err := greenhouse.Default().WriteCSV(f); err != nil {
		f.Close()
		return err
	}
	if err := f.Close(); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "wrote %s: %d samples at 1 min of %s, %s, %s, %s\n", path, greenhouse.Default().Len(),
		greenhouse.Setpoint, greenhouse.Valve, greenhouse.Outdoor, greenhouse.Output)
	return nil
}

// load reads the record named by o. With a spec, the output and inputs
// are the spec's series.
func load(o Options) (*dataset, error) {
	ds := &dataset{output: o.Output, inputs: o.Inputs, interval: o.Interval, unit: o.Unit}
	if o.Spec != "" {
		m, err := parse.Model(o.Spec)
		if err != nil {
			return nil, fmt.Errorf("the spec does not parse:\n%w", err)
		}
		ds.output, ds.inputs = m.Output, nil
		for _, in := range m.Inputs {
			ds.inputs = append(ds.inputs, in.Series)
		}
		if ds.interval == 0 && m.Interval.Value > 0 {
			ds.interval, ds.unit = m.Interval.Value, m.Interval.Unit
		}
	}
	if len(ds.inputs) == 0 {
		return nil, errors.New("no input columns named (-inputs)")
	}
	if o.Spec == "" {
		seen := map[string]bool{ds.output: true}
		for _, in := range ds.inputs {
			if seen[in] {
				if in == ds.output {
					return nil, fmt.Errorf("-inputs names %q, the output (-output): a series cannot drive itself", in)
				}
				return nil, fmt.Errorf("-inputs names %q twice", in)
			}
			seen[in] = true
		}
	}
	if o.Data == "" {
		g := greenhouse.Default()
		ds.name = "built-in greenhouse record (4 days, PI control with a test signal)"
		ds.builtin = true
		ds.data = map[string][]float64{}
		for _, n := range append([]string{ds.output}, ds.inputs...) {
			s, ok := g.Series(n)
			if !ok || n == greenhouse.Minute {
				return nil, fmt.Errorf("the built-in record has no series %q (it has %s, %s, %s, %s)", n,
					greenhouse.Output, greenhouse.Valve, greenhouse.Outdoor, greenhouse.Setpoint)
			}
			ds.data[n] = s
		}
		if ds.interval == 0 {
			ds.interval, ds.unit = greenhouse.Interval, "min"
		}
		// The truth is known for the demo's own output and inputs.
		ds.builtin = ds.output == greenhouse.Output
		for _, in := range ds.inputs {
			ds.builtin = ds.builtin && (in == greenhouse.Valve || in == greenhouse.Outdoor)
		}
	} else {
		t, err := ReadCSVFile(o.Data)
		if err != nil {
			return nil, err
		}
		ds.name = o.Data
		if ds.data, err = t.Select(append([]string{ds.output}, ds.inputs...)...); err != nil {
			return nil, err
		}
	}
	ds.n = len(ds.data[ds.output])
	if ds.unit == "" {
		ds.unit = "samples"
	}
	return ds, nil
}

func intervalText(ds *dataset) string {
	if ds.interval == 0 {
		return "not given (times in samples)"
	}
	return fmt.Sprintf("%g %s", ds.interval, ds.unit)
}

// timeUnit is the unit times are printed in.
func (ds *dataset) timeUnit() string {
	if ds.interval == 0 {
		return "samples"
	}
	return ds.unit
}

// step returns the sample interval in time units (1 when none).
func (ds *dataset) step() float64 {
	if ds.interval == 0 {
		return 1
	}
	return ds.interval
}

// fitSpec parses spec and fits it.
func fitSpec(ctx context.Context, spec string, ds *dataset, skip int, pr *progress) (*tf.Estimate, error) {
	m, err := parse.Model(spec)
	if err != nil {
		return nil, fmt.Errorf("the spec does not parse:\n%w", err)
	}
	if m.Interval.Value == 0 && ds.interval > 0 {
		m.Interval = tf.Interval{Value: ds.interval, Unit: ds.unit}
	}
	pr.say("fitting %s", m)
	est, err := tf.Fit(ctx, m, ds.data, &tf.FitSettings{IgnoreExtra: true, First: skip})
	if err != nil {
		return nil, err
	}
	pr.say("fitted in %d iterations (%s)", est.Iter, est.Reason)
	return est, nil
}

// recovery compares the fitted paths with the greenhouse truth.
func recovery(paths []modelinfo.Path) []Recovery {
	var out []Recovery
	for _, p := range paths {
		var tp greenhouse.Path
		switch p.Input {
		case greenhouse.Valve:
			tp = greenhouse.True.Valve
		case greenhouse.Outdoor:
			tp = greenhouse.True.Outdoor
		default:
			continue
		}
		r := Recovery{Input: p.Input, TrueDelay: tp.Delay, Delay: p.DeadTime, TrueGain: tp.Gain(), Gain: p.Gain,
			TrueTau: tp.TimeConstant(), Tau: math.NaN()}
		for _, md := range p.Modes {
			if md.Kind == tf.ModeReal {
				r.Tau = math.Max(nanToZero(r.Tau), md.TimeConstant.Time)
			}
		}
		r.GainErr = (r.Gain - r.TrueGain) / r.TrueGain
		r.DelayExact = r.Delay == r.TrueDelay
		r.GainIn10 = math.Abs(r.GainErr) <= 0.10
		out = append(out, r)
	}
	return out
}

func nanToZero(x float64) float64 {
	if math.IsNaN(x) {
		return 0
	}
	return x
}

func writeRecovery(w io.Writer, rs []Recovery) {
	ok := func(b bool) string {
		if b {
			return "ok"
		}
		return "MISSED"
	}
	fmt.Fprintf(w, "\nHow close the identified model is to the true one (the demo data's generator):\n")
	fmt.Fprintf(w, "  %-8s  %-19s  %-33s  %s\n", "", "dead time (min)", "gain (degC per % or per degC)", "time constant (min)")
	fmt.Fprintf(w, "  %-8s  %4s %5s %-8s  %6s %6s %8s %-9s  %5s %6s\n", "input", "true", "found", "", "true", "found", "error", "", "true", "found")
	for _, r := range rs {
		fmt.Fprintf(w, "  %-8s  %4d %5d %-8s  %6.3f %6.3f %+7.1f%% %-9s  %5.1f %6.1f\n", r.Input, r.TrueDelay, r.Delay, ok(r.DelayExact),
			r.TrueGain, r.Gain, 100*r.GainErr, ok(r.GainIn10)+" (10%)", r.TrueTau, r.Tau)
	}
}

// Simulation is the noise-free run of a fitted model from the recorded
// inputs, started at the steady state of their first samples.
type Simulation struct {
	Y []float64
	// RMS is the root-mean-square difference from the output and
	// Explained the share of the output's variance it accounts for,
	// 1 - var(y - sim)/var(y), both from the first summed residual on.
	RMS, Explained float64
	// From is the first sample compared.
	From int
}

// simulate runs the fitted model without noise from the inputs and
// prints how well it follows the output: the test that matters for
// control, since a controller sees the deterministic part.
func simulate(est *tf.Estimate, ds *dataset, skip int, w io.Writer) (*Simulation, error) {
	m := est.Model.Clone()
	m.Noise = nil
	y, err := m.Simulate(ds.data, &tf.SimSettings{Steady: true})
	if err != nil {
		return nil, fmt.Errorf("simulation: %w", err)
	}
	obs := ds.data[ds.output]
	from := max(skip, est.Conditioning.First)
	var sd, sy, my float64
	k := 0
	for t := from; t < len(obs); t++ {
		my += obs[t]
		k++
	}
	my /= float64(k)
	for t := from; t < len(obs); t++ {
		d := obs[t] - y[t]
		sd += d * d
		sy += (obs[t] - my) * (obs[t] - my)
	}
	s := &Simulation{Y: y, RMS: math.Sqrt(sd / float64(k)), Explained: 1 - sd/sy, From: from}
	fmt.Fprintf(w, "\nSimulation from the inputs alone (noise-free, from sample %d): RMS error %.3g, %.1f %% of the output variance explained\n",
		from, s.RMS, 100*s.Explained)
	return s, nil
}

// caution follows the report: what the identified model is good for.
const caution = `Caution: the identified model is an approximation, valid near the operating
conditions of this record. Commission any controller tuned on it under the
site's safety procedures, with independent safety interlocks; defer to local
codes and licensed practice.
`
