package tf_test

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/tf"
)

func discretizeKind(t *testing.T, kind string, p map[string]float64, theta, T float64) tf.Rational {
	t.Helper()
	var r tf.Rational
	var err error
	switch kind {
	case "fopdt":
		r, err = tf.FOPDT{Gain: p["K"], TimeConstant: p["tau"], DeadTime: theta}.Discretize(T)
	case "sopdt":
		r, err = tf.SOPDT{Gain: p["K"], Tau1: p["tau1"], Tau2: p["tau2"], DeadTime: theta}.Discretize(T)
	case "second":
		r, err = tf.SecondOrder{Gain: p["K"], NaturalFrequency: p["wn"], Damping: p["zeta"], DeadTime: theta}.Discretize(T)
	default:
		t.Fatalf("unknown kind %q", kind)
	}
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestDiscretizeScipyZOH compares the dead-time-free discretisations with
// scipy.signal.cont2discrete(method='zoh') 1.10.1. scipy's numerator in
// descending powers of z is {0, w0, w1, ...}: the leading zero is the
// hold's one-sample delay, our Delay() == 1. Tolerance 1e-12 relative to
// the largest coefficient: scipy forms the result by a matrix exponential
// and ss2tf, we by closed forms; both are accurate to a few ulps at these
// sample intervals (T between 1/30 and 1/2 of the time constants).
func TestDiscretizeScipyZOH(t *testing.T) {
	g := readGolden(t)
	for _, c := range g.C2D {
		t.Run(c.Name, func(t *testing.T) {
			r := discretizeKind(t, c.Kind, c.Params, 0, c.T)
			if r.Delay() != 1 {
				t.Errorf("delay %d, want 1 (the hold)", r.Delay())
			}
			wantNum := c.NumZ[1:]
			num := r.Num()
			for len(num) < len(wantNum) {
				num = append(num, 0)
			}
			scale := 0.0
			for _, v := range wantNum {
				scale = math.Max(scale, math.Abs(v))
			}
			for k := range wantNum {
				if math.Abs(num[k]-wantNum[k]) > 1e-12*scale {
					t.Errorf("num[%d] = %v, scipy.signal.cont2discrete %v", k, num[k], wantNum[k])
				}
			}
			den := r.Den()
			if len(den) != len(c.DenZ) {
				t.Fatalf("den %v, scipy %v", den, c.DenZ)
			}
			for k := range den {
				if math.Abs(den[k]-c.DenZ[k]) > 1e-12*math.Max(1, math.Abs(c.DenZ[k])) {
					t.Errorf("den[%d] = %v, scipy.signal.cont2discrete %v", k, den[k], c.DenZ[k])
				}
			}
		})
	}
}

// TestDiscretizeFractionalDeadTime compares the discrete step response
// with the continuous step response with dead time sampled at kT, which a
// zero-order hold reproduces exactly (the step input is constant between
// samples). Reference: scipy.linalg.expm on scipy.signal.tf2ss 1.10.1,
// y(u) = C A^-1 (e^{Au} - I) B at u = kT - theta. Tolerance 1e-11 |K|:
// coefficient rounding of a few eps |K| accumulated over 40 samples.
func TestDiscretizeFractionalDeadTime(t *testing.T) {
	g := readGolden(t)
	for _, c := range g.Steps {
		t.Run(c.Name, func(t *testing.T) {
			r := discretizeKind(t, c.Kind, c.Params, c.Theta, c.T)
			y := r.Step(len(c.Y))
			k := math.Abs(c.Params["K"])
			for i := range y {
				if math.Abs(y[i]-c.Y[i]) > 1e-11*k {
					t.Errorf("t=%g: step %v, scipy.linalg.expm %v", float64(i)*c.T, y[i], c.Y[i])
				}
			}
		})
	}
}

// TestFOPDTAnalytic checks the ZOH FOPDT with fractional dead time against
// the closed-form continuous step response K (1 - exp(-(t-theta)/tau))
// for t > theta, sampled at t = kT (common practice: the step response of
// a first-order lag). Tolerance 1e-13 |K| over 200 samples.
func TestFOPDTAnalytic(t *testing.T) {
	for _, c := range []struct{ K, tau, theta, T float64 }{
		{2, 5, 2.3, 1},
		{-0.7, 0.3, 0.6, 0.25},
		{1, 12, 0, 1},
		{4.5, 30, 17.75, 2.5},
		{1, 1, 0.999, 1},
		{1, 3, 7, 1}, // whole samples
	} {
		r, err := tf.FOPDT{Gain: c.K, TimeConstant: c.tau, DeadTime: c.theta}.Discretize(c.T)
		if err != nil {
			t.Fatal(err)
		}
		y := r.Step(200)
		for k, v := range y {
			tk := float64(k) * c.T
			want := 0.0
			if tk > c.theta {
				want = c.K * (1 - math.Exp(-(tk-c.theta)/c.tau))
			}
			if math.Abs(v-want) > 1e-13*math.Abs(c.K) {
				t.Errorf("%+v: y(%g) = %v, want %v", c, tk, v, want)
				break
			}
		}
		// And back: the discrete term returns the continuous parameters.
		back, err := r.AsFOPDT(c.T)
		if err != nil {
			t.Fatalf("%+v: AsFOPDT: %v", c, err)
		}
		if math.Abs(back.Gain-c.K) > 1e-12*math.Abs(c.K) || math.Abs(back.TimeConstant-c.tau) > 1e-10*c.tau ||
			math.Abs(back.DeadTime-c.theta) > 1e-9*c.T {
			t.Errorf("%+v: round trip %+v", c, back)
		}
	}
}

func TestAsFOPDTBadInput(t *testing.T) {
	for _, c := range []struct {
		name     string
		num, den []float64
		delay    int
		want     string
	}{
		{"second order", []float64{1}, []float64{1, -1.1, 0.3}, 1, "tf.Rational.AsFOPDT: term denominator degree: is 2: must be 1 for a first-order term"},
		{"negative pole", []float64{1}, []float64{1, 0.5}, 1, "tf.Rational.AsFOPDT: term pole: is -0.5: must lie in (0, 1) for a first-order lag"},
		{"no dead time", []float64{1}, []float64{1, -0.5}, 0, "tf.Rational.AsFOPDT: term dead time: is 0: must be >= 1 sample for a zero-order-hold image (the hold adds one)"},
		{"numerator split outside", []float64{1, -0.6}, []float64{1, -0.5}, 1, "tf.Rational.AsFOPDT: term numerator split b1/(b1+b2): is 2.5: must lie in [0, 1] for a fractional dead time"},
		{"integrator", []float64{1}, []float64{1, -1}, 1, "tf.Rational.AsFOPDT: term pole: is 1: must lie in (0, 1) for a first-order lag"},
	} {
		r := tf.MustRational(c.num, c.den, c.delay)
		var me *tf.ModelError
		if _, err := r.AsFOPDT(1); !errors.As(err, &me) || !errors.Is(err, tf.ErrModel) || err.Error() != c.want {
			t.Errorf("%s: err %v, want *tf.ModelError %q", c.name, err, c.want)
		}
	}
	// A bad interval is a setting, under the function's name.
	var se *tf.SettingError
	if _, err := (tf.FOPDT{Gain: 1, TimeConstant: 2}).Discretize(-1); !errors.As(err, &se) || !errors.Is(err, tf.ErrSetting) ||
		err.Error() != "tf.FOPDT.Discretize: interval = -1: must be positive and finite" {
		t.Errorf("negative interval: %v", err)
	}
}

// TestDiscretizeContinuity: the three closed forms (oscillatory, double
// pole, two real poles) join continuously at critical damping, and the
// SOPDT switch to the double-pole form at Tau1 ~ Tau2 is continuous: step
// responses for damping 1 -+ 1e-7 and time constants 1e-7 apart agree
// with the critical case to 1e-6 |K| (first-order in the perturbation).
func TestDiscretizeContinuity(t *testing.T) {
	const wn, T, theta = 0.5, 0.7, 1.3
	ref, err := tf.SecondOrder{Gain: 2, NaturalFrequency: wn, Damping: 1, DeadTime: theta}.Discretize(T)
	if err != nil {
		t.Fatal(err)
	}
	yr := ref.Step(80)
	for _, z := range []float64{1 - 1e-7, 1 + 1e-7, 1 - 1e-3} {
		r, err := tf.SecondOrder{Gain: 2, NaturalFrequency: wn, Damping: z, DeadTime: theta}.Discretize(T)
		if err != nil {
			t.Fatal(err)
		}
		tol := 1e-6 * 2
		if z == 1-1e-3 {
			tol = 1e-2 // a real change of damping, only a sanity bound
		}
		for k, v := range r.Step(80) {
			if math.Abs(v-yr[k]) > tol {
				t.Fatalf("damping %v: y[%d] = %v, critical %v", z, k, v, yr[k])
			}
		}
	}
	tau := 1 / wn
	for _, d := range []float64{1e-7, 1e-5} {
		r, err := tf.SOPDT{Gain: 2, Tau1: tau * (1 + d), Tau2: tau, DeadTime: theta}.Discretize(T)
		if err != nil {
			t.Fatal(err)
		}
		for k, v := range r.Step(80) {
			if math.Abs(v-yr[k]) > 10*d*2 {
				t.Fatalf("tau ratio 1+%v: y[%d] = %v, double pole %v", d, k, v, yr[k])
			}
		}
	}
	// Undamped (zeta = 0) oscillates between 0 and 2K around K forever:
	// y = K (1 - cos(wn u)) at the samples (common practice).
	r, err := tf.SecondOrder{Gain: 1, NaturalFrequency: 0.3, Damping: 0}.Discretize(1)
	if err != nil {
		t.Fatal(err)
	}
	for k, v := range r.Step(100) {
		if want := 1 - math.Cos(0.3*float64(k)); math.Abs(v-want) > 1e-12 {
			t.Fatalf("undamped y[%d] = %v, want %v", k, v, want)
		}
	}
}

// TestAsSecondOrderRoundTrip: discretising a continuous second-order
// model and converting back returns its parameters (to 1e-8 relative;
// the poles pass through a root finder and a logarithm) with a numerator
// mismatch at rounding level.
func TestAsSecondOrderRoundTrip(t *testing.T) {
	for _, c := range []tf.SecondOrder{
		{Gain: 1.2, NaturalFrequency: 0.8, Damping: 0.3, DeadTime: 3.3},
		{Gain: -0.5, NaturalFrequency: 2, Damping: 0.05, DeadTime: 0.1},
		{Gain: 3, NaturalFrequency: 0.5, Damping: 1, DeadTime: 0.9},
		{Gain: 1, NaturalFrequency: 0.6, Damping: 2.5, DeadTime: 2},
		{Gain: 7, NaturalFrequency: 0.05, Damping: 0.7, DeadTime: 17.25},
	} {
		const T = 0.5
		r, err := c.Discretize(T)
		if err != nil {
			t.Fatal(err)
		}
		back, mis, err := r.AsSecondOrder(T)
		if err != nil {
			t.Fatalf("%+v: %v", c, err)
		}
		rel := func(a, b float64) float64 { return math.Abs(a-b) / math.Max(math.Abs(b), 1e-300) }
		if rel(back.Gain, c.Gain) > 1e-10 || rel(back.NaturalFrequency, c.NaturalFrequency) > 1e-8 ||
			math.Abs(back.Damping-c.Damping) > 1e-8*math.Max(1, c.Damping) || math.Abs(back.DeadTime-c.DeadTime) > 1e-8*T || mis > 1e-9 {
			t.Errorf("%+v: back %+v, mismatch %.3g", c, back, mis)
		}
	}
	// A fitted-looking term that is not an exact image: the mismatch says so.
	r := tf.MustRational([]float64{0.1, 0.3, -0.05}, []float64{1, -1.2, 0.4}, 2)
	if _, mis, err := r.AsSecondOrder(1); err != nil || !(mis > 0.01) {
		t.Errorf("inexact term: mismatch %v, %v", mis, err)
	}
	var me *tf.ModelError
	if _, _, err := tf.MustRational([]float64{1}, []float64{1, -0.5}, 1).AsSecondOrder(1); !errors.As(err, &me) ||
		err.Error() != "tf.Rational.AsSecondOrder: term denominator degree: is 1: must be 2 for a second-order term" {
		t.Errorf("first-order term: %v", err)
	}
}

// TestStepAtBadInput checks that the three continuous models
// agree: StepAt is NaN for parameters Discretize rejects whatever the
// interval (non-finite gain, time constants that are not positive and
// finite, negative or non-finite damping or dead time) and for t = NaN,
// and a number for valid ones, FOPDT.StepAt as the second-order models
// (NaN, not 0 or -Gain, for TimeConstant 0).
func TestStepAtBadInput(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	type stepper interface{ StepAt(float64) float64 }
	bad := []struct {
		name string
		p    stepper
		t    float64
	}{
		{"FOPDT zero time constant", tf.FOPDT{Gain: 2, TimeConstant: 0}, 1},
		{"FOPDT negative time constant", tf.FOPDT{Gain: 2, TimeConstant: -1}, 1},
		{"FOPDT NaN time constant", tf.FOPDT{Gain: 2, TimeConstant: nan}, 1},
		{"FOPDT infinite time constant", tf.FOPDT{Gain: 2, TimeConstant: inf}, 1},
		{"FOPDT NaN gain", tf.FOPDT{Gain: nan, TimeConstant: 1}, 1},
		{"FOPDT infinite gain", tf.FOPDT{Gain: inf, TimeConstant: 1}, 1},
		{"FOPDT negative dead time", tf.FOPDT{Gain: 2, TimeConstant: 1, DeadTime: -1}, 1},
		{"FOPDT NaN dead time", tf.FOPDT{Gain: 2, TimeConstant: 1, DeadTime: nan}, 1},
		{"FOPDT infinite dead time", tf.FOPDT{Gain: 2, TimeConstant: 1, DeadTime: inf}, 1},
		{"FOPDT invalid before the dead time", tf.FOPDT{Gain: 2, TimeConstant: 0, DeadTime: 5}, 1},
		{"FOPDT NaN time", tf.FOPDT{Gain: 2, TimeConstant: 1}, nan},
		{"SOPDT zero tau", tf.SOPDT{Gain: 2, Tau1: 0, Tau2: 1}, 1},
		{"SOPDT negative dead time", tf.SOPDT{Gain: 2, Tau1: 1, Tau2: 2, DeadTime: -1}, 1},
		{"SOPDT NaN dead time", tf.SOPDT{Gain: 2, Tau1: 1, Tau2: 2, DeadTime: nan}, 1},
		{"SOPDT NaN time", tf.SOPDT{Gain: 2, Tau1: 1, Tau2: 2}, nan},
		{"SecondOrder negative damping", tf.SecondOrder{Gain: 2, NaturalFrequency: 1, Damping: -0.1}, 1},
		{"SecondOrder negative dead time", tf.SecondOrder{Gain: 2, NaturalFrequency: 1, Damping: 0.5, DeadTime: -1}, 1},
		{"SecondOrder infinite dead time", tf.SecondOrder{Gain: 2, NaturalFrequency: 1, Damping: 0.5, DeadTime: inf}, 1},
		{"SecondOrder NaN time", tf.SecondOrder{Gain: 2, NaturalFrequency: 1, Damping: 0.5}, nan},
	}
	for _, c := range bad {
		if v := c.p.StepAt(c.t); !math.IsNaN(v) {
			t.Errorf("%s: StepAt(%v) = %v, want NaN", c.name, c.t, v)
		}
	}
	// Valid parameters: 0 up to the dead time, the closed form after it
	// (FOPDT: 2 (1 - e^{-1}) one time constant after the dead time).
	good := tf.FOPDT{Gain: 2, TimeConstant: 3, DeadTime: 1}
	if v := good.StepAt(1); v != 0 {
		t.Errorf("FOPDT at the dead time: %v, want 0", v)
	}
	if v, want := good.StepAt(4), 2*(1-math.Exp(-1)); math.Abs(v-want) > 1e-15 {
		t.Errorf("FOPDT one time constant on: %v, want %v", v, want)
	}
	for _, p := range []stepper{good, tf.SOPDT{Gain: 2, Tau1: 1, Tau2: 2, DeadTime: 1}, tf.SecondOrder{Gain: 2, NaturalFrequency: 1, Damping: 0.5, DeadTime: 1}} {
		if v := p.StepAt(-inf); v != 0 {
			t.Errorf("%T at -Inf: %v, want 0", p, v)
		}
		if v := p.StepAt(50); math.IsNaN(v) || math.Abs(v-2) > 1e-6 {
			t.Errorf("%T at 50: %v, want about the gain 2", p, v)
		}
	}
}
