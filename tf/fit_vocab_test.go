package tf

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"
)

// TestSettingsValidate checks the exported Validate of every settings
// struct of the estimation side: the one rule (zero means the default,
// a negative count or a probability outside (0, 1) is an error), a
// *SettingError naming the caller's field, Op naming Validate itself;
// the zero value is valid.
func TestSettingsValidate(t *testing.T) {
	for _, tc := range []struct {
		err  error
		want string
	}{
		{FitSettings{Starts: -1}.Validate(), "tf.FitSettings.Validate: FitSettings.Starts = -1: must be zero or positive"},
		{CheckSettings{CrossLags: -1}.Validate(), "tf.CheckSettings.Validate: CheckSettings.CrossLags = -1: must be zero or positive (0 means Lags)"},
		{CheckSettings{Alpha: 1.5}.Validate(), "tf.CheckSettings.Validate: CheckSettings.Alpha = 1.5: must lie strictly between 0 and 1 (0 means 0.05)"},
		{ForecastSettings{Level: -0.1}.Validate(), "tf.ForecastSettings.Validate: ForecastSettings.Level = -0.1: must lie strictly between 0 and 1 (0 means 0.95)"},
		{ForecastSettings{InputModels: map[string]InputModel{"x": {Sigma2: math.NaN()}}}.Validate(),
			`tf.ForecastSettings.Validate: ForecastSettings.InputModels["x"].Sigma2 = NaN: the innovation variance must be zero or positive and finite`},
		{IdentifySettings{Forms: -1}.Validate(), "tf.IdentifySettings.Validate: IdentifySettings.Forms = -1: must be zero or positive (0 means 2)"},
		{IdentifySettings{Fit: &FitSettings{Tol: -1}}.Validate(), "tf.IdentifySettings.Validate: IdentifySettings.Fit.Tol = -1: must be a finite number, zero or positive"},
		{IdentifySettings{OutputDiff: []float64{1, math.Inf(1)}}.Validate(), "tf.IdentifySettings.Validate: IdentifySettings.OutputDiff[1] = +Inf: a differencing coefficient must be a finite number"},
	} {
		var se *SettingError
		if !errors.As(tc.err, &se) || !errors.Is(tc.err, ErrSetting) || !strings.HasPrefix(tc.err.Error(), tc.want) {
			t.Errorf("got %v\nwant %s", tc.err, tc.want)
		}
	}
	for _, err := range []error{FitSettings{}.Validate(), CheckSettings{}.Validate(), ForecastSettings{}.Validate(), IdentifySettings{}.Validate(),
		IdentifySettings{MaxR: -1, MaxP: -1, InputDiff: map[string][]float64{"x": {1, -1}}}.Validate()} {
		if err != nil {
			t.Errorf("valid settings refused: %v", err)
		}
	}
}

// TestCandidateStringNamesCriterion checks that a candidate's summary
// names its ranking criterion (it printed "score" for the BIC) and the
// structure in the one spelling.
func TestCandidateStringNamesCriterion(t *testing.T) {
	data := identifyTrapData()
	for _, byAIC := range []bool{false, true} {
		cands, err := Identify(context.Background(), "y", []string{"x"}, data, &IdentifySettings{NoRefine: true, MaxCandidates: 2, ByAIC: byAIC})
		if err != nil {
			t.Fatal(err)
		}
		c := cands[0]
		crit, score := "BIC", c.Estimate.BIC
		if byAIC {
			crit, score = "AIC", c.Estimate.AIC
		}
		head := strings.SplitN(c.String(), "\n", 2)[0]
		if c.Criterion != crit || c.Score != score || !strings.HasPrefix(head, "#1 "+crit+" ") || strings.Contains(head, "score") ||
			!strings.HasSuffix(head, "  "+StructureLabel(c.Structure)) || !strings.Contains(head, "noise ARMA(") {
			t.Errorf("ByAIC %v: criterion %q, score %v (estimate %v), summary %q", byAIC, c.Criterion, c.Score, score, head)
		}
	}
}

// TestErrorsOfInnerStagesNameTheCaller checks that an error found by an
// inner stage carries the Op of the function the caller called: Fit's
// data check run inside Check and Forecast says tf.Check and
// tf.Estimate.Forecast, not tf.Fit.
func TestErrorsOfInnerStagesNameTheCaller(t *testing.T) {
	est, data := mcEstimate(t)
	short := map[string][]float64{"y": data["y"], "x": data["x"][:100]}
	_, err := Check(est, short, nil)
	var se *SeriesError
	if !errors.As(err, &se) || se.Op != "tf.Check" || !errors.Is(err, ErrLength) || !strings.HasPrefix(err.Error(), `tf.Check: series "x" has 100 samples, 300 expected`) {
		t.Errorf("Check: %v", err)
	}
	_, err = est.Forecast(short, 3, nil)
	if !errors.As(err, &se) || se.Op != "tf.Estimate.Forecast" || !errors.Is(err, ErrLength) {
		t.Errorf("Forecast: %v", err)
	}
}
