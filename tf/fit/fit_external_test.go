package fit_test

import (
	"context"
	"encoding/binary"
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// trapData returns a series of n samples about level with unit Gaussian
// noise (seeded).
func trapData(seed uint64, n int, level float64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 3))
	x := make([]float64, n)
	for i := range x {
		x[i] = level + rng.NormFloat64()
	}
	return x
}

// TestBadInputModelDataAndModel is the table of mistakes a user makes with Model's data and
// models built in code: each gives a typed error naming the series or
// the part of the model, with the key words of its message checked.
func TestBadInputModelDataAndModel(t *testing.T) {
	m := parse.MustModel("y = c + w0 / (1 - d1 B) B x + a")
	x := trapData(1, 200, 5)
	y := fixture.MustRecord(t, "y = 1 + 2 / (1 - 0.5 B) B x + a", map[string][]float64{"x": x}, &tf.SimSettings{Seed1: 1, Sigma: 1})["y"]
	constant := func(v float64) []float64 {
		c := make([]float64, 200)
		for i := range c {
			c[i] = v
		}
		return c
	}
	nan := constant(math.NaN())
	tiny := func(s []float64) []float64 {
		out := make([]float64, len(s))
		for i, v := range s {
			out[i] = v * 1e-170
		}
		return out
	}
	// Models built in code with a structure no spec can have.
	exp0 := m.Clone()
	exp0.Inputs[0].Den.Factors[0].Exp = 0
	expNeg := m.Clone()
	expNeg.Inputs[0].Num.Factors[0].Exp = -1
	delayNeg := m.Clone()
	delayNeg.Inputs[0].Delay = -1
	delayBig := m.Clone()
	delayBig.Inputs[0].Delay = tf.MaxDelay + 1
	powNeg := m.Clone()
	powNeg.Inputs[0].Den.Factors[0].Terms[1].Power = -2
	noName := m.Clone()
	noName.Inputs[0].Series = ""
	noiseExp := parse.MustModel("y = w0 x + AR(1)")
	noiseExp.Noise.AR.Factors[0].Exp = 0
	for _, tc := range []struct {
		name string
		m    tf.Model
		data map[string][]float64
		is   func(error) bool
		keys []string
	}{
		{"constant output", m, map[string][]float64{"y": constant(3), "x": x}, isSeries(tf.ErrConstant, "y"),
			[]string{`fit.Model: series "y" is constant`, "every sample is 3", "nothing to explain"}},
		{"constant input", m, map[string][]float64{"y": y, "x": constant(40)}, isSeries(tf.ErrConstant, "x"),
			[]string{`"x"`, "every sample is 40", "never moves", "leave it out of the model"}},
		{"data scaled by 1e-170", m, map[string][]float64{"y": tiny(y), "x": tiny(x)}, isShared(`fit of output "y"`),
			[]string{"residual sum of squares is zero", `"y"`, "underflow", "rescale the series"}},
		{"all-NaN input", m, map[string][]float64{"y": y, "x": nan}, isSample("x", 0), []string{`fit.Model: series "x" sample 0 is NaN`}},
		{"factor power 0", exp0, map[string][]float64{"y": y, "x": x}, isModel(`input "x" denominator, factor 1`),
			[]string{"power 0 is outside 1..64"}},
		{"factor power -1", expNeg, map[string][]float64{"y": y, "x": x}, isModel(`input "x" numerator, factor 1`),
			[]string{"power -1 is outside 1..64"}},
		{"dead time -1", delayNeg, map[string][]float64{"y": y, "x": x}, isModel(`input "x" dead time`),
			[]string{"-1 samples is outside 0..10000"}},
		{"dead time over MaxDelay", delayBig, map[string][]float64{"y": y, "x": x}, isModel(`input "x" dead time`),
			[]string{"10001 samples is outside 0..10000"}},
		{"negative power of B", powNeg, map[string][]float64{"y": y, "x": x}, isModel(`input "x" denominator, factor 1`),
			[]string{"power of B -2 is outside 0..64"}},
		{"input without a name", noName, map[string][]float64{"y": y, "x": x}, isModel("input 1"), []string{"has no series name"}},
		{"noise factor power 0", noiseExp, map[string][]float64{"y": y, "x": x}, isModel("noise AR, factor 1"),
			[]string{"power 0"}},
		{"integrating input held at 5", parse.MustModel("y = w0 B / (1 - B) x + a"), map[string][]float64{"y": y, "x": x},
			isShared(`input "x"`), []string{"no settled start", "pole at z = 1", "held at its first value", "Settings.ZeroPreSample"}},
		// 1/(1 - 1.9 B) grows as 1.9^t, past float64 after about 1100 samples.
		{"fixed non-invertible MA", parse.MustModel("y = w0 x + (1 - 1.9 B) a"), map[string][]float64{"y": trapData(8, 1500, 0), "x": trapData(9, 1500, 0)},
			isSeries(tf.ErrOverflow, "y"), []string{"no start point gives finite residuals", "fixed noise MA", "check the fixed values"}},
		{"dead time longer than the record", parse.MustModel("y = w0 B^250 x + a"), map[string][]float64{"y": y, "x": x},
			isSeries(tf.ErrShort, "y"), []string{`input "x" with dead time 250`, "check the dead time"}},
	} {
		est, err := fit.Model(context.Background(), tc.m, tc.data, nil)
		if err == nil || !tc.is(err) {
			t.Errorf("%s: got %v, %v", tc.name, est, err)
			continue
		}
		for _, k := range tc.keys {
			if !strings.Contains(err.Error(), k) {
				t.Errorf("%s: message %q lacks %q", tc.name, err.Error(), k)
			}
		}
		if est != nil {
			t.Errorf("%s: an estimate came with the error", tc.name)
		}
	}
	// The same models built in code are refused by Simulate and NewSystem.
	for _, bad := range []tf.Model{exp0, expNeg, delayNeg, powNeg, noiseExp} {
		var me *tf.ModelError
		if _, err := bad.Simulate(map[string][]float64{"x": x}, nil); !errors.As(err, &me) {
			t.Errorf("Simulate of %v: %v, want a *ModelError", me, err)
		}
		if _, err := tf.NewSystem(bad, nil); !errors.As(err, &me) {
			t.Errorf("NewSystem: %v, want a *ModelError", err)
		}
	}
}

func isSeries(kind error, series string) func(error) bool {
	return func(err error) bool {
		var se *tf.SeriesError
		return errors.As(err, &se) && errors.Is(err, kind) && se.Series == series && se.Op == "fit.Model"
	}
}

// isShared matches the shared *ModelError of Model's own checks.
func isShared(part string) func(error) bool {
	return func(err error) bool {
		var me *errs.ModelError
		return errors.As(err, &me) && errors.Is(err, tf.ErrModel) && me.Part == part && me.Op == "fit.Model"
	}
}

func isSample(series string, index int) func(error) bool {
	return func(err error) bool {
		var se *errs.SampleError
		return errors.As(err, &se) && errors.Is(err, tf.ErrSample) && se.Series == series && se.Index == index
	}
}

func isModel(part string) func(error) bool {
	return func(err error) bool {
		var me *tf.ModelError
		return errors.As(err, &me) && me.Part == part
	}
}

// TestModelWarningTraps checks the warnings for fits that converge but
// must not be trusted: 2 residuals for 1 coefficient (dead time 10000 of
// 10002 samples), a pole at 0.9999 on a record of 2000 samples, and two
// identical inputs (no standard errors).
func TestModelWarningTraps(t *testing.T) {
	// Dead time 10000 with n = 10002: N = 2 residuals for k = 1.
	x := trapData(2, 10002, 0)
	y := make([]float64, len(x))
	rng := rand.New(rand.NewPCG(4, 5))
	for i := range y {
		y[i] = rng.NormFloat64()
		if i >= 10000 {
			y[i] += 2 * x[i-10000]
		}
	}
	e, err := fit.Model(context.Background(), parse.MustModel("y = w0 B^10000 x + a"), map[string][]float64{"y": y, "x": x}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if msg := warningText(e, fit.FewResiduals); !strings.Contains(msg, "only 2 residuals for 1 free coefficients") || !strings.Contains(msg, "max(50, 10 per coefficient) = 50") {
		t.Errorf("dead time 10000 of 10002: FewResiduals warning %q (warnings %v)", msg, e.Warnings)
	}
	// A pole at 0.9999 (time constant 10000 samples, gain 100), the
	// input stepped from 0 to 1 at sample 10, 2000 samples: the record
	// covers 0.2 time constants.
	n := 2000
	step := make([]float64, n)
	for i := 10; i < n; i++ {
		step[i] = 1
	}
	slow := fixture.MustRecord(t, "y = 0.01 / (1 - 0.9999 B) B u + a", map[string][]float64{"u": step}, &tf.SimSettings{Seed1: 6, Sigma: 0.05})["y"]
	e, err = fit.Model(context.Background(), parse.MustModel("y = w0 / (1 - d1 B) B u + a"), map[string][]float64{"y": slow, "u": step}, nil)
	if err != nil {
		t.Fatal(err)
	}
	msg := warningText(e, fit.SlowPole)
	if !strings.Contains(msg, `input "u" has a pole with |z|`) || !strings.Contains(msg, "(fewer than 5)") || !strings.Contains(msg, "gain and time constant are poorly determined") {
		t.Errorf("pole 0.9999 on 2000 samples: SlowPole warning %q (estimates %v, warnings %v)", msg, e.Params, e.Warnings)
	}
	w0, _ := e.Param("w0")
	d1, _ := e.Param("d1")
	t.Logf("pole 0.9999, gain 100: fitted gain %.3g, pole %.6g", w0.Value/(1-d1.Value), d1.Value)
	// Two identical inputs: J'J is singular, no standard errors.
	a := trapData(7, 300, 0)
	b := append([]float64(nil), a...)
	yy := make([]float64, len(a))
	for i := range yy {
		yy[i] = 3*a[i] + rng.NormFloat64()
	}
	e, err = fit.Model(context.Background(), parse.MustModel("y = w1 p + w2 q + a"), map[string][]float64{"y": yy, "p": a, "q": b}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if msg := warningText(e, fit.BadStandardError); !strings.Contains(msg, "standard error of w1, w2 is not available") || !hasWarning(e, fit.SingularInformation) {
		t.Errorf("identical inputs: BadStandardError %q, warnings %v", msg, e.Warnings)
	}
	for _, k := range []fit.WarningKind{fit.FewResiduals, fit.SlowPole, fit.BadStandardError, fit.StartupTransient} {
		if !k.Serious() {
			t.Errorf("%v is not serious", k)
		}
	}
}

// TestBadInputModelSettings is the table of every field of Settings with a
// bad value (SimSettings and StepSettings: TestSimSettingsRule): each
// gives a *SettingError (or a *SampleError for an innovation) naming the
// field, both from the
// Validate method and from the call that takes the settings. The rule is
// the package's: zero means the default, a negative value is an error.
// Fields with no bad value: Settings.ZeroPreSample, Settle,
// IgnoreExtra; SimSettings.Seed1, Seed2, FromRest (every value valid).
func TestBadInputModelSettings(t *testing.T) {
	m := parse.MustModel("y = c + w0 / (1 - d1 B) B x + AR(1)")
	x := trapData(1, 120, 5)
	data := fixture.MustRecord(t, "y = 1 + 2 / (1 - 0.5 B) B x + 1 / (1 - 0.3 B) a", map[string][]float64{"x": x}, &tf.SimSettings{Seed1: 1, Sigma: 1})
	cases := []struct {
		s     fit.Settings
		field string
		rule  string
	}{
		{fit.Settings{MaxIter: -1}, "Settings.MaxIter", "Settings.MaxIter = -1: must be zero or positive (0 means 200 iterations)"},
		{fit.Settings{Starts: -2}, "Settings.Starts", "Settings.Starts = -2: must be zero or positive"},
		{fit.Settings{First: -3}, "Settings.First", "Settings.First = -3: must be zero or positive"},
		{fit.Settings{Tol: -1e-9}, "Settings.Tol", "Settings.Tol = -1e-09: must be a finite number, zero or positive"},
		{fit.Settings{Tol: math.NaN()}, "Settings.Tol", "must be a finite number, zero or positive"},
		{fit.Settings{Tol: 1}, "Settings.Tol", "must be below 1"},
		{fit.Settings{Tol: math.Inf(1)}, "Settings.Tol", "must be a finite number, zero or positive"},
	}
	for _, tc := range cases {
		for _, err := range []error{tc.s.Validate(), second(fit.Model(context.Background(), m, data, &tc.s))} {
			var ae *tf.SettingError
			if !errors.As(err, &ae) || ae.Setting != tc.field || !strings.Contains(err.Error(), tc.rule) {
				t.Errorf("%+v: %v, want *SettingError for %s (%q)", tc.s, err, tc.field, tc.rule)
			}
		}
	}
	// First is checked against the data's length by fit.Model.
	var fse *tf.SettingError
	if _, err := fit.Model(context.Background(), m, data, &fit.Settings{First: 120}); !errors.As(err, &fse) || fse.Setting != "Settings.First" ||
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
	if err := (fit.Settings{}).Validate(); err != nil {
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

// TestModelSpecRoundTrip checks that a fitted model prints as a spec that
// package parse reads back with the estimates as start values, and that
// refitting from there returns to the same estimates (within the
// optimiser's tolerance, 1e-6 relative) in very few iterations.
func TestModelSpecRoundTrip(t *testing.T) {
	u := fixture.WhiteInput(8, 9, 800)
	data := fixture.MustRecord(t, "y = 3 + (1.5 - 0.4 B) / (1 - 0.7 B) B^2 u + (1 - 0.3 B) a", map[string][]float64{"u": u}, &tf.SimSettings{Seed1: 1, Seed2: 2, Sigma: 0.5})
	m, err := parse.Model("y = c + (w0 - w1 B) / (1 - d1 B) B^2 u + (1 - t1 B) a")
	if err != nil {
		t.Fatal(err)
	}
	est, err := fit.Model(context.Background(), m, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	back, err := parse.Model(est.Model.String())
	if err != nil {
		t.Fatalf("fitted spec %q does not parse: %v", est.Model.String(), err)
	}
	if !back.Equal(est.Model) {
		t.Fatalf("spec %q reads back as a different model", est.Model.String())
	}
	// The model with the estimates held prints with "=" for every
	// coefficient, reads back as the same model, holds the same values,
	// and leaves nothing to fit; est.Model is unchanged (still free).
	held := est.Held()
	hs := held.String()
	if strings.Contains(hs, "~") || !strings.Contains(hs, "d1 = ") || !strings.Contains(est.Model.String(), "d1 ~ ") {
		t.Errorf("held spec %q (fitted %q)", hs, est.Model.String())
	}
	hb, err := parse.Model(hs)
	if err != nil || !hb.Equal(held) {
		t.Fatalf("held spec %q reads back as %v, %v", hs, hb, err)
	}
	for _, c := range held.Params() {
		p, ok := est.Param(c.Name)
		if c.Free || !ok || c.Value != p.Value {
			t.Errorf("held %s = %v (free %v), estimate %v", c.Name, c.Value, c.Free, p.Value)
		}
	}
	if _, err := fit.Model(context.Background(), held, data, nil); !errors.Is(err, tf.ErrModel) || !strings.Contains(err.Error(), "nothing is free to estimate") {
		t.Errorf("refit of the held model: %v", err)
	}
	again, err := fit.Model(context.Background(), back, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range again.Params {
		q := est.Params[i]
		if p.Name != q.Name || p.Start != q.Value || !(absValue(p.Value-q.Value) <= 1e-6*absValue(q.Value)) {
			t.Errorf("%s: refit %v from start %v, first fit %v", p.Name, p.Value, p.Start, q.Value)
		}
	}
	if again.Iter > 3 {
		t.Errorf("refit from the estimates took %d iterations (%s, %d evals; first fit %d iterations)", again.Iter, again.Reason, again.Evals, est.Iter)
	}
}

func absValue(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// roundTripCase is one model of our own for the simulate-then-fit round trips:
// the truth, the spec fitted (the same structure with free names), the
// true value of every free name, and the input generator.
type roundTripCase struct {
	name  string
	truth string
	spec  string
	want  map[string]float64
	input func(rng *rand.Rand, n int) []float64
	in    string
}

// roundTripCases are three models of our own: a valve input far from zero (about
// 50 %), a differenced input far from zero, and MA noise with a dead time
// and a two-term numerator.
var roundTripCases = []roundTripCase{
	{
		name:  "valve about 50 %",
		truth: "y = 10 + 2 / (1 - 0.7 B) B valve + 1 / (1 - 0.5 B) a",
		spec:  "y = c + w0 / (1 - d1 B) B valve + 1 / (1 - p1 B) a",
		want:  map[string]float64{"c": 10, "w0": 2, "d1": 0.7, "p1": 0.5},
		in:    "valve",
		input: gaussianAbout(50, 5),
	},
	{
		name:  "differenced feed about 20",
		truth: "(1 - B) level = 1.5 / (1 - 0.6 B) B ((1 - B) feed) + 1 / (1 - 0.4 B) a",
		spec:  "(1 - B) level = w0 / (1 - d1 B) B ((1 - B) feed) + 1 / (1 - p1 B) a",
		want:  map[string]float64{"w0": 1.5, "d1": 0.6, "p1": 0.4},
		in:    "feed",
		input: gaussianAbout(20, 1),
	},
	{
		name:  "MA noise, dead time 3",
		truth: "y = 5 + (1.5 - 0.4 B) / (1 - 0.5 B) B^3 u + (1 - 0.6 B) a",
		spec:  "y = c + (w0 - w1 B) / (1 - d1 B) B^3 u + (1 - t1 B) a",
		want:  map[string]float64{"c": 5, "w0": 1.5, "w1": 0.4, "d1": 0.5, "t1": 0.6},
		in:    "u",
		input: gaussianAbout(3, 1),
	},
}

// gaussianAbout returns the input of a round-trip case: n independent
// normal draws of mean and standard deviation sd.
func gaussianAbout(mean, sd float64) func(rng *rand.Rand, n int) []float64 {
	return func(rng *rand.Rand, n int) []float64 {
		x := make([]float64, n)
		for i := range x {
			x[i] = mean + sd*rng.NormFloat64()
		}
		return x
	}
}

// simulateRoundTrip simulates c with the defaults of Model.Simulate (a settled
// start) and unit innovations.
func simulateRoundTrip(t testing.TB, c roundTripCase, seed uint64, n int, fromRest bool) map[string][]float64 {
	t.Helper()
	x := c.input(rand.New(rand.NewPCG(seed, 77)), n)
	return fixture.MustRecord(t, c.truth, map[string][]float64{c.in: x}, &tf.SimSettings{Seed1: seed, Seed2: 78, Sigma: 1, FromRest: fromRest})
}

// TestModelSimulateRoundTripDefaults simulates each of the three models
// with the defaults of Model.Simulate, fits the same structure with the
// defaults of Model, and counts the seeds in which every estimate lies
// within 4 standard errors of the truth: at least 99 of 100 per model.
// Asymptotically the CLS estimates are normal about the truth (Box,
// Jenkins & Reinsel, chapter on fitting transfer-function models), so
// that a 4 SE miss has probability 6e-5 per estimate; the 1 % allowance
// is for the finite sample (n = 300). Simulated from rest instead
// (SimSettings.FromRest), the valve model misses in most seeds, which
// this test also shows.
func TestModelSimulateRoundTripDefaults(t *testing.T) {
	seeds, n := 100, 300
	for _, c := range roundTripCases {
		m := parse.MustModel(c.spec)
		ok, worst := 0, 0.0
		for s := range seeds {
			data := simulateRoundTrip(t, c, uint64(s), n, false)
			e, err := fit.Model(context.Background(), m, data, nil)
			if err != nil {
				t.Fatalf("%s, seed %d: %v", c.name, s, err)
			}
			all := true
			for name, v := range c.want {
				p, found := e.Param(name)
				if !found {
					t.Fatalf("%s: no estimate of %s", c.name, name)
				}
				z := math.Abs(p.Value-v) / p.SE
				worst = math.Max(worst, z)
				if !(z <= 4) {
					all = false
					t.Logf("%s, seed %d: %s = %.4g, truth %.4g, %.1f SE away", c.name, s, name, p.Value, v, z)
				}
			}
			if all {
				ok++
			}
		}
		t.Logf("%s: %d of %d seeds with every estimate within 4 SE (largest %.2f SE)", c.name, ok, seeds, worst)
		if ok < 99 {
			t.Errorf("%s: only %d of %d seeds with every estimate within 4 SE of the truth, want >= 99", c.name, ok, seeds)
		}
	}
	// The trap the settled default of Simulate avoids: the valve model
	// simulated from rest and fitted with the defaults misses (phi1 soaks up the
	// start-up transient) and Model says so with a StartupTransient
	// warning.
	c := roundTripCases[0]
	data := simulateRoundTrip(t, c, 1, n, true)
	e, err := fit.Model(context.Background(), parse.MustModel(c.spec), data, nil)
	if err != nil {
		t.Fatal(err)
	}
	p, _ := e.Param("p1")
	if z := math.Abs(p.Value-0.5) / p.SE; z < 4 {
		t.Errorf("from rest: p1 = %.3g, %.1f SE from 0.5; want the trap to show (p1 more than 4 SE from 0.5)", p.Value, z)
	}
	if !hasWarning(e, fit.StartupTransient) {
		t.Errorf("from rest: no StartupTransient warning: %v", e.Warnings)
	}
}

func hasWarning(e *fit.Estimate, k fit.WarningKind) bool {
	for _, w := range e.Warnings {
		if w.Kind == k {
			return true
		}
	}
	return false
}

func warningText(e *fit.Estimate, k fit.WarningKind) string {
	for _, w := range e.Warnings {
		if w.Kind == k {
			return w.Message
		}
	}
	return ""
}

// TestModelStartupTransient checks the StartupTransient warning: no false
// alarm on records that start settled (200 seeds of each of the three
// models; the test's stated false-alarm rate is 1e-4 a fit, so 600 fits
// give a false alarm with probability about 0.06), a warning naming the
// samples and the Settle remedy on a record simulated from rest with a
// valve about 50 %, and none once Settle leaves the transient out.
func TestModelStartupTransient(t *testing.T) {
	n := 300
	for _, c := range roundTripCases {
		m := parse.MustModel(c.spec)
		alarms := 0
		for s := range 200 {
			e, err := fit.Model(context.Background(), m, simulateRoundTrip(t, c, uint64(1000+s), n, false), nil)
			if err != nil {
				t.Fatalf("%s, seed %d: %v", c.name, s, err)
			}
			if hasWarning(e, fit.StartupTransient) {
				alarms++
				t.Logf("%s, seed %d: %s", c.name, 1000+s, warningText(e, fit.StartupTransient))
			}
		}
		if alarms > 0 {
			t.Errorf("%s: %d false alarms in 200 settled records", c.name, alarms)
		}
	}
	c := roundTripCases[0]
	m := parse.MustModel(c.spec)
	for s := range 20 {
		data := simulateRoundTrip(t, c, uint64(2000+s), n, true)
		e, err := fit.Model(context.Background(), m, data, nil)
		if err != nil {
			t.Fatal(err)
		}
		msg := warningText(e, fit.StartupTransient)
		if msg == "" {
			t.Errorf("seed %d: record from rest, valve about 50: no StartupTransient warning (%v)", 2000+s, e.Warnings)
			continue
		}
		for _, key := range []string{"samples 2..", "Settings.Settle", "Settings.First", "start-up transient"} {
			if !strings.Contains(msg, key) {
				t.Errorf("seed %d: warning %q lacks %q", 2000+s, msg, key)
			}
		}
		es, err := fit.Model(context.Background(), m, data, &fit.Settings{Settle: true})
		if err != nil {
			t.Fatal(err)
		}
		if hasWarning(es, fit.StartupTransient) {
			t.Errorf("seed %d: with Settle (first residual %d) the warning stays: %s", 2000+s, es.Conditioning.First, warningText(es, fit.StartupTransient))
		}
	}
}

// fuzzSpecs are the structures FuzzModel draws from; the fuzzer also
// perturbs powers and dead times (including the invalid values 0 and -1)
// so that models no spec can express reach fit.Model.
func fuzzModel(sel, exp, delay, pow byte) tf.Model {
	free := func(name string, neg bool, p int) tf.Term {
		return tf.Term{Neg: neg, Coef: tf.Coef{Name: name, Free: true}, Power: p}
	}
	one := tf.Term{Coef: tf.Coef{Value: 1}}
	num := tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{free("w0", false, 0)}}}}
	den := tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, free("d1", true, 1)}}}}
	m := tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x", Num: num, Delay: int(int8(delay)) % 5}}}
	switch sel % 6 {
	case 1:
		m.Inputs[0].Den = den
	case 2:
		m.Const = &tf.Coef{Name: "c", Free: true}
		m.Inputs[0].Den = den
		m.Noise = &arma.Noise{AR: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, free("p1", true, 1)}}}}}
	case 3:
		m.Noise = &arma.Noise{MA: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, free("t1", true, 1)}}}}}
	case 4:
		m.Diff = tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, {Neg: true, Coef: tf.Coef{Value: 1}, Power: 1}}}}}
		m.Inputs[0].Diff = m.Diff.Clone()
		m.Noise = &arma.Noise{}
	case 5:
		m.Const = &tf.Coef{Name: "c", Free: true}
	}
	if sel&0x40 != 0 && len(m.Inputs[0].Den.Factors) > 0 {
		m.Inputs[0].Den.Factors[0].Exp = int(int8(exp)) % 4 // 0, negative: invalid
	}
	if sel&0x80 != 0 {
		m.Inputs[0].Num.Factors[0].Terms[0].Power = int(int8(pow)) % 4
	}
	return m
}

// fuzzSeries reads pairs of float64 (output, input) from b; mode adds
// constant or huge values.
func fuzzSeries(b []byte, mode byte) (y, x []float64) {
	for len(b) >= 16 {
		y = append(y, math.Float64frombits(binary.LittleEndian.Uint64(b)))
		x = append(x, math.Float64frombits(binary.LittleEndian.Uint64(b[8:])))
		b = b[16:]
	}
	for i := range y {
		switch mode % 5 {
		case 1: // small integers: exact, often constant stretches
			y[i], x[i] = float64(int8(math.Float64bits(y[i]))), float64(int8(math.Float64bits(x[i])))
		case 2: // values in a sane range
			y[i], x[i] = math.Mod(y[i], 1e3), math.Mod(x[i], 1e3)
		case 3:
			x[i] = 7 // a constant input
		case 4:
			y[i] *= 1e-170
		}
	}
	return y, x
}

// FuzzModel fits small models (some with invalid structure) to arbitrary
// data, including NaN, huge, tiny and constant values: Model must return a
// typed error or an estimate whose sum of squares, log-likelihood and
// coefficients are finite, whose missing standard errors are warned of,
// and never panic.
func FuzzModel(f *testing.F) {
	seed := make([]byte, 16*60)
	for i := 0; i < 60; i++ {
		binary.LittleEndian.PutUint64(seed[16*i:], math.Float64bits(float64(i%7)+0.1*float64(i%3)))
		binary.LittleEndian.PutUint64(seed[16*i+8:], math.Float64bits(float64(i%5)))
	}
	f.Add(seed, byte(0), byte(1), byte(1), byte(0), byte(2))
	f.Add(seed, byte(2), byte(1), byte(0), byte(0), byte(0))
	f.Add(seed, byte(0x43), byte(0), byte(255), byte(255), byte(1))
	f.Add(seed[:16*8], byte(3), byte(1), byte(1), byte(0), byte(3))
	f.Add(seed, byte(4), byte(1), byte(2), byte(0), byte(4))
	f.Fuzz(func(t *testing.T, b []byte, sel, exp, delay, pow, mode byte) {
		if len(b) > 16*400 {
			b = b[:16*400]
		}
		m := fuzzModel(sel, exp, delay, pow)
		y, x := fuzzSeries(b, mode)
		e, err := fit.Model(context.Background(), m, map[string][]float64{"y": y, "x": x}, &fit.Settings{MaxIter: 30})
		if err != nil {
			var me *tf.ModelError // Model.Validate's error
			if !errors.As(err, &me) && !errors.Is(err, tf.ErrSample) && !errors.Is(err, tf.ErrShort) && !errors.Is(err, tf.ErrConstant) &&
				!errors.Is(err, tf.ErrLength) && !errors.Is(err, tf.ErrName) && !errors.Is(err, tf.ErrSetting) && !errors.Is(err, tf.ErrModel) &&
				!errors.Is(err, tf.ErrConvergence) && !errors.Is(err, tf.ErrOverflow) {
				t.Fatalf("error of no kind %T: %v", err, err)
			}
			if errors.Is(err, tf.ErrInternal) {
				t.Fatalf("internal error: %v", err)
			}
			return
		}
		if !(e.SSQ > 0) || math.IsInf(e.SSQ, 0) || math.IsInf(e.LogLik, 0) || math.IsNaN(e.LogLik) || math.IsNaN(e.AIC) {
			t.Fatalf("estimate with SSQ %v, LogLik %v, AIC %v", e.SSQ, e.LogLik, e.AIC)
		}
		warned := hasWarning(e, fit.BadStandardError)
		for _, p := range e.Params {
			if math.IsNaN(p.Value) || math.IsInf(p.Value, 0) {
				t.Fatalf("estimate %s = %v", p.Name, p.Value)
			}
			if (math.IsNaN(p.SE) || math.IsInf(p.SE, 0) || p.SE == 0) && !warned {
				t.Fatalf("SE of %s = %v without a BadStandardError warning: %v", p.Name, p.SE, e.Warnings)
			}
		}
	})
}

// Forecast and Check on a record shorter than the estimate's
// conditioning name the output and the reason, not a Settings field
// the caller never set.
func TestShortRecordForConditioning(t *testing.T) {
	m := parse.MustModel("y = 0.5 / (1 - 0.6 B) B^2 x + AR(1)")
	n := 400
	x := fixture.WhiteInput(3, 4, n)
	y := fixture.MustRecord(t, "y = 0.5 / (1 - 0.6 B) B^2 x + 1 / (1 - 0.4 B) a", map[string][]float64{"x": x}, &tf.SimSettings{Sigma: 0.1, Seed1: 1, Seed2: 2})["y"]
	e, err := fit.Model(context.Background(), m, map[string][]float64{"x": x, "y": y}, nil)
	if err != nil {
		t.Fatal(err)
	}
	short := map[string][]float64{"x": x[:3], "y": y[:3]}
	want := `series "y": 3 samples, at least 4 needed (the estimate's residuals start at index 3`
	if _, err := e.Forecast(short, 5, nil); err == nil || !strings.Contains(err.Error(), want) || strings.Contains(err.Error(), "FitSettings") {
		t.Errorf("Forecast on 3 samples: %v", err)
	}
	if _, err := fit.Check(e, short, nil); err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("Check on 3 samples: %v", err)
	}
}
