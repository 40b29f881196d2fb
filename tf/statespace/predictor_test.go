package statespace

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/tf"
)

// The innovations form's one-step errors are the fitted model's
// residuals: fit a model with the library's conditional least squares
// (tf.Fit), realise the estimate (Held), run the predictor from its
// default start over the same record and compare its errors e_t with the
// estimate's residuals a_t. The two start differently (the fit's
// residual recursion conditions on a_t = 0 before its First index and on
// inputs settled at their first sample, the predictor starts every path
// at rest), and both forget their start at the rate of the MA root
// (0.4) and the input poles (0.7, 0.6): after 200 samples the start's
// share is below 0.7^200 = 1e-31 of the data's scale, so the remaining
// difference is rounding, and 1e-9 of the largest residual is a wide
// margin for it.
func TestPredictorMatchesFitResiduals(t *testing.T) {
	const n, skip = 1500, 200
	for _, c := range []struct{ name, truth, free string }{
		{"level", "y = 10 + 0.8 / (1 - 0.7 B) B^2 x + (1 - 0.4 B) / (1 - 0.5 B) a",
			"y = c + w0 / (1 - d1 B) B^2 x + (1 - t1 B) / (1 - p1 B) a"},
		{"differenced", "(1 - B) y = (0.5 + 0.3 B) / (1 - 0.6 B) B ((1 - B) x) + (1 - 0.4 B) a",
			"(1 - B) y = (w0 + w1 B) / (1 - d1 B) B ((1 - B) x) + (1 - t1 B) a"},
	} {
		t.Run(c.name, func(t *testing.T) {
			x := series(n, 1, 3)
			y, err := mustModel(t, c.truth).Simulate(map[string][]float64{"x": x}, &tf.SimSettings{Sigma: 0.5, Seed1: 4})
			if err != nil {
				t.Fatal(err)
			}
			held, resid, first := fitModel(t, mustModel(t, c.free), map[string][]float64{"x": x, "y": y})
			r, err := Realise(held)
			if err != nil {
				t.Fatal(err)
			}
			pred, e, err := r.OneStep([][]float64{x}, y, nil)
			if err != nil {
				t.Fatal(err)
			}
			s := maxAbs(resid[first:])
			for i := max(skip, first); i < n; i++ {
				if math.Abs(e[i]-resid[i]) > 1e-9*s {
					t.Fatalf("t = %d: one-step error %.15g, residual %.15g", i, e[i], resid[i])
				}
				if pred[i]+e[i] != y[i] {
					t.Fatalf("t = %d: prediction %g + error %g is not the output %g", i, pred[i], e[i], y[i])
				}
			}
		})
	}
}

// Gain is G, zero outside the noise part, theta_j - Phi_j on it; a
// noise-free model has none. For (1 - 0.4 B)/((1 - 0.5 B)(1 - B)) a,
// Phi = 1 - 1.5 B + 0.5 B^2, so K = (-0.4 + 1.5, 0 - 0.5) = (1.1, -0.5)
// (by hand), after the path's two states.
func TestGain(t *testing.T) {
	r, err := Realise(mustModel(t, "(1 - B) y = 0.5 / (1 - 0.6 B) B^2 ((1 - B) x) + (1 - 0.4 B) / (1 - 0.5 B) a"))
	if err != nil {
		t.Fatal(err)
	}
	k, err := r.Gain()
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{0, 0, 1.1, -0.5}
	if rows, _ := k.Dims(); rows != len(want) {
		t.Fatalf("K has %d rows, want %d", rows, len(want))
	}
	for i, w := range want {
		if math.Abs(k.At(i, 0)-w) > 1e-15 {
			t.Errorf("K[%d] = %g, want %g", i, k.At(i, 0), w)
		}
	}
	r, _ = Realise(mustModel(t, "y = 0.5 B x"))
	if _, err := r.Gain(); !errors.Is(err, ErrModel) {
		t.Errorf("noise-free Gain: %v, want ErrModel", err)
	}
	if _, err := NewPredictor(r, nil); !errors.Is(err, ErrModel) {
		t.Errorf("noise-free NewPredictor: %v, want ErrModel", err)
	}
}

// Step records the first non-finite input or output in Err, and Reset
// clears it; the predictor's errors after Reset are those of a fresh one.
func TestPredictorErr(t *testing.T) {
	r, err := Realise(mustModel(t, "y = 0.5 B x + (1 - 0.3 B) a"))
	if err != nil {
		t.Fatal(err)
	}
	p, err := NewPredictor(r, nil)
	if err != nil {
		t.Fatal(err)
	}
	p.Step([]float64{1}, 2)
	p.Step([]float64{math.NaN()}, 2)
	var se *SampleError
	if !errors.As(p.Err(), &se) || se.Index != 1 || se.Series != "x" {
		t.Errorf("Err() = %v, want a *SampleError for input x at step 1", p.Err())
	}
	p.Reset()
	if p.Err() != nil {
		t.Errorf("after Reset: %v", p.Err())
	}
	_, e1 := p.Step([]float64{1}, 2)
	q, _ := NewPredictor(r, nil)
	if _, e2 := q.Step([]float64{1}, 2); e1 != e2 {
		t.Errorf("after Reset: error %g, fresh predictor %g", e1, e2)
	}
	if allocs := testing.AllocsPerRun(100, func() { p.Step([]float64{1}, 2) }); allocs != 0 {
		t.Errorf("Step allocates %v times", allocs)
	}
}
