package control

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/tf"
)

// FuzzTune feeds free-form numbers to Tune and Analyze: a plant of up to
// two numerator and denominator coefficients with a dead time, an
// interval, a closed-loop time, a sensitivity target and the rule. Each
// call must return a typed error of the library's kinds (never a
// recovered panic) or finite settings of a loop stable on the model (an
// unstable one is an error) and a loop whose figures are not
// NaN where the loop is stable.
func FuzzTune(f *testing.F) {
	f.Add(0.4, 0.0, -0.8, 0.0, uint8(3), 1.0, 0.0, 0.0, uint8(0), false)
	f.Add(0.05, 0.03, -1.5, 0.56, uint8(2), 60.0, 5.0, 0.0, uint8(1), true)
	f.Add(0.5, 0.0, -1.0, 0.0, uint8(4), 2.0, 0.0, 1.6, uint8(2), false)
	f.Add(0.2, -0.3, -1.6, 0.95, uint8(1), 1e-300, 1e300, 1.2, uint8(0), true)
	f.Fuzz(func(t *testing.T, n0, n1, d1, d2 float64, delay uint8, iv, tc, ms float64, rule uint8, deriv bool) {
		p, err := tf.NewRational([]float64{n0, n1}, []float64{1, d1, d2}, int(delay%40))
		if err != nil {
			return
		}
		s := TuneSettings{Rule: []Rule{SIMC, IMC, Dahlin}[rule%3], Derivative: deriv, ClosedLoopTime: tc, MaxSensitivity: ms}
		tu, err := Tune(p, tf.Interval{Value: iv, Unit: "min"}, s)
		if err != nil {
			checkKind(t, err)
			return
		}
		if !tu.Stable || math.IsNaN(tu.Ms) || math.IsInf(tu.Ms, 0) {
			t.Fatalf("nil error for a loop unstable on the model: %v", tu)
		}
		for _, v := range append(append(tu.Controller.Num(), tu.Controller.Den()...), tu.PID.Gain, tu.PID.Integral, tu.PID.Derivative, tu.ClosedLoopTime) {
			if !finite(v) {
				t.Fatalf("non-finite setting in %v", tu)
			}
		}
		lp, err := Analyze(tu.Controller, p, LoopSettings{Horizon: 50})
		if err != nil {
			checkKind(t, err)
			return
		}
		if lp.Stable && (math.IsNaN(lp.SensitivityPeak) || math.IsNaN(lp.Setpoint.IAE)) {
			t.Fatalf("stable loop with NaN figures: %+v", lp)
		}
	})
}

// checkKind fails unless err matches one of the library's kinds other
// than ErrInternal.
func checkKind(t *testing.T, err error) {
	t.Helper()
	if errors.Is(err, errs.ErrInternal) {
		t.Fatalf("library fault: %v", err)
	}
	for _, k := range []error{errs.ErrSetting, errs.ErrModel, errs.ErrSample, errs.ErrConvergence} {
		if errors.Is(err, k) {
			return
		}
	}
	t.Fatalf("error of no kind: %v", err)
}
