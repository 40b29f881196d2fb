package main

import (
	"fmt"
	"math"
	"os"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/prewhiten"
	"github.com/backshift/backshift/tf"
)

// maxPictureLag is the largest lag shown in the correlation pictures, in
// samples; a short record shows lags up to a quarter of its length
// (pictureLag).
const maxPictureLag = 40

// pictureLag is the largest lag shown for a series of n samples.
func pictureLag(n int) int { return max(1, min(maxPictureLag, n/4)) }

// prewhitened is one input's prewhitened cross-correlation and
// impulse-response weights, as the identification saw them.
type prewhitened struct {
	Input   string
	Filter  prewhiten.Filter
	Corr    *ccf.Correlation
	Weights *ccf.Weights
}

// prewhitenAll prewhitens every input as the identification does (an
// autoregression fitted to the input, applied to input and output) and
// estimates its impulse-response weights to the output.
func prewhitenAll(ds *dataset) ([]prewhitened, error) {
	var out []prewhitened
	y := ds.data[ds.output]
	for _, name := range ds.inputs {
		res, err := prewhiten.Pair(ds.data[name], y, ds.output, &prewhiten.Settings{Name: name})
		if res == nil {
			return nil, err
		}
		// A prewhitened input that fails the whiteness check is still
		// usable for a picture; the identification itself reports it.
		a, b := res.Alpha[res.Start:], res.Beta[res.Start:]
		w, err := ccf.ImpulseWeights(a, b, pictureLag(len(a)), name, nil)
		if err != nil {
			return nil, err
		}
		c, err := ccf.Cross(a, b, pictureLag(len(a)), &ccf.Settings{Names: [2]string{name, ds.output}})
		if err != nil {
			return nil, err
		}
		out = append(out, prewhitened{Input: name, Filter: res.Filter, Corr: c, Weights: w})
	}
	return out, nil
}

// pictures writes every PNG into dir and returns their paths, and for
// each picture that could not be drawn (a record too short for its
// correlations, no stable path for the step responses, ...) a sentence
// saying why.
func pictures(dir string, est *tf.Estimate, ds *dataset, out *Outcome) (files, skipped []string, err error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, nil, err
	}
	unit := ds.timeUnit()
	dt := ds.step()
	add := func(name string, f func(path string) error) error {
		p := picturePath(dir, name)
		if err := f(p); err != nil {
			skipped = append(skipped, fmt.Sprintf("%s.png not drawn: %v", name, err))
			return nil
		}
		files = append(files, p)
		return nil
	}
	pw, pwErr := prewhitenAll(ds)
	delays := map[string]int{}
	for _, in := range est.Model.Inputs {
		delays[in.Series] = in.Delay
	}

	// The record itself.
	if err := add("data", func(path string) error {
		y := ds.data[ds.output]
		t := make([]float64, len(y))
		for i := range t {
			t[i] = float64(i) * dt
		}
		out := seriesPanel{Title: "Output: " + ds.output, YLabel: ds.output + outputUnit(ds),
			Lines: []namedLine{{Name: ds.output, Y: y, Color: colData, Width: 0.8}}}
		if ds.builtin {
			if sp, ok := ds.setpoint(); ok {
				out.Lines = append(out.Lines, namedLine{Name: "setpoint", Y: sp, Color: colBand, Width: 1.2})
			}
		}
		panels := []seriesPanel{out}
		for _, name := range ds.inputs {
			panels = append(panels, seriesPanel{Title: "Input: " + name, YLabel: inputUnit(ds, name),
				Lines: []namedLine{{Name: name, Y: ds.data[name], Color: colModel, Width: 0.6}}})
		}
		return plotSeries(path, t, panels, "time ("+unit+")")
	}); err != nil {
		return nil, nil, err
	}

	// Prewhitened cross-correlation with the 95 % band.
	if err := add("ccf", func(path string) error {
		if pwErr != nil {
			return pwErr
		}
		var panels []corrPanel
		for _, p := range pw {
			c := corrPanel{Title: fmt.Sprintf("Prewhitened cross-correlation, %s leading %s", p.Input, ds.output),
				Band: p.Corr.Band(0.95), Mark: -1}
			lag := len(p.Weights.V) - 1
			for k := -min(10, lag); k <= lag; k++ {
				c.Lags = append(c.Lags, float64(k)*dt)
				c.R = append(c.R, p.Corr.At(k))
			}
			if b, ok := delays[p.Input]; ok {
				c.Mark = float64(b) * dt
				c.MarkLabel = "fitted dead time " + amount(float64(b)*dt, unit)
			}
			panels = append(panels, c)
		}
		return plotCorrelations(path, panels, "lag ("+unit+"), positive: input leads output", "cross-correlation")
	}); err != nil {
		return nil, nil, err
	}

	// Impulse-response weights with +-2 SE.
	if err := add("weights", func(path string) error {
		if pwErr != nil {
			return pwErr
		}
		var panels []weightPanel
		for _, p := range pw {
			w := weightPanel{Title: fmt.Sprintf("Impulse-response weights, %s -> %s", p.Input, ds.output),
				V: p.Weights.V, SE: p.Weights.SE, YLabel: ds.output + " per unit " + p.Input}
			for k := range p.Weights.V {
				w.Lags = append(w.Lags, float64(k)*dt)
			}
			if ds.builtin {
				w.True = truePath(p.Input).impulse(len(w.V))
				w.YLabel = greenhouseUnits(p.Input)
			}
			panels = append(panels, w)
		}
		return plotWeights(path, panels, "lag ("+unit+")")
	}); err != nil {
		return nil, nil, err
	}

	// Residual autocorrelation with the 95 % band.
	if err := add("residual-acf", func(path string) error {
		r := est.Resid[est.Conditioning.First:]
		lag := pictureLag(len(r))
		acf, err := arma.ACF(r, lag)
		if err != nil {
			return err
		}
		c := corrPanel{Title: "Autocorrelation of the residuals", Band: 1.96 * acf.White, Mark: -1, LegendBottom: true}
		for k := 1; k <= lag; k++ {
			c.Lags = append(c.Lags, float64(k)*dt)
			c.R = append(c.R, acf.R[k])
		}
		return plotCorrelations(path, []corrPanel{c}, "lag ("+unit+")", "autocorrelation")
	}); err != nil {
		return nil, nil, err
	}

	// Step responses with settling time.
	if err := add("step", func(path string) error {
		var panels []stepPanel
		for _, p := range out.Paths {
			if p.Err != nil {
				continue
			}
			n := int(math.Ceil(1.3*p.Step.Settle.Samples)) + 2
			y := p.Rational.Step(n)
			s := stepPanel{Title: fmt.Sprintf("Step response of %s to a unit step in %s", ds.output, p.Input),
				Y: y, Final: p.Gain, Settling: p.Step.Settle.Samples * dt, DeadTime: float64(p.DeadTime) * dt,
				YLabel: ds.output + " per unit " + p.Input, Unit: unit}
			for k := range y {
				s.T = append(s.T, float64(k)*dt)
			}
			if ds.builtin {
				s.True = truePath(p.Input).step(n)
				s.YLabel = greenhouseUnits(p.Input)
			}
			panels = append(panels, s)
		}
		return plotSteps(path, panels, "time after the step ("+unit+")")
	}); err != nil {
		return nil, nil, err
	}

	// Observed against one-step-ahead fitted values.
	if err := add("fit", func(path string) error {
		y := ds.data[ds.output]
		t := make([]float64, len(y))
		fit := make([]float64, len(y))
		for i := range y {
			t[i] = float64(i) * dt
			fit[i] = y[i] - est.Resid[i] // NaN before the first residual
		}
		return plotFit(path, t, y, fit, int(180/dt), est.Conditioning.First, "time ("+unit+")", ds.output+outputUnit(ds))
	}); err != nil {
		return nil, nil, err
	}

	// Observed against the noise-free simulation from the inputs alone.
	if out.Simulation != nil {
		if err := add("simulation", func(path string) error {
			// From the first summed residual on: before it the
			// simulation is still starting up.
			from := out.Simulation.From
			y := ds.data[ds.output][from:]
			t := make([]float64, len(y))
			for i := range t {
				t[i] = float64(i+from) * dt
			}
			return plotSimulation(path, t, y, out.Simulation.Y[from:], "time ("+unit+")", ds.output+outputUnit(ds))
		}); err != nil {
			return nil, nil, err
		}
	}

	// Forecast with its interval and the planned input.
	if out.forecast != nil {
		if err := add("forecast", func(path string) error { return plotForecastFrom(path, ds, out.forecast) }); err != nil {
			return nil, nil, err
		}
	}
	return files, skipped, nil
}

// setpoint returns the demo record's setpoint series.
func (ds *dataset) setpoint() ([]float64, bool) {
	return greenhouse.Default().Series(greenhouse.Setpoint)
}

func outputUnit(ds *dataset) string {
	if ds.builtin {
		return " (degC)"
	}
	return ""
}

func greenhouseUnits(input string) string {
	if input == greenhouse.Valve {
		return "degC per % valve"
	}
	return "degC per degC outdoor"
}

// trueRat is a true path as a transfer function.
type trueRat struct{ r tf.Rational }

func truePath(input string) trueRat {
	p := greenhouse.True.Valve
	if input == greenhouse.Outdoor {
		p = greenhouse.True.Outdoor
	}
	return trueRat{tf.MustRational([]float64{p.Omega}, []float64{1, -p.Delta}, p.Delay)}
}

func (t trueRat) impulse(n int) []float64 { return t.r.Impulse(n) }
func (t trueRat) step(n int) []float64    { return t.r.Step(n) }
