package tf_test

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
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

// TestFitTraps is the table of mistakes a user makes with Fit's data and
// models built in code: each gives a typed error naming the series or
// the part of the model, with the key words of its message checked.
func TestFitTraps(t *testing.T) {
	m := parse.MustModel("y = c + w0 / (1 - d1 B) B x + a")
	x := trapData(1, 200, 5)
	y, err := parse.MustModel("y = 1 + 2 / (1 - 0.5 B) B x + a").Simulate(map[string][]float64{"x": x}, &tf.SimSettings{Seed1: 1, Sigma: 1})
	if err != nil {
		t.Fatal(err)
	}
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
		{"constant output", m, map[string][]float64{"y": constant(3), "x": x}, isFit(tf.ConstantSeries, "y"),
			[]string{`series is constant: "y"`, "every sample is 3", "nothing to explain"}},
		{"constant input", m, map[string][]float64{"y": y, "x": constant(40)}, isFit(tf.ConstantSeries, "x"),
			[]string{`"x"`, "every sample is 40", "never moves", "leave it out of the model"}},
		{"data scaled by 1e-170", m, map[string][]float64{"y": tiny(y), "x": tiny(x)}, isFit(tf.ZeroResiduals, "y"),
			[]string{"residual sum of squares is zero", `"y"`, "underflow", "rescale the series"}},
		{"all-NaN input", m, map[string][]float64{"y": y, "x": nan}, isSample("x", 0), []string{`series "x" sample 0 is NaN`}},
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
			isFit(tf.NoSettledStart, "x"), []string{"pole at z = 1", "held at its first value", "FitSettings.ZeroPreSample"}},
		// 1/(1 - 1.9 B) grows as 1.9^t, past float64 after about 1100 samples.
		{"fixed non-invertible MA", parse.MustModel("y = w0 x + (1 - 1.9 B) a"), map[string][]float64{"y": trapData(8, 1500, 0), "x": trapData(9, 1500, 0)},
			isFit(tf.NoStartPoint, "y"), []string{"not finite at any start point", "fixed noise MA", "check the fixed values"}},
		{"dead time longer than the record", parse.MustModel("y = w0 B^250 x + a"), map[string][]float64{"y": y, "x": x},
			isFit(tf.TooFewObservations, "y"), []string{`input "x" with dead time 250`, "check the dead time"}},
	} {
		est, err := tf.Fit(context.Background(), tc.m, tc.data, nil)
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

func isFit(p tf.FitProblem, series string) func(error) bool {
	return func(err error) bool {
		var fe *tf.FitError
		return errors.As(err, &fe) && fe.Problem == p && fe.Series == series
	}
}

func isSample(series string, index int) func(error) bool {
	return func(err error) bool {
		var se *tf.SampleError
		return errors.As(err, &se) && se.Series == series && se.Index == index
	}
}

func isModel(part string) func(error) bool {
	return func(err error) bool {
		var me *tf.ModelError
		return errors.As(err, &me) && me.Part == part
	}
}

// TestFitWarningTraps checks the warnings for fits that converge but
// must not be trusted: 2 residuals for 1 coefficient (dead time 10000 of
// 10002 samples), a pole at 0.9999 on a record of 2000 samples, and two
// identical inputs (no standard errors).
func TestFitWarningTraps(t *testing.T) {
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
	e, err := tf.Fit(context.Background(), parse.MustModel("y = w0 B^10000 x + a"), map[string][]float64{"y": y, "x": x}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if msg := rtWarning(e, tf.FewResiduals); !strings.Contains(msg, "only 2 residuals for 1 free coefficients") || !strings.Contains(msg, "max(50, 10 per coefficient) = 50") {
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
	slow, err := parse.MustModel("y = 0.01 / (1 - 0.9999 B) B u + a").Simulate(map[string][]float64{"u": step}, &tf.SimSettings{Seed1: 6, Sigma: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	e, err = tf.Fit(context.Background(), parse.MustModel("y = w0 / (1 - d1 B) B u + a"), map[string][]float64{"y": slow, "u": step}, nil)
	if err != nil {
		t.Fatal(err)
	}
	msg := rtWarning(e, tf.SlowPole)
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
	e, err = tf.Fit(context.Background(), parse.MustModel("y = w1 p + w2 q + a"), map[string][]float64{"y": yy, "p": a, "q": b}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if msg := rtWarning(e, tf.BadStandardError); !strings.Contains(msg, "standard error of w1, w2 is not available") || !rtHas(e, tf.SingularInformation) {
		t.Errorf("identical inputs: BadStandardError %q, warnings %v", msg, e.Warnings)
	}
	for _, k := range []tf.WarningKind{tf.FewResiduals, tf.SlowPole, tf.BadStandardError, tf.StartupTransient} {
		if !k.Serious() {
			t.Errorf("%v is not serious", k)
		}
	}
}
