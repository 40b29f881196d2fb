package tf_test

import (
	"encoding/binary"
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// TestSystemErr checks that every streaming path that can overflow says
// so: System.Err and Plant.Err keep the first non-finite output with its
// step and cause, Reset clears it, and Model.Simulate refuses an input
// path without a settled start.
func TestSystemErr(t *testing.T) {
	// An unstable input term grows past float64: 2^1024 after 1024 steps.
	sys, err := tf.NewSystem(parse.MustModel("y = 1 / (1 - 2 B) x"), nil)
	if err != nil {
		t.Fatal(err)
	}
	for k := 0; k < 1100; k++ {
		sys.Step([]float64{1})
		if k < 1000 && sys.Err() != nil {
			t.Fatalf("step %d: early error %v", k, sys.Err())
		}
	}
	var se *tf.SimError
	if err := sys.Err(); !errors.As(err, &se) || se.Part != "output y" || se.Step != 1023 || !errors.Is(err, tf.ErrOverflow) || !strings.Contains(err.Error(), "step 1023 gave +Inf") ||
		!strings.Contains(err.Error(), `the term of input "x" is unstable`) {
		t.Errorf("unstable term: Err = %v", err)
	}
	sys.Reset()
	if sys.Err() != nil {
		t.Errorf("after Reset: %v", sys.Err())
	}
	// A NaN input sample is named, at its step.
	sys.Step([]float64{1})
	sys.Step([]float64{math.NaN()})
	if err := sys.Err(); !errors.Is(err, tf.ErrSample) || err.Error() != `tf.System.Step: output y: step 1 gave NaN: input sample of "x" is NaN` {
		t.Errorf("NaN input: Err = %v", err)
	}
	// A stable model with inputs too large for float64.
	big, err := tf.NewSystem(parse.MustModel("y = 10 / (1 - 0.5 B) x"), nil)
	if err != nil {
		t.Fatal(err)
	}
	big.Step([]float64{1e308})
	if err := big.Err(); err == nil || !strings.Contains(err.Error(), "step 0 gave +Inf: float64 overflowed: the inputs are too large") {
		t.Errorf("large input: Err = %v", err)
	}
	// Plant.
	r, err := tf.NewRational([]float64{1}, []float64{1, -3}, 0)
	if err != nil {
		t.Fatal(err)
	}
	p := tf.NewPlant(r)
	for range 700 {
		p.Step(1)
	}
	if err := p.Err(); !errors.As(err, &se) || se.Part != "plant" || !strings.Contains(err.Error(), "gave +Inf: float64 overflowed: the term is unstable") {
		t.Errorf("unstable plant: Err = %v", err)
	}
	p.Reset()
	p.Step(math.Inf(-1))
	if err := p.Err(); err == nil || !strings.Contains(err.Error(), "step 0 gave -Inf: the input sample is -Inf") {
		t.Errorf("plant -Inf input: Err = %v", err)
	}
	if err := p.SetSteady(0); err == nil { // the gain exists: 1/(1-3)
		if p.Err() != nil {
			t.Errorf("after SetSteady: %v", p.Err())
		}
	}
	// An integrating input term has no settled start for a non-zero
	// first sample: Simulate says so and names FromRest; FromRest runs.
	integ := parse.MustModel("level = 0.2 B / (1 - B) inflow")
	in := map[string][]float64{"inflow": {3, 3, 4, 4}}
	var me *tf.ModelError
	if _, err := integ.Simulate(in, nil); !errors.As(err, &me) || me.Part != "input inflow" || !errors.As(err, new(*tf.GainError)) ||
		!strings.Contains(err.Error(), "its first sample is 3") || !strings.Contains(err.Error(), "SimSettings.FromRest") {
		t.Errorf("integrator from 3: %v", err)
	}
	y, err := integ.Simulate(in, &tf.SimSettings{FromRest: true})
	if err != nil || y[3] != 0.2*(3+3+4) {
		t.Errorf("integrator FromRest: %v, %v (want y[3] = 0.2 (3 + 3 + 4), the running sum)", y, err)
	}
}

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

// FuzzSystemStep builds a System from fuzzed coefficients (any float64,
// including NaN and huge values, and invalid powers and dead times) and
// steps it with fuzzed inputs: NewSystem returns a typed error or a
// System; every Step either gives a finite output or leaves Err set
// (from that step on), and nothing panics.
func FuzzSystemStep(f *testing.F) {
	f.Add([]byte{}, 0.5, -0.8, 0.3, byte(1), byte(1))
	f.Add([]byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16}, 1.0, -2.0, 0.9, byte(0), byte(3))
	f.Add(make([]byte, 64), 1e308, 1.0, 0.0, byte(2), byte(0))
	f.Fuzz(func(t *testing.T, b []byte, w0, d1, p1 float64, exp, delay byte) {
		one := tf.Term{Coef: tf.Coef{Value: 1}}
		term := func(v float64, p int) tf.Term { return tf.Term{Coef: tf.Coef{Value: v}, Power: p} }
		m := tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x", Delay: int(int8(delay)) % 6,
			Num: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{term(w0, 0)}}}},
			Den: tf.Poly{Factors: []tf.Factor{{Exp: int(int8(exp)) % 3, Terms: []tf.Term{one, term(d1, 1)}}}}}},
			Noise: &arma.Noise{AR: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, term(p1, 1)}}}}}}
		sys, err := tf.NewSystem(m, &tf.SimSettings{Sigma: math.Abs(math.Mod(p1, 10)), Seed1: 1})
		if err != nil {
			return
		}
		failed := false
		for len(b) >= 8 {
			u := math.Float64frombits(binary.LittleEndian.Uint64(b))
			b = b[8:]
			y := sys.Step([]float64{u})
			if math.IsNaN(y) || math.IsInf(y, 0) {
				failed = true
			}
			if failed && sys.Err() == nil {
				t.Fatalf("non-finite output %v and no Err", y)
			}
			if !failed && sys.Err() != nil {
				t.Fatalf("Err %v with finite outputs", sys.Err())
			}
		}
	})
}

// TestSystemStreaming checks Clone, Reset and SetSteady of the streaming
// plant.
func TestSystemStreaming(t *testing.T) {
	m := parse.MustModel("(1 - B) y = 0.1 + 0.5 / (1 - 0.8 B) B^2 valve + 0.3 ((1 - B) feed) + (1 - 0.3 B) / (1 - 0.5 B) a")
	sys, err := tf.NewSystem(m, &tf.SimSettings{Seed1: 1, Seed2: 2, Sigma: 0.1, BurnIn: 50})
	if err != nil {
		t.Fatal(err)
	}
	if got := sys.Inputs(); len(got) != 2 || got[0] != "valve" || got[1] != "feed" {
		t.Fatalf("Inputs() = %v", got)
	}
	rng := rand.New(rand.NewPCG(3, 3))
	u := make([][]float64, 200)
	for i := range u {
		u[i] = []float64{rng.NormFloat64(), rng.NormFloat64()}
	}
	var first []float64
	for i := range 100 {
		first = append(first, sys.Step(u[i]))
	}
	c := sys.Clone()
	for i := 100; i < 200; i++ {
		if a, b := sys.Step(u[i]), c.Step(u[i]); a != b {
			t.Fatalf("clone differs at %d: %v vs %v", i, a, b)
		}
	}
	sys.Reset()
	for i := range 100 {
		if v := sys.Step(u[i]); v != first[i] {
			t.Fatalf("after Reset step %d = %v, first run %v", i, v, first[i])
		}
	}
	// Steady state of a noise-free, undifferenced model: a constant input
	// keeps the output at c + sum_i G_i(1) u_i.
	m2 := parse.MustModel("y = 2 + 0.5 / (1 - 0.8 B) B^2 valve + (0.2 + 0.1 B) ((1 - B) feed)")
	s2, _ := tf.NewSystem(m2, nil)
	if err := s2.SetSteady([]float64{4, 7}); err != nil {
		t.Fatal(err)
	}
	want := 2 + 0.5/(1-0.8)*4 // the differenced feed is 0 at steady state
	for i := range 10 {
		if v := s2.Step([]float64{4, 7}); math.Abs(v-want) > 1e-12 {
			t.Fatalf("steady step %d = %v, want %v", i, v, want)
		}
	}
	// The default settled start of Simulate has no start-up transient.
	x := []float64{4, 4, 4, 4, 4}
	y, _ := m2.Simulate(map[string][]float64{"valve": x, "feed": x}, nil)
	for i, v := range y {
		if math.Abs(v-want) > 1e-12 {
			t.Errorf("settled Simulate y[%d] = %v, want %v", i, v, want)
		}
	}
	// An integrating path has no steady state for a non-zero input.
	m3 := parse.MustModel("y = 0.5 / (1 - B) x")
	s3, _ := tf.NewSystem(m3, nil)
	var me *tf.ModelError
	var ge *tf.GainError
	if err := s3.SetSteady([]float64{1}); !errors.As(err, &me) || !errors.As(err, &ge) || !errors.Is(err, tf.ErrModel) ||
		err.Error() != "tf.System.SetSteady: input x: has a pole at z = 1 (an integrator), so no steady state for a non-zero input" {
		t.Errorf("integrator SetSteady: %v", err)
	}
	if err := s3.SetSteady([]float64{0}); err != nil {
		t.Errorf("integrator SetSteady(0): %v", err)
	}
}

// SetSteady with the wrong number of input samples is a *SeriesError,
// not a panic, and an error leaves the system as it was.
func TestSystemSetSteadyBadInput(t *testing.T) {
	m := parse.MustModel("y = 0.5 / (1 - 0.8 B) B^2 valve + 0.3 / (1 - B) feed")
	sys, err := tf.NewSystem(m, nil)
	if err != nil {
		t.Fatal(err)
	}
	var se *tf.SeriesError
	if err := sys.SetSteady([]float64{1}); !errors.As(err, &se) || !errors.Is(err, tf.ErrLength) ||
		err.Error() != `tf.System.SetSteady: series "u" has 1 samples against 2 (one steady sample per input, in the order of Inputs)` {
		t.Fatalf("SetSteady with 1 of 2 inputs: err = %v, want *SeriesError", err)
	}
	ref := sys.Clone()
	// feed passes an integrator (pole at z = 1): no steady state for a
	// non-zero level, so valve must not be moved either.
	if err := sys.SetSteady([]float64{2, 1}); err == nil {
		t.Fatal("SetSteady through an integrator: no error")
	}
	for i := range 20 {
		if a, b := sys.Step([]float64{2, 0}), ref.Step([]float64{2, 0}); a != b {
			t.Fatalf("step %d after a failed SetSteady: %v, untouched copy %v", i, a, b)
		}
	}
}

// NewSystem rejects a burn-in above tf.MaxBurnIn (it would loop for a
// very long time) with a *SettingError, as Model.Simulate does.
func TestNewSystemBurnInLimit(t *testing.T) {
	m := parse.MustModel("y = 0.5 / (1 - 0.8 B) u + (1 - 0.3 B) a")
	var ae *tf.SettingError
	_, err := tf.NewSystem(m, &tf.SimSettings{Sigma: 1, BurnIn: tf.MaxBurnIn + 1})
	if !errors.As(err, &ae) || ae.Setting != "SimSettings.BurnIn" || ae.Op != "tf.NewSystem" {
		t.Fatalf("BurnIn = MaxBurnIn+1: err = %v, want *SettingError for BurnIn", err)
	}
}

func BenchmarkSystemStep(b *testing.B) {
	sys, err := tf.NewSystem(simBenchModel, &tf.SimSettings{Seed1: 1, Seed2: 2, Sigma: 0.1})
	if err != nil {
		b.Fatal(err)
	}
	u := []float64{1, 2}
	b.ReportAllocs()
	for b.Loop() {
		sys.Step(u)
	}
}
