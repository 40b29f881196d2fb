package fit

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
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
	for _, c := range readScipyCases(t) {
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
	c := tf.Coef{Name: "c", Free: true}
	m := tf.Model{Output: "y", Diff: fixture.Diff1(), Const: &c, Noise: &arma.Noise{}}
	est := mustFit(t, m, map[string][]float64{"y": y}, nil)
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

// TestBadInputForecast checks the typed errors of Forecast.
func TestBadInputForecast(t *testing.T) {
	est, data := plantEstimate(t)
	if _, err := est.Forecast(data, 0, nil); !errors.As(err, new(*tf.SettingError)) || err.Error() != "fit.Estimate.Forecast: h = 0: the horizon must be at least 1" {
		t.Errorf("h = 0: %v", err)
	}
	if _, err := est.Forecast(data, 3, &ForecastSettings{Level: 1.5}); !errors.As(err, new(*tf.SettingError)) ||
		err.Error() != "fit.Estimate.Forecast: ForecastSettings.Level = 1.5: must lie strictly between 0 and 1 (0 means 0.95)" {
		t.Errorf("level 1.5: %v", err)
	}
	var fe *tf.SeriesError
	_, err := est.Forecast(data, 5, &ForecastSettings{Future: map[string][]float64{"x": {1, 2}}})
	if !errors.As(err, &fe) || !errors.Is(err, tf.ErrShort) || fe.Series != "x" || fe.Have != 2 || fe.Need != 5 ||
		err.Error() != `fit.Estimate.Forecast: series "x": 2 samples, at least 5 needed (its values in ForecastSettings.Future: one is needed for every step of the horizon)` {
		t.Errorf("short future: %v", err)
	}
	var se *errs.SampleError
	_, err = est.Forecast(data, 2, &ForecastSettings{Future: map[string][]float64{"x": {1, math.NaN()}}})
	if !errors.As(err, &se) || se.Index != 1 || se.Series != "ForecastSettings.Future[x]" {
		t.Errorf("NaN future: %v", err)
	}
}

func plantEstimate(t *testing.T) (*Estimate, map[string][]float64) {
	t.Helper()
	y, x := fixture.SimulatePlant(fixture.NewRand(5), 300)
	data := map[string][]float64{"y": y, "x": x}
	est := mustFit(t, fixture.PlantModel(), data, nil)
	return est, data
}

// TestForecastARMAInput forecasts an input from an ARMA(1,1) model
// fitted with arma.Fit and checks the input's forecast path against
// arma's own forecasts of the same series (Kalman-filter exact
// forecasts, which equal the conditional recursion used here once the
// MA start-up has died out: theta 0.5 over 400 samples leaves 0.5^400),
// to 1e-8 relative.
func TestForecastARMAInput(t *testing.T) {
	rng := fixture.NewRand(61)
	n, h := 400, 6
	x := fixture.Noise(rng, n, []float64{1, -0.6}, []float64{1, -0.5}, 1)
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
	m := tf.Model{Output: "y", Const: &tf.Coef{Name: "c", Free: true},
		Inputs: []tf.Input{{Series: "x", Num: fixture.Poly(fixture.Factor(fixture.Term(false, "w0", 0, 0))), Delay: 2}}, Noise: &arma.Noise{}}
	data := map[string][]float64{"y": y, "x": x}
	est := mustFit(t, m, data, nil)
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

// TestForecastIntegratingInput forecasts y = c + w0/(1 - B) B x + a,
// fitted with ZeroPreSample, with the future input known. By the model's
// definition (common practice: the integrator sums its input from rest),
// the forecast mean is c + w0 sum_{k <= t-1} x_k and, the noise being
// white, the standard error is sigma at every step; both are computed
// here by direct summation and must agree to 1e-10 relative (summation
// order only). Forecast follows the fit's conditioning: an estimate
// claiming the held-input convention gets a typed error naming the
// cause, never +Inf means with a nil error.
func TestForecastIntegratingInput(t *testing.T) {
	est, data := checkIntegratorFit(t)
	x := data["x"]
	n, h := len(x), 6
	fut := []float64{5, 6, 7, 4, 5, 5}
	fc, err := est.Forecast(data, h, &ForecastSettings{Future: map[string][]float64{"x": fut}})
	if err != nil {
		t.Fatal(err)
	}
	c, _ := est.Param("c")
	w0, _ := est.Param("w0")
	all := append(append([]float64(nil), x...), fut...)
	for j := 0; j < h; j++ {
		sum := 0.0
		for k := 0; k <= n+j-1; k++ {
			sum += all[k]
		}
		want := c.Value + w0.Value*sum
		if math.Abs(fc.Mean[j]-want) > 1e-10*math.Abs(want) {
			t.Errorf("step %d: mean %v, direct sum %v", j+1, fc.Mean[j], want)
		}
		if se := math.Sqrt(est.Sigma2); math.Abs(fc.SE[j]-se) > 1e-12*se {
			t.Errorf("step %d: SE %v, want sigma %v", j+1, fc.SE[j], se)
		}
	}
	held := *est
	held.Conditioning.ZeroPreSample = false
	fc, err = held.Forecast(data, h, &ForecastSettings{Future: map[string][]float64{"x": fut}})
	if !checkIntegratorRefused(err) || fc != nil {
		t.Errorf("held-input integrator: %v, %v", fc, err)
	}
}

// TestBadInputForecastInputModel gives Forecast input models that cannot
// forecast their input and checks each *InputModelError names the input
// and the field; the roots are those of the polynomials as written:
// MA 1 - 2B has its zero at z = 2 (not invertible), AR 1 - 1.5B its root
// at z = 1.5 (explosive), while AR 1 - B (a unit root, integration) is
// accepted.
func TestBadInputForecastInputModel(t *testing.T) {
	est, data := plantEstimate(t)
	ok := InputModel{AR: []float64{1, -0.5}, MA: []float64{1}, C: 0, Sigma2: 1}
	with := func(f func(*InputModel)) map[string]InputModel {
		m := ok
		m.AR = append([]float64(nil), ok.AR...)
		m.MA = append([]float64(nil), ok.MA...)
		f(&m)
		return map[string]InputModel{"x": m}
	}
	for _, tc := range []struct {
		name  string
		ims   map[string]InputModel
		field string
		rule  string
	}{
		{"negative variance", with(func(m *InputModel) { m.Sigma2 = -1 }), "Sigma2", "must be zero or positive and finite"},
		{"NaN variance", with(func(m *InputModel) { m.Sigma2 = math.NaN() }), "Sigma2", "must be zero or positive and finite"},
		{"infinite variance", with(func(m *InputModel) { m.Sigma2 = math.Inf(1) }), "Sigma2", "must be zero or positive and finite"},
		{"infinite constant", with(func(m *InputModel) { m.C = math.Inf(-1) }), "C", "the constant c must be a finite number"},
		{"NaN constant", with(func(m *InputModel) { m.C = math.NaN() }), "C", "the constant c must be a finite number"},
		{"NaN AR", with(func(m *InputModel) { m.AR[1] = math.NaN() }), "AR[1]", "must be a finite number"},
		{"huge MA", with(func(m *InputModel) { m.MA = []float64{1, 1e209} }), "MA[1]", "must be a finite number"},
		{"zero AR constant", with(func(m *InputModel) { m.AR[0] = 0 }), "AR[0]", "constant term must be 1"},
		{"AR constant 2", with(func(m *InputModel) { m.AR[0] = 2 }), "AR[0]", "constant term must be 1"},
		{"MA constant 3", with(func(m *InputModel) { m.MA = []float64{3} }), "MA[0]", "constant term must be 1"},
		{"non-invertible MA", with(func(m *InputModel) { m.MA = []float64{1, -2} }), "MA", "zero on or outside the unit circle"},
		{"explosive AR", with(func(m *InputModel) { m.AR = []float64{1, -1.5} }), "AR", "root outside the unit circle"},
	} {
		_, err := est.Forecast(data, 5, &ForecastSettings{InputModels: tc.ims})
		var ie *tf.SettingError
		if !errors.As(err, &ie) || ie.Setting != `ForecastSettings.InputModels["x"].`+tc.field || !strings.Contains(err.Error(), tc.rule) ||
			!strings.Contains(err.Error(), `ForecastSettings.InputModels["x"].`+tc.field) {
			t.Errorf("%s: %v", tc.name, err)
		}
	}
	if fc, err := est.Forecast(data, 5, &ForecastSettings{InputModels: with(func(m *InputModel) { m.AR = []float64{1, -1} })}); err != nil || fc == nil {
		t.Errorf("unit-root AR refused: %v", err)
	}
	var ue *tf.SeriesError
	_, err := est.Forecast(data, 5, &ForecastSettings{InputModels: map[string]InputModel{"xx": ok}})
	if !errors.As(err, &ue) || ue.Series != "xx" || !errors.Is(err, tf.ErrName) ||
		err.Error() != `fit.Estimate.Forecast: series "xx": named in ForecastSettings.InputModels, it is not an input (the inputs are "x"); check the spelling` {
		t.Errorf("unknown input model: %v", err)
	}
	_, err = est.Forecast(data, 5, &ForecastSettings{Future: map[string][]float64{"valve": {1, 2, 3, 4, 5}}})
	if !errors.As(err, &ue) || !strings.Contains(ue.Detail, "ForecastSettings.Future") || ue.Series != "valve" {
		t.Errorf("unknown future: %v", err)
	}
	var sa *errs.SampleError
	_, err = est.Forecast(data, 2, &ForecastSettings{Future: map[string][]float64{"x": {1, 1e200}}})
	if !errors.As(err, &sa) || sa.Series != "ForecastSettings.Future[x]" || sa.Index != 1 || sa.Limit != MaxMagnitude {
		t.Errorf("huge future: %v", err)
	}
	for _, lv := range []float64{-0.5, 1, math.NaN(), 2} {
		_, err = est.Forecast(data, 2, &ForecastSettings{Level: lv})
		var ae *tf.SettingError
		if !errors.As(err, &ae) || ae.Setting != "ForecastSettings.Level" {
			t.Errorf("level %v: %v", lv, err)
		}
	}
	var ee *errs.ModelError
	bad := *est
	bad.Sigma2 = math.NaN()
	if _, err = bad.Forecast(data, 2, nil); !errors.As(err, &ee) || ee.Part != "estimate's Sigma2 = NaN" {
		t.Errorf("NaN Sigma2: %v", err)
	}
	var nilEst *Estimate
	if _, err = nilEst.Forecast(data, 2, nil); !errors.As(err, &ee) || ee.Part != "estimate" || ee.Op != "fit.Estimate.Forecast" {
		t.Errorf("nil estimate: %v", err)
	}
}

// TestForecastOverflow sets the estimated denominator of a fit to a pole
// at z = 1.5 (unstable): the residuals over the 300 samples stay finite
// (1.5^300 is about 1e53) but a 2000-step forecast grows as 1.5^2000,
// beyond float64. Forecast must return a *SeriesError of kind
// ErrOverflow naming
// the step, never NaN or infinite numbers with a nil error.
func TestForecastOverflow(t *testing.T) {
	est, data := plantEstimate(t)
	bad := *est
	bad.Model = est.Model.Clone()
	bad.Model.Inputs[0].Den.Factors[0].Terms[1].Coef.Value = 1.5
	fc, err := bad.Forecast(data, 2000, &ForecastSettings{Future: map[string][]float64{"x": make([]float64, 2000)}})
	var ne *tf.SeriesError
	if !errors.As(err, &ne) || !errors.Is(err, tf.ErrOverflow) || fc != nil || !strings.Contains(ne.Series, "forecast") || !strings.Contains(ne.Detail, "at index ") || !strings.Contains(err.Error(), "overflowed float64") {
		t.Fatalf("overflowing forecast: %v, %v", fc != nil, err)
	}
}

// TestForecastPlanOutsideRecord gives a known future input that leaves
// the range of the record and checks the warning names the input and
// both ranges (the record's from the data, the plan's from the values
// given); a plan inside the range gets no such warning, and a forecast
// from an unsound estimate (a 20-row fit of 5 coefficients) carries the
// estimate's faults as a warning.
func TestForecastPlanOutsideRecord(t *testing.T) {
	est, data := plantEstimate(t)
	lo, hi := valueRange(data["x"])
	plan := []float64{lo, hi + 1, (lo + hi) / 2}
	fc, err := est.Forecast(data, 3, &ForecastSettings{Future: map[string][]float64{"x": plan}})
	if err != nil {
		t.Fatal(err)
	}
	if len(fc.Warnings) != 1 {
		t.Fatalf("warnings %+v", fc.Warnings)
	}
	w := fc.Warnings[0]
	if w.Kind != PlanOutsideRecord || w.Input != "x" || w.RecordMin != lo || w.RecordMax != hi || w.PlanMin != lo || w.PlanMax != hi+1 {
		t.Errorf("warning %+v; record %v..%v", w, lo, hi)
	}
	want := `input "x": the planned values span ` + formatSig(lo, 6) + " .. " + formatSig(hi+1, 6) + ", outside the range " + formatSig(lo, 6) + " .. " + formatSig(hi, 6) + " seen in the record"
	if !strings.HasPrefix(w.Message, want) {
		t.Errorf("message %q, want prefix %q", w.Message, want)
	}
	if fc.Inputs[0].RecordMin != lo || fc.Inputs[0].RecordMax != hi {
		t.Errorf("input record range %v..%v", fc.Inputs[0].RecordMin, fc.Inputs[0].RecordMax)
	}
	fc, err = est.Forecast(data, 3, &ForecastSettings{Future: map[string][]float64{"x": {lo, hi, (lo + hi) / 2, 1e9}}})
	if err != nil || len(fc.Warnings) != 0 {
		t.Errorf("plan inside the record (a value beyond h is not used): %v, %+v", err, fc.Warnings)
	}
	y, x := fixture.SimulatePlant(fixture.NewRand(4), 20)
	small := map[string][]float64{"y": y, "x": x}
	e20, err := Model(t.Context(), fixture.PlantModel(), small, nil)
	if err != nil {
		t.Fatal(err)
	}
	fc, err = e20.Forecast(small, 2, nil)
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, w := range fc.Warnings {
		found = found || (w.Kind == UnsoundEstimate && strings.Contains(w.Message, "not to be trusted") && strings.Contains(w.Message, "fewer than max(50, 10 per coefficient) = 50"))
	}
	if !found {
		t.Errorf("no unsound-estimate warning: %+v", fc.Warnings)
	}
}

// TestBadInputForecastHorizon checks that a horizon above MaxHorizon is
// a *SettingError naming h and the limit, returned at once: without the
// limit h = 1<<40 would ask for terabytes of forecast series.
func TestBadInputForecastHorizon(t *testing.T) {
	y := []float64{0, 1, 0.5, 1.5, 1, 2, 1.2, 2.5, 2, 3, 2.2, 3.4}
	c := tf.Coef{Name: "c", Free: true}
	m := tf.Model{Output: "y", Diff: fixture.Diff1(), Const: &c, Noise: &arma.Noise{}}
	data := map[string][]float64{"y": y}
	est := mustFit(t, m, data, nil)
	for _, h := range []int{MaxHorizon + 1, 1 << 40, math.MaxInt} {
		fc, err := est.Forecast(data, h, nil)
		var ae *tf.SettingError
		if !errors.As(err, &ae) || ae.Setting != "h" || ae.Value != strconv.Itoa(h) {
			t.Fatalf("h = %d: got %v, %v; want *SettingError for h", h, fc != nil, err)
		}
		if msg := err.Error(); !strings.Contains(msg, "fit.Estimate.Forecast: h = ") || !strings.Contains(msg, "must be at most tf.MaxHorizon (1048576 steps)") {
			t.Errorf("h = %d: message %q", h, msg)
		}
	}
	if testing.Short() {
		return
	}
	fc, err := est.Forecast(data, MaxHorizon, nil)
	if err != nil || len(fc.Mean) != MaxHorizon {
		t.Fatalf("h = MaxHorizon: %v", err)
	}
}

// FuzzForecast forecasts from a fit of fixture.PlantModel (300 samples of its
// own simulation) with fuzzed horizons, levels, known future values,
// input models, estimates (the denominator, noise AR and variance
// overwritten) and data (one sample overwritten), NaN and huge values
// included. Every call must return a typed error of the library or a
// result whose every number is finite; never a panic.
func FuzzForecast(f *testing.F) {
	y, x := fixture.SimulatePlant(fixture.NewRand(5), 300)
	base := map[string][]float64{"y": y, "x": x}
	est, err := Model(context.Background(), fixture.PlantModel(), base, nil)
	if err != nil {
		f.Fatal(err)
	}
	f.Add(int16(5), 0.95, true, 1.0, 2.0, 0.5, 0.0, 0.0, 1.0, 0.6, 0.5, 1.0, uint16(10), 0.0, false)
	f.Add(int16(0), 0.0, false, 0.0, 0.0, 0.5, 0.3, 5.0, 1.0, 0.6, 0.5, 1.0, uint16(10), 0.0, false)
	f.Add(int16(40), 0.5, false, 0.0, 0.0, 1.0, -2.0, math.Inf(1), -1.0, 1.5, 1.0, math.NaN(), uint16(3), 1e300, true)
	f.Add(int16(3000), 0.99, true, 1e150, -1e150, 0.999, 0.999, 1e100, 1e100, 0.9999, 0.9999, 1e200, uint16(299), math.NaN(), true)
	f.Fuzz(func(t *testing.T, h int16, level float64, known bool, f1, f2, ar1, ma1, mean, sig2, d1, p1, s2 float64, at uint16, v float64, touch bool) {
		e := *est
		e.Model = est.Model.Clone()
		if touch {
			e.Model.Inputs[0].Den.Factors[0].Terms[1].Coef.Value = d1
			e.Model.Noise.AR.Factors[0].Terms[1].Coef.Value = p1
			e.Sigma2 = s2
		}
		data := map[string][]float64{"y": base["y"], "x": append([]float64(nil), base["x"]...)}
		if touch {
			data["x"][int(at)%len(data["x"])] = v
		}
		set := &ForecastSettings{Level: level}
		hh := int(h)
		if known {
			fut := make([]float64, max(hh, 0))
			for i := range fut {
				fut[i] = f1 + f2*float64(i%7)
			}
			set.Future = map[string][]float64{"x": fut}
		} else {
			set.InputModels = map[string]InputModel{"x": {AR: []float64{1, -ar1}, MA: []float64{1, -ma1}, C: mean, Sigma2: sig2}}
		}
		fc, err := e.Forecast(data, hh, set)
		if err != nil {
			if !hasKind(err) {
				t.Fatalf("error of no kind %T: %v", err, err)
			}
			return
		}
		for _, s := range [][]float64{fc.Mean, fc.SE, fc.Lower, fc.Upper} {
			for j, v := range s {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("step %d: %v with a nil error", j+1, v)
				}
			}
		}
		for _, in := range fc.Inputs {
			for j, v := range in.Values {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("input %s step %d: %v with a nil error", in.Series, j+1, v)
				}
			}
		}
	})
}

// TestForecastInputsForecast checks the forecast intervals when the input
// is itself forecast from its AR model (fitted by Yule-Walker): over 100
// replicates x 10 steps the 95 % intervals cover 92-98 % of the futures.
// The standard errors equal those with the input known for the first
// b = 3 steps (which use only observed inputs) and exceed them after.
func TestForecastInputsForecast(t *testing.T) {
	const reps, n, h = 100, 400, 10
	rng := rand.New(rand.NewPCG(77, 78))
	in, total := 0, 0
	for r := 0; r < reps; r++ {
		y, x, est, data := replicatePlant(t, rng, n, h)
		fc, err := est.Forecast(data, h, nil)
		if err != nil {
			t.Fatal(err)
		}
		if fc.Inputs[0].Known || len(fc.Inputs[0].Model.AR) < 1 {
			t.Fatalf("input should be forecast: %+v", fc.Inputs[0])
		}
		known, err := est.Forecast(data, h, &ForecastSettings{Future: map[string][]float64{"x": x[n:]}})
		if err != nil {
			t.Fatal(err)
		}
		for j := 0; j < h; j++ {
			if j < 3 && math.Abs(fc.SE[j]-known.SE[j]) > 1e-12*known.SE[j] || j >= 3 && fc.SE[j] <= known.SE[j] {
				t.Fatalf("step %d: SE %v with the input forecast, %v with it known", j+1, fc.SE[j], known.SE[j])
			}
		}
		for j := 0; j < h; j++ {
			total++
			if y[n+j] >= fc.Lower[j] && y[n+j] <= fc.Upper[j] {
				in++
			}
		}
	}
	if f := float64(in) / float64(total); f < 0.92 || f > 0.98 {
		t.Errorf("forecast intervals with forecast inputs cover %.3f of %d futures", f, total)
	}
}
