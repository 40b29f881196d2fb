package identify

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// TestBadInputSettingsValidate checks Settings.Validate by the one rule
// of the settings (zero means the default, a negative count is an
// error): a *SettingError naming the caller's field, nested settings of
// the fits named under Settings.Fit, Op naming Validate itself; the zero
// value and negative order bounds (order zero only) are valid.
func TestBadInputSettingsValidate(t *testing.T) {
	for _, tc := range []struct {
		err  error
		want string
	}{
		{Settings{Forms: -1}.Validate(), "identify.Settings.Validate: Settings.Forms = -1: must be zero or positive (0 means 2)"},
		{Settings{Fit: &fit.Settings{Tol: -1}}.Validate(), "identify.Settings.Validate: Settings.Fit.Tol = -1: must be a finite number, zero or positive"},
		{Settings{OutputDiff: []float64{1, math.Inf(1)}}.Validate(), "identify.Settings.Validate: Settings.OutputDiff[1] = +Inf: a differencing coefficient must be a finite number"},
	} {
		var se *tf.SettingError
		if !errors.As(tc.err, &se) || !errors.Is(tc.err, tf.ErrSetting) || !strings.HasPrefix(tc.err.Error(), tc.want) {
			t.Errorf("got %v\nwant %s", tc.err, tc.want)
		}
	}
	for _, err := range []error{Settings{}.Validate(), Settings{MaxR: -1, MaxP: -1, InputDiff: map[string][]float64{"x": {1, -1}}}.Validate()} {
		if err != nil {
			t.Errorf("valid settings refused: %v", err)
		}
	}
}

// TestCandidateStringOfFailedFit: a candidate without an estimate prints
// its structure and says the fit failed.
func TestCandidateStringOfFailedFit(t *testing.T) {
	if s := (Candidate{Structure: fixture.PlantModel()}).String(); !strings.Contains(s, "fit failed") {
		t.Errorf("got %q", s)
	}
}
