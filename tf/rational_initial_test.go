package tf_test

import (
	"testing"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
)

// TestFilterFromScipy checks filtering from given initial conditions and
// from the steady state of a constant input against
// testdata/scipy/initial.json (scipy.signal.lfiltic + lfilter, and
// lfilter_zi + lfilter, scipy 1.10.1), for FilterFrom/SteadyPast and for
// the streaming Plant (SetHistory/SetSteady). Tolerance respTol (1e-12
// relative to the largest value so far): the same recursion as scipy's
// transposed direct form II, evaluated in another order, over 40 samples
// of stable terms.
func TestFilterFromScipy(t *testing.T) {
	var ref struct {
		Source string `json:"source"`
		Cases  []struct {
			Name        string    `json:"name"`
			Num         []float64 `json:"num"`
			Den         []float64 `json:"den"`
			Delay       int       `json:"delay"`
			PastInput   []float64 `json:"past_input"`
			PastOutput  []float64 `json:"past_output"`
			Input       []float64 `json:"input"`
			Output      []float64 `json:"output"`
			U           float64   `json:"u"`
			SteadyConst []float64 `json:"steady_const_output"`
			SteadyInput []float64 `json:"steady_input"`
			SteadyOut   []float64 `json:"steady_output"`
		} `json:"cases"`
	}
	testutil.ReadJSON(t, "testdata/scipy/initial.json", &ref)
	if len(ref.Cases) < 5 {
		t.Fatalf("%d cases in initial.json, want 5", len(ref.Cases))
	}
	stream := func(p *tf.Plant, x []float64) []float64 {
		y := make([]float64, len(x))
		for i, v := range x {
			y[i] = p.Step(v)
		}
		return y
	}
	for _, c := range ref.Cases {
		r, err := tf.NewRational(c.Num, c.Den, c.Delay)
		if err != nil {
			t.Fatal(err)
		}
		past := tf.Past{Input: c.PastInput, Output: c.PastOutput}
		y, err := r.FilterFrom(c.Input, past)
		if err != nil {
			t.Fatal(err)
		}
		if e := testutil.RunningRelErr(y, c.Output); !(e <= respTol) {
			t.Errorf("%s: FilterFrom relative error %.3g vs scipy.signal.lfiltic+lfilter", c.Name, e)
		}
		p := tf.NewPlant(r)
		if err := p.SetHistory(c.PastInput, c.PastOutput); err != nil {
			t.Fatal(err)
		}
		if e := testutil.RunningRelErr(stream(p, c.Input), c.Output); !(e <= respTol) {
			t.Errorf("%s: Plant.SetHistory relative error %.3g vs scipy.signal.lfiltic+lfilter", c.Name, e)
		}
		sp, err := r.SteadyPast(c.U)
		if err != nil {
			t.Fatal(err)
		}
		constant := make([]float64, len(c.SteadyConst))
		for i := range constant {
			constant[i] = c.U
		}
		for _, run := range []struct {
			what    string
			x, want []float64
		}{{"constant input", constant, c.SteadyConst}, {"noisy input", c.SteadyInput, c.SteadyOut}} {
			ys, err := r.FilterFrom(run.x, sp)
			if err != nil {
				t.Fatal(err)
			}
			if e := testutil.RunningRelErr(ys, run.want); !(e <= respTol) {
				t.Errorf("%s, %s: SteadyPast+FilterFrom relative error %.3g vs scipy.signal.lfilter_zi+lfilter", c.Name, run.what, e)
			}
			p := tf.NewPlant(r)
			if err := p.SetSteady(c.U); err != nil {
				t.Fatal(err)
			}
			if e := testutil.RunningRelErr(stream(p, run.x), run.want); !(e <= respTol) {
				t.Errorf("%s, %s: Plant.SetSteady relative error %.3g vs scipy.signal.lfilter_zi+lfilter", c.Name, run.what, e)
			}
		}
	}
}
