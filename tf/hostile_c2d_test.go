package tf_test

import (
	"math"
	"testing"

	"github.com/backshift/backshift/tf"
)

// TestHostileStepAtInvalid checks that the three continuous models
// agree: StepAt is NaN for parameters Discretize rejects whatever the
// interval (non-finite gain, time constants that are not positive and
// finite, negative or non-finite damping or dead time) and for t = NaN,
// and a number for valid ones, FOPDT.StepAt as the second-order models
// (NaN, not 0 or -Gain, for TimeConstant 0).
func TestHostileStepAtInvalid(t *testing.T) {
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
