package tf

import (
	"errors"
	"github.com/backshift/backshift/internal/errs"
	"math"
	"strings"
	"testing"
)

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

// TestForecastInputModelErrors gives Forecast input models that cannot
// forecast their input and checks each *InputModelError names the input
// and the field; the roots are those of the polynomials as written:
// MA 1 - 2B has its zero at z = 2 (not invertible), AR 1 - 1.5B its root
// at z = 1.5 (explosive), while AR 1 - B (a unit root, integration) is
// accepted.
func TestForecastInputModelErrors(t *testing.T) {
	est, data := mcEstimate(t)
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
		var ie *SettingError
		if !errors.As(err, &ie) || ie.Setting != `ForecastSettings.InputModels["x"].`+tc.field || !strings.Contains(err.Error(), tc.rule) ||
			!strings.Contains(err.Error(), `ForecastSettings.InputModels["x"].`+tc.field) {
			t.Errorf("%s: %v", tc.name, err)
		}
	}
	if fc, err := est.Forecast(data, 5, &ForecastSettings{InputModels: with(func(m *InputModel) { m.AR = []float64{1, -1} })}); err != nil || fc == nil {
		t.Errorf("unit-root AR refused: %v", err)
	}
	var ue *SeriesError
	_, err := est.Forecast(data, 5, &ForecastSettings{InputModels: map[string]InputModel{"xx": ok}})
	if !errors.As(err, &ue) || ue.Series != "xx" || !errors.Is(err, ErrName) ||
		err.Error() != `tf.Estimate.Forecast: series "xx" is not known (named in ForecastSettings.InputModels, it is not an input (the inputs are "x"); check the spelling)` {
		t.Errorf("unknown input model: %v", err)
	}
	_, err = est.Forecast(data, 5, &ForecastSettings{Future: map[string][]float64{"valve": {1, 2, 3, 4, 5}}})
	if !errors.As(err, &ue) || !strings.Contains(ue.Detail, "ForecastSettings.Future") || ue.Series != "valve" {
		t.Errorf("unknown future: %v", err)
	}
	var sa *errs.SampleError
	_, err = est.Forecast(data, 2, &ForecastSettings{Future: map[string][]float64{"x": {1, 1e200}}})
	if !errors.As(err, &sa) || sa.Series != "future x" || sa.Index != 1 || sa.Limit != FitMaxMagnitude {
		t.Errorf("huge future: %v", err)
	}
	for _, lv := range []float64{-0.5, 1, math.NaN(), 2} {
		_, err = est.Forecast(data, 2, &ForecastSettings{Level: lv})
		var ae *SettingError
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
	if _, err = nilEst.Forecast(data, 2, nil); !errors.As(err, &ee) || ee.Part != "estimate" || ee.Op != "tf.Estimate.Forecast" {
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
	est, data := mcEstimate(t)
	bad := *est
	bad.Model = est.Model.Clone()
	bad.Model.Inputs[0].Den.Factors[0].Terms[1].Coef.Value = 1.5
	fc, err := bad.Forecast(data, 2000, &ForecastSettings{Future: map[string][]float64{"x": make([]float64, 2000)}})
	var ne *SeriesError
	if !errors.As(err, &ne) || !errors.Is(err, ErrOverflow) || fc != nil || !strings.Contains(ne.Series, "forecast") || !strings.Contains(ne.Detail, "at index ") || !strings.Contains(err.Error(), "overflowed float64") {
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
	est, data := mcEstimate(t)
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
	y, x := mcSim(newRand(4), 20)
	small := map[string][]float64{"y": y, "x": x}
	e20, err := Fit(t.Context(), mcModel(), small, nil)
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
