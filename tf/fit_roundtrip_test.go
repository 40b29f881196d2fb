package tf_test

import (
	"context"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// TestFitSpecRoundTrip checks that a fitted model prints as a spec that
// package parse reads back with the estimates as start values, and that
// refitting from there returns to the same estimates (within the
// optimiser's tolerance, 1e-6 relative) in very few iterations.
func TestFitSpecRoundTrip(t *testing.T) {
	truth, err := parse.Model("y = 3 + (1.5 - 0.4 B) / (1 - 0.7 B) B^2 u + (1 - 0.3 B) a")
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(8, 9))
	u := make([]float64, 800)
	for i := range u {
		u[i] = rng.NormFloat64()
	}
	y, err := truth.Simulate(map[string][]float64{"u": u}, &tf.SimSettings{Seed1: 1, Seed2: 2, Sigma: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	data := map[string][]float64{"y": y, "u": u}
	m, err := parse.Model("y = c + (w0 - w1 B) / (1 - d1 B) B^2 u + (1 - t1 B) a")
	if err != nil {
		t.Fatal(err)
	}
	est, err := tf.Fit(context.Background(), m, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	back, err := parse.Model(est.Model.String())
	if err != nil {
		t.Fatalf("fitted spec %q does not parse: %v", est.Model.String(), err)
	}
	if !back.Equal(est.Model) {
		t.Fatalf("spec %q reads back as a different model", est.Model.String())
	}
	again, err := tf.Fit(context.Background(), back, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range again.Params {
		q := est.Params[i]
		if p.Name != q.Name || p.Start != q.Value || !(fitAbs(p.Value-q.Value) <= 1e-6*fitAbs(q.Value)) {
			t.Errorf("%s: refit %v from start %v, first fit %v", p.Name, p.Value, p.Start, q.Value)
		}
	}
	if again.Iter > 3 {
		t.Errorf("refit from the estimates took %d iterations (%s, %d evals; first fit %d iterations)", again.Iter, again.Reason, again.Evals, est.Iter)
	}
}

func fitAbs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
