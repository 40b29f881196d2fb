package control_test

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/control"
)

// TestModelDrawWholePath checks that ModelDraw draws the whole path of
// tf.Model.Path, the model's output differencing and the input's
// differencing included: for (1 - B) y = w0/(1 - d1 B) B^2 u every drawn
// plant is w0 B^2/((1 - d1 B)(1 - B)) with its drawn w0 and d1 (an
// integrator), and for y = w0/(1 - d1 B) B ((1 - B) u) every drawn plant
// has gain 0 (hand algebra, common practice: D(B) y = G x is y = G/D x).
func TestModelDrawWholePath(t *testing.T) {
	cov := [][]float64{{1e-6, 0}, {0, 1e-4}}
	out := parse.MustModel("(1 - B) y = w0 / (1 - d1 B) B^2 u + a where w0 = 0.05, d1 = 0.5")
	draw, err := control.ModelDraw(out, "u", []string{"w0", "d1"}, cov)
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for k := range 50 {
		p, err := draw(rng)
		if err != nil {
			t.Fatal(err)
		}
		w0, d1 := p.Num()[0], p.Den()[2]
		want := []float64{1, -1 - d1, d1}
		if d1 == 0.5 || !slices.Equal(p.Num(), []float64{w0}) || !slices.Equal(p.Den(), want) || p.Delay() != 2 || p.Stable() {
			t.Fatalf("draw %d: %v, want w0 B^2 / ((1 - d1 B)(1 - B)) with d1 drawn (den %v)", k, p, want)
		}
	}
	in := parse.MustModel("y = w0 / (1 - d1 B) B ((1 - B) u) + a where w0 = 0.5, d1 = 0.5")
	draw, err = control.ModelDraw(in, "u", []string{"w0", "d1"}, cov)
	if err != nil {
		t.Fatal(err)
	}
	for k := range 50 {
		p, err := draw(rng)
		if err != nil {
			t.Fatal(err)
		}
		if g, err := p.Gain(); err != nil || g != 0 || len(p.Num()) != 2 {
			t.Fatalf("draw %d: %v, gain %v (%v), want w0 (1 - B) B / (1 - d1 B), gain 0", k, p, g, err)
		}
	}
}

// TestModelDrawCopiesNames: a caller who reorders
// its names slice after ModelDraw must not change later draws. The draws
// after the reorder equal those of a ModelDraw given its own slice, with
// the same seed.
func TestModelDrawCopiesNames(t *testing.T) {
	m := parse.MustModel("y = w0 / (1 - d1 B) B^2 u + a where w0 = 0.8, d1 = 0.5")
	cov := [][]float64{{1e-4, 0}, {0, 4e-4}}
	names := []string{"w0", "d1"}
	reused, err := control.ModelDraw(m, "u", names, cov)
	if err != nil {
		t.Fatal(err)
	}
	own, err := control.ModelDraw(m, "u", []string{"w0", "d1"}, cov)
	if err != nil {
		t.Fatal(err)
	}
	names[0], names[1] = names[1], names[0]
	r1, r2 := rand.New(rand.NewPCG(3, 4)), rand.New(rand.NewPCG(3, 4))
	for k := range 20 {
		a, err1 := reused(r1)
		b, err2 := own(r2)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		if !slices.Equal(a.Num(), b.Num()) || !slices.Equal(a.Den(), b.Den()) {
			t.Fatalf("draw %d after the caller reordered its names: %v, want %v", k, a, b)
		}
		if math.Abs(a.Num()[0]-0.8) > 0.05 {
			t.Fatalf("draw %d: w0 = %v, far from its mean 0.8 (SD 0.01)", k, a.Num()[0])
		}
	}
}

// closedLoopStep simulates the loop y = P u, u = C (1 - y) from rest for
// n samples by the two difference equations (plant dead time at least
// 1), independently of Analyze, and returns y.
func closedLoopStep(c, p tf.Rational, n int) []float64 {
	nc, dc, bc := c.Num(), c.Den(), c.Delay()
	np, dp, bp := p.Num(), p.Den(), p.Delay()
	y, u, e := make([]float64, n), make([]float64, n), make([]float64, n)
	at := func(x []float64, i int) float64 {
		if i < 0 {
			return 0
		}
		return x[i]
	}
	for t := range n {
		for k, v := range np {
			y[t] += v * at(u, t-bp-k)
		}
		for k := 1; k < len(dp); k++ {
			y[t] -= dp[k] * at(y, t-k)
		}
		e[t] = 1 - y[t]
		for k, v := range nc {
			u[t] += v * at(e, t-bc-k)
		}
		for k := 1; k < len(dc); k++ {
			u[t] -= dc[k] * at(u, t-k)
		}
	}
	return y
}

// TestTuneOnWholePath on an integrating model
// (1 - B) y = 0.05/(1 - 0.5 B) B^2 u, every 1 min. Tuned on the term
// alone (Input.Rational, a self-regulating plant of gain 0.1) SIMC's PI
// closed around the model's real path is unstable (measured
// a largest closed-loop pole of 1.125). Tuned on the whole path
// (Model.Path, an integrator) SIMC takes its integrating row (Skogestad
// 2003, Table 1 with tau1 -> infinity: Kc = 1/(k' (tc + theta)),
// Ti = 4 (tc + theta)), and the loop is stable: Analyze's closed-loop
// poles lie inside the unit circle, and a time-domain run of the two
// difference equations settles at the set point (integral action, common
// practice) to 1e-6 within 2000 samples.
func TestTuneOnWholePath(t *testing.T) {
	m := parse.MustModel("(1 - B) y = 0.05 / (1 - 0.5 B) B^2 u; every 1 min")
	term, err := m.Inputs[0].Rational()
	if err != nil {
		t.Fatal(err)
	}
	path, err := m.Path("u")
	if err != nil {
		t.Fatal(err)
	}
	ls := control.LoopSettings{Interval: m.Interval, Horizon: 400}
	wrong, err := control.Tune(term, m.Interval, control.TuneSettings{Rule: control.SIMC})
	if err != nil {
		t.Fatal(err)
	}
	real, err := control.Analyze(wrong.Controller, path, ls)
	if err != nil {
		t.Fatal(err)
	}
	if real.Stable || math.Abs(real.MaxPole-1.125) > 0.005 {
		t.Errorf("tuned on the term alone, closed on the path: stable %v, max pole %.4f, want unstable near 1.125", real.Stable, real.MaxPole)
	}
	for _, rule := range []control.Rule{control.SIMC, control.IMC, control.Dahlin} {
		tu, err := control.Tune(path, m.Interval, control.TuneSettings{Rule: rule})
		if err != nil {
			t.Fatalf("%s on the path: %v", rule, err)
		}
		loop, err := control.Analyze(tu.Controller, path, ls)
		if err != nil {
			t.Fatal(err)
		}
		if !tu.Stable || !loop.Stable || !(loop.MaxPole < 1) {
			t.Errorf("%s on the path %v: tuning stable %v, loop stable %v, max pole %.4f", rule, path, tu.Stable, loop.Stable, loop.MaxPole)
		}
		y := closedLoopStep(tu.Controller, path, 2000)
		if d := math.Abs(y[len(y)-1] - 1); !(d < 1e-6) {
			t.Errorf("%s: closed-loop step ends at %v, want the set point 1", rule, y[len(y)-1])
		}
		t.Logf("%s: %v, max pole %.4f, Ms %.3f", rule, tu.PID, loop.MaxPole, loop.SensitivityPeak)
		if rule != control.SIMC {
			continue
		}
		r := tu.Model
		if !r.Integrating || r.Tau2 != 0 {
			t.Fatalf("SIMC reduced the path to %v, want an integrator with dead time", r)
		}
		tc, th := tu.ClosedLoopTime, r.DeadTime
		kc, ti := 1/(r.Gain*(tc+th)), 4*(tc+th)
		if math.Abs(tu.PID.Gain/kc-1) > 1e-9 || math.Abs(tu.PID.Integral/ti-1) > 1e-9 {
			t.Errorf("SIMC on the integrator %v: Kc %v Ti %v, want %v and %v", r, tu.PID.Gain, tu.PID.Integral, kc, ti)
		}
	}
}
