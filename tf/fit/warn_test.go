package fit

import (
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
)

func hasWarning(ws []Warning, k WarningKind) bool {
	for _, w := range ws {
		if w.Kind == k {
			return true
		}
	}
	return false
}

// TestModelWarningsRules checks each warning rule on estimates built by
// hand: a pole at z = 1.0 (integrator) and an AR root at 1.2, an MA zero
// at 1.0, a numerator zero at 0.52 beside a pole at 0.5, a correlation of
// 0.97, and a fit that did not converge.
func TestModelWarningsRules(t *testing.T) {
	m := fixture.PlantModel()
	set := func(p tf.Poly, v float64) {
		p.Each(func(c *tf.Coef) {
			if c.Name != "" {
				c.Value = v
			}
		})
	}
	set(m.Inputs[0].Num, 1) // w0 = 1, then w1 = 0.52: zero at z = 0.52
	m.Inputs[0].Num.Factors[0].Terms[1].Coef.Value = 0.52
	set(m.Inputs[0].Den, 1.0) // pole at z = 1
	set(m.Noise.AR, 1.2)      // AR root at z = 1.2
	m.Noise.MA = fixture.OneMinus("t1", 1)
	set(m.Noise.MA, 1.0) // MA zero at z = 1
	e := &Estimate{Model: m, Converged: false, Reason: "not converged: iteration limit reached",
		Params: []Param{{Name: "w0"}, {Name: "d1"}},
		Cov:    [][]float64{{1, 0.97}, {0.97, 1}}}
	ws := warningsOf(e, false, nil)
	for _, k := range []WarningKind{UnstableDenominator, NonStationaryNoise, NonInvertibleNoise, HighCorrelation, NotConverged} {
		if !hasWarning(ws, k) {
			t.Errorf("missing %v warning: %v", k, ws)
		}
	}
	if hasWarning(ws, CancellingRoots) {
		// zero 0.52 vs pole 1.0 are far apart
		t.Errorf("unexpected cancellation warning: %v", ws)
	}
	set(m.Inputs[0].Den, 0.5)
	ws = warningsOf(e, true, nil)
	if !hasWarning(ws, CancellingRoots) || !hasWarning(ws, SingularInformation) || hasWarning(ws, UnstableDenominator) {
		t.Errorf("zero 0.52 beside pole 0.5, singular J'J: %v", ws)
	}
}

// TestModelWarnsRedundant fits a first-order numerator and denominator to
// data with a pure gain and white noise: the fitted zero and pole cancel
// and the estimates correlate near 1, and the fit says so.
func TestModelWarnsRedundant(t *testing.T) {
	rng := fixture.NewRand(21)
	n := 500
	x := fixture.AR1(rng, n, 0.3)
	y := make([]float64, n)
	for i := 1; i < n; i++ {
		y[i] = 2*x[i-1] + 0.3*rng.NormFloat64()
	}
	num := fixture.Poly(fixture.Factor(fixture.Term(false, "w0", 0, 0), fixture.Term(true, "w1", 0, 1)))
	m := tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x", Num: num, Den: fixture.OneMinus("d1", 1), Delay: 1}}, Noise: &arma.Noise{}}
	est := mustFit(t, m, map[string][]float64{"y": y, "x": x}, nil)
	w1, _ := est.Param("w1")
	d1, _ := est.Param("d1")
	w0, _ := est.Param("w0")
	if math.Abs(w1.Value/w0.Value-d1.Value) < cancelDist && !hasWarning(est.Warnings, CancellingRoots) {
		t.Errorf("zero %v and pole %v cancel without a warning: %v", w1.Value/w0.Value, d1.Value, est.Warnings)
	}
	if !hasWarning(est.Warnings, CancellingRoots) || !hasWarning(est.Warnings, HighCorrelation) {
		t.Errorf("warnings %v (w0 %v w1 %v d1 %v)", est.Warnings, w0.Value, w1.Value, d1.Value)
	}
}

// TestSlowPoleWording checks that the SlowPole warning names where the
// pole lies: d1 = 0.997 is a lag of time constant -1/ln 0.997 = 332.8
// samples (arithmetic), with a longer record as the remedy; d1 = -0.997
// (a fit of the harness with noise 1.5) is a mode that changes sign every sample,
// which no sampled lag has (a zero-order hold maps a real pole -1/T to
// z = e^(-Ts/T) > 0, z = e^(sTs): common practice), so the message must
// not call it a time constant to be cured by a longer record.
func TestSlowPoleWording(t *testing.T) {
	m := fixture.PlantModel()
	setDen := func(v float64) {
		m.Inputs[0].Den.Each(func(c *tf.Coef) {
			if c.Name != "" {
				c.Value = v
			}
		})
	}
	e := &Estimate{Model: m, Converged: true, N: 500}
	find := func() string {
		var ws warningList
		ws.slowPoles(e)
		for _, w := range ws {
			if w.Kind == SlowPole && len(w.Params) > 0 && w.Params[0] == "d1" {
				return w.Message
			}
		}
		return ""
	}
	setDen(0.997)
	msg := find()
	if !strings.Contains(msg, "time constant 332.8 samples") || !strings.Contains(msg, "use a longer record") {
		t.Errorf("positive pole 0.997: %q", msg)
	}
	setDen(-0.997)
	msg = find()
	if msg == "" {
		t.Fatal("no SlowPole warning for a pole at -0.997")
	}
	for _, want := range []string{"negative real axis at z = -0.997", "changes sign every sample", "Nyquist", "a longer record does not cure it", "lower denominator order"} {
		if !strings.Contains(msg, want) {
			t.Errorf("pole -0.997: missing %q in %q", want, msg)
		}
	}
	if strings.Contains(msg, "use a longer record") || strings.Contains(msg, "time constant 332.8 samples,") {
		t.Errorf("pole -0.997 worded as a slow lag: %q", msg)
	}
}
