package tf_test

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/tf"
)

// TestStepFiguresFirstOrder: a first-order lag of time constant tau has
// the 10-90 % rise time tau ln 9 and the 2 % settling time tau ln 50
// (common practice: solve 1 - e^{-t/tau} = level). The discretised lag
// reproduces the continuous response at the samples; linear interpolation
// between samples shifts a crossing by about 1/(8 tau) samples, hence the
// tolerance of 0.01 samples for tau = 20.
func TestStepFiguresFirstOrder(t *testing.T) {
	const tau = 20.0
	r, err := tf.FOPDT{Gain: 3, TimeConstant: tau}.Discretize(1)
	if err != nil {
		t.Fatal(err)
	}
	info, err := r.StepFigures(tf.StepSettings{Interval: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(info.Rise.Samples-tau*math.Log(9)) > 0.01 {
		t.Errorf("rise %v samples, want %v", info.Rise.Samples, tau*math.Log(9))
	}
	if math.Abs(info.Rise.Time-0.5*info.Rise.Samples) > 1e-12 {
		t.Errorf("rise time %v, want samples*0.5", info.Rise.Time)
	}
	if math.Abs(info.Settle.Samples-tau*math.Log(50)) > 0.01 {
		t.Errorf("settling %v samples, want %v", info.Settle.Samples, tau*math.Log(50))
	}
	if info.Overshoot != 0 || info.Undershoot != 0 || math.Abs(info.Final-3) > 1e-12 {
		t.Errorf("overshoot %v undershoot %v final %v", info.Overshoot, info.Undershoot, info.Final)
	}
	if info.RiseFrom != 0.1 || info.RiseTo != 0.9 || info.Band != 0.02 {
		t.Errorf("levels reported %v, %v, %v; want the defaults 0.1, 0.9, 0.02", info.RiseFrom, info.RiseTo, info.Band)
	}
	// A 5 % band settles at tau ln 20.
	info5, _ := r.StepFigures(tf.StepSettings{Band: 0.05})
	if math.Abs(info5.Settle.Samples-tau*math.Log(20)) > 0.01 {
		t.Errorf("5 %% settling %v, want %v", info5.Settle.Samples, tau*math.Log(20))
	}
	// Rise levels 5 % to 95 %: tau (ln 20 - ln(20/19)) = tau ln 19 (the
	// same closed form), reported with the figures.
	wide, _ := r.StepFigures(tf.StepSettings{RiseFrom: 0.05, RiseTo: 0.95})
	if math.Abs(wide.Rise.Samples-tau*math.Log(19)) > 0.01 || wide.RiseFrom != 0.05 || wide.RiseTo != 0.95 {
		t.Errorf("5-95 %% rise %v samples (levels %v, %v), want %v", wide.Rise.Samples, wide.RiseFrom, wide.RiseTo, tau*math.Log(19))
	}
	modes, err := r.Modes(0.5)
	if err != nil || len(modes) != 1 || modes[0].Kind != tf.ModeReal {
		t.Fatalf("modes %+v, %v", modes, err)
	}
	if math.Abs(modes[0].TimeConstant.Samples-tau) > 1e-10 || math.Abs(modes[0].TimeConstant.Time-tau/2) > 1e-10 {
		t.Errorf("time constant %+v, want %v samples", modes[0].TimeConstant, tau)
	}
}

// TestStepSettingsMeasure: figures measured on a step response computed
// elsewhere are those StepFigures reports for the term whose response it
// is (the first-order lag of TestStepFiguresFirstOrder: rise tau ln 9,
// common practice), and a zero or non-finite final value or a bad
// setting is a typed error.
func TestStepSettingsMeasure(t *testing.T) {
	r, err := tf.FOPDT{Gain: 3, TimeConstant: 20}.Discretize(1)
	if err != nil {
		t.Fatal(err)
	}
	o := tf.StepSettings{Interval: 0.5, Horizon: 400}
	want, err := r.StepFigures(o)
	if err != nil {
		t.Fatal(err)
	}
	y := r.Step(400)
	got, err := o.Measure(y, want.Final)
	if err != nil || got != want {
		t.Errorf("Measure: %+v, %v\nwant the term's figures %+v", got, err, want)
	}
	if math.Abs(got.Rise.Samples-20*math.Log(9)) > 0.01 {
		t.Errorf("rise %v samples, want %v", got.Rise.Samples, 20*math.Log(9))
	}
	for _, final := range []float64{0, math.NaN(), math.Inf(1)} {
		var me *tf.ModelError
		if _, err := o.Measure(y, final); !errors.As(err, &me) || me.Op != "tf.StepSettings.Measure" {
			t.Errorf("final %v: %v, want a *ModelError of tf.StepSettings.Measure", final, err)
		}
	}
	var se *tf.SettingError
	if _, err := (tf.StepSettings{Band: 2}).Measure(y, 3); !errors.As(err, &se) || se.Setting != "StepSettings.Band" {
		t.Errorf("band 2: %v, want a *SettingError naming StepSettings.Band", err)
	}
}

// TestStepFiguresUnderdamped: the standard second-order lag overshoots by
// exp(-pi zeta / sqrt(1 - zeta^2)) at the peak time pi/wd (common
// practice). Sampling 300 times per period keeps the sampled peak within
// 1e-3 of the continuous one and its time within a sample.
func TestStepFiguresUnderdamped(t *testing.T) {
	const zeta, wn = 0.3, 0.02 // wn in rad/sample (T = 1)
	r, err := tf.SecondOrder{Gain: -2, NaturalFrequency: wn, Damping: zeta}.Discretize(1)
	if err != nil {
		t.Fatal(err)
	}
	info, err := r.StepFigures(tf.StepSettings{})
	if err != nil {
		t.Fatal(err)
	}
	wantOS := math.Exp(-math.Pi * zeta / math.Sqrt(1-zeta*zeta))
	if math.Abs(info.Overshoot-wantOS) > 1e-3 {
		t.Errorf("overshoot %v, want %v", info.Overshoot, wantOS)
	}
	wd := wn * math.Sqrt(1-zeta*zeta)
	if math.Abs(info.PeakAt.Samples-math.Pi/wd) > 1 {
		t.Errorf("peak time %v, want %v", info.PeakAt.Samples, math.Pi/wd)
	}
	if math.Abs(info.Peak-(-2)*(1+wantOS)) > 2e-3 {
		t.Errorf("peak %v for a negative gain, want %v", info.Peak, -2*(1+wantOS))
	}
	if info.Band != 0.02 || math.IsNaN(info.Settle.Samples) {
		t.Errorf("band %v settling %v", info.Band, info.Settle)
	}
	modes, err := r.Modes(2)
	if err != nil || len(modes) != 1 || modes[0].Kind != tf.ModeComplex {
		t.Fatalf("modes %+v, %v", modes, err)
	}
	// z = e^{sT} exactly, so s = ln z recovers wn and zeta to rounding.
	m := modes[0]
	if math.Abs(m.Damping-zeta) > 1e-9 || math.Abs(m.NaturalFrequency-wn) > 1e-12 || math.Abs(m.NaturalFrequencyTime-wn/2) > 1e-12 {
		t.Errorf("mode %+v, want zeta %v wn %v", m, zeta, wn)
	}
}

// TestStepFiguresInverseResponse: omega = -0.5 + 0.9 B over
// 1 - 1.3 B + 0.42 B^2 starts at -0.5 while its gain is 0.4/0.12, so the
// undershoot is 0.5/(10/3) = 0.15 exactly, by hand.
func TestStepFiguresInverseResponse(t *testing.T) {
	r := tf.MustRational([]float64{-0.5, 0.9}, []float64{1, -1.3, 0.42}, 0)
	info, err := r.StepFigures(tf.StepSettings{})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(info.Undershoot-0.15) > 1e-12 {
		t.Errorf("undershoot %v, want 0.15", info.Undershoot)
	}
	if r.IsMinimumPhase() {
		t.Errorf("zero at z = 1.8 reported minimum phase")
	}
}

// TestModeKinds classifies poles chosen by hand.
func TestModeKinds(t *testing.T) {
	// Denominator (1 - B)(1 + 0.5 B)(1 - 1.5 B) with poles 1, -0.5 and
	// 1.5, multiplied out here.
	den := []float64{1}
	for _, z := range []float64{1, -0.5, 1.5} {
		n := make([]float64, len(den)+1)
		for k, v := range den {
			n[k] += v
			n[k+1] -= z * v
		}
		den = n
	}
	r := tf.MustRational([]float64{1}, den, 0)
	modes, err := r.Modes(0)
	if err != nil {
		t.Fatal(err)
	}
	kinds := map[tf.ModeKind]int{}
	for _, m := range modes {
		kinds[m.Kind]++
	}
	if kinds[tf.ModeIntegrator] != 1 || kinds[tf.ModeAlternating] != 1 || kinds[tf.ModeUnstable] != 1 || len(modes) != 3 {
		t.Errorf("modes %+v", modes)
	}
	// A pure FIR term has no modes.
	fir := tf.MustRational([]float64{0.25, 0.25, 0.25, 0.25}, []float64{1}, 0)
	if m, _ := fir.Modes(1); len(m) != 0 {
		t.Errorf("FIR modes %+v", m)
	}
	// Step metrics of the FIR moving average: reaches 1 at sample 3, no
	// overshoot, settled (within 2 %) from sample 3 on, interpolated
	// entry between samples 2 (0.75) and 3 (1.0): 2 + (0.25-0.02)/0.25.
	info, err := fir.StepFigures(tf.StepSettings{})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(info.Settle.Samples-(2+0.23/0.25)) > 1e-12 || info.Overshoot != 0 || info.PeakAt.Samples != 3 {
		t.Errorf("FIR step info %+v", info)
	}
	// 10 % is already exceeded at sample 0 (0.25, direct feedthrough),
	// which counts as a crossing at 0; 90 % is crossed between samples 2
	// (0.75) and 3 (1.0).
	t10 := 0.0
	t90 := 2 + (0.9-0.75)/0.25
	if math.Abs(info.Rise.Samples-(t90-t10)) > 1e-12 {
		t.Errorf("FIR rise %v, want %v", info.Rise.Samples, t90-t10)
	}
	// A horizon too short to settle reports NaN settling.
	slow := tf.MustRational([]float64{0.01}, []float64{1, -0.99}, 0)
	short, err := slow.StepFigures(tf.StepSettings{Horizon: 50})
	if err != nil || !math.IsNaN(short.Settle.Samples) || !math.IsNaN(short.Rise.Samples) {
		t.Errorf("short horizon: %+v, %v", short, err)
	}
}
