package main

import (
	"fmt"
	"os"
	"path/filepath"

	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/prewhiten"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// picture is one PNG file: its name without ".png" and the function that
// draws it into a path.
type picture struct {
	name string
	draw func(path string) error
}

// pictures writes every PNG into dir and returns their paths, and for
// each picture that could not be drawn (a record too short for its
// correlations, no stable path for the step responses, ...) a sentence
// saying why. The drawing of each picture is in plots.go.
func pictures(dir string, est *fit.Estimate, ds *dataset, out *Outcome) (files, skipped []string, err error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, nil, err
	}
	// The correlations need consecutive samples: with gaps in the
	// output they are those of the stretch the identification saw.
	pw, pwErr := prewhitenAll(ds)
	if g := ds.gaps; g != nil && len(g.Output) > 0 && g.StretchTo > g.StretchFrom {
		pw, pwErr = prewhitenAll(ds.stretch(g.StretchFrom, g.StretchTo))
	}
	mk := pictureMarks(est.Model, out.Outliers, ds)
	withWeights := func(draw func(string, *dataset, []prewhitened, *fit.Estimate) error) func(string) error {
		return func(path string) error {
			if pwErr != nil {
				return pwErr
			}
			return draw(path, ds, pw, est)
		}
	}
	list := []picture{
		{"data", func(path string) error { return recordPicture(path, ds, mk) }},
		{"ccf", withWeights(correlationPicture)},
		{"weights", withWeights(weightsPicture)},
		{"residual-acf", func(path string) error { return residualPicture(path, ds, est) }},
		{"step", func(path string) error { return stepPicture(path, ds, out.Paths) }},
		{"fit", func(path string) error { return fitPicture(path, ds, est, mk) }},
	}
	if out.Simulation != nil {
		list = append(list, picture{"simulation", func(path string) error { return simulationPicture(path, ds, out.Simulation) }})
	}
	if out.forecast != nil {
		list = append(list, picture{"forecast", func(path string) error { return forecastPicture(path, ds, out.forecast) }})
	}
	for _, p := range list {
		path := filepath.Join(dir, p.name+".png")
		if err := p.draw(path); err != nil {
			skipped = append(skipped, fmt.Sprintf("%s.png not drawn: %v", p.name, err))
			continue
		}
		files = append(files, path)
	}
	return files, skipped, nil
}

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

// times returns the times of n samples from sample from on, dt apart.
func times(n, from int, dt float64) []float64 {
	t := make([]float64, n)
	for i := range t {
		t[i] = float64(i+from) * dt
	}
	return t
}

// setpoint returns the demo record's setpoint series.
func (ds *dataset) setpoint() ([]float64, bool) {
	return greenhouse.Default().Series(greenhouse.Setpoint)
}

// outputUnit returns the unit of the output for an axis label, " (degC)"
// on the demo and "" for a file (whose units are not known).
func outputUnit(ds *dataset) string {
	if ds.builtin {
		return " (degC)"
	}
	return ""
}

// inputUnit returns the axis label of an input: its name, with its unit
// on the demo.
func inputUnit(ds *dataset, input string) string {
	if ds.builtin {
		if input == greenhouse.Valve {
			return "valve opening (%)"
		}
		return input + " (degC)"
	}
	return input
}

// greenhouseUnits returns the unit of a demo path's gain.
func greenhouseUnits(input string) string {
	if input == greenhouse.Valve {
		return "degC per % valve"
	}
	return "degC per degC outdoor"
}

// truePath returns the demo's true path from input to the output.
func truePath(input string) tf.Rational {
	p := greenhouse.True.Valve
	if input == greenhouse.Outdoor {
		p = greenhouse.True.Outdoor
	}
	return tf.MustRational([]float64{p.Omega}, []float64{1, -p.Delta}, p.Delay)
}
