package tf_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// simClose reports whether got and want agree within tol*(1+|want|) at
// every index, and the worst index.
func simClose(got, want []float64, tol float64) (bool, int) {
	if len(got) != len(want) {
		return false, -1
	}
	worst, wi := 0.0, 0
	for i := range want {
		e := math.Abs(got[i]-want[i]) / (1 + math.Abs(want[i]))
		if !(e <= worst) {
			worst, wi = e, i
		}
	}
	return worst <= tol, wi
}

// TestSimulateScipyWholeModel compares whole-model simulations of parsed
// specs with scipy.signal.lfilter 1.10.1 applied stage by stage
// (testdata/spec/make_sim.py). Tolerance 1e-10 relative to 1 + |y|: the
// stages are the same recursions, summed in a different order, over 300
// samples; integrated outputs reach |y| ~ 100.
func TestSimulateScipyWholeModel(t *testing.T) {
	var ref struct {
		Cases []struct {
			Name        string
			Spec        string
			Inputs      map[string][]float64
			Innovations []float64
			Output      []float64
		}
	}
	testutil.ReadJSON(t, "testdata/spec/sim.json", &ref)
	if len(ref.Cases) < 5 {
		t.Fatalf("%d cases", len(ref.Cases))
	}
	for _, c := range ref.Cases {
		m, err := parse.Model(c.Spec)
		if err != nil {
			t.Errorf("%s: %v", c.Name, err)
			continue
		}
		s := &tf.SimSettings{FromRest: true} // scipy's lfilter starts from rest
		if m.Noise != nil {
			s.Innovations = c.Innovations
		}
		y, err := m.Simulate(c.Inputs, s)
		if err != nil {
			t.Errorf("%s: %v", c.Name, err)
			continue
		}
		if ok, i := simClose(y, c.Output, 1e-10); !ok {
			t.Errorf("%s: y[%d] = %v, scipy %v", c.Name, i, y[i], c.Output[i])
		}
		// The streaming System gives the same numbers bit for bit.
		sys, err := tf.NewSystem(m, nil)
		if err != nil {
			t.Fatal(err)
		}
		names := sys.Inputs()
		u := make([]float64, len(names))
		for k := range y {
			for i, n := range names {
				u[i] = c.Inputs[n][k]
			}
			a := 0.0
			if m.Noise != nil {
				a = c.Innovations[k]
			}
			if v := sys.StepWith(u, a); v != y[k] {
				t.Fatalf("%s: System step %d = %v, Simulate %v", c.Name, k, v, y[k])
			}
		}
	}
}

// TestStepScipyGolden writes each model of H1's golden file
// (testdata/scipy/golden.json, scipy.signal.lfilter 1.10.1) as a spec,
// parses it and checks the noise-free step response and the response to
// the recorded random input. A denominator with constant term d0 != 1 is
// written divided through by d0, as the parser's message tells users to
// do. Tolerance 1e-12 relative to 1 + |y| (1e-10 for the unstable model,
// whose response grows to ~1e3): the same recursion, rounding only.
func TestStepScipyGolden(t *testing.T) {
	var ref struct {
		Models []struct {
			Name          string
			Num, Den      []float64
			Delay         int
			Step          []float64
			Input, Output []float64
		}
	}
	testutil.ReadJSON(t, "testdata/scipy/golden.json", &ref)
	if len(ref.Models) < 10 {
		t.Fatalf("%d golden models", len(ref.Models))
	}
	for _, g := range ref.Models {
		if len(g.Step) == 0 || len(g.Input) == 0 || len(g.Output) != len(g.Input) {
			t.Fatalf("%s: golden record incomplete", g.Name)
		}
		num, den := append([]float64(nil), g.Num...), append([]float64(nil), g.Den...)
		if d0 := den[0]; d0 != 1 {
			for i := range num {
				num[i] /= d0
			}
			for i := range den {
				den[i] /= d0
			}
		}
		spec := "y = " + simPolyText(num) + " / " + simPolyText(den) + " B^" + strconv.Itoa(g.Delay) + " x"
		m, err := parse.Model(spec)
		if err != nil {
			t.Errorf("%s: %q: %v", g.Name, spec, err)
			continue
		}
		tol := 1e-12
		if strings.Contains(g.Name, "unstable") {
			tol = 1e-10
		}
		ones := make([]float64, len(g.Step))
		for i := range ones {
			ones[i] = 1
		}
		y, err := m.Simulate(map[string][]float64{"x": ones}, &tf.SimSettings{FromRest: true}) // scipy starts from rest
		if err != nil {
			t.Fatal(err)
		}
		if ok, i := simClose(y, g.Step, tol); !ok {
			t.Errorf("%s: step[%d] = %v, scipy %v", g.Name, i, y[i], g.Step[i])
		}
		y, err = m.Simulate(map[string][]float64{"x": g.Input}, &tf.SimSettings{FromRest: true})
		if err != nil {
			t.Fatal(err)
		}
		if ok, i := simClose(y, g.Output, tol); !ok {
			t.Errorf("%s: output[%d] = %v, scipy %v", g.Name, i, y[i], g.Output[i])
		}
	}
}

// simPolyText writes coefficients as a spec polynomial in parentheses.
func simPolyText(c []float64) string {
	var b strings.Builder
	b.WriteByte('(')
	for k, v := range c {
		switch {
		case k == 0:
			b.WriteString(strconv.FormatFloat(v, 'g', -1, 64))
		case v < 0:
			b.WriteString(" - " + strconv.FormatFloat(-v, 'g', -1, 64))
		default:
			b.WriteString(" + " + strconv.FormatFloat(v, 'g', -1, 64))
		}
		if k > 0 {
			b.WriteString(" B^" + strconv.Itoa(k))
		}
	}
	b.WriteByte(')')
	return b.String()
}

// TestSimulateMatchesHandBuilt checks that a parsed spec simulates
// exactly (bit for bit) as the sum of the constant and each input's
// rational term built by hand with tf.NewRational and filtered with
// Rational.Filter.
func TestSimulateMatchesHandBuilt(t *testing.T) {
	m := parse.MustModel("y = 3.5 + (0.8 - 0.25 B) / ((1 - 0.5 B)(1 + 0.2 B)) B^3 x + w0 / (1 - d B)^2 z where w0 = 1.5, d ~ 0.7")
	g1, err := tf.NewRational([]float64{0.8, -0.25}, []float64{1, -0.3, -0.1}, 3) // (1 - 0.5 B)(1 + 0.2 B) = 1 - 0.3 B - 0.1 B^2
	if err != nil {
		t.Fatal(err)
	}
	g2, err := tf.NewRational([]float64{1.5}, []float64{1, -1.4, 0.48999999999999994}, 0) // (1 - 0.7 B)^2, 0.7^2 in float64
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(5, 6))
	x, z := make([]float64, 500), make([]float64, 500)
	for i := range x {
		x[i], z[i] = rng.NormFloat64(), 10+rng.NormFloat64()
	}
	x0 := append([]float64(nil), x...)
	y, err := m.Simulate(map[string][]float64{"x": x, "z": z, "unused": {1}}, &tf.SimSettings{FromRest: true}) // Filter starts from rest
	if err != nil {
		t.Fatal(err)
	}
	f1, _ := g1.Filter(x)
	f2, _ := g2.Filter(z)
	for i := range y {
		if want := 3.5 + f1[i] + f2[i]; y[i] != want {
			t.Fatalf("y[%d] = %v, hand-built %v", i, y[i], want)
		}
	}
	for i := range x {
		if x[i] != x0[i] {
			t.Fatal("Simulate modified its input")
		}
	}
	// The parsed polynomials are the hand-built ones.
	r1, _ := m.Inputs[0].Rational()
	r2, _ := m.Inputs[1].Rational()
	if !slices.Equal(r1.Num(), g1.Num()) || !slices.Equal(r1.Den(), g1.Den()) || r1.Delay() != 3 ||
		!slices.Equal(r2.Num(), g2.Num()) || !slices.Equal(r2.Den(), g2.Den()) {
		t.Errorf("parsed %v/%v B^%d and %v/%v, hand-built %v/%v and %v/%v",
			r1.Num(), r1.Den(), r1.Delay(), r2.Num(), r2.Den(), g1.Num(), g1.Den(), g2.Num(), g2.Den())
	}
}

// TestSimulateNoise checks the seeded noise: reproducible, seed-
// dependent, and with the variance of its ARMA model. For AR(1) noise
// with phi = 0.6 and sigma = 0.5 the stationary variance is
// sigma^2 / (1 - phi^2) = 0.390625 (textbook closed form); 40000
// samples after a burn-in estimate it within 5 % (the standard error of
// a sample variance of an AR(1) with phi = 0.6 is about
// var * sqrt(2 (1 + phi^2) / ((1 - phi^2) n)) = 1.2 %).
func TestSimulateNoise(t *testing.T) {
	m := parse.MustModel("y = 0 x + 1 / (1 - 0.6 B) a")
	n := 40000
	x := make([]float64, n)
	s := &tf.SimSettings{Seed1: 7, Seed2: 8, Sigma: 0.5, BurnIn: 200}
	y1, err := m.Simulate(map[string][]float64{"x": x}, s)
	if err != nil {
		t.Fatal(err)
	}
	y2, _ := m.Simulate(map[string][]float64{"x": x}, s)
	y3, _ := m.Simulate(map[string][]float64{"x": x}, &tf.SimSettings{Seed1: 7, Seed2: 9, Sigma: 0.5, BurnIn: 200})
	if !slices.Equal(y1, y2) {
		t.Error("equal seeds gave different series")
	}
	if slices.Equal(y1, y3) {
		t.Error("different seeds gave the same series")
	}
	mean, v := 0.0, 0.0
	for _, v := range y1 {
		mean += v
	}
	mean /= float64(n)
	for _, y := range y1 {
		v += (y - mean) * (y - mean)
	}
	v /= float64(n - 1)
	if want := 0.25 / (1 - 0.36); math.Abs(v-want) > 0.05*want {
		t.Errorf("noise variance %v, want %v", v, want)
	}
	// Without burn-in (BurnIn < 0) the noise starts from rest:
	// y_0 = sigma * a_0 only.
	y4, _ := m.Simulate(map[string][]float64{"x": x[:3]}, &tf.SimSettings{Seed1: 1, Seed2: 1, Sigma: 2, BurnIn: -1})
	a := rand.New(rand.NewPCG(1, 1))
	a0, a1 := 2*a.NormFloat64(), 2*a.NormFloat64()
	if y4[0] != a0 || y4[1] != 0.6*a0+a1 {
		t.Errorf("noise from rest: %v, want %v, %v", y4[:2], a0, 0.6*a0+a1)
	}
}

func TestSimulateBadInput(t *testing.T) {
	m := parse.MustModel("y = w0 x + w1 z + a where w0 ~ 1, w1 ~ 2")
	ok := []float64{1, 2, 3}
	var se *tf.SeriesError
	if _, err := m.Simulate(map[string][]float64{"x": ok}, nil); !errors.As(err, &se) || se.Series != "z" || !errors.Is(err, tf.ErrName) ||
		err.Error() != `tf.Model.Simulate: series "z": the model has an input of this name but the inputs map has no such series` {
		t.Errorf("missing series: %v", err)
	}
	if _, err := m.Simulate(map[string][]float64{"x": ok, "z": ok[:2]}, nil); !errors.As(err, &se) || se.Series != "z" || !errors.Is(err, tf.ErrLength) ||
		err.Error() != `tf.Model.Simulate: series "z" has 2 samples against 3 (the length of series "x")` {
		t.Errorf("unequal lengths: %v", err)
	}
	var sa *tf.SampleError
	if _, err := m.Simulate(map[string][]float64{"x": ok, "z": {1, math.NaN(), 3}}, nil); !errors.As(err, &sa) || sa.Series != "z" || sa.Index != 1 {
		t.Errorf("NaN: %v", err)
	}
	if _, err := m.Simulate(map[string][]float64{"x": ok, "z": ok}, &tf.SimSettings{Innovations: ok[:1]}); !errors.As(err, &se) || se.Series != "innovations" || !errors.Is(err, tf.ErrLength) {
		t.Errorf("innovations length: %v", err)
	}
	var ae *tf.SettingError
	if _, err := m.Simulate(map[string][]float64{"x": ok, "z": ok}, &tf.SimSettings{Sigma: -1}); !errors.As(err, &ae) || ae.Setting != "SimSettings.Sigma" ||
		err.Error() != "tf.Model.Simulate: SimSettings.Sigma = -1: must be a finite number, zero or positive (0, the default, draws no noise)" {
		t.Errorf("negative Sigma: %v", err)
	}
	var me *tf.ModelError
	nf := parse.MustModel("y = w0 x where w0 ~ 1")
	if _, err := nf.Simulate(map[string][]float64{"x": ok}, &tf.SimSettings{Sigma: 1}); !errors.As(err, &me) || me.Part != "noise" || me.Op != "tf.Model.Simulate" {
		t.Errorf("Sigma without noise: %v", err)
	}
	ns := parse.MustModel("y = w0 x + 1 / (1 - 1.2 B) a")
	if _, err := ns.Simulate(map[string][]float64{"x": ok}, &tf.SimSettings{Sigma: 1, BurnIn: 10}); !errors.As(err, &me) || me.Part != "noise" ||
		!strings.Contains(err.Error(), "(set SimSettings.BurnIn to -1 for none)") {
		t.Errorf("burn-in of a non-stationary noise: %v", err)
	}
	// The automatic burn-in (BurnIn 0) runs none for a noise model with
	// no stationary state, and so does BurnIn -1.
	for _, b := range []int{0, -1} {
		if _, err := ns.Simulate(map[string][]float64{"x": ok}, &tf.SimSettings{Sigma: 1, BurnIn: b}); err != nil {
			t.Errorf("non-stationary noise, BurnIn %d: %v", b, err)
		}
	}
	nan := m.Clone()
	nan.Inputs[0].Num.Factors[0].Terms[0].Coef.Value = math.NaN()

	if _, err := nan.Simulate(map[string][]float64{"x": ok, "z": ok}, nil); !errors.As(err, &me) || me.Part != `input "x" numerator, factor 1` || me.Op != "tf.Model.Simulate" ||
		!strings.Contains(err.Error(), "is NaN, not finite") {
		t.Errorf("NaN coefficient: %v", err)
	}
}

func TestIntervalSeconds(t *testing.T) {
	for _, c := range []struct {
		spec string
		want float64
		ok   bool
	}{
		{"y = w x every 30 s", 30, true},
		{"y = w x every 1.5 min", 90, true},
		{"y = w x every 2 h", 7200, true},
		{"y = w x every 1 d", 86400, true},
		{"y = w x", 0, false},
	} {
		got, ok := parse.MustModel(c.spec).Interval.Seconds()
		if got != c.want || ok != c.ok {
			t.Errorf("%s: %v %v", c.spec, got, ok)
		}
	}
}

// TestSimulateInputsUnchanged runs Simulate, NewSystem and Plant with
// every caller-owned argument in use (model, input map, innovations,
// histories) and checks that none is modified or kept: changing a
// history slice after SetHistory must not change the plant's output.
func TestSimulateInputsUnchanged(t *testing.T) {
	m := parse.MustModel("(1 - B) y = 2 + (0.5 - 0.2 B) / (1 - 0.6 B) B^2 x + w ((1 - B) z) + (1 - t1 B) / (1 - p1 B) a where w = 0.3, t1 ~ 0.2, p1 ~ 0.5")
	m0 := m.Clone()
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	z := []float64{8, 7, 6, 5, 4, 3, 2, 1}
	a := []float64{0.1, -0.2, 0.3, 0, 0, 0.5, -0.1, 0.2}
	x0, z0, a0 := append([]float64(nil), x...), append([]float64(nil), z...), append([]float64(nil), a...)
	inputs := map[string][]float64{"x": x, "z": z}
	y1, err := m.Simulate(inputs, &tf.SimSettings{Innovations: a})
	if err != nil {
		t.Fatal(err)
	}
	sys, err := tf.NewSystem(m, &tf.SimSettings{Sigma: 1, Seed1: 1, Seed2: 2, BurnIn: 10})
	if err != nil {
		t.Fatal(err)
	}
	sys.Step([]float64{1, 2})
	if !m.Equal(m0) || len(inputs) != 2 || !slices.Equal(x, x0) || !slices.Equal(z, z0) || !slices.Equal(a, a0) {
		t.Fatal("Simulate or NewSystem modified the model, the input map, a series or the innovations")
	}
	y2, err := m.Simulate(inputs, &tf.SimSettings{Innovations: a})
	if err != nil || !slices.Equal(y1, y2) {
		t.Fatalf("second run differs: %v", err)
	}
	r := tf.MustRational([]float64{0.5, 0.1}, []float64{1, -0.7}, 1)
	pastIn, pastOut := []float64{1, 2, 3}, []float64{4}
	p := tf.NewPlant(r)
	if err := p.SetHistory(pastIn, pastOut); err != nil {
		t.Fatal(err)
	}
	q := p.Clone()
	pastIn[2], pastOut[0] = 100, 100 // must not reach the plant
	if pastIn[0] != 1 || pastIn[1] != 2 {
		t.Fatal("SetHistory modified its arguments")
	}
	want, err := r.FilterFrom([]float64{1, 1, 1}, tf.Past{Input: []float64{1, 2, 3}, Output: []float64{4}})
	if err != nil {
		t.Fatal(err)
	}
	for i, w := range want {
		if got, gotq := p.Step(1), q.Step(1); got != w || gotq != w {
			t.Fatalf("step %d: plant %v, clone %v, FilterFrom %v (history slice kept?)", i, got, gotq, w)
		}
	}
}

// TestSimulateBurnInBadInput checks that a burn-in above MaxBurnIn is a
// *SettingError naming BurnIn and the limit, returned at once (BurnIn =
// math.MaxInt would draw innovations practically for ever), and that
// the limit itself does not apply when Innovations are given (BurnIn is
// then ignored).
func TestSimulateBurnInBadInput(t *testing.T) {
	m := parse.MustModel("y = 0.5 x + 1 / (1 - 0.6 B) a")
	in := map[string][]float64{"x": {1, 2, 3}}
	for _, b := range []int{tf.MaxBurnIn + 1, math.MaxInt} {
		y, err := m.Simulate(in, &tf.SimSettings{Sigma: 1, BurnIn: b})
		var se *tf.SettingError
		if !errors.As(err, &se) || se.Setting != "SimSettings.BurnIn" || se.Value != strconv.Itoa(b) || se.Op != "tf.Model.Simulate" || !errors.Is(err, tf.ErrSetting) {
			t.Fatalf("BurnIn %d: got %v, %v; want *tf.SettingError for BurnIn", b, y, err)
		}
		if !strings.Contains(err.Error(), "must be at most tf.MaxBurnIn (16777216 draws); 0 means automatic, a negative value none") {
			t.Errorf("BurnIn %d: message %q", b, err.Error())
		}
	}
	if _, err := m.Simulate(in, &tf.SimSettings{BurnIn: math.MaxInt, Innovations: []float64{0, 0, 0}}); err != nil {
		t.Errorf("BurnIn ignored with Innovations: %v", err)
	}
}

// TestSimulateOverflow checks that an output that overflows
// float64 is a *SimError for the output, naming the sample and the noise
// scale, instead of +-Inf or NaN returned silently. Sigma = 1e308 times
// a standard normal draw (|z| > 1.8 with probability 0.07 per draw)
// overflows within the 200 samples for these seeds, and the AR filter
// 1/(1 - 0.6 B) amplifies what does not; an input of 1e308 through the
// gain 2 overflows at once.
func TestSimulateOverflow(t *testing.T) {
	m := parse.MustModel("y = 0.5 x + 1 / (1 - 0.6 B) a")
	x := make([]float64, 200)
	for _, c := range []struct {
		name string
		s    tf.SimSettings
		msg  string
	}{
		{"Sigma 1e308", tf.SimSettings{Sigma: 1e308, Seed1: 1, Seed2: 2},
			"the output overflowed float64 (noise scale Sigma = 1e+308)"},
		{"Sigma 1e308 with burn-in", tf.SimSettings{Sigma: 1e308, Seed1: 1, Seed2: 2, BurnIn: 500},
			"tf.Model.Simulate: output y: step 0 gave "},
		{"max float Sigma", tf.SimSettings{Sigma: math.MaxFloat64, Seed1: 3, Seed2: 4},
			"(noise scale Sigma = 1.7976931348623157e+308)"},
	} {
		t.Run(c.name, func(t *testing.T) {
			y, err := m.Simulate(map[string][]float64{"x": x}, &c.s)
			var se *tf.SimError
			if !errors.As(err, &se) || se.Part != "output y" || !errors.Is(err, tf.ErrOverflow) {
				t.Fatalf("got %v, %v; want *tf.SimError for the output", y, err)
			}
			if !strings.Contains(err.Error(), c.msg) {
				t.Errorf("message %q, want it to contain %q", err.Error(), c.msg)
			}
		})
	}
	big := parse.MustModel("y = 2 x")
	_, err := big.Simulate(map[string][]float64{"x": {1, 1e308}}, nil)
	if err == nil || err.Error() != "tf.Model.Simulate: output y: step 1 gave +Inf: the output overflowed float64 (the inputs, the innovations or an unstable term is too large)" {
		t.Errorf("input overflow: %v", err)
	}
}

// simBenchModel is a typical two-input model with ARMA(2, 1) noise and a
// differenced output.
var simBenchModel = parse.MustModel("(1 - B) temp = 0.01 + (0.8 + 0.3 B) / (1 - 0.7 B) B^4 burner + (0.2 - 0.1 B) B^2 ((1 - B) feed) + ARMA(2, 1) " +
	"where phi1 = 0.5, phi2 = -0.2, theta1 = 0.3")

func BenchmarkSimulate(b *testing.B) {
	for _, n := range []int{1000, 10000, 100000, 1000000} {
		rng := rand.New(rand.NewPCG(1, uint64(n)))
		in := map[string][]float64{"burner": make([]float64, n), "feed": make([]float64, n)}
		for i := range n {
			in["burner"][i], in["feed"][i] = rng.NormFloat64(), rng.NormFloat64()
		}
		s := &tf.SimSettings{Seed1: 1, Seed2: 2, Sigma: 0.1}
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			b.SetBytes(int64(8 * n))
			for b.Loop() {
				if _, err := simBenchModel.Simulate(in, s); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestSimulateSettledDefault checks the default start of Model.Simulate
// against Fit's conditioning: a noise-free record of an input that is
// constant at 50 stays at the steady state c + Gain 50 (the gain
// omega(1)/delta(1) = 2/(1-0.7)), and a differenced input constant at
// 20 leaves the output at zero; with FromRest the first gives the step
// response from zero instead.
func TestSimulateSettledDefault(t *testing.T) {
	flat := []float64{50, 50, 50, 50, 50}
	y, err := parse.MustModel("y = 10 + 2 / (1 - 0.7 B) B valve").Simulate(map[string][]float64{"valve": flat}, nil)
	if err != nil {
		t.Fatal(err)
	}
	want := 10 + 2/(1-0.7)*50
	for i, v := range y {
		if math.Abs(v-want) > 1e-12*want {
			t.Errorf("settled valve: y[%d] = %v, want %v", i, v, want)
		}
	}
	y, err = parse.MustModel("(1 - B) level = 1.5 / (1 - 0.6 B) B ((1 - B) feed)").Simulate(map[string][]float64{"feed": {20, 20, 20, 20}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, v := range y {
		if v != 0 {
			t.Errorf("settled differenced feed: y[%d] = %v, want 0", i, v)
		}
	}
	y, err = parse.MustModel("y = 10 + 2 / (1 - 0.7 B) B valve").Simulate(map[string][]float64{"valve": flat}, &tf.SimSettings{FromRest: true})
	if err != nil {
		t.Fatal(err)
	}
	// From rest: y_t = 10 + 2 * 50 (1 - 0.7^t)/(1 - 0.7) for t >= 1 (the
	// difference equation u_t = 0.7 u_{t-1} + 2 x_{t-1} summed by hand, a
	// geometric series).
	for i, v := range y {
		w := 10.0
		if i >= 1 {
			w += 100 * (1 - math.Pow(0.7, float64(i))) / (1 - 0.7)
		}
		if math.Abs(v-w) > 1e-12*400 { // rounding of a few operations on values up to 343
			t.Errorf("from rest: y[%d] = %v, want %v", i, v, w)
		}
	}
}
