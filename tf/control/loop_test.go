package control

import (
	"errors"
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"github.com/backshift/backshift/tf"
)

// ultimateGain is the loop gain k = Kc K at which proportional control
// of the discrete first-order lag with dead time
//
//	G(B) = K (1 - a) B^d / (1 - a B),  0 < a < 1, d >= 1,
//
// reaches the stability boundary. Derived here (the Nyquist criterion for
// sampled systems, Franklin, Powell & Workman, Digital Control of Dynamic
// Systems, 3rd ed., section 7.4; the Jury test, section 4.5; section
// numbers from memory): the
// characteristic polynomial is 1 - a B + k (1 - a) B^d. For d = 1 its
// pole is z = a - k (1 - a), inside the unit circle while k < (1 + a)/(1 - a).
// For d = 2, z^2 - a z + k (1 - a) satisfies Jury's conditions |k (1 - a)|
// < 1, 1 - a + k (1 - a) > 0, 1 + a + k (1 - a) > 0, so k < 1/(1 - a). In
// general the loop crosses -1 at the frequency w_u where the phase is -pi,
//
//	d w_u + atan2(a sin w_u, 1 - a cos w_u) = pi,
//
// (the left side rises from 0 to d pi on [0, pi]), and k_u = |1 - a
// e^{-i w_u}| / (1 - a); for d = 1 and 2 this gives the closed forms.
func ultimateGain(a float64, d int) float64 {
	switch d {
	case 1:
		return (1 + a) / (1 - a)
	case 2:
		return 1 / (1 - a)
	}
	f := func(w float64) float64 { return float64(d)*w + math.Atan2(a*math.Sin(w), 1-a*math.Cos(w)) - math.Pi }
	lo, hi := 0.0, math.Pi
	for it := 0; it < 200; it++ {
		mid := 0.5 * (lo + hi)
		if f(mid) < 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	w := 0.5 * (lo + hi)
	return cmplx.Abs(1-complex(a, 0)*cmplx.Exp(complex(0, -w))) / (1 - a)
}

// TestStabilityLimit finds the stability boundary of proportional control
// from Analyze's closed-loop poles (bisection on the gain) and checks it
// and the gain margin against ultimateGain, to 1e-9 relative (bisection
// to 1e-12; the poles near the boundary are simple).
func TestStabilityLimit(t *testing.T) {
	for _, c := range []struct {
		a float64
		d int
	}{{0.5, 1}, {0.9, 1}, {0.8, 2}, {0.95, 2}, {0.9, 3}, {0.7, 5}, {0.98, 12}} {
		K := 2.0
		p, err := tf.NewRational([]float64{K * (1 - c.a)}, []float64{1, -c.a}, c.d)
		if err != nil {
			t.Fatal(err)
		}
		ku := ultimateGain(c.a, c.d)
		stable := func(k float64) bool {
			ctl, _ := tf.Constant(k / K)
			lp, err := Analyze(ctl, p, LoopSettings{Horizon: 1})
			if err != nil {
				t.Fatal(err)
			}
			return lp.Stable
		}
		lo, hi := 0.0, 10*ku
		for hi-lo > 1e-12*ku {
			if mid := 0.5 * (lo + hi); stable(mid) {
				lo = mid
			} else {
				hi = mid
			}
		}
		near(t, "stability limit", lo, ku, 1e-9)
		ctl, _ := tf.Constant(0.5 / K)
		lp, err := Analyze(ctl, p, LoopSettings{Horizon: 1})
		if err != nil {
			t.Fatal(err)
		}
		near(t, "gain margin", lp.Margins.GainMargin, ku/0.5, 1e-9)
	}
}

// TestAnalyzeFigures checks the set-point figures against
// tf.Rational.StepFigures of the closed loop C P/(1 + C P)
// (tf.Rational.CloseLoop), which measures the same definitions on its
// own step response: equal to 1e-9. The final values follow from the
// gains (common practice: integral action removes the offset).
func TestAnalyzeFigures(t *testing.T) {
	p := sopdt(t, 2, 10, 3, 2)
	for _, c := range []PID{{Gain: 1, Integral: 10}, {Gain: 0.5}, {Form: Series, Gain: 1, Integral: 10, Derivative: 3}} {
		ctl, err := c.Discrete(1, "")
		if err != nil {
			t.Fatal(err)
		}
		lp, err := Analyze(ctl, p, LoopSettings{Horizon: 400, Interval: tf.Interval{Value: 30, Unit: "s"}})
		if err != nil {
			t.Fatal(err)
		}
		l, _ := ctl.Times(p)
		one, _ := tf.Constant(1)
		cl, err := l.CloseLoop(one)
		if err != nil {
			t.Fatal(err)
		}
		want, err := cl.StepFigures(tf.StepSettings{Horizon: 400, Interval: 30})
		if err != nil {
			t.Fatal(err)
		}
		got := lp.Setpoint.Figures
		for _, f := range []struct {
			name   string
			g, w   float64
			absTol float64
		}{
			{"final", got.Final, want.Final, 1e-9}, {"rise", got.Rise.Samples, want.Rise.Samples, 1e-9},
			{"rise time", got.Rise.Time, want.Rise.Time, 1e-7}, {"settle", got.Settle.Samples, want.Settle.Samples, 1e-9},
			{"overshoot", got.Overshoot, want.Overshoot, 1e-9}, {"peak", got.Peak, want.Peak, 1e-9},
		} {
			near(t, c.String()+" "+f.name, f.g, f.w, f.absTol)
		}
		if c.Integral == 0 {
			near(t, "P offset", got.Final, 0.5, 1e-12) // K Kc/(1 + K Kc), K Kc = 1
		}
		// After a unit load step a PI controller's integral must reach
		// -1, so the integrated error sum y_t T is Ti/Kc (derived here
		// from the backward-difference PI: u_t = Kc e_t + Kc T/Ti sum e);
		// the IAE is at least that, more when y changes sign.
		if c.Integral > 0 && c.Derivative == 0 {
			ie := 0.0
			for _, y := range lp.Load.Output {
				ie += y * 30
			}
			near(t, "load integrated error", ie, c.Integral/c.Gain*30, 1e-6)
			if lp.Load.IAE < ie-1e-9 {
				t.Errorf("load IAE %v below the integrated error %v", lp.Load.IAE, ie)
			}
		}
	}
}

// TestAnalyzeBadInput checks the traps: an algebraic loop, a bad setting,
// a loop too long for the root finder.
func TestAnalyzeBadInput(t *testing.T) {
	noDelay, _ := tf.NewRational([]float64{1}, []float64{1, -0.5}, 0)
	one, _ := tf.Constant(1)
	long, _ := tf.NewRational([]float64{0.1}, []float64{1, -0.9}, 300)
	p, _ := tf.NewRational([]float64{0.1}, []float64{1, -0.9}, 1)
	for _, c := range []struct {
		name string
		c, p tf.Rational
		s    LoopSettings
		kind error
		word string
	}{
		{"algebraic loop", one, noDelay, LoopSettings{}, ErrModel, "algebraic loop"},
		{"negative horizon", one, p, LoopSettings{Horizon: -1}, ErrSetting, "LoopSettings.Horizon"},
		{"bad band", one, p, LoopSettings{Step: tf.StepSettings{Band: 2}}, ErrSetting, "LoopSettings.Step.Band"},
		{"bad interval", one, p, LoopSettings{Interval: tf.Interval{Value: -1}}, ErrSetting, "LoopSettings.Interval.Value"},
		{"long dead time", one, long, LoopSettings{}, ErrModel, "resample slower"},
	} {
		_, err := Analyze(c.c, c.p, c.s)
		if !errors.Is(err, c.kind) || err == nil || !strings.Contains(err.Error(), c.word) || !strings.Contains(err.Error(), "control.Analyze") {
			t.Errorf("%s: %v", c.name, err)
		}
	}
}

// TestAnalyzeConcurrent runs Analyze from several goroutines on one
// controller and plant (run with -race): every result equals the
// sequential one.
func TestAnalyzeConcurrent(t *testing.T) {
	p := sopdt(t, 2, 10, 3, 2)
	tu, err := Tune(p, tf.Interval{}, TuneSettings{Derivative: true})
	if err != nil {
		t.Fatal(err)
	}
	want, err := Analyze(tu.Controller, p, LoopSettings{Horizon: 100})
	if err != nil {
		t.Fatal(err)
	}
	got := make([]Loop, 8)
	done := make(chan int)
	for i := range got {
		go func() {
			got[i], _ = Analyze(tu.Controller, p, LoopSettings{Horizon: 100})
			done <- i
		}()
	}
	for range got {
		<-done
	}
	for i, g := range got {
		if g.SensitivityPeak != want.SensitivityPeak || g.Setpoint.IAE != want.Setpoint.IAE || g.MaxPole != want.MaxPole {
			t.Errorf("goroutine %d: Ms %v IAE %v, sequential %v %v", i, g.SensitivityPeak, g.Setpoint.IAE, want.SensitivityPeak, want.Setpoint.IAE)
		}
	}
}
