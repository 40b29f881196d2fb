package control

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/tf"
)

// TestCheckWorstCase checks the grid (corners included, gain fastest)
// and that each extreme is the extreme of the cases analysed one by one.
// For proportional control of a lag with dead time the stability limit
// (ultimateGain, derived in loop_test.go) says which corners are
// unstable.
func TestCheckWorstCase(t *testing.T) {
	const K, a = 2.0, 0.9
	p, _ := tf.NewRational([]float64{K * (1 - a)}, []float64{1, -a}, 3)
	kc := 0.95 * ultimateGain(a, 3) / K // stable nominally, not with 30 % more gain
	ctl, _ := tf.Constant(kc)
	w, err := CheckWorstCase(ctl, p, WorstCaseSettings{GainBelow: 0.2, GainAbove: 0.3, DelayBelow: 1, DelayAbove: 1, GainSteps: 3})
	if err != nil {
		t.Fatal(err)
	}
	if len(w.Cases) != 9 {
		t.Fatalf("%d cases, want 3 gains x 3 dead times", len(w.Cases))
	}
	wantG := []float64{0.8, 1.05, 1.3}
	unstable := 0
	for i, c := range w.Cases {
		near(t, "gain factor", c.GainFactor, wantG[i%3], 1e-12)
		if c.DelayChange != i/3-1 {
			t.Errorf("case %d: dead time change %d, want %d", i, c.DelayChange, i/3-1)
		}
		stable := K*c.GainFactor*kc < ultimateGain(a, 3+c.DelayChange)
		if c.Loop.Stable != stable {
			t.Errorf("case %d (gain %v, dead time %+d): stable %v, the closed form says %v", i, c.GainFactor, c.DelayChange, c.Loop.Stable, stable)
		}
		if !stable {
			unstable++
		}
	}
	if w.Unstable != unstable || unstable == 0 {
		t.Errorf("unstable %d, want %d (> 0)", w.Unstable, unstable)
	}
	ms, at := 0.0, -1
	for i, c := range w.Cases {
		if c.Loop.Stable && c.Loop.SensitivityPeak > ms {
			ms, at = c.Loop.SensitivityPeak, i
		}
	}
	if w.SensitivityPeak.Case != at || w.SensitivityPeak.Value != ms {
		t.Errorf("worst Ms %+v, want %v at case %d", w.SensitivityPeak, ms, at)
	}
	// The smallest gain and dead time is the most robust corner: its gain
	// margin is not the worst.
	if w.GainMargin.Case == 0 {
		t.Errorf("worst gain margin at the gentlest corner")
	}
}

// TestCheckWorstCaseBadInput checks the traps of CheckWorstCase.
func TestCheckWorstCaseBadInput(t *testing.T) {
	p, _ := tf.NewRational([]float64{0.2}, []float64{1, -0.9}, 2)
	ctl, _ := tf.Constant(1)
	for _, s := range []WorstCaseSettings{
		{GainBelow: 1}, {GainAbove: math.NaN()}, {DelayBelow: 3}, {DelayAbove: -1}, {GainSteps: 1},
	} {
		if _, err := CheckWorstCase(ctl, p, s); !errors.Is(err, ErrSetting) {
			t.Errorf("%+v: %v", s, err)
		}
	}
}

// TestModelDraw checks the covariance draws: the sample mean and
// covariance of 20000 draws of two parameters agree with the mean and
// cov given, within 4 standard errors (a normal sample's mean has
// standard error sd/sqrt(n); its variance sd^2 sqrt(2/n)).
func TestModelDraw(t *testing.T) {
	m := tf.Model{Output: "y", Inputs: []tf.Input{{
		Series: "u",
		Num:    tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Name: "w0", Value: 0.5, Free: true}}}}}},
		Den: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Value: 1}},
			{Neg: true, Coef: tf.Coef{Name: "d1", Value: 0.8, Free: true}, Power: 1}}}}},
		Delay: 2,
	}}}
	cov := [][]float64{{0.01, 0.002}, {0.002, 0.0009}}
	draw, err := ModelDraw(m, "u", []string{"w0", "d1"}, cov)
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(11, 0))
	const n = 20000
	var s0, s1, s00, s11, s01 float64
	for range n {
		p, err := draw(rng)
		if err != nil {
			t.Fatal(err)
		}
		w0, d1 := p.Num()[0], -p.Den()[1]
		if p.Delay() != 2 {
			t.Fatalf("dead time %d", p.Delay())
		}
		s0, s1 = s0+w0, s1+d1
		s00, s11, s01 = s00+w0*w0, s11+d1*d1, s01+w0*d1
	}
	m0, m1 := s0/n, s1/n
	near(t, "mean w0", m0, 0.5, 4*0.1/math.Sqrt(n))
	near(t, "mean d1", m1, 0.8, 4*0.03/math.Sqrt(n))
	near(t, "var w0", s00/n-m0*m0, 0.01, 4*0.01*math.Sqrt(2.0/n))
	near(t, "var d1", s11/n-m1*m1, 0.0009, 4*0.0009*math.Sqrt(2.0/n))
	near(t, "cov", s01/n-m0*m1, 0.002, 4*math.Sqrt(0.01*0.0009/n))
	if m.Inputs[0].Num.Factors[0].Terms[0].Coef.Value != 0.5 {
		t.Error("the model was modified")
	}
	for _, c := range []struct {
		input string
		names []string
		cov   [][]float64
	}{
		{"x", []string{"w0"}, [][]float64{{1}}},
		{"u", []string{"nope"}, [][]float64{{1}}},
		{"u", []string{"w0", "d1"}, [][]float64{{1}}},
		{"u", []string{"w0", "d1"}, [][]float64{{1, 2}, {2, 1}}},
		{"u", []string{"w0", "d1"}, [][]float64{{1, 0.5}, {0.4, 1}}},
		{"u", []string{"w0"}, [][]float64{{math.Inf(1)}}},
	} {
		if _, err := ModelDraw(m, c.input, c.names, c.cov); !errors.Is(err, ErrSetting) {
			t.Errorf("%v %v %v: %v", c.input, c.names, c.cov, err)
		}
	}
	// A repeated name (its covariance a valid 2 x 2 matrix) was drawn
	// twice, the second value winning; it is refused, naming both.
	_, err = ModelDraw(m, "u", []string{"w0", "w0"}, [][]float64{{0.01, 0.002}, {0.002, 0.01}})
	var se *SettingError
	if !errors.As(err, &se) || se.Setting != "names[1]" || !strings.Contains(err.Error(), "repeats names[0]") {
		t.Errorf("repeated name: %v", err)
	}
}
