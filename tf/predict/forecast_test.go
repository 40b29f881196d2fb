package predict_test

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
	"github.com/backshift/backshift/tf/predict"
)

// batchForecast is the fit's batch forecast (fit.Estimate.Forecast, to be
// fit's) of h steps from the end of data with the inputs' futures known.
func batchForecast(t *testing.T, e *fit.Estimate, data map[string][]float64, h int, future map[string][]float64) *fit.Forecast {
	t.Helper()
	fc, err := e.Forecast(data, h, &fit.ForecastSettings{Future: future})
	if err != nil {
		t.Fatal(err)
	}
	return fc
}

// checkPoints compares predictions with the batch forecast: means,
// standard errors and limits to 1e-10 of the forecast's scale (the
// largest |mean| plus the largest SE), the target of the issue; the two
// sum the same terms in nearly the same order, so rounding differences
// are near 1e-15 of that scale.
func checkPoints(t *testing.T, what string, got []predict.Point, fc *fit.Forecast) {
	t.Helper()
	scale := 0.0
	for j := range fc.Mean {
		scale = max(scale, math.Abs(fc.Mean[j])+fc.SE[j])
	}
	for j, g := range got {
		if !near(g.Mean, fc.Mean[j], 1e-10, scale) || !near(g.SE, fc.SE[j], 1e-10, scale) ||
			!near(g.Lower, fc.Lower[j], 1e-10, scale) || !near(g.Upper, fc.Upper[j], 1e-10, scale) {
			t.Fatalf("%s, step %d: %+v, batch forecast mean %v SE %v limits %v %v", what, j+1, g, fc.Mean[j], fc.SE[j], fc.Lower[j], fc.Upper[j])
		}
	}
}

// TestForecastEqualsBatch: after a fitted record's first n samples, the
// predictor's k-step forecasts for planned inputs equal the batch
// forecast from those n samples (fit.Estimate.Forecast with the inputs'
// futures known) to 1e-10, intervals included; a plan shorter than the
// horizon is held at its last value, an input without a plan at its
// last value fed.
func TestForecastEqualsBatch(t *testing.T) {
	const n, h = 500, 40
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			data, e, p := c.fitted(t, 600, 21)
			warm(t, p, data, n)
			names := p.Inputs()
			plan := make([][]float64, len(names))
			future := map[string][]float64{}
			for i, name := range names {
				x := data[name]
				full := make([]float64, h)
				switch i {
				case 0: // a plan of 10 values, then held
					plan[i] = x[n : n+10]
					copy(full, x[n:n+10])
					for j := 10; j < h; j++ {
						full[j] = x[n+9]
					}
				default: // no plan: held at the last value fed
					for j := range full {
						full[j] = x[n-1]
					}
				}
				future[name] = full
			}
			got := make([]predict.Point, h)
			if err := p.Forecast(got, plan); err != nil {
				t.Fatal(err)
			}
			checkPoints(t, "planned", got, batchForecast(t, e, window(data, n), h, future))
		})
	}
}

// TestMissingOutputs: with the output missing from sample n0 on and the
// inputs known, the one-step predictions continue from the inputs alone
// and equal the batch forecast from the last observed sample n0-1 with
// those inputs as its known future (fit.Estimate.Forecast), intervals
// included (they widen by the psi weights); a forecast after the gap
// continues that batch forecast; an observed output ends the gap.
func TestMissingOutputs(t *testing.T) {
	const n0, gap, h = 450, 30, 20
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			data, e, p := c.fitted(t, 600, 31)
			warm(t, p, data, n0)
			steps := make([]predict.Point, gap)
			for i := n0; i < n0+gap; i++ {
				s, err := p.Update(row(p, data, i), math.NaN())
				if err != nil {
					t.Fatal(err)
				}
				if !math.IsNaN(s.Error) || !math.IsNaN(s.Innov) {
					t.Fatalf("sample %d: error %v, innovation %v for a missing output, want NaN", i, s.Error, s.Innov)
				}
				steps[i-n0] = s.Point
			}
			if p.Missing() != gap {
				t.Fatalf("Missing() = %d, want %d", p.Missing(), gap)
			}
			future := map[string][]float64{}
			for _, name := range p.Inputs() {
				full := make([]float64, gap+h)
				copy(full, data[name][n0:n0+gap+h])
				future[name] = full
			}
			fc := batchForecast(t, e, window(data, n0), gap+h, future)
			checkPoints(t, "missing outputs", steps, fc)
			plan := make([][]float64, len(p.Inputs()))
			for i, name := range p.Inputs() {
				plan[i] = data[name][n0+gap : n0+gap+h]
			}
			after := make([]predict.Point, h)
			if err := p.Forecast(after, plan); err != nil {
				t.Fatal(err)
			}
			tail := &fit.Forecast{Mean: fc.Mean[gap:], SE: fc.SE[gap:], Lower: fc.Lower[gap:], Upper: fc.Upper[gap:]}
			checkPoints(t, "forecast after the gap", after, tail)
			i := n0 + gap
			if _, err := p.Update(row(p, data, i), data["y"][i]); err != nil || p.Missing() != 0 {
				t.Fatalf("observed output after the gap: error %v, Missing %d", err, p.Missing())
			}
			// The next SE is above sigma (the gap left the history uncertain;
			// its exact values are checked against statsmodels in
			// TestGapReference) and back to sigma, exactly, once the
			// uncertainty has died out (gap.go's covEps).
			want := math.Sqrt(e.Sigma2)
			s, _ := p.Update(row(p, data, i+1), data["y"][i+1])
			if !(s.SE > want*(1+1e-6)) {
				t.Fatalf("SE right after the gap %v, want above sigma %v", s.SE, want)
			}
			for i += 2; i < 580; i++ {
				s, _ = p.Update(row(p, data, i), data["y"][i])
			}
			if s.SE != want {
				t.Fatalf("SE long after the gap %v, want sigma %v", s.SE, want)
			}
		})
	}
}

// TestForecastClosedForms checks Forecast against textbook formulas
// (Box, Jenkins, Reinsel & Ljung 2015, Time Series Analysis, 5th ed.,
// the forecasting chapter): for AR(1) noise about a constant c,
// mean_h = c + phi^h (y_n - c) and SE_h = sigma sqrt((1 - phi^(2h)) /
// (1 - phi^2)); for a random walk (1 - B) y = a, mean_h = y_n and SE_h =
// sigma sqrt(h). Tolerance 1e-13 relative: a few roundings per step.
func TestForecastClosedForms(t *testing.T) {
	const h = 12
	const c, phi = 10.0, 0.7
	k := tf.Coef{Value: c}
	for _, tc := range []struct {
		name    string
		m       tf.Model
		sigma2  float64
		ys      []float64
		want    func(h float64) (mean, se float64) // h steps ahead of the last y
		meanTol float64                            // relative; 0: exactly
	}{
		{"AR(1)", tf.Model{Output: "y", Const: &k, Noise: &tf.Noise{AR: polyOf(1, -phi)}}, 4, []float64{9, 11, 13.5},
			func(h float64) (float64, float64) {
				return c + math.Pow(phi, h)*(13.5-c), math.Sqrt(4 * (1 - math.Pow(phi, 2*h)) / (1 - phi*phi))
			}, 1e-13},
		{"random walk", tf.Model{Output: "y", Diff: polyOf(1, -1), Noise: &tf.Noise{}}, 1, []float64{1, 2, 4},
			func(h float64) (float64, float64) { return 4, math.Sqrt(h) }, 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p := mustPredictor(t, tc.m, tc.sigma2, nil)
			for _, y := range tc.ys {
				if _, err := p.Update(nil, y); err != nil {
					t.Fatal(err)
				}
			}
			got := make([]predict.Point, h)
			if err := p.Forecast(got, nil); err != nil {
				t.Fatal(err)
			}
			for j, g := range got {
				mean, se := tc.want(float64(j + 1))
				if !near(g.Mean, mean, tc.meanTol, mean) || !near(g.SE, se, 1e-13, se) {
					t.Fatalf("step %d: %+v, want mean %v SE %v", j+1, g, mean, se)
				}
			}
		})
	}
}

// TestForecastBadInput: requests Forecast refuses, each with its typed
// error, and a forecast leaves the predictor as it was.
func TestForecastBadInput(t *testing.T) {
	m := fixture.MustModel(t, benchSpec)
	data := record(t, benchSpec, 60, 4)
	p := mustPredictor(t, m, 1, nil)
	dst := make([]predict.Point, 5)
	if err := p.Forecast(dst, nil); !errors.Is(err, predict.ErrShort) ||
		err.Error() != `predict.Predictor.Forecast: series "y": 0 samples, at least 4 needed (samples fed; forecasts start once the start-up samples have settled the states (Predictor.First))` {
		t.Errorf("before First: %v", err)
	}
	if err := p.Warm(data); err != nil {
		t.Fatal(err)
	}
	before, _ := p.MarshalBinary()
	for _, c := range []struct {
		name string
		plan [][]float64
		kind error
		msg  string
	}{
		{"one plan for two inputs", [][]float64{{1}}, predict.ErrLength,
			`predict.Predictor.Forecast: series "plan" has 1 samples against 2 (one slice per input series, in the order of Predictor.Inputs() (nil holds every input at its last value))`},
		{"NaN in a plan", [][]float64{{1, math.NaN()}, nil}, predict.ErrSample,
			`predict.Predictor.Forecast: series "plan[u1]" sample 1 is NaN: samples must be finite numbers`},
	} {
		if err := p.Forecast(dst, c.plan); !errors.Is(err, c.kind) || err.Error() != c.msg {
			t.Errorf("%s: %v\nwant %s", c.name, err, c.msg)
		}
	}
	if err := p.Forecast(dst, [][]float64{{70, 80}, {3}}); err != nil {
		t.Fatal(err)
	}
	if after, _ := p.MarshalBinary(); string(after) != string(before) || p.Count() != 60 {
		t.Error("Forecast changed the predictor")
	}
}
