package control

import (
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/tf"
)

// fopdt is the exact zero-order-hold image of k e^{-theta s}/(tau s + 1)
// at T = 1 (tf.FOPDT.Discretize, itself checked against
// scipy.signal.cont2discrete in package tf).
func fopdt(t *testing.T, k, tau, theta float64) tf.Rational {
	t.Helper()
	p, err := tf.FOPDT{Gain: k, TimeConstant: tau, DeadTime: theta}.Discretize(1)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func sopdt(t *testing.T, k, t1, t2, theta float64) tf.Rational {
	t.Helper()
	p, err := tf.SOPDT{Gain: k, Tau1: t1, Tau2: t2, DeadTime: theta}.Discretize(1)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func near(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if !(math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))) {
		t.Errorf("%s = %.10g, want %.10g (tol %g)", what, got, want, tol)
	}
}

// TestHalfRule checks HalfRule on its formulas (Skogestad 2003, section
// 3.1, eqs. for first and second order as stated on HalfRule). The first
// case is the paper's introductory example, 1/((s+1)(0.2s+1)) ~ e^{-0.1
// s}/(1.1 s + 1) (from memory); the others are computed by hand from the
// formulas. Interval 0: a continuous controller (no h/2).
func TestHalfRule(t *testing.T) {
	for _, c := range []struct {
		name          string
		r             Reading
		order         int
		k, t1, t2, th float64
	}{
		{"paper intro (from memory)", Reading{Gain: 1, Lags: []float64{1, 0.2}}, 1, 1, 1.1, 0, 0.1},
		{"second order", Reading{Gain: 1, Lags: []float64{1, 0.2, 0.04}}, 2, 1, 1, 0.22, 0.02},
		// The paper's example (from memory): (-0.3s+1)(0.08s+1) /
		// ((2s+1)(s+1)(0.4s+1)(0.2s+1)(0.05s+1)^3); the lead 0.08 against
		// the lag 0.2 leaves 0.12; first order tau1 = 2.5, theta = 1.47;
		// second order tau1 = 2, tau2 = 1.2, theta = 0.77.
		{"paper example, order 1 (from memory)", skogestadExample, 1, 1, 2.5, 0, 1.47},
		{"paper example, order 2 (from memory)", skogestadExample, 2, 1, 2, 1.2, 0.77},
		{"inverse response", Reading{Gain: 3, Lags: []float64{0.4, 2, 1}, Inverse: []float64{0.3}, DeadTime: 1}, 1, 3, 2.5, 0, 2.2},
		{"sample interval h/2", Reading{Gain: 1, Lags: []float64{5, 1}, DeadTime: 2, Interval: 1}, 1, 1, 5.5, 0, 3},
		{"integrating, order 1", Reading{Gain: 0.5, Integrating: true, Lags: []float64{4, 1}, DeadTime: 2}, 1, 0.5, 0, 0, 5},
		{"integrating, order 2", Reading{Gain: 0.5, Integrating: true, Lags: []float64{4, 1}, DeadTime: 2}, 2, 0.5, 0, 4.5, 2.5},
		{"lead against a longer lag (rule T3)", Reading{Gain: 1, Lags: []float64{10, 4}, Leads: []float64{3}}, 1, 1, 10.5, 0, 0.5},
		{"lead longer than every lag (rule T1)", Reading{Gain: 1, Lags: []float64{4, 1}, Leads: []float64{8}}, 1, 2, 1, 0, 0},
	} {
		t.Run(c.name, func(t *testing.T) {
			m, err := HalfRule(c.r, c.order)
			if err != nil {
				t.Fatal(err)
			}
			near(t, "gain", m.Gain, c.k, 1e-12)
			near(t, "Tau1", m.Tau1, c.t1, 1e-12)
			near(t, "Tau2", m.Tau2, c.t2, 1e-12)
			near(t, "dead time", m.DeadTime, c.th, 1e-12)
		})
	}
}

// skogestadExample is the reading of the half rule's worked example in
// Skogestad (2003), as recalled (from memory).
var skogestadExample = Reading{Gain: 1, Lags: []float64{2, 1, 0.4, 0.2, 0.05, 0.05, 0.05}, Leads: []float64{0.08}, Inverse: []float64{0.3}}

// TestSIMCPaperExample applies SIMC's PI rule to the first-order model of
// the paper's example, tc = theta = 1.47: Kc = 2.5/(2 1.47) = 0.850,
// Ti = min(2.5, 4 2.94) = 2.5 (the paper's settings, from memory, agree
// to its three digits).
func TestSIMCPaperExample(t *testing.T) {
	m, err := HalfRule(skogestadExample, 1)
	if err != nil {
		t.Fatal(err)
	}
	tn := &tuner{model: m, s: TuneSettings{Rule: SIMC}}
	c := tn.pid(tn.ruleTime()) // T = 0: a continuous loop, tc = theta
	near(t, "Kc", c.Gain, 0.850, 1e-3)
	near(t, "Ti", c.Integral, 2.5, 1e-12)
}

// TestReadZOHImages reads exact zero-order-hold images back (1e-9), and a
// term with a lead from its poles, zeros and group delay.
func TestReadZOHImages(t *testing.T) {
	r, err := Read(sopdt(t, 2, 10, 3, 2), 1)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Lags) != 2 || r.Integrating {
		t.Fatalf("reading %+v", r)
	}
	near(t, "gain", r.Gain, 2, 1e-9)
	near(t, "lag 1", r.Lags[0], 10, 1e-9)
	near(t, "lag 2", r.Lags[1], 3, 1e-9)
	near(t, "dead time", r.DeadTime, 2, 1e-9)
	if r.How != "second-order image" {
		t.Errorf("read by %q", r.How)
	}
	// A second-order term with a lead is read from poles, zeros and the
	// group delay. The exact ZOH image of 2 (4s+1) e^{-2s}/((10s+1)(3s+1))
	// is ZOH(G) + 4 ZOH(s G), and ZOH(s G) = (1 - B) sum_k g(kT) B^k with
	// g the impulse response 2 (e^{-u/10} - e^{-u/3})/(10 - 3), u = kT - 2
	// (derived here), that is 2/7 (a1 - a2) (1 - B) B^3/((1 - a1 B)(1 - a2 B)).
	// Its lead is no longer exactly a discrete zero, nor its dead time
	// exactly 2: both to O(T^2/tau) of the reading (0.05 here).
	lag := sopdt(t, 2, 10, 3, 2)
	a1, a2 := math.Exp(-0.1), math.Exp(-1.0/3)
	c := 4 * 2.0 / 7 * (a1 - a2)
	num := lag.Num() // the image of the lags, B^3 (w0 + w1 B) / den
	num[0], num[1] = num[0]+c, num[1]-c
	withLead, _ := tf.NewRational(num, lag.Den(), lag.Delay())
	r, err = Read(withLead, 1)
	if err != nil || len(r.Leads) != 1 || r.How != "poles, zeros and group delay" {
		t.Fatalf("%+v %v", r, err)
	}
	near(t, "lead", r.Leads[0], 4, 0.05)
	near(t, "lags", r.Lags[0]+r.Lags[1], 13, 1e-9)
	near(t, "dead time with a lead", r.DeadTime, 2, 0.05)
	near(t, "dead time with a lead", r.DeadTime, 2, 0.05)
	// k' e^{-dT s}/s has the exact image k' T B^(d+1)/(1 - B) (common
	// practice: the held input integrates over one interval).
	p, _ := tf.NewRational([]float64{0.25 * 2}, []float64{1, -1}, 4)
	r, err = Read(p, 2)
	if err != nil {
		t.Fatal(err)
	}
	if !r.Integrating || len(r.Lags) != 0 {
		t.Fatalf("reading %+v", r)
	}
	near(t, "slope", r.Gain, 0.25, 1e-12)
	near(t, "integrating dead time", r.DeadTime, 6, 1e-12)
	// A first-order image with a fractional dead time is read exactly
	// by tf.Rational.AsFOPDT.
	r, err = Read(fopdt(t, 1.5, 7, 2.4), 1)
	if err != nil || r.How != "first-order image" {
		t.Fatalf("%+v %v", r, err)
	}
	near(t, "fractional dead time", r.DeadTime, 2.4, 1e-9)
}

// TestTuneFormulas checks the rules' formulas (as stated on SIMC and IMC:
// Skogestad 2003, eqs. for PI/PID; Rivera et al. 1986, Table 1 rows for
// the first-order model with e^{-theta s} ~ 1 - theta s and with the
// first-order Pade approximation, and the second-order row, from memory
// and re-derived in the comments of the IMC rule) on exact images,
// numbers computed by hand from the formulas.
func TestTuneFormulas(t *testing.T) {
	iv := tf.Interval{Value: 1, Unit: "min"}
	p := fopdt(t, 2, 10, 3) // effective dead time 3 + h/2 = 3.5
	for _, c := range []struct {
		name       string
		p          tf.Rational
		s          TuneSettings
		kc, ti, td float64
		tol        float64
	}{
		// SIMC, default tc = theta + h/2 = 4 (Tune's doc): Kc = 10/(2 *
		// 7.5), Ti = min(10, 30).
		{"SIMC PI", p, TuneSettings{}, 10.0 / 15, 10, 0, 1e-9},
		// SIMC, tc = theta = 3.5 set: Kc = 10/(2 * 7), Ti = min(10, 28).
		{"SIMC PI tc theta", p, TuneSettings{ClosedLoopTime: 3.5}, 10.0 / 14, 10, 0, 1e-9},
		// SIMC PI, tc = 1: Ti = min(10, 4 * 4.5) = 10; Kc = 10/(2*4.5).
		{"SIMC PI tc 1", p, TuneSettings{ClosedLoopTime: 1}, 10.0 / 9, 10, 0, 1e-9},
		// A long lag: Ti = 4 (tc + theta) = 30 < 40, tc = 4.
		{"SIMC PI long lag", fopdt(t, 2, 40, 3), TuneSettings{}, 40.0 / 15, 30, 0, 1e-9},
		// SOPDT 2 e^{-2s}/((10s+1)(3s+1)): theta 2.5, tc = 3, Kc =
		// 10/(2*5.5), Ti 10, Td 3 (series).
		{"SIMC PID", sopdt(t, 2, 10, 3, 2), TuneSettings{Derivative: true}, 10.0 / 11, 10, 3, 1e-9},
		// IMC PI, lambda 2: Kc = 10/(2 (2 + 3.5)), Ti = 10.
		{"IMC PI", p, TuneSettings{Rule: IMC, ClosedLoopTime: 2}, 10.0 / 11, 10, 0, 1e-9},
		// IMC PID on the first-order model, lambda 2:
		// Kc = 23.5/(2 * 7.5), Ti = 11.75, Td = 35/23.5.
		{"IMC PID Pade", p, TuneSettings{Rule: IMC, Derivative: true, ClosedLoopTime: 2}, 23.5 / 15, 11.75, 35 / 23.5, 1e-9},
		// IMC PID on SOPDT, lambda 1: Kc = 13/(2 * 3.5), Ti = 13, Td = 30/13.
		{"IMC PID SOPDT", sopdt(t, 2, 10, 3, 2), TuneSettings{Rule: IMC, Derivative: true, ClosedLoopTime: 1}, 13.0 / 7, 13, 30.0 / 13, 1e-9},
	} {
		t.Run(c.name, func(t *testing.T) {
			tu, err := Tune(c.p, iv, c.s)
			if err != nil {
				t.Fatal(err)
			}
			near(t, "Kc", tu.PID.Gain, c.kc, c.tol)
			near(t, "Ti", tu.PID.Integral, c.ti, c.tol)
			near(t, "Td", tu.PID.Derivative, c.td, c.tol)
			if !tu.Stable || !strings.Contains(tu.String(), Caution) {
				t.Errorf("stable %v; String lacks the caution:\n%s", tu.Stable, tu)
			}
		})
	}
}

// TestTuneIntegrating checks SIMC's integrating rule: k' = 0.25, theta =
// 6 + h/2 = 7 (interval 2), default tc = theta + h/2 = 8 (Tune's doc):
// Kc = 1/(0.25 * 15), Ti = 60.
func TestTuneIntegrating(t *testing.T) {
	p, _ := tf.NewRational([]float64{0.5}, []float64{1, -1}, 4)
	tu, err := Tune(p, tf.Interval{Value: 2, Unit: "s"}, TuneSettings{})
	if err != nil {
		t.Fatal(err)
	}
	near(t, "Kc", tu.PID.Gain, 1/(0.25*15), 1e-12)
	near(t, "Ti", tu.PID.Integral, 60, 1e-12)
	if !tu.Stable {
		t.Error("loop on the model unstable")
	}
}

// TestSIMCTable checks the robustness SIMC's tc = theta gives a
// first-order process with Ti = Tau1 (Skogestad 2003, Table 1, from
// memory: GM 3.14, PM 61.4 degrees, Ms 1.59, delay margin 2.14 theta);
// derived here: the loop is e^{-theta s}/(2 theta s), so GM = pi, PM =
// pi/2 - 1/2 rad, delay margin (pi - 1) theta. A discrete loop at 100
// samples per dead time approximates it: the hold's T/2 is in the
// effective dead time, the backward-difference integral differs by
// O(T/Ti); 1 % covers both.
func TestSIMCTable(t *testing.T) {
	p := fopdt(t, 1.3, 120, 100)
	tu, err := Tune(p, tf.Interval{}, TuneSettings{})
	if err != nil {
		t.Fatal(err)
	}
	if tu.PID.Integral != tu.Model.Tau1 {
		t.Fatalf("Ti = %v, want Tau1 = %v", tu.PID.Integral, tu.Model.Tau1)
	}
	lp, err := Analyze(tu.Controller, p, LoopSettings{Horizon: 100})
	if err != nil {
		t.Fatal(err)
	}
	th := tu.Model.DeadTime
	near(t, "GM", lp.Margins.GainMargin, math.Pi, 0.01)
	near(t, "PM", lp.Margins.PhaseMargin*180/math.Pi, 61.35, 0.01)
	near(t, "Ms", lp.SensitivityPeak, 1.59, 0.01)
	near(t, "delay margin / theta", lp.DelayMargin.Samples/th, math.Pi-1, 0.01)
}

// TestTuneMaxSensitivity checks the 1-D search: the tuned loop has the
// target peak to the search's tolerance (1e-9 in log tc).
func TestTuneMaxSensitivity(t *testing.T) {
	p := sopdt(t, 2, 10, 3, 2)
	for _, s := range []TuneSettings{{MaxSensitivity: 1.6}, {Rule: IMC, Derivative: true, MaxSensitivity: 1.4}, {Rule: Dahlin, MaxSensitivity: 1.5}} {
		tu, err := Tune(p, tf.Interval{}, s)
		if err != nil {
			t.Fatal(err)
		}
		lp, err := Analyze(tu.Controller, p, LoopSettings{})
		if err != nil {
			t.Fatal(err)
		}
		near(t, string(s.Rule)+" Ms", lp.SensitivityPeak, s.MaxSensitivity, 1e-6)
		near(t, "Tuning.Ms", tu.Ms, lp.SensitivityPeak, 1e-12)
	}
}

// TestDahlin checks that Dahlin's controller makes the loop on the model
// the first-order response it was designed for (derived on the Dahlin
// rule): y_t = 1 - q^(t-b+1) for t >= b, 0 before, q = e^{-T/lambda};
// the loop's responses are simulated by two difference equations, so
// they agree to rounding (1e-12).
func TestDahlin(t *testing.T) {
	integ, _ := tf.NewRational([]float64{0.5}, []float64{1, -1}, 4)
	for _, c := range []struct {
		name string
		p    tf.Rational
		b    int
	}{{"first order", fopdt(t, 2, 10, 3), 4}, {"integrating", integ, 4}} {
		tu, err := Tune(c.p, tf.Interval{}, TuneSettings{Rule: Dahlin, ClosedLoopTime: 5})
		if err != nil {
			t.Fatal(err)
		}
		lp, err := Analyze(tu.Controller, c.p, LoopSettings{Horizon: 60})
		if err != nil {
			t.Fatal(err)
		}
		q := math.Exp(-1.0 / 5)
		for k, y := range lp.Setpoint.Output {
			want := 0.0
			if k >= c.b {
				want = 1 - math.Pow(q, float64(k-c.b+1))
			}
			if math.Abs(y-want) > 1e-12 {
				t.Fatalf("%s: y[%d] = %v, want %v", c.name, k, y, want)
			}
		}
	}
	// A lightly damped plant, which Read refuses, is tuned by Dahlin's
	// rule on the model itself; the loop on the model is the designed
	// first-order response, so stable.
	ringing, _ := tf.NewRational([]float64{0.2}, []float64{1, -1.6, 0.95}, 2)
	if tu, err := Tune(ringing, tf.Interval{}, TuneSettings{Rule: Dahlin}); err != nil || !tu.Stable || tu.Reading.How != "dead time only" {
		t.Errorf("lightly damped plant: %v %v", tu, err)
	}
	// A sampling zero on the negative real axis is smoothed: the loop is
	// stable and reaches the set point.
	tu, err := Tune(sopdt(t, 2, 10, 3, 2), tf.Interval{}, TuneSettings{Rule: Dahlin})
	if err != nil || !tu.Stable {
		t.Fatalf("%v %v", err, tu)
	}
}

// TestConvertForm checks the series/parallel conversion round trip
// (common practice formulas on TuneSettings.Form).
func TestConvertForm(t *testing.T) {
	s := PID{Form: Series, Gain: 1.2, Integral: 10, Derivative: 2}
	p := convertForm(s)
	near(t, "parallel Kc", p.Gain, 1.2*1.2, 1e-12)
	near(t, "parallel Ti", p.Integral, 12, 1e-12)
	near(t, "parallel Td", p.Derivative, 20.0/12, 1e-12)
	b := convertForm(p)
	near(t, "round trip Kc", b.Gain, s.Gain, 1e-12)
	near(t, "round trip Ti", b.Integral, s.Integral, 1e-12)
	near(t, "round trip Td", b.Derivative, s.Derivative, 1e-12)
	tu, err := Tune(sopdt(t, 2, 10, 3, 2), tf.Interval{}, TuneSettings{Derivative: true, Form: Parallel})
	if err != nil || tu.PID.Form != Parallel {
		t.Fatalf("%v %v", tu.PID, err)
	}
}
