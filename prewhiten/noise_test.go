package prewhiten_test

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/prewhiten"
)

// TestIdentifyNoise: output = 1.5 B^2/(1 - 0.5 B) x + AR(1) noise
// (phi 0.7); the preliminary noise from the weights found by
// prewhitening, then IdentifyNoise, must propose AR(1) first in most of
// 20 replicates (fixed seeds), with phi1 near 0.7, and its term must
// parse in a whole spec with the input term.
func TestIdentifyNoise(t *testing.T) {
	const reps, n = 20, 500
	ar1, sumPhi := 0, 0.0
	for i := 0; i < reps; i++ {
		rng := rand.New(rand.NewPCG(uint64(i)+100, 7))
		e := make([]float64, n+100)
		a := make([]float64, n+100)
		for j := range e {
			e[j] = rng.NormFloat64()
			a[j] = 0.5 * rng.NormFloat64()
		}
		x := make([]float64, n+100)
		filter.Run(x, []float64{1}, []float64{1, -0.6}, e)
		y := make([]float64, n+100)
		filter.Run(y, []float64{0, 0, 1.5}, []float64{1, -0.5}, x)
		noise := make([]float64, n+100)
		filter.Run(noise, []float64{1}, []float64{1, -0.7}, a)
		for j := range y {
			y[j] += noise[j]
		}
		x, y = x[100:], y[100:]
		pw, err := prewhiten.Pair(x, y, "y", nil)
		if err != nil {
			t.Fatal(err)
		}
		w, err := ccf.ImpulseWeights(pw.Alpha[pw.Start:], pw.Beta[pw.Start:], 20, "x", nil)
		if err != nil {
			t.Fatal(err)
		}
		id, err := ccf.Identify(w, nil)
		if err != nil {
			t.Fatal(err)
		}
		best := id.Candidates[0]
		v := make([]float64, 31)
		copy(v[best.Delay:], impulse(t, best.Num, best.Den, 31-best.Delay))
		nz, _, err := ccf.NoiseSeries(y, [][]float64{x}, []*ccf.Weights{{Input: "x", V: v, SE: v}})
		if err != nil {
			t.Fatal(err)
		}
		nid, err := prewhiten.IdentifyNoise(context.Background(), nz, nil)
		if err != nil {
			t.Fatal(err)
		}
		if nid.Start != 30 || math.Abs(nid.ACF.R[0]-1) > 1e-12 || len(nid.PACF.R) == 0 {
			t.Errorf("replicate %d: start %d, ACF %v", i, nid.Start, nid.ACF.R[:2])
		}
		if nid.Best.P == 1 && nid.Best.Q == 0 {
			ar1++
			sumPhi += nid.Starts["phi1"]
		}
		if i == 0 {
			spec := "y = " + best.Term + " + " + nid.Term + ccf.StartClause(append(append([]string(nil), best.Names...), nid.Names...), merge(best.Starts, nid.Starts))
			if _, err := parse.Model(spec); err != nil {
				t.Errorf("%q: %v", spec, err)
			}
			t.Logf("replicate 0: %s", spec)
		}
	}
	t.Logf("AR(1) proposed first in %d of %d replicates, mean phi1 %.3f", ar1, reps, sumPhi/float64(max(ar1, 1)))
	if ar1 < 14 {
		t.Errorf("AR(1) first in %d of %d replicates, want at least 14", ar1, reps)
	}
	if ar1 > 0 && math.Abs(sumPhi/float64(ar1)-0.7) > 0.1 {
		t.Errorf("mean phi1 %.3f, want 0.7 within 0.1", sumPhi/float64(ar1))
	}
}

func merge(a, b map[string]float64) map[string]float64 {
	m := map[string]float64{}
	for k, v := range a {
		m[k] = v
	}
	for k, v := range b {
		m[k] = v
	}
	return m
}
