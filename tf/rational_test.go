package tf_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"runtime"
	"strconv"
	"testing"

	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/testutil"
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

// TestRationalSamplesAndArgumentsBadInput is the table of bad samples and
// arguments given to the methods of Rational, Plant and the continuous
// models (filtering, steady starts, gains, step figures, frequency
// responses, discretisation): each gives the typed error naming the
// series and index, the setting, or the unstable or integrating model.
func TestRationalSamplesAndArgumentsBadInput(t *testing.T) {
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

// TestResponseLengthBadInput checks the documented lengths of Impulse and
// Step: nil for every n <= 0, including math.MinInt, and for a length no
// slice can have (math.MaxInt) the runtime panic of make, recoverable,
// rather than a hang or a wrong result.
func TestResponseLengthBadInput(t *testing.T) {
	r := tf.MustRational([]float64{0.5}, []float64{1, -0.8}, 2)
	for _, n := range []int{0, -1, -1000, math.MinInt} {
		if h := r.Impulse(n); h != nil {
			t.Errorf("Impulse(%d) = %v, want nil", n, h)
		}
		if y := r.Step(n); y != nil {
			t.Errorf("Step(%d) = %v, want nil", n, y)
		}
	}
	for name, f := range map[string]func(int) []float64{"Impulse": r.Impulse, "Step": r.Step} {
		func() {
			defer func() {
				if _, ok := recover().(runtime.Error); !ok {
					t.Errorf("%s(math.MaxInt): want a runtime error panic", name)
				}
			}()
			f(math.MaxInt)
		}()
	}
}

// TestNormaliseBadInput checks that a den[0] whose division takes a
// coefficient out of float64 range is reported for den coefficient 0,
// with its value and the coefficient concerned, wrapping ErrNormalise,
// never as a numerator coefficient of +Inf, a value the caller never
// gave.
func TestNormaliseBadInput(t *testing.T) {
	for _, c := range []struct {
		name     string
		num, den []float64
		msg      string
	}{
		{"tiny den[0] overflows num", []float64{10}, []float64{1e-308},
			"tf.NewRational: den coefficient 0 (B^0) = 1e-308: normalising by den[0] (to make it 1) leaves float64 range: num coefficient 0 = 10 divided by it is +Inf"},
		{"tiny den[0] overflows den", []float64{1e-308}, []float64{1e-308, -2},
			"tf.NewRational: den coefficient 0 (B^0) = 1e-308: normalising by den[0] (to make it 1) leaves float64 range: den coefficient 1 = -2 divided by it is -Inf"},
		{"huge den[0] underflows num", []float64{1, 1e-300}, []float64{1e300},
			"tf.NewRational: den coefficient 0 (B^0) = 1e+300: normalising by den[0] (to make it 1) leaves float64 range: num coefficient 1 = 1e-300 divided by it is 0"},
		{"negative tiny den[0]", []float64{1e300}, []float64{-1e-300},
			"tf.NewRational: den coefficient 0 (B^0) = -1e-300: normalising by den[0] (to make it 1) leaves float64 range: num coefficient 0 = 1e+300 divided by it is -Inf"},
	} {
		t.Run(c.name, func(t *testing.T) {
			r, err := tf.NewRational(c.num, c.den, 0)
			var ce *tf.CoefError
			if !errors.As(err, &ce) || ce.Poly != "den" || ce.Index != 0 || ce.Value != c.den[0] || !errors.Is(err, tf.ErrNormalise) || !errors.Is(err, tf.ErrModel) {
				t.Fatalf("got %v, %v; want *tf.CoefError for den[0] wrapping ErrNormalise", r, err)
			}
			if err.Error() != c.msg {
				t.Errorf("message %q\nwant    %q", err.Error(), c.msg)
			}
		})
	}
	// A small den[0] that the coefficients survive is still fine.
	r, err := tf.NewRational([]float64{1e-300}, []float64{1e-300, -0.5e-300}, 0)
	if err != nil || r.Num()[0] != 1 || r.Den()[1] != -0.5 {
		t.Errorf("small den[0]: %v, %v", r, err)
	}
}

// randomStable returns a random stable term: r poles inside radius 0.95
// (real, or complex pairs), a numerator of degree s with coefficients in
// [-1, 1] and a dead time in 0..5.
func randomStable(rng *rand.Rand) tf.Rational {
	r := rng.IntN(7)
	var zs []complex128
	for len(zs) < r {
		m := 0.95 * math.Sqrt(rng.Float64())
		if r-len(zs) >= 2 && rng.IntN(2) == 0 {
			phi := math.Pi * rng.Float64()
			z := complex(m*math.Cos(phi), m*math.Sin(phi))
			zs = append(zs, z, complex(real(z), -imag(z)))
		} else {
			zs = append(zs, complex(2*m-0.95, 0))
		}
	}
	den := poly.FromInverseRoots(zs)
	num := make([]float64, 1+rng.IntN(5))
	for k := range num {
		num[k] = 2*rng.Float64() - 1
	}
	return tf.MustRational(num, den, rng.IntN(6))
}

func randomSeries(rng *rand.Rand, n int) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64()
	}
	return x
}

// Tolerance for identities between two different evaluation orders of
// the same recursion (power-series division against the filter loop, or
// a running sum): rounding of a few ulps per step, amplified by the
// recursion (denominators of degree 6 with poles up to 0.95 have
// coefficients up to ~6 and amplify rounding by up to ~1e3), so 1e-12
// relative to the largest value so far (observed up to ~2e-13).
const identityTol = 1e-12

// randomCase is one random draw of TestRationalProperties: a stable term
// g, a second term q, a dead-time shift, an input series, a history
// length and a steady input level.
type randomCase struct {
	g, q tf.Rational
	sh   int
	x    []float64
	m    int
	u    float64
}

// randomCases draws the 300 trials of TestRationalProperties from one
// seeded generator.
func randomCases() []randomCase {
	rng := rand.New(rand.NewPCG(20261201, 2))
	trials := make([]randomCase, 300)
	for i := range trials {
		tr := &trials[i]
		tr.g = randomStable(rng)
		tr.sh = rng.IntN(9)
		tr.q = randomStable(rng)
		tr.x = randomSeries(rng, 300)
		tr.m = 1 + rng.IntN(40)
		tr.u = rng.NormFloat64()
	}
	return trials
}

// responseLen is the length of the impulse responses compared.
const responseLen = 120

// TestRationalProperties checks identities of random stable terms, one
// subtest per identity, each over every trial (it stops at the first
// trial that breaks it).
func TestRationalProperties(t *testing.T) {
	trials := randomCases()
	for _, p := range []struct {
		name  string
		check func(t *testing.T, trial int, tr randomCase)
	}{
		{"step is the running sum of the impulse response", stepIsRunningSum},
		{"a filtered unit pulse is the impulse response", pulseGivesImpulse},
		{"dead time shifts exactly", delayShiftsExactly},
		{"series is convolution, parallel is sum", seriesAndParallel},
		{"gain is the impulse sum within the BIBO tail", gainIsImpulseSum},
		{"plant equals batch filtering, clone and reset", plantMatchesBatch},
		{"a history continues the whole series", historyContinues},
		{"a steady start holds gain times input", steadyStartHolds},
		{"frequency response at 0 is the gain", zeroFrequencyIsGain},
	} {
		t.Run(p.name, func(t *testing.T) {
			for i, tr := range trials {
				p.check(t, i, tr)
			}
		})
	}
}

// stepIsRunningSum: step response = cumulative sum of the impulse response.
func stepIsRunningSum(t *testing.T, trial int, tr randomCase) {
	h := tr.g.Impulse(responseLen)
	cs := make([]float64, responseLen)
	acc := 0.0
	for k, v := range h {
		acc += v
		cs[k] = acc
	}
	if e := testutil.RunningRelErr(tr.g.Step(responseLen), cs); !(e <= identityTol) {
		t.Fatalf("trial %d %v: step vs cumsum(impulse) error %.3g", trial, tr.g, e)
	}
}

// pulseGivesImpulse: filtering a unit pulse gives the impulse response.
func pulseGivesImpulse(t *testing.T, trial int, tr randomCase) {
	pulse := make([]float64, responseLen)
	pulse[0] = 1
	y, _ := tr.g.Filter(pulse)
	if e := testutil.RunningRelErr(y, tr.g.Impulse(responseLen)); !(e <= identityTol) {
		t.Fatalf("trial %d: filtered pulse vs impulse error %.3g", trial, e)
	}
}

// delayShiftsExactly: a dead time longer by sh shifts the impulse response by sh
// samples, exactly.
func delayShiftsExactly(t *testing.T, trial int, tr randomCase) {
	g, sh := tr.g, tr.sh
	h := g.Impulse(responseLen)
	hs := tf.MustRational(g.Num(), g.Den(), g.Delay()+sh).Impulse(responseLen)
	for k := range hs {
		want := 0.0
		if k >= sh {
			want = h[k-sh]
		}
		if hs[k] != want {
			t.Fatalf("trial %d: shift by %d: h[%d] = %v, want %v exactly", trial, sh, k, hs[k], want)
		}
	}
}

// seriesAndParallel: series impulse response = convolution of the
// impulse responses; parallel = sum. The product denominator has degree
// up to 12 and amplifies rounding further: 10 identityTol (observed up to
// ~4e-12).
func seriesAndParallel(t *testing.T, trial int, tr randomCase) {
	h, hq := tr.g.Impulse(responseLen), tr.q.Impulse(responseLen)
	ser, err := tr.g.Times(tr.q)
	if err != nil {
		t.Fatal(err)
	}
	conv := make([]float64, responseLen)
	for i := 0; i < responseLen; i++ {
		for j := 0; j <= i; j++ {
			conv[i] += h[j] * hq[i-j]
		}
	}
	if e := testutil.RunningRelErr(ser.Impulse(responseLen), conv); !(e <= 10*identityTol) {
		t.Fatalf("trial %d: series vs convolution error %.3g", trial, e)
	}
	par, err := tr.g.Plus(tr.q)
	if err != nil {
		t.Fatal(err)
	}
	sum := make([]float64, responseLen)
	for i := range sum {
		sum[i] = h[i] + hq[i]
	}
	if e := testutil.RunningRelErr(par.Impulse(responseLen), sum); !(e <= 10*identityTol) {
		t.Fatalf("trial %d: parallel vs sum error %.3g", trial, e)
	}
}

// gainIsImpulseSum: steady-state gain = sum of the impulse response, within the
// BIBO tail bound (|sum_{k>=N} h_k| <= sum_{k>=N} |h_k| <= Tail).
func gainIsImpulseSum(t *testing.T, trial int, tr randomCase) {
	g := tr.g
	bound, err := g.BIBOBound()
	if err != nil {
		t.Fatal(err)
	}
	total, abs := 0.0, 0.0
	for _, v := range g.Impulse(bound.Terms) {
		total += v
		abs += math.Abs(v)
	}
	gain, err := g.Gain()
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(gain-total) > bound.Tail+1e-12*abs {
		t.Fatalf("trial %d: gain %v, sum of impulse %v, tail bound %v", trial, gain, total, bound.Tail)
	}
	if math.Abs(abs-bound.Sum) > 1e-12*abs {
		t.Fatalf("trial %d: BIBO sum %v, want %v", trial, bound.Sum, abs)
	}
}

// plantMatchesBatch: the streaming plant equals batch filtering sample for
// sample, bit for bit (same summation order); a clone continues
// identically; Reset returns to rest.
func plantMatchesBatch(t *testing.T, trial int, tr randomCase) {
	x := tr.x
	yb, _ := tr.g.Filter(x)
	p := tf.NewPlant(tr.g)
	for i, v := range x {
		if got := p.Step(v); got != yb[i] {
			t.Fatalf("trial %d: plant y[%d] = %v, batch %v", trial, i, got, yb[i])
		}
	}
	c := p.Clone()
	for i := 0; i < 20; i++ {
		if a, b := p.Step(x[i]), c.Step(x[i]); a != b {
			t.Fatalf("trial %d: clone diverged at %d: %v vs %v", trial, i, a, b)
		}
	}
	p.Reset()
	if got := p.Step(x[0]); got != yb[0] {
		t.Fatalf("trial %d: after Reset y[0] = %v, want %v", trial, got, yb[0])
	}
}

// historyContinues: filtering from a history equals filtering the whole
// series (the first m samples provide the past of the rest), and a plant
// given the same history continues the same way.
func historyContinues(t *testing.T, trial int, tr randomCase) {
	x, m := tr.x, tr.m
	yb, _ := tr.g.Filter(x)
	yr, err := tr.g.FilterFrom(x[m:], tf.Past{Input: x[:m], Output: yb[:m]})
	if err != nil {
		t.Fatal(err)
	}
	for i := range yr {
		if yr[i] != yb[m+i] {
			t.Fatalf("trial %d: FilterFrom y[%d] = %v, whole-series %v", trial, i, yr[i], yb[m+i])
		}
	}
	ph := tf.NewPlant(tr.g)
	if err := ph.SetHistory(x[:m], yb[:m]); err != nil {
		t.Fatal(err)
	}
	for i := m; i < len(x); i++ {
		if got := ph.Step(x[i]); got != yb[i] {
			t.Fatalf("trial %d: plant from history y[%d] = %v, want %v", trial, i, got, yb[i])
		}
	}
}

// steadyStartHolds: a steady start with a constant input keeps the output at
// gain*u, within 1e-12 of the output's scale (rounding of the steady
// history).
func steadyStartHolds(t *testing.T, trial int, tr randomCase) {
	g, u := tr.g, tr.u
	gain, err := g.Gain()
	if err != nil {
		t.Fatal(err)
	}
	bound, err := g.BIBOBound()
	if err != nil {
		t.Fatal(err)
	}
	past, err := g.SteadyPast(u)
	if err != nil {
		t.Fatal(err)
	}
	cu := make([]float64, 50)
	for i := range cu {
		cu[i] = u
	}
	ys, _ := g.FilterFrom(cu, past)
	ps := tf.NewPlant(g)
	if err := ps.SetSteady(u); err != nil {
		t.Fatal(err)
	}
	for i, v := range ys {
		if math.Abs(v-gain*u) > 1e-12*(math.Abs(gain*u)+bound.Sum*math.Abs(u)) {
			t.Fatalf("trial %d: steady start y[%d] = %v, want %v", trial, i, v, gain*u)
		}
		if got := ps.Step(u); got != v {
			t.Fatalf("trial %d: steady plant y[%d] = %v, batch %v", trial, i, got, v)
		}
	}
}

// zeroFrequencyIsGain: the frequency response at w = 0 is the gain (phase
// 0 or pi by its sign), to 1e-12.
func zeroFrequencyIsGain(t *testing.T, trial int, tr randomCase) {
	gain, err := tr.g.Gain()
	if err != nil {
		t.Fatal(err)
	}
	mag, ph0, err := tr.g.GainPhase([]float64{0})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(mag[0]-math.Abs(gain)) > 1e-12*math.Max(1, math.Abs(gain)) {
		t.Fatalf("trial %d: |G(1)| = %v, gain %v", trial, mag[0], gain)
	}
	if wantPh := map[bool]float64{true: 0, false: math.Pi}[gain >= 0]; math.Abs(math.Abs(ph0[0])-wantPh) > 1e-12 {
		t.Fatalf("trial %d: phase at 0 = %v for gain %v", trial, ph0[0], gain)
	}
}

// benchTerms are the benchmarked (s, r) orders, stable, of our own; the
// same coefficients are used by testdata/peer/lfilter_peer.py.
var benchTerms = []struct {
	name string
	r    tf.Rational
}{
	{"1,1", tf.MustRational([]float64{0.4, 0.2}, []float64{1, -0.7}, 0)},
	{"2,2", tf.MustRational([]float64{0.2, 0.1, 0.05}, []float64{1, -1.2, 0.5}, 0)},
	{"4,4", tf.MustRational([]float64{0.1, 0.05, -0.02, 0.01, 0.003}, []float64{1, -1.9, 1.35, -0.42, 0.048}, 0)},
}

// BenchmarkFilter times Rational.Filter, which checks the input for
// NaN/Inf and allocates the output (as scipy.signal.lfilter does), over
// 10^3..10^7 samples; ns/sample is reported.
func BenchmarkFilter(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	x := make([]float64, 10_000_000)
	for i := range x {
		x[i] = rng.NormFloat64()
	}
	for _, o := range benchTerms {
		for n := 1000; n <= len(x); n *= 10 {
			b.Run(o.name+"/"+strconv.Itoa(n), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					if _, err := o.r.Filter(x[:n]); err != nil {
						b.Fatal(err)
					}
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/sample")
			})
		}
	}
}
