package tf

import (
	"context"
	"errors"
	"github.com/backshift/backshift/internal/errs"
	"math"
	"testing"

	"github.com/backshift/backshift/arma"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestForecastAgainstScipy compares forecasts from origin n - 10 with the
// future inputs known (the model fitted on all n samples) with the
// independent numpy/scipy.signal.lfilter 1.10.1 implementation in
// testdata/fit/ref_fit.py at the scipy estimates. The estimates agree to
// ~1e-7 relative, so means and standard errors agree to 1e-6 relative.
// The same holds with every input forecast from a Yule-Walker/AIC
// autoregression of its differenced series (numpy Durbin-Levinson in the
// script, R's var.pred convention), the input forecast errors entering
// the variance.
func TestForecastAgainstScipy(t *testing.T) {
	for _, c := range readRef(t) {
		t.Run(c.Name, func(t *testing.T) {
			est, data := c.fit(t)
			o := c.Forecast.Origin
			hist := map[string][]float64{}
			fut := map[string][]float64{}
			for k, v := range data {
				hist[k] = v[:o]
				fut[k] = v[o:]
			}
			fc, err := est.Forecast(hist, c.Forecast.H, &ForecastSettings{Future: fut})
			if err != nil {
				t.Fatal(err)
			}
			if fc.Origin != o {
				t.Errorf("origin %d, want %d", fc.Origin, o)
			}
			for j := range c.Forecast.Mean {
				if !scalar.EqualWithinRel(fc.Mean[j], c.Forecast.Mean[j], 1e-6) || !scalar.EqualWithinRel(fc.SE[j], c.Forecast.SE[j], 1e-6) {
					t.Errorf("step %d: %.10g (SE %.8g), scipy %.10g (SE %.8g)", j+1, fc.Mean[j], fc.SE[j], c.Forecast.Mean[j], c.Forecast.SE[j])
				}
			}
			// Inputs forecast from their own Yule-Walker/AIC autoregressions.
			fa, err := est.Forecast(hist, c.Forecast.H, nil)
			if err != nil {
				t.Fatal(err)
			}
			for j := range c.Forecast.MeanAR {
				if !scalar.EqualWithinRel(fa.Mean[j], c.Forecast.MeanAR[j], 1e-6) || !scalar.EqualWithinRel(fa.SE[j], c.Forecast.SEAR[j], 1e-6) {
					t.Errorf("AR inputs, step %d: %.10g (SE %.8g), numpy %.10g (SE %.8g)", j+1, fa.Mean[j], fa.SE[j], c.Forecast.MeanAR[j], c.Forecast.SEAR[j])
				}
			}
		})
	}
}

// TestForecastRandomWalk checks the textbook case (common practice): for
// (1 - B) y_t = a_t the forecast is the last value at every horizon with
// standard error sigma sqrt(h), and the 95 % interval is -/+ 1.959964 SE.
// The drift is estimated by Levenberg-Marquardt, whose damped last step
// leaves a relative error near 1e-9 even on this linear problem, hence
// the 1e-8 tolerance on the drift and the means.
func TestForecastRandomWalk(t *testing.T) {
	y := []float64{0, 1, 0.5, 1.5, 1, 2, 1.2, 2.5, 2, 3, 2.2, 3.4}
	c := Coef{Name: "c", Free: true}
	m := Model{Output: "y", Diff: diff1, Const: &c, Noise: &arma.Noise{}}
	est, err := Fit(context.Background(), m, map[string][]float64{"y": y}, nil)
	if err != nil {
		t.Fatal(err)
	}
	// The drift c is the mean difference, (3.4 - 0)/11.
	if !scalar.EqualWithinAbsOrRel(est.Params[0].Value, 3.4/11, 1e-12, 1e-8) {
		t.Errorf("drift %v, want %v", est.Params[0].Value, 3.4/11)
	}
	fc, err := est.Forecast(map[string][]float64{"y": y}, 4, nil)
	if err != nil {
		t.Fatal(err)
	}
	for j := 0; j < 4; j++ {
		want := 3.4 + float64(j+1)*3.4/11
		se := math.Sqrt(est.Sigma2 * float64(j+1))
		if !scalar.EqualWithinAbsOrRel(fc.Mean[j], want, 1e-12, 1e-8) || !scalar.EqualWithinRel(fc.SE[j], se, 1e-12) ||
			!scalar.EqualWithinRel(fc.Upper[j]-fc.Mean[j], 1.959963984540054*se, 1e-9) {
			t.Errorf("h=%d: %v (SE %v), want %v (SE %v)", j+1, fc.Mean[j], fc.SE[j], want, se)
		}
	}
}

// TestForecastErrors checks the typed errors of Forecast.
func TestForecastErrors(t *testing.T) {
	est, data := mcEstimate(t)
	if _, err := est.Forecast(data, 0, nil); !errors.As(err, new(*SettingError)) || err.Error() != "tf.Estimate.Forecast: h = 0: the horizon must be at least 1" {
		t.Errorf("h = 0: %v", err)
	}
	if _, err := est.Forecast(data, 3, &ForecastSettings{Level: 1.5}); !errors.As(err, new(*SettingError)) ||
		err.Error() != "tf.Estimate.Forecast: ForecastSettings.Level = 1.5: must lie strictly between 0 and 1 (0 means 0.95)" {
		t.Errorf("level 1.5: %v", err)
	}
	var fe *SeriesError
	_, err := est.Forecast(data, 5, &ForecastSettings{Future: map[string][]float64{"x": {1, 2}}})
	if !errors.As(err, &fe) || !errors.Is(err, ErrShort) || fe.Series != "x" || fe.Have != 2 || fe.Need != 5 ||
		err.Error() != `tf.Estimate.Forecast: series "x": 2 samples, at least 5 needed (its values in ForecastSettings.Future: one is needed for every step of the horizon)` {
		t.Errorf("short future: %v", err)
	}
	var se *errs.SampleError
	_, err = est.Forecast(data, 2, &ForecastSettings{Future: map[string][]float64{"x": {1, math.NaN()}}})
	if !errors.As(err, &se) || se.Index != 1 || se.Series != "future x" {
		t.Errorf("NaN future: %v", err)
	}
}

func mcEstimate(t *testing.T) (*Estimate, map[string][]float64) {
	t.Helper()
	y, x := mcSim(newRand(5), 300)
	data := map[string][]float64{"y": y, "x": x}
	est, err := Fit(context.Background(), mcModel(), data, nil)
	if err != nil {
		t.Fatal(err)
	}
	return est, data
}

// TestForecastARMAInput forecasts an input from an ARMA(1,1) model
// fitted with arma.Fit and checks the input's forecast path against
// arma's own forecasts of the same series (Kalman-filter exact
// forecasts, which equal the conditional recursion used here once the
// MA start-up has died out: theta 0.5 over 400 samples leaves 0.5^400),
// to 1e-8 relative.
func TestForecastARMAInput(t *testing.T) {
	rng := newRand(61)
	n, h := 400, 6
	x := simNoise(rng, n, []float64{1, -0.6}, []float64{1, -0.5}, 1)
	for i := range x {
		x[i] += 5
	}
	u := make([]float64, n)
	for i := 2; i < n; i++ {
		u[i] = 0.8 * x[i-2]
	}
	y := make([]float64, n)
	for i := range y {
		y[i] = 1 + u[i] + 0.3*rng.NormFloat64()
	}
	ar, err := arma.Fit(context.Background(), x, arma.Order{P: 1, Q: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	af, err := ar.Forecast(h, 0.95, nil)
	if err != nil {
		t.Fatal(err)
	}
	m := Model{Output: "y", Const: &Coef{Name: "c", Free: true},
		Inputs: []Input{{Series: "x", Num: mkPoly(mkFactor(mkTerm(false, "w0", 0, 0))), Delay: 2}}, Noise: &arma.Noise{}}
	data := map[string][]float64{"y": y, "x": x}
	est, err := Fit(context.Background(), m, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	im := InputModel{AR: ar.Model.ARPoly(), MA: ar.Model.MAPoly(), C: ar.Model.Mean, Sigma2: ar.Model.Sigma2}
	fc, err := est.Forecast(data, h, &ForecastSettings{InputModels: map[string]InputModel{"x": im}})
	if err != nil {
		t.Fatal(err)
	}
	for j := 0; j < h; j++ {
		if !scalar.EqualWithinRel(fc.Inputs[0].Values[j], af.Mean[j], 1e-8) {
			t.Errorf("input step %d: %v, arma %v", j+1, fc.Inputs[0].Values[j], af.Mean[j])
		}
	}
	// With b = 2 the output's first two steps use observed inputs only.
	w0, _ := est.Param("w0")
	if want := math.Sqrt(est.Sigma2 + w0.Value*w0.Value*ar.Model.Sigma2); !scalar.EqualWithinRel(fc.SE[2], want, 1e-12) {
		t.Errorf("step 3 SE %v, want sqrt(sigma2 + w0^2 sigma_x^2) = %v", fc.SE[2], want)
	}
}
