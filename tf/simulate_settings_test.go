package tf_test

import (
	"errors"
	"math"
	"slices"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// TestSimSettingsRule checks SimSettings and StepSettings against the
// library's settings rule: a bad value is a *SettingError naming the
// field, under the exported function called, with the wording below.
func TestSimSettingsRule(t *testing.T) {
	x := make([]float64, 20)
	noisy := parse.MustModel("y = 2 / (1 - 0.5 B) B x + 1 / (1 - 0.3 B) a")
	for _, tc := range []struct {
		s     tf.SimSettings
		field string
		text  string // the message after "op: "
	}{
		{tf.SimSettings{Sigma: -1}, "SimSettings.Sigma", "SimSettings.Sigma = -1: must be a finite number, zero or positive (0, the default, draws no noise)"},
		{tf.SimSettings{Sigma: math.NaN()}, "SimSettings.Sigma", "SimSettings.Sigma = NaN: must be a finite number, zero or positive (0, the default, draws no noise)"},
		{tf.SimSettings{Sigma: math.Inf(1)}, "SimSettings.Sigma", "SimSettings.Sigma = +Inf: must be a finite number, zero or positive (0, the default, draws no noise)"},
		{tf.SimSettings{BurnIn: tf.MaxBurnIn + 1}, "SimSettings.BurnIn", "SimSettings.BurnIn = 16777217: must be at most tf.MaxBurnIn (16777216 draws); 0 means automatic, a negative value none"},
	} {
		_, errSim := noisy.Simulate(map[string][]float64{"x": x}, &tc.s)
		_, errSys := tf.NewSystem(noisy, &tc.s)
		for op, err := range map[string]error{"tf.SimSettings.Validate": tc.s.Validate(), "tf.Model.Simulate": errSim, "tf.NewSystem": errSys} {
			var se *tf.SettingError
			if !errors.As(err, &se) || se.Setting != tc.field || !errors.Is(err, tf.ErrSetting) || err.Error() != op+": "+tc.text {
				t.Errorf("%+v: got %v\nwant %s: %s", tc.s, err, op, tc.text)
			}
		}
	}
	// A negative BurnIn is valid: no burn-in.
	if err := (tf.SimSettings{BurnIn: -1}).Validate(); err != nil {
		t.Errorf("BurnIn -1: %v", err)
	}
	g := tf.MustRational([]float64{1}, []float64{1, -0.5}, 1)
	for _, tc := range []struct {
		o    tf.StepSettings
		text string
	}{
		{tf.StepSettings{Band: -0.1}, "StepSettings.Band = -0.1: must lie in (0, 1), or be 0 for the default 0.02"},
		{tf.StepSettings{Band: 1}, "StepSettings.Band = 1: must lie in (0, 1), or be 0 for the default 0.02"},
		{tf.StepSettings{RiseFrom: math.NaN()}, "StepSettings.RiseFrom = NaN: must lie in (0, 1), or be 0 for the default 0.1"},
		{tf.StepSettings{RiseTo: 1.5}, "StepSettings.RiseTo = 1.5: must lie in (0, 1), or be 0 for the default 0.9"},
		{tf.StepSettings{RiseFrom: 0.95}, "StepSettings.RiseFrom = 0.95: must lie below StepSettings.RiseTo (0.9)"},
		{tf.StepSettings{Interval: -1}, "StepSettings.Interval = -1: must be a finite number, zero or positive (0: not given, times in samples only)"},
		{tf.StepSettings{Interval: math.Inf(1)}, "StepSettings.Interval = +Inf: must be a finite number, zero or positive (0: not given, times in samples only)"},
		{tf.StepSettings{Horizon: -1}, "StepSettings.Horizon = -1: must lie in 0..10^7 (0: chosen from the slowest pole)"},
		{tf.StepSettings{Horizon: 1e8}, "StepSettings.Horizon = 100000000: must lie in 0..10^7 (0: chosen from the slowest pole)"},
	} {
		_, errF := g.StepFigures(tc.o)
		for op, err := range map[string]error{"tf.StepSettings.Validate": tc.o.Validate(), "tf.Rational.StepFigures": errF} {
			if !errors.Is(err, tf.ErrSetting) || err.Error() != op+": "+tc.text {
				t.Errorf("%+v: got %v\nwant %s: %s", tc.o, err, op, tc.text)
			}
		}
	}
	if err := (tf.StepSettings{}).Validate(); err != nil {
		t.Error(err)
	}
}

// TestAutomaticBurnIn checks SimSettings.BurnIn = 0 (automatic) against
// its documented formula, ceil(ln 1e-12 / ln rho) + p + q draws with at
// least 100 + p + q: for AR(1) noise with phi = 0.95 that is
// ceil(538.7) + 1 = 540 draws (our formula, evaluated by hand), and for
// phi = 0.3 the floor, 101. The automatic run equals the run with that
// explicit count, and differs from BurnIn < 0 (none).
func TestAutomaticBurnIn(t *testing.T) {
	x := make([]float64, 5)
	for _, c := range []struct {
		spec string
		burn int
	}{
		{"y = 0.5 x + 1 / (1 - 0.95 B) a", 540},
		{"y = 0.5 x + 1 / (1 - 0.3 B) a", 101},
		{"y = 0.5 x + (1 - 0.4 B) a", 101}, // MA(1): no pole, the floor 100 + q
	} {
		m := parse.MustModel(c.spec)
		run := func(b int) []float64 {
			y, err := m.Simulate(map[string][]float64{"x": x}, &tf.SimSettings{Seed1: 3, Seed2: 4, Sigma: 1, BurnIn: b})
			if err != nil {
				t.Fatal(err)
			}
			return y
		}
		auto := run(0)
		if !slices.Equal(auto, run(c.burn)) {
			t.Errorf("%s: automatic burn-in differs from %d draws", c.spec, c.burn)
		}
		if slices.Equal(auto, run(c.burn-1)) || slices.Equal(auto, run(-1)) {
			t.Errorf("%s: automatic burn-in equals %d draws or none", c.spec, c.burn-1)
		}
	}
}

// TestBurnInStationary: with the automatic burn-in the first sample of an
// AR(1) noise with phi = 0.95 has the stationary variance
// sigma^2 / (1 - phi^2) = 10.26 (the AR(1) variance, a published formula:
// Box, Jenkins and Reinsel, Time Series Analysis, AR(1) section), while
// without a burn-in it has variance sigma^2 = 1. Over 2000 seeds the
// sample variance has a relative standard error of sqrt(2/2000) = 3.2 %;
// the tolerance is 15 % (over four standard errors).
func TestBurnInStationary(t *testing.T) {
	m := parse.MustModel("y = 0 x + 1 / (1 - 0.95 B) a")
	x := []float64{0}
	vari := func(b int) float64 {
		s := 0.0
		const n = 2000
		for i := range n {
			y, err := m.Simulate(map[string][]float64{"x": x}, &tf.SimSettings{Seed1: uint64(i), Seed2: 99, Sigma: 1, BurnIn: b})
			if err != nil {
				t.Fatal(err)
			}
			s += y[0] * y[0]
		}
		return s / n
	}
	want := 1 / (1 - 0.95*0.95)
	if v := vari(0); math.Abs(v-want) > 0.15*want {
		t.Errorf("automatic burn-in: variance of y_0 %.3g, want %.3g", v, want)
	}
	if v := vari(-1); math.Abs(v-1) > 0.15 {
		t.Errorf("no burn-in: variance of y_0 %.3g, want 1", v)
	}
}

// TestModelValidateOp: Model.Validate's errors name it as Op when the
// caller called it, and name the caller's function otherwise.
func TestModelValidateOp(t *testing.T) {
	m := parse.MustModel("y = w0 x where w0 ~ 1")
	m.Inputs[0].Delay = -1
	want := `input "x" dead time: -1 samples is outside 0..10000 (a dead time counts whole samples of delay, B^b with b >= 0)`
	for op, err := range map[string]error{
		"tf.Model.Validate": m.Validate(),
		"tf.NewSystem":      errOnly(tf.NewSystem(m, nil)),
		"tf.Model.Simulate": errOnly(m.Simulate(map[string][]float64{"x": {1}}, nil)),
	} {
		var me *tf.ModelError
		if !errors.As(err, &me) || !errors.Is(err, tf.ErrModel) || err.Error() != op+": "+want {
			t.Errorf("got %v\nwant %s: %s", err, op, want)
		}
	}
}

func errOnly[T any](_ T, err error) error { return err }
