package tf_test

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/tf"
)

func TestNewRationalBadInput(t *testing.T) {
	long := make([]float64, tf.MaxDegree+2)
	long[0], long[len(long)-1] = 1, 0.1
	okLong := make([]float64, tf.MaxDegree+1)
	okLong[0], okLong[len(okLong)-1] = 1, 0.1
	padded := append(append([]float64(nil), long[:tf.MaxDegree+1]...), 0, 0) // trailing zeros are dropped
	padded[tf.MaxDegree] = 0.1
	nan, inf := math.NaN(), math.Inf(1)
	for _, c := range []struct {
		name     string
		num, den []float64
		delay    int
		poly     string // CoefError.Poly; "" for a DelayError
		index    int
		problem  error
		msg      string
	}{
		{"zero leading denominator", []float64{1}, []float64{0, 1}, 0, "den", 0, tf.ErrZeroConstant,
			"tf.NewRational: den coefficient 0 (B^0) = 0: constant term is zero"},
		{"NaN numerator", []float64{1, nan}, []float64{1}, 0, "num", 1, tf.ErrNotFinite,
			"tf.NewRational: num coefficient 1 (B^1) = NaN: value is NaN or infinite"},
		{"Inf denominator", []float64{1}, []float64{1, -0.5, inf}, 0, "den", 2, tf.ErrNotFinite,
			"tf.NewRational: den coefficient 2 (B^2) = +Inf: value is NaN or infinite"},
		{"-Inf leading denominator", []float64{1}, []float64{math.Inf(-1)}, 0, "den", 0, tf.ErrNotFinite,
			"tf.NewRational: den coefficient 0 (B^0) = -Inf: value is NaN or infinite"},
		{"empty numerator", nil, []float64{1}, 0, "num", -1, tf.ErrEmpty, "tf.NewRational: num: no coefficients"},
		{"empty denominator", []float64{1}, []float64{}, 0, "den", -1, tf.ErrEmpty, "tf.NewRational: den: no coefficients"},
		{"numerator degree past limit", long, []float64{1}, 0, "num", tf.MaxDegree + 1, tf.ErrDegree,
			"tf.NewRational: num has degree 65: degree above tf.MaxDegree (64)"},
		{"denominator degree past limit", []float64{1}, long, 0, "den", tf.MaxDegree + 1, tf.ErrDegree,
			"tf.NewRational: den has degree 65: degree above tf.MaxDegree (64)"},
		{"negative dead time", []float64{1}, []float64{1}, -1, "", 0, nil, "tf.NewRational: dead time -1 samples outside 0..10000"},
		{"huge dead time", []float64{1}, []float64{1}, tf.MaxDelay + 1, "", 0, nil, "tf.NewRational: dead time 10001 samples outside 0..10000"},
		{"overflow by normalisation", []float64{1e300}, []float64{1e-300}, 0, "den", 0, tf.ErrNormalise,
			"tf.NewRational: den coefficient 0 (B^0) = 1e-300: normalising by den[0] (to make it 1) leaves float64 range: num coefficient 0 = 1e+300 divided by it is +Inf"},
	} {
		t.Run(c.name, func(t *testing.T) {
			r, err := tf.NewRational(c.num, c.den, c.delay)
			if err == nil {
				t.Fatalf("no error; got %v", r)
			}
			if err.Error() != c.msg {
				t.Errorf("message %q, want %q", err.Error(), c.msg)
			}
			if !errors.Is(err, tf.ErrModel) {
				t.Errorf("%v does not match tf.ErrModel", err)
			}
			if c.poly == "" {
				var de *tf.DelayError
				if !errors.As(err, &de) || de.Delay != c.delay {
					t.Errorf("err %#v, want *tf.DelayError{%d}", err, c.delay)
				}
				return
			}
			var ce *tf.CoefError
			if !errors.As(err, &ce) {
				t.Fatalf("err %T, want *tf.CoefError", err)
			}
			if ce.Poly != c.poly || ce.Index != c.index || !errors.Is(err, c.problem) {
				t.Errorf("got %+v, want poly %s index %d problem %v", *ce, c.poly, c.index, c.problem)
			}
		})
	}
	// The limits themselves are accepted, and trailing zeros do not count.
	for _, c := range [][2][]float64{{okLong, {1}}, {{1}, okLong}, {padded, {1}}} {
		if _, err := tf.NewRational(c[0], c[1], tf.MaxDelay); err != nil {
			t.Errorf("degree %d/%d, delay MaxDelay: %v", len(c[0])-1, len(c[1])-1, err)
		}
	}
}

func TestBadSamplesAndArguments(t *testing.T) {
	g := tf.MustRational([]float64{0.5}, []float64{1, -0.5}, 1)
	integ := tf.MustRational([]float64{1}, []float64{1, -1}, 1)
	unst := tf.MustRational([]float64{1}, []float64{1, -1.2}, 0)
	sample := func(series string, index int) func(error) bool {
		return func(err error) bool {
			var se *tf.SampleError
			return errors.As(err, &se) && se.Series == series && se.Index == index && errors.Is(err, tf.ErrSample) && se.Op != ""
		}
	}
	isArg := func(arg string) func(error) bool {
		return func(err error) bool {
			var se *tf.SettingError
			return errors.As(err, &se) && se.Setting == arg && errors.Is(err, tf.ErrSetting) && se.Op != ""
		}
	}
	isGain := func(err error) bool { var ge *tf.GainError; return errors.As(err, &ge) && errors.Is(err, tf.ErrModel) }
	isUnstable := func(err error) bool {
		var ue *tf.UnstableError
		return errors.As(err, &ue) && errors.Is(err, tf.ErrModel) && ue.Op != ""
	}
	isCoef := func(p error) func(error) bool {
		return func(err error) bool { var ce *tf.CoefError; return errors.As(err, &ce) && errors.Is(err, p) }
	}
	first := func(_ any, err error) error { return err }
	second := func(_, _ any, err error) error { return err }
	for _, c := range []struct {
		name string
		err  error
		ok   func(error) bool
	}{
		{"NaN input sample", first(g.Filter([]float64{1, 2, math.NaN()})), sample("input", 2)},
		{"Inf input sample", first(g.FilterFrom([]float64{math.Inf(-1)}, tf.Past{})), sample("input", 0)},
		{"NaN past input", first(g.FilterFrom([]float64{1}, tf.Past{Input: []float64{0, math.NaN()}})), sample("past input", 1)},
		{"NaN past output", first(g.FilterFrom([]float64{1}, tf.Past{Output: []float64{math.NaN()}})), sample("past output", 0)},
		{"NaN steady input", first(g.SteadyPast(math.NaN())), sample("steady input", 0)},
		{"plant NaN history", tf.NewPlant(g).SetHistory([]float64{math.Inf(1)}, nil), sample("past input", 0)},
		{"integrator gain", first(integ.Gain()), isGain},
		{"integrator steady start", tf.NewPlant(integ).SetSteady(1), isGain},
		{"unstable BIBO", first(unst.BIBOBound()), isUnstable},
		{"integrator BIBO", first(integ.BIBOBound()), isUnstable},
		{"unstable step metrics", first(unst.StepFigures(tf.StepSettings{})), isUnstable},
		{"bad band", first(g.StepFigures(tf.StepSettings{Band: 1.5})), isArg("StepSettings.Band")},
		{"negative interval", first(g.StepFigures(tf.StepSettings{Interval: -1})), isArg("StepSettings.Interval")},
		{"integrator on the unit circle", second(integ.GainPhase([]float64{0, 1})), isUnstable},
		{"decreasing frequencies", second(g.GainPhase([]float64{1, 0.5})), isArg("w[1]")},
		{"NaN frequency", second(g.GainPhase([]float64{math.NaN()})), isArg("w[0]")},
		{"modes negative interval", first(g.Modes(-1)), isArg("interval")},
		{"FOPDT zero tau", first(tf.FOPDT{Gain: 1, TimeConstant: 0, DeadTime: 1}.Discretize(1)), isArg("TimeConstant")},
		{"FOPDT NaN gain", first(tf.FOPDT{Gain: math.NaN(), TimeConstant: 1}.Discretize(1)), isArg("Gain")},
		{"FOPDT negative dead time", first(tf.FOPDT{Gain: 1, TimeConstant: 1, DeadTime: -0.5}.Discretize(1)), isArg("DeadTime")},
		{"FOPDT huge dead time", first(tf.FOPDT{Gain: 1, TimeConstant: 1, DeadTime: 1e9}.Discretize(1)), isArg("DeadTime")},
		{"FOPDT zero interval", first(tf.FOPDT{Gain: 1, TimeConstant: 1}.Discretize(0)), isArg("interval")},
		{"FOPDT time constant 1e300 intervals", first(tf.FOPDT{Gain: 1, TimeConstant: 1e300}.Discretize(1)), isArg("TimeConstant")},
		{"SOPDT time constant 1e300 intervals", first(tf.SOPDT{Gain: 1, Tau1: 1, Tau2: 1e300}.Discretize(1)), isArg("time constant")},
		{"SOPDT negative tau", first(tf.SOPDT{Gain: 1, Tau1: 1, Tau2: -2}.Discretize(1)), isArg("Tau2")},
		{"second order negative damping", first(tf.SecondOrder{Gain: 1, NaturalFrequency: 1, Damping: -0.1}.Discretize(1)), isArg("Damping")},
		{"ill-posed loop", first(tf.MustRational([]float64{1}, []float64{1}, 0).CloseLoop(tf.MustRational([]float64{-1}, []float64{1}, 0))), isCoef(tf.ErrZeroConstant)},
		// The loop has a dead time (b_g + b_h = 3), so den[0] = 1 however
		// large omega_g(0) omega_h(0) is: well posed.
		{"loop with dead time and a large product gain is well posed", func() error {
			_, err := tf.MustRational([]float64{1}, []float64{1, -2}, 3).CloseLoop(tf.MustRational([]float64{1e300}, []float64{1, 1e300}, 0))
			if err != nil {
				return nil // reported as a failure below
			}
			return errors.New("ok")
		}(), func(err error) bool { return err.Error() == "ok" }},
		{"loop coefficients overflow", first(tf.MustRational([]float64{1e300, 1e300}, []float64{1, 1e300}, 0).CloseLoop(tf.MustRational([]float64{1e300}, []float64{1}, 0))), isCoef(tf.ErrNotFinite)},
		{"loop dead time past degree limit", first(tf.MustRational([]float64{1}, []float64{1, -0.5}, 60).CloseLoop(tf.MustRational([]float64{1}, []float64{1}, 10))), isCoef(tf.ErrDegree)},
		{"series degree past limit", first(tf.MustRational([]float64{1}, make40(), 0).Times(tf.MustRational([]float64{1}, make40(), 0))), isCoef(tf.ErrDegree)},
		{"series dead time past limit", first(tf.MustRational([]float64{1}, []float64{1}, tf.MaxDelay).Times(g)), func(err error) bool { var de *tf.DelayError; return errors.As(err, &de) }},
		{"parallel dead-time difference past degree limit", first(tf.MustRational([]float64{1}, []float64{1}, 100).Plus(g)), isCoef(tf.ErrDegree)},
		{"constant NaN", first(tf.Constant(math.NaN())), isCoef(tf.ErrNotFinite)},
	} {
		if c.err == nil || !c.ok(c.err) {
			t.Errorf("%s: err = %v (%T)", c.name, c.err, c.err)
		}
	}
	// Op names the exported function the caller called, also when the
	// fault was found by a function it calls (Gain inside SetSteady).
	for _, c := range []struct {
		err  error
		want string
	}{
		{tf.NewPlant(integ).SetSteady(1), "tf.Plant.SetSteady: no steady-state gain: denominator at B = 1 is 0 (pole at z = 1), numerator 1"},
		{first(integ.Gain()), "tf.Rational.Gain: no steady-state gain: denominator at B = 1 is 0 (pole at z = 1), numerator 1"},
		{first(g.Filter([]float64{1, 2, math.NaN()})), `tf.Rational.Filter: series "input" sample 2 is NaN: samples must be finite numbers`},
		{g.FilterTo(make([]float64, 1), []float64{math.Inf(1)}), `tf.Rational.FilterTo: series "input" sample 0 is +Inf: samples must be finite numbers`},
		{first(unst.StepFigures(tf.StepSettings{})), "tf.Rational.StepFigures: step figures needs a stable term; largest pole magnitude 1.2"},
		{first(g.StepFigures(tf.StepSettings{RiseFrom: 0.5, RiseTo: 0.4})), "tf.Rational.StepFigures: StepSettings.RiseFrom = 0.5: must lie below StepSettings.RiseTo (0.4)"},
		{first(tf.MustRational([]float64{1}, make40(), 0).Times(tf.MustRational([]float64{1}, make40(), 0))), "tf.Rational.Times: den has degree 80: degree above tf.MaxDegree (64)"},
	} {
		if c.err == nil || c.err.Error() != c.want {
			t.Errorf("got  %v\nwant %s", c.err, c.want)
		}
	}
}

func make40() []float64 {
	d := make([]float64, 41)
	d[0], d[40] = 1, 0.5
	return d
}

// TestInputsNotModified checks that constructors and methods never write
// to caller slices.
func TestInputsNotModified(t *testing.T) {
	num := []float64{2, 1}
	den := []float64{2, -1}
	r := tf.MustRational(num, den, 1)
	if num[0] != 2 || den[0] != 2 || den[1] != -1 {
		t.Fatalf("NewRational modified its arguments: %v %v", num, den)
	}
	if got := r.Den(); got[0] != 1 || got[1] != -0.5 {
		t.Errorf("normalised den %v, want [1 -0.5]", got)
	}
	r.Num()[0] = 99
	if r.Num()[0] != 1 {
		t.Errorf("Num() returned internal storage")
	}
	x := []float64{1, 2, 3}
	past := tf.Past{Input: []float64{4, 5}, Output: []float64{6}}
	if _, err := r.FilterFrom(x, past); err != nil {
		t.Fatal(err)
	}
	if x[0] != 1 || x[2] != 3 || past.Input[0] != 4 || past.Input[1] != 5 || past.Output[0] != 6 {
		t.Errorf("FilterFrom modified its arguments: %v %+v", x, past)
	}
	var zero tf.Rational
	if h := zero.Impulse(3); h[0] != 0 || len(h) != 3 {
		t.Errorf("zero Rational impulse %v", h)
	}
}

// TestConcurrentUse runs the read-only methods of one Rational from
// several goroutines (meaningful under go test -race).
func TestConcurrentUse(t *testing.T) {
	r := tf.MustRational([]float64{0.2, 0.1}, []float64{1, -1.1, 0.3}, 2)
	x := make([]float64, 500)
	for i := range x {
		x[i] = float64(i % 7)
	}
	want, _ := r.Filter(x)
	done := make(chan error, 4)
	for g := 0; g < 4; g++ {
		go func() {
			for i := 0; i < 20; i++ {
				y, err := r.Filter(x)
				if err != nil {
					done <- err
					return
				}
				for k := range y {
					if y[k] != want[k] {
						done <- errors.New("concurrent Filter differs")
						return
					}
				}
				_ = r.Poles()
				_, _ = r.StepFigures(tf.StepSettings{})
				p := tf.NewPlant(r)
				p.Step(1)
			}
			done <- nil
		}()
	}
	for g := 0; g < 4; g++ {
		if err := <-done; err != nil {
			t.Fatal(err)
		}
	}
}

// TestStableIntegrators: integrators built by multiplying out factors
// (by hand: (1 - B)(1 - 0.9 B)(1 + 0.3 B + 0.2 B^2) and (1 + B)(1 - 0.5 B))
// are not stable whatever the rounding of their computed poles.
func TestStableIntegrators(t *testing.T) {
	mul := func(a, b []float64) []float64 {
		c := make([]float64, len(a)+len(b)-1)
		for i, x := range a {
			for j, y := range b {
				c[i+j] += x * y
			}
		}
		return c
	}
	for _, den := range [][]float64{
		mul(mul([]float64{1, -1}, []float64{1, -0.9}), []float64{1, 0.3, 0.2}),
		mul([]float64{1, 1}, []float64{1, -0.5}),
		mul(mul([]float64{1, -1}, []float64{1, -1}), []float64{1, -0.7}),
	} {
		r := tf.MustRational([]float64{1}, den, 0)
		if r.Stable() {
			t.Errorf("den %v with a pole on the unit circle reported stable (poles %v)", den, r.Poles())
		}
	}
}
