package tf_test

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// TestSettingsValidate is the table of every field of FitSettings with a
// bad value (SimSettings and StepSettings: TestSimSettingsRule): each
// gives a *SettingError (or a *SampleError for an innovation) naming the
// field, both from the
// Validate method and from the call that takes the settings. The rule is
// the package's: zero means the default, a negative value is an error.
// Fields with no bad value: FitSettings.ZeroPreSample, Settle,
// IgnoreExtra; SimSettings.Seed1, Seed2, FromRest (every value valid).
func TestSettingsValidate(t *testing.T) {
	m := parse.MustModel("y = c + w0 / (1 - d1 B) B x + AR(1)")
	x := trapData(1, 120, 5)
	y, err := parse.MustModel("y = 1 + 2 / (1 - 0.5 B) B x + 1 / (1 - 0.3 B) a").Simulate(map[string][]float64{"x": x}, &tf.SimSettings{Seed1: 1, Sigma: 1})
	if err != nil {
		t.Fatal(err)
	}
	data := map[string][]float64{"y": y, "x": x}
	fit := []struct {
		s     tf.FitSettings
		field string
		rule  string
	}{
		{tf.FitSettings{MaxIter: -1}, "FitSettings.MaxIter", "FitSettings.MaxIter = -1: must be zero or positive (0 means 200 iterations)"},
		{tf.FitSettings{Starts: -2}, "FitSettings.Starts", "FitSettings.Starts = -2: must be zero or positive"},
		{tf.FitSettings{First: -3}, "FitSettings.First", "FitSettings.First = -3: must be zero or positive"},
		{tf.FitSettings{Tol: -1e-9}, "FitSettings.Tol", "FitSettings.Tol = -1e-09: must be a finite number, zero or positive"},
		{tf.FitSettings{Tol: math.NaN()}, "FitSettings.Tol", "must be a finite number, zero or positive"},
		{tf.FitSettings{Tol: 1}, "FitSettings.Tol", "must be below 1"},
		{tf.FitSettings{Tol: math.Inf(1)}, "FitSettings.Tol", "must be a finite number, zero or positive"},
	}
	for _, tc := range fit {
		for _, err := range []error{tc.s.Validate(), second(tf.Fit(context.Background(), m, data, &tc.s))} {
			var ae *tf.SettingError
			if !errors.As(err, &ae) || ae.Setting != tc.field || !strings.Contains(err.Error(), tc.rule) {
				t.Errorf("%+v: %v, want *SettingError for %s (%q)", tc.s, err, tc.field, tc.rule)
			}
		}
	}
	// First is checked against the data's length by Fit.
	var fse *tf.SettingError
	if _, err := tf.Fit(context.Background(), m, data, &tf.FitSettings{First: 120}); !errors.As(err, &fse) || fse.Setting != "FitSettings.First" ||
		!strings.Contains(err.Error(), "must be below the number of samples, 120") {
		t.Errorf("First = n: %v", err)
	}
	// SimSettings and StepSettings: see TestSimSettingsRule.
	bad := tf.SimSettings{Innovations: []float64{0, math.Inf(1), 0}}
	var se *tf.SampleError
	if err := bad.Validate(); !errors.As(err, &se) || se.Series != "innovations" || se.Index != 1 {
		t.Errorf("innovation +Inf: %v", err)
	}
	// The zero values are the defaults and valid.
	if err := (tf.FitSettings{}).Validate(); err != nil {
		t.Error(err)
	}
	if err := (tf.SimSettings{}).Validate(); err != nil {
		t.Error(err)
	}
	if err := (tf.StepSettings{}).Validate(); err != nil {
		t.Error(err)
	}
}

func second[T any](_ T, err error) error { return err }
