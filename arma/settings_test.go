package arma

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"
)

// TestSettingsValidate: every field of FitSettings, SimSettings and
// Grid with a bad value gives a typed error naming the field, from
// Validate and from the call that takes the settings. Fields with no bad
// value: FitSettings.Name and AllowNonInvertible, SimSettings.Seed1 and
// Seed2 (any string, bool or seed). SimSettings.BurnIn negative is
// documented (none) and accepted.
func TestSettingsValidate(t *testing.T) {
	y, err := Simulate(Model{AR: []float64{0.5}, Sigma2: 1}, 120, &SimSettings{Seed1: 5})
	if err != nil {
		t.Fatal(err)
	}
	t.Run("FitSettings", func(t *testing.T) { checkFitSettingsErrors(t, y) })
	t.Run("SimSettings", checkSimSettingsErrors)
	t.Run("Grid", func(t *testing.T) { checkGridErrors(t, y) })
	t.Run("defaults", func(t *testing.T) {
		var nilOpt *FitSettings
		var nilSim *SimSettings
		if nilOpt.Validate() != nil || nilSim.Validate() != nil || (Grid{}).Validate() != nil {
			t.Error("the defaults do not validate")
		}
	})
}

// isSettingErr matches a *SettingError on field.
func isSettingErr(field string) func(error) bool {
	return func(err error) bool { var e *SettingError; return errors.As(err, &e) && e.Setting == field }
}

// isSampleErrAt matches a *SampleError at sample i of series.
func isSampleErrAt(series string, i int) func(error) bool {
	return func(err error) bool {
		var e *SampleError
		return errors.As(err, &e) && e.Series == series && e.Index == i
	}
}

// checkFitSettingsErrors checks each bad FitSettings value through
// Validate, Fit, FitNoise and Select on y (120 samples): the error, its
// wording and its Op.
func checkFitSettingsErrors(t *testing.T, y []float64) {
	ctx := context.Background()
	col := func(v ...float64) []float64 {
		c := make([]float64, len(y))
		for i := range c {
			c[i] = float64(i)
		}
		copy(c[3:], v)
		return c
	}
	nan := math.NaN()
	opts := []struct {
		o    FitSettings
		ok   func(error) bool
		want string
	}{
		{FitSettings{Constant: 3}, isSettingErr("FitSettings.Constant"), "FitSettings.Constant = 3: unknown ConstantRule"},
		{FitSettings{Constant: -1}, isSettingErr("FitSettings.Constant"), "ConstantFree"},
		{FitSettings{Regressors: [][]float64{col(), col()[:50]}}, isSettingErr("FitSettings.Regressors"), "FitSettings.Regressors = column x2 of 50 samples: every column needs the series' length, and x1 has 120"},
		{FitSettings{Regressors: [][]float64{col(), col(nan)}, RegressorNames: []string{"a", "valve"}}, isSampleErrAt("valve", 3), `series "valve" sample 3 is NaN`},
		{FitSettings{Regressors: [][]float64{col(1e300)}}, isSampleErrAt("x1", 3), "beyond the largest magnitude accepted, 1e+140"},
		{FitSettings{Regressors: [][]float64{col()}, RegressorNames: []string{"a", "b"}}, isSettingErr("FitSettings.RegressorNames"), "FitSettings.RegressorNames = 2 names: give one name per regressor column (1)"},
		{FitSettings{Regressors: [][]float64{col(), col()}, RegressorNames: []string{"a", "a"}}, isSettingErr("FitSettings.RegressorNames"), `"a": used twice`},
		{FitSettings{Regressors: [][]float64{col()}, RegressorNames: []string{""}}, isSettingErr("FitSettings.RegressorNames"), "empty name"},
		{FitSettings{Regressors: [][]float64{col()}, RegressorNames: []string{"c"}}, isSettingErr("FitSettings.RegressorNames"), `"c": is reserved for the constant c`},
		{FitSettings{Held: map[string]float64{"phi1": nan}}, isSettingErr(`FitSettings.Held["phi1"]`), `FitSettings.Held["phi1"] = NaN: must be finite`},
		{FitSettings{StartValues: map[string]float64{"phi1": math.Inf(1)}}, isSettingErr(`FitSettings.StartValues["phi1"]`), `FitSettings.StartValues["phi1"] = +Inf: must be finite`},
		{FitSettings{First: -2}, isSettingErr("FitSettings.First"), "FitSettings.First = -2: must not be negative"},
		{FitSettings{MaxIter: -1}, isSettingErr("FitSettings.MaxIter"), "FitSettings.MaxIter = -1: must not be negative (zero means 500)"},
		{FitSettings{Tol: -1e-3}, isSettingErr("FitSettings.Tol"), "[0, 1)"},
		{FitSettings{Tol: 1}, isSettingErr("FitSettings.Tol"), "[0, 1)"},
		{FitSettings{Tol: nan}, isSettingErr("FitSettings.Tol"), "FitSettings.Tol = NaN: must be in [0, 1) (zero means 1e-14)"},
	}
	for _, c := range opts {
		calls := map[string]error{
			"Validate": c.o.Validate(),
			"Fit":      second(Fit(ctx, y, Order{P: 1}, &c.o)),
			"FitNoise": second(FitNoise(ctx, y, Model{AR: []float64{0.1}}.Noise(), nil, &c.o)),
			"Select":   second(Select(ctx, y, Grid{MaxP: 1}, &c.o)),
		}
		for how, err := range calls {
			if !c.ok(err) || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s %+v: %T %v, want the field's error with %q", how, c.o, err, err, c.want)
			}
			// Op names the function called.
			if op := "arma." + how; how == "Validate" && !strings.HasPrefix(err.Error(), "arma.FitSettings.Validate: ") ||
				how != "Validate" && !strings.HasPrefix(err.Error(), op+": ") {
				t.Errorf("%s: %v does not start with its Op", how, err)
			}
		}
	}
}

// checkSimSettingsErrors checks each bad SimSettings value through
// Validate and Simulate, and that a negative BurnIn is accepted.
func checkSimSettingsErrors(t *testing.T) {
	sims := []struct {
		s    SimSettings
		ok   func(error) bool
		want string
	}{
		{SimSettings{BurnIn: MaxSamples + 1}, isSettingErr("SimSettings.BurnIn"), "above MaxSamples"},
		{SimSettings{Innovations: []float64{0, 1, math.Inf(-1)}}, isSampleErrAt("innovations", 2), `series "innovations" sample 2 is -Inf`},
	}
	for _, c := range sims {
		for how, err := range map[string]error{"Validate": c.s.Validate(), "Simulate": second(Simulate(Model{Sigma2: 1}, 3, &c.s))} {
			if !c.ok(err) || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s %+v: %T %v, want the field's error with %q", how, c.s, err, err, c.want)
			}
		}
	}
	if _, err := Simulate(Model{Sigma2: 1}, 2, &SimSettings{Innovations: []float64{1}}); !isSettingErr("SimSettings.Innovations")(err) || err.Error() != "arma.Simulate: SimSettings.Innovations = 1 values: needs n = 2 values" {
		t.Errorf("innovations of the wrong length: %v", err)
	}
	if _, err := Simulate(Model{Sigma2: 1}, 3, &SimSettings{BurnIn: -5}); err != nil {
		t.Errorf("documented negative BurnIn: %v", err)
	}
}

// checkGridErrors checks each bad Grid value through Validate and Select
// on y.
func checkGridErrors(t *testing.T, y []float64) {
	ctx := context.Background()
	grids := []struct {
		g     Grid
		field string
		want  string
	}{
		{Grid{MaxP: -1}, "Grid.MaxP", "must not be negative"},
		{Grid{MaxQ: -1}, "Grid.MaxQ", "must not be negative"},
		{Grid{D: -1}, "Grid.D", "must not be negative"},
		{Grid{SP: -1, Period: 4}, "Grid.SP", "must not be negative"},
		{Grid{SD: -1, Period: 4}, "Grid.SD", "must not be negative"},
		{Grid{SQ: -1, Period: 4}, "Grid.SQ", "must not be negative"},
		{Grid{SQ: 1, Period: 1}, "Grid", "Period >= 2"},
		{Grid{Period: -12}, "Grid.Period", "must not be negative"},
		{Grid{MaxP: MaxLag + 1}, "Grid", "above MaxLag"},
		{Grid{Criterion: 9}, "Grid.Criterion", "Grid.Criterion = 9: unknown Criterion; use ByBIC (the default), ByAICc or ByAIC"},
		{Grid{Workers: -2}, "Grid.Workers", "must not be negative"},
	}
	for _, c := range grids {
		for how, err := range map[string]error{"Validate": c.g.Validate(), "Select": second(Select(ctx, y, c.g, nil))} {
			if !isSettingErr(c.field)(err) || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s %+v: %T %v, want a *SettingError on %s with %q", how, c.g, err, err, c.field, c.want)
			}
		}
	}
}

func second[T any](_ T, err error) error { return err }

// TestModelCoefficientMessages: a NaN or infinite coefficient of a
// Model is reported with the slice and index that hold it.
func TestModelCoefficientMessages(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	cases := []struct {
		name string
		err  error
		want string
	}{
		{"Simulate SAR", second(Simulate(Model{SAR: []float64{0.1, nan}, Period: 4, Sigma2: 1}, 5, nil)), "arma.Simulate: model SAR[1]: is NaN: coefficients must be finite"},
		{"Simulate Mean", second(Simulate(Model{Mean: inf, Sigma2: 1}, 5, nil)), "arma.Simulate: model Mean: is +Inf"},
		{"Simulate Sigma2", second(Simulate(Model{Sigma2: -2}, 5, nil)), "arma.Simulate: model Sigma2: is -2: a variance must not be negative"},
		{"Stationary AR", func() error { _, _, err := Model{AR: []float64{inf}}.Stationary(); return err }(), "arma.Model.Stationary: model AR[0]: is +Inf"},
		{"Invertible SMA", func() error { _, _, err := Model{SMA: []float64{nan}, Period: 2}.Invertible(); return err }(), "arma.Model.Invertible: model SMA[0]: is NaN"},
		{"Psi MA", second(Model{MA: []float64{0.2, 0.1, nan}}.Psi(3)), "arma.Model.Psi: model MA[2]: is NaN"},
	}
	for _, c := range cases {
		var ae *ModelError
		if !errors.As(c.err, &ae) || !strings.Contains(c.err.Error(), c.want) {
			t.Errorf("%s: %T %v, want %q", c.name, c.err, c.err, c.want)
		}
	}
}
