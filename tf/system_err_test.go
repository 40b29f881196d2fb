package tf_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// TestSystemErr checks that every streaming path that can overflow says
// so: System.Err and Plant.Err keep the first non-finite output with its
// step and cause, Reset clears it, and Model.Simulate refuses an input
// path without a settled start.
func TestSystemErr(t *testing.T) {
	// An unstable input term grows past float64: 2^1024 after 1024 steps.
	sys, err := tf.NewSystem(parse.MustModel("y = 1 / (1 - 2 B) x"), nil)
	if err != nil {
		t.Fatal(err)
	}
	for k := 0; k < 1100; k++ {
		sys.Step([]float64{1})
		if k < 1000 && sys.Err() != nil {
			t.Fatalf("step %d: early error %v", k, sys.Err())
		}
	}
	var se *tf.SimError
	if err := sys.Err(); !errors.As(err, &se) || se.Part != "output y" || se.Step != 1023 || !errors.Is(err, tf.ErrOverflow) || !strings.Contains(err.Error(), "step 1023 gave +Inf") ||
		!strings.Contains(err.Error(), `the term of input "x" is unstable`) {
		t.Errorf("unstable term: Err = %v", err)
	}
	sys.Reset()
	if sys.Err() != nil {
		t.Errorf("after Reset: %v", sys.Err())
	}
	// A NaN input sample is named, at its step.
	sys.Step([]float64{1})
	sys.Step([]float64{math.NaN()})
	if err := sys.Err(); !errors.Is(err, tf.ErrSample) || err.Error() != `tf.System.Step: output y: step 1 gave NaN: input sample of "x" is NaN` {
		t.Errorf("NaN input: Err = %v", err)
	}
	// A stable model with inputs too large for float64.
	big, err := tf.NewSystem(parse.MustModel("y = 10 / (1 - 0.5 B) x"), nil)
	if err != nil {
		t.Fatal(err)
	}
	big.Step([]float64{1e308})
	if err := big.Err(); err == nil || !strings.Contains(err.Error(), "step 0 gave +Inf: float64 overflowed: the inputs are too large") {
		t.Errorf("large input: Err = %v", err)
	}
	// Plant.
	r, err := tf.NewRational([]float64{1}, []float64{1, -3}, 0)
	if err != nil {
		t.Fatal(err)
	}
	p := tf.NewPlant(r)
	for range 700 {
		p.Step(1)
	}
	if err := p.Err(); !errors.As(err, &se) || se.Part != "plant" || !strings.Contains(err.Error(), "gave +Inf: float64 overflowed: the term is unstable") {
		t.Errorf("unstable plant: Err = %v", err)
	}
	p.Reset()
	p.Step(math.Inf(-1))
	if err := p.Err(); err == nil || !strings.Contains(err.Error(), "step 0 gave -Inf: the input sample is -Inf") {
		t.Errorf("plant -Inf input: Err = %v", err)
	}
	if err := p.SetSteady(0); err == nil { // the gain exists: 1/(1-3)
		if p.Err() != nil {
			t.Errorf("after SetSteady: %v", p.Err())
		}
	}
	// An integrating input term has no settled start for a non-zero
	// first sample: Simulate says so and names FromRest; FromRest runs.
	integ := parse.MustModel("level = 0.2 B / (1 - B) inflow")
	in := map[string][]float64{"inflow": {3, 3, 4, 4}}
	var me *tf.ModelError
	if _, err := integ.Simulate(in, nil); !errors.As(err, &me) || me.Part != "input inflow" || !errors.As(err, new(*tf.GainError)) ||
		!strings.Contains(err.Error(), "its first sample is 3") || !strings.Contains(err.Error(), "SimSettings.FromRest") {
		t.Errorf("integrator from 3: %v", err)
	}
	y, err := integ.Simulate(in, &tf.SimSettings{FromRest: true})
	if err != nil || y[3] != 0.2*(3+3+4) {
		t.Errorf("integrator FromRest: %v, %v (want y[3] = 0.2 (3 + 3 + 4), the running sum)", y, err)
	}
}

// TestSimulateSettledDefault checks the new default of Model.Simulate
// against Fit's conditioning: a noise-free record of an input that is
// constant at 50 stays at the steady state c + Gain 50 (the gain
// omega(1)/delta(1) = 2/(1-0.7)), and a differenced input constant at
// 20 leaves the output at zero; with FromRest the first gives the step
// response from zero instead.
func TestSimulateSettledDefault(t *testing.T) {
	flat := []float64{50, 50, 50, 50, 50}
	y, err := parse.MustModel("y = 10 + 2 / (1 - 0.7 B) B valve").Simulate(map[string][]float64{"valve": flat}, nil)
	if err != nil {
		t.Fatal(err)
	}
	want := 10 + 2/(1-0.7)*50
	for i, v := range y {
		if math.Abs(v-want) > 1e-12*want {
			t.Errorf("settled valve: y[%d] = %v, want %v", i, v, want)
		}
	}
	y, err = parse.MustModel("(1 - B) level = 1.5 / (1 - 0.6 B) B ((1 - B) feed)").Simulate(map[string][]float64{"feed": {20, 20, 20, 20}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, v := range y {
		if v != 0 {
			t.Errorf("settled differenced feed: y[%d] = %v, want 0", i, v)
		}
	}
	y, err = parse.MustModel("y = 10 + 2 / (1 - 0.7 B) B valve").Simulate(map[string][]float64{"valve": flat}, &tf.SimSettings{FromRest: true})
	if err != nil {
		t.Fatal(err)
	}
	// From rest: y_t = 10 + 2 * 50 (1 - 0.7^t)/(1 - 0.7) for t >= 1 (the
	// difference equation u_t = 0.7 u_{t-1} + 2 x_{t-1} summed by hand, a
	// geometric series).
	for i, v := range y {
		w := 10.0
		if i >= 1 {
			w += 100 * (1 - math.Pow(0.7, float64(i))) / (1 - 0.7)
		}
		if math.Abs(v-w) > 1e-12*400 { // rounding of a few operations on values up to 343
			t.Errorf("from rest: y[%d] = %v, want %v", i, v, w)
		}
	}
}
