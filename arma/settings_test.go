package arma

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"
)

// TestSettingsValidate: every field of Options, SimSettings and Grid with
// a bad value gives a typed error naming the field, from Validate and
// from the call that takes the settings. Fields with no bad value:
// Options.Name and AllowNonInvertible, SimSettings.Seed1 and Seed2 (any
// string, bool or seed). SimSettings.BurnIn negative is documented
// (none) and accepted.
func TestSettingsValidate(t *testing.T) {
	y, err := Simulate(Model{AR: []float64{0.5}, Sigma2: 1}, 120, &SimSettings{Seed1: 5})
	if err != nil {
		t.Fatal(err)
	}
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
	isArg := func(field string) func(error) bool {
		return func(err error) bool { var e *ArgError; return errors.As(err, &e) && e.Arg == field }
	}
	dataAt := func(series string, i int) func(error) bool {
		return func(err error) bool {
			var e *DataError
			return errors.As(err, &e) && e.Series == series && e.Index == i
		}
	}
	opts := []struct {
		o    Options
		ok   func(error) bool
		want string
	}{
		{Options{Mean: 3}, isArg("Options.Mean"), "unknown MeanMode 3"},
		{Options{Mean: -1}, isArg("Options.Mean"), "MeanFree"},
		{Options{X: [][]float64{col(), col()[:50]}}, isArg("Options.X"), "regressor x2 has 50 samples"},
		{Options{X: [][]float64{col(), col(nan)}, XNames: []string{"a", "valve"}}, dataAt("valve", 3), "valve sample 3 is NaN"},
		{Options{X: [][]float64{col(1e300)}}, dataAt("x1", 3), "beyond MaxAbs"},
		{Options{X: [][]float64{col()}, XNames: []string{"a", "b"}}, isArg("Options.XNames"), "2 names for 1 regressors"},
		{Options{X: [][]float64{col(), col()}, XNames: []string{"a", "a"}}, isArg("Options.XNames"), `"a" used twice`},
		{Options{X: [][]float64{col()}, XNames: []string{""}}, isArg("Options.XNames"), "empty name"},
		{Options{X: [][]float64{col()}, XNames: []string{"mean"}}, isArg("Options.XNames"), "reserved"},
		{Options{Fixed: map[string]float64{"phi1": nan}}, isArg("Options.Fixed"), "value of phi1 is NaN"},
		{Options{Init: map[string]float64{"phi1": math.Inf(1)}}, isArg("Options.Init"), "value of phi1 is +Inf"},
		{Options{Start: -2}, isArg("Options.Start"), "must not be negative"},
		{Options{MaxIter: -1}, isArg("Options.MaxIter"), "must not be negative"},
		{Options{Tol: -1e-3}, isArg("Options.Tol"), "[0, 1)"},
		{Options{Tol: 1}, isArg("Options.Tol"), "[0, 1)"},
		{Options{Tol: nan}, isArg("Options.Tol"), "[0, 1)"},
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
		}
	}
	sims := []struct {
		s    SimSettings
		ok   func(error) bool
		want string
	}{
		{SimSettings{BurnIn: MaxSamples + 1}, isArg("SimSettings.BurnIn"), "above MaxSamples"},
		{SimSettings{Innovations: []float64{0, 1, math.Inf(-1)}}, dataAt("innovations", 2), "innovations sample 2 is -Inf"},
	}
	for _, c := range sims {
		for how, err := range map[string]error{"Validate": c.s.Validate(), "Simulate": second(Simulate(Model{Sigma2: 1}, 3, &c.s))} {
			if !c.ok(err) || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s %+v: %T %v, want the field's error with %q", how, c.s, err, err, c.want)
			}
		}
	}
	if _, err := Simulate(Model{Sigma2: 1}, 2, &SimSettings{Innovations: []float64{1}}); !isArg("SimSettings.Innovations")(err) || !strings.Contains(err.Error(), "has 1 values, n is 2") {
		t.Errorf("innovations of the wrong length: %v", err)
	}
	if _, err := Simulate(Model{Sigma2: 1}, 3, &SimSettings{BurnIn: -5}); err != nil {
		t.Errorf("documented negative BurnIn: %v", err)
	}
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
		{Grid{Criterion: 9}, "Grid.Criterion", "unknown Criterion 9"},
		{Grid{Workers: -2}, "Grid.Workers", "must not be negative"},
	}
	for _, c := range grids {
		for how, err := range map[string]error{"Validate": c.g.Validate(), "Select": second(Select(ctx, y, c.g, nil))} {
			if !isArg(c.field)(err) || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s %+v: %T %v, want an *ArgError on %s with %q", how, c.g, err, err, c.field, c.want)
			}
		}
	}
	var nilOpt *Options
	var nilSim *SimSettings
	if nilOpt.Validate() != nil || nilSim.Validate() != nil || (Grid{}).Validate() != nil {
		t.Error("the defaults do not validate")
	}
}

func second[T any](_ T, err error) error { return err }

// TestModelCoefficientMessages: a NaN or infinite coefficient of a
// Model was reported as "coefficients must be finite" without saying
// which; the message now names the slice and index.
func TestModelCoefficientMessages(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	cases := []struct {
		name string
		err  error
		want string
	}{
		{"Simulate SAR", second(Simulate(Model{SAR: []float64{0.1, nan}, Period: 4, Sigma2: 1}, 5, nil)), "SAR[1] is NaN"},
		{"Simulate Mean", second(Simulate(Model{Mean: inf, Sigma2: 1}, 5, nil)), "Mean is +Inf"},
		{"Simulate Sigma2", second(Simulate(Model{Sigma2: -2}, 5, nil)), "Sigma2 must not be negative, got -2"},
		{"Stationary AR", func() error { _, _, err := Model{AR: []float64{inf}}.Stationary(); return err }(), "AR[0] is +Inf"},
		{"Invertible SMA", func() error { _, _, err := Model{SMA: []float64{nan}, Period: 2}.Invertible(); return err }(), "SMA[0] is NaN"},
		{"Psi MA", second(Model{MA: []float64{0.2, 0.1, nan}}.Psi(3)), "MA[2] is NaN"},
	}
	for _, c := range cases {
		var ae *ArgError
		if !errors.As(c.err, &ae) || !strings.Contains(c.err.Error(), c.want) {
			t.Errorf("%s: %T %v, want %q", c.name, c.err, c.err, c.want)
		}
	}
}
