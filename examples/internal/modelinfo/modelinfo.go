package modelinfo

import (
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"strings"

	"github.com/backshift/backshift/tf"
)

// Path is the summary of one input path of a model.
type Path struct {
	Input    string
	Rational tf.Rational
	// Gain is the steady-state gain (NaN when it does not exist: a pole
	// at z = 1).
	Gain float64
	// DeadTime is the dead time in samples.
	DeadTime int
	Modes    []tf.Mode
	Stable   bool
	// Step holds the step-response metrics of a stable path; Err says
	// why there are none.
	Step tf.StepFigures
	Err  error
	// Slope is, for an integrating path (output differenced once by
	// (1 - B)), the rise of the output per sample for a unit step of the
	// input once the ramp is established; NaN otherwise.
	Slope float64
}

// Paths summarises every input path of m that a controller could act
// through: event inputs (a step or a pulse at a known time) are left
// out. interval is the sample interval in the unit the caller reports
// times in (0 for samples only).
// It returns an error when an input's polynomials are not a valid
// transfer function.
func Paths(m tf.Model, interval float64) ([]Path, error) {
	var out []Path
	for _, in := range m.Inputs {
		if in.Event != nil {
			continue
		}
		// The whole path to y: the term, the input's differencing over the
		// output's (tf.Model.Path).
		r, err := m.Path(in.Series)
		if err != nil {
			return nil, fmt.Errorf("input %s: %w", in.Series, err)
		}
		p := Path{Input: in.Series, Rational: r, DeadTime: r.Delay(), Stable: r.Stable(), Gain: math.NaN(), Slope: math.NaN()}
		if g, err := r.Gain(); err == nil {
			p.Gain = g
		} else if c := m.Diff.Coeffs(); len(c) == 2 && c[0] == 1 && c[1] == -1 {
			// y = G(B)/(1 - B) x: the ramp rate of a step is G's gain, G
			// the path of the model without its output differencing.
			if g, err := (tf.Model{Output: m.Output, Inputs: []tf.Input{in}}).Path(in.Series); err == nil {
				p.Slope, _ = g.Gain()
			}
		}
		p.Modes, _ = r.Modes(interval)
		switch {
		case p.Stable && p.Gain == 0:
			p.Err = fmt.Errorf("none: the path's gain is 0, so a step leaves the output where it was")
		case p.Stable:
			p.Step, p.Err = r.StepFigures(tf.StepSettings{Interval: interval})
		default:
			p.Err = fmt.Errorf("no step metrics: the path is not stable")
		}
		out = append(out, p)
	}
	return out, nil
}

// Interval returns the model's sample interval and its unit, or (0,
// "samples") when the model has none.
func Interval(m tf.Model) (float64, string) {
	if m.Interval.Value > 0 {
		return m.Interval.Value, m.Interval.Unit
	}
	return 0, "samples"
}

// Write prints the summary of every input path of m to w, times in the
// model's interval unit when it has one.
func Write(w io.Writer, m tf.Model) error {
	iv, unit := Interval(m)
	paths, err := Paths(m, iv)
	if err != nil {
		return err
	}
	for _, p := range paths {
		fmt.Fprintf(w, "  %s -> %s\n", p.Input, m.Output)
		if math.IsNaN(p.Gain) {
			fmt.Fprintf(w, "    gain             none (integrating: pole at z = 1)\n")
			if !math.IsNaN(p.Slope) {
				if iv > 0 {
					fmt.Fprintf(w, "    ramp rate        %.4g per %s per unit input (%.4g per sample)\n", p.Slope/iv, unit, p.Slope)
				} else {
					fmt.Fprintf(w, "    ramp rate        %.4g per sample per unit input\n", p.Slope)
				}
			}
		} else {
			fmt.Fprintf(w, "    gain             %.4g %s per unit of %s\n", p.Gain, m.Output, p.Input)
		}
		fmt.Fprintf(w, "    dead time        %s\n", span(float64(p.DeadTime), float64(p.DeadTime)*iv, unit))
		for _, md := range p.Modes {
			switch md.Kind {
			case tf.ModeReal:
				fmt.Fprintf(w, "    time constant    %s (pole %.4f)\n", span(md.TimeConstant.Samples, md.TimeConstant.Time, unit), real(md.Pole))
			case tf.ModeComplex:
				wn := md.NaturalFrequency
				wu := "rad/sample"
				if iv > 0 {
					wn, wu = md.NaturalFrequencyTime, "rad/"+unit
				}
				fmt.Fprintf(w, "    oscillatory mode natural frequency %.4g %s, damping %.3f (poles %s)\n", wn, wu, md.Damping, zstr(md.Pole))
			default:
				fmt.Fprintf(w, "    %-16s pole %s\n", md.Kind+" mode", zstr(md.Pole))
			}
		}
		switch {
		case p.Stable:
			fmt.Fprintf(w, "    stable           yes (largest pole magnitude %.4f)\n", p.Rational.MaxPoleMagnitude())
		case !math.IsNaN(p.Slope):
			fmt.Fprintf(w, "    stable           no: integrating (pole at z = 1; bounded input, unbounded output)\n")
		default:
			fmt.Fprintf(w, "    stable           NO (largest pole magnitude %.4f)\n", p.Rational.MaxPoleMagnitude())
		}
		if p.Err != nil {
			fmt.Fprintf(w, "    step response    %v\n", p.Err)
			continue
		}
		s := p.Step
		fmt.Fprintf(w, "    step response    rise (10-90 %%) %s, settling (%g %%) %s, overshoot %.1f %%\n",
			span(s.Rise.Samples, s.Rise.Time, unit), 100*s.Band, span(s.Settle.Samples, s.Settle.Time, unit), 100*s.Overshoot)
	}
	return nil
}

// span formats a duration in samples and, when an interval is known, in
// time units.
func span(samples, t float64, unit string) string {
	if math.IsNaN(samples) {
		return "not reached"
	}
	if unit == "samples" {
		if samples == 1 {
			return "1 sample"
		}
		return fmt.Sprintf("%.3g samples", samples)
	}
	if samples == t {
		return fmt.Sprintf("%.3g %s", t, unit)
	}
	if samples == 1 {
		return fmt.Sprintf("%.3g %s (1 sample)", t, unit)
	}
	return fmt.Sprintf("%.3g %s (%.3g samples)", t, unit, samples)
}

func zstr(z complex128) string {
	if imag(z) == 0 {
		return fmt.Sprintf("%.4f", real(z))
	}
	return strings.TrimSpace(fmt.Sprintf("%.4f +- %.4fi (|z| %.4f)", real(z), math.Abs(imag(z)), cmplx.Abs(z)))
}
