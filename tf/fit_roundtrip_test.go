package tf_test

import (
	"context"
	"errors"
	"math/rand/v2"
	"strings"
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
	// The model with the estimates held prints with "=" for every
	// coefficient, reads back as the same model, holds the same values,
	// and leaves nothing to fit; est.Model is unchanged (still free).
	held := est.Held()
	hs := held.String()
	if strings.Contains(hs, "~") || !strings.Contains(hs, "d1 = ") || !strings.Contains(est.Model.String(), "d1 ~ ") {
		t.Errorf("held spec %q (fitted %q)", hs, est.Model.String())
	}
	hb, err := parse.Model(hs)
	if err != nil || !hb.Equal(held) {
		t.Fatalf("held spec %q reads back as %v, %v", hs, hb, err)
	}
	for _, c := range held.Params() {
		p, ok := est.Param(c.Name)
		if c.Free || !ok || c.Value != p.Value {
			t.Errorf("held %s = %v (free %v), estimate %v", c.Name, c.Value, c.Free, p.Value)
		}
	}
	if _, err := tf.Fit(context.Background(), held, data, nil); !errors.Is(err, tf.ErrModel) || !strings.Contains(err.Error(), "nothing is free to estimate") {
		t.Errorf("refit of the held model: %v", err)
	}
	again, err := tf.Fit(context.Background(), back, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range again.Params {
		q := est.Params[i]
		if p.Name != q.Name || p.Start != q.Value || !(absValue(p.Value-q.Value) <= 1e-6*absValue(q.Value)) {
			t.Errorf("%s: refit %v from start %v, first fit %v", p.Name, p.Value, p.Start, q.Value)
		}
	}
	if again.Iter > 3 {
		t.Errorf("refit from the estimates took %d iterations (%s, %d evals; first fit %d iterations)", again.Iter, again.Reason, again.Evals, est.Iter)
	}
}

func absValue(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
