package tf_test

import (
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
)

// TestMarginsPureDelay: L = k B^d has |L| = k and phase -d w, so the
// phase crosses -180 degrees first at w = pi/d and the gain margin is
// 1/k (by hand). With k = 1 every frequency is a gain crossover; use
// k = 0.5 (no gain crossover) and check the absence too.
func TestMarginsPureDelay(t *testing.T) {
	for _, d := range []int{1, 3, 10, 250} {
		r := tf.MustRational([]float64{0.5}, []float64{1}, d)
		m, err := r.LoopMargins()
		if err != nil {
			t.Fatal(err)
		}
		if !m.HasGainMargin || math.Abs(m.GainMargin-2) > 1e-12 || math.Abs(m.PhaseCrossover-math.Pi/float64(d)) > 1e-12 {
			t.Errorf("d=%d: %+v, want gain margin 2 at pi/d", d, m)
		}
		if m.HasPhaseMargin {
			t.Errorf("d=%d: |L| = 0.5 has no gain crossover, got %+v", d, m)
		}
		if math.Abs(m.GainMarginDecibels()-20*math.Log10(2)) > 1e-10 {
			t.Errorf("dB %v", m.GainMarginDecibels())
		}
	}
}

// TestMarginsClosedLoop checks the definitions through the closed loop:
// scaling the open loop by its gain margin puts a closed-loop pole on the
// unit circle (largest pole magnitude 1 to 1e-9), and at the gain
// crossover |L| = 1 with phase -180 degrees plus the phase margin.
func TestMarginsClosedLoop(t *testing.T) {
	one := tf.MustRational([]float64{1}, []float64{1}, 0)
	for _, l := range []tf.Rational{
		tf.MustRational([]float64{0.5}, []float64{1, -0.8}, 3),             // lag plus dead time
		tf.MustRational([]float64{0.2, 0.1}, []float64{1, -1.3, 0.42}, 2),  // second order
		tf.MustRational([]float64{0.05}, []float64{1, -1.9, 0.9}, 1),       // with an integrator
		tf.MustRational([]float64{0.3, -0.2}, []float64{1, -1.2, 0.72}, 4), // complex poles
	} {
		m, err := l.LoopMargins()
		if err != nil {
			t.Fatal(err)
		}
		if !m.HasGainMargin {
			t.Errorf("%v: no gain margin", l)
			continue
		}
		k, _ := tf.Constant(m.GainMargin)
		scaled, _ := k.Times(l)
		cl, err := scaled.CloseLoop(one)
		if err != nil {
			t.Fatal(err)
		}
		if e := math.Abs(cl.MaxPoleMagnitude() - 1); e > 1e-9 {
			t.Errorf("%v: closed loop at the gain margin %v has max |pole| off 1 by %.3g", l, m.GainMargin, e)
		}
		// Below the margin the closed loop is stable.
		k2, _ := tf.Constant(0.99 * m.GainMargin)
		s2, _ := k2.Times(l)
		cl2, _ := s2.CloseLoop(one)
		if !cl2.Stable() {
			t.Errorf("%v: closed loop unstable below the gain margin", l)
		}
		if m.HasPhaseMargin {
			mag, ph, err := l.GainPhase([]float64{m.GainCrossover})
			if err != nil {
				t.Fatal(err)
			}
			pm := math.Remainder(ph[0]+math.Pi, 2*math.Pi)
			if math.Abs(mag[0]-1) > 1e-12 || math.Abs(pm-m.PhaseMargin) > 1e-9 {
				t.Errorf("%v: at the gain crossover |L| = %v, phase margin %v vs %v", l, mag[0], pm, m.PhaseMargin)
			}
		}
	}
}

// TestMarginsNumpy compares with margins found by numpy on a dense grid
// of 2^21 frequencies with linear interpolation (testdata/scipy/
// make_golden.py); interpolation on that grid is accurate to ~1e-11, so
// 1e-9 relative.
func TestMarginsNumpy(t *testing.T) {
	var g struct {
		Margins []struct {
			Num, Den       []float64
			Delay          int
			GainMargin     *float64 `json:"gain_margin"`
			PhaseCrossover *float64 `json:"phase_crossover"`
			PhaseMargin    *float64 `json:"phase_margin"`
			GainCrossover  *float64 `json:"gain_crossover"`
		} `json:"margins"`
	}
	testutil.ReadJSON(t, "testdata/scipy/golden.json", &g)
	if len(g.Margins) == 0 {
		t.Fatal("no margins in the golden file")
	}
	near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Max(1, math.Abs(b)) }
	for _, c := range g.Margins {
		r := tf.MustRational(c.Num, c.Den, c.Delay)
		m, err := r.LoopMargins()
		if err != nil {
			t.Fatal(err)
		}
		if (c.GainMargin != nil) != m.HasGainMargin || m.HasGainMargin && (!near(m.GainMargin, *c.GainMargin) || !near(m.PhaseCrossover, *c.PhaseCrossover)) {
			t.Errorf("%v: gain margin %v at %v, numpy %v at %v", r, m.GainMargin, m.PhaseCrossover, deref(c.GainMargin), deref(c.PhaseCrossover))
		}
		if (c.PhaseMargin != nil) != m.HasPhaseMargin || m.HasPhaseMargin && (!near(m.PhaseMargin, *c.PhaseMargin) || !near(m.GainCrossover, *c.GainCrossover)) {
			t.Errorf("%v: phase margin %v at %v, numpy %v at %v", r, m.PhaseMargin, m.GainCrossover, deref(c.PhaseMargin), deref(c.GainCrossover))
		}
	}
}

func deref(p *float64) float64 {
	if p == nil {
		return math.NaN()
	}
	return *p
}
