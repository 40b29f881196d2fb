package prewhiten_test

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/prewhiten"
)

// TestIdentifyNoise: output = 1.5 B^2/(1 - 0.5 B) x + AR(1) noise
// (phi 0.7); the preliminary noise from the weights found by
// prewhitening, then IdentifyNoise, must propose AR(1) first in most of
// 20 replicates (fixed seeds), with phi1 near 0.7 (the AR coefficient
// of the best candidate's fit, the number package tf starts from).
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
		best := bestForm(t, x, y, "y", nil, 20, "x")
		nz := formNoise(t, best, y, x, "x")
		nid, err := prewhiten.IdentifyNoise(context.Background(), nz, nil)
		if err != nil {
			t.Fatal(err)
		}
		if nid.Start != 30 || math.Abs(nid.ACF.R[0]-1) > 1e-12 || len(nid.PACF.R) == 0 {
			t.Errorf("replicate %d: start %d, ACF %v", i, nid.Start, nid.ACF.R[:2])
		}
		if nid.Best.P == 1 && nid.Best.Q == 0 {
			ar1++
			sumPhi += bestNoise(t, nid).AR[0]
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

// bestNoise returns the fitted model of the candidate of order nid.Best.
func bestNoise(t *testing.T, nid *prewhiten.NoiseIdentification) arma.Model {
	t.Helper()
	for _, c := range nid.Candidates {
		if c.Order == nid.Best && c.Result != nil {
			return c.Result.Model
		}
	}
	t.Fatalf("no fitted candidate of the best order %v", nid.Best)
	return arma.Model{}
}

// TestIdentifyNoiseNegativeBound pins the documented meaning of a
// negative MaxP or MaxQ (order zero only, as ccf.IdentifySettings' MaxR
// and MaxS): on an AR(1) series (phi 0.7, our own simulation) MaxP -1
// tries exactly the pure MA orders q = 0..2, MaxQ -3 exactly the pure AR
// orders p = 0..2, and both negative white noise alone, whose term is "a".
func TestIdentifyNoiseNegativeBound(t *testing.T) {
	rng := rand.New(rand.NewPCG(12, 34))
	a := make([]float64, 300)
	for i := range a {
		a[i] = rng.NormFloat64()
	}
	y := make([]float64, 300)
	filter.Run(y, []float64{1}, []float64{1, -0.7}, a)
	cases := []struct {
		name       string
		maxP, maxQ int
		want       map[[2]int]bool // the (p, q) orders tried
	}{
		{"MaxP -1", -1, 0, map[[2]int]bool{{0, 0}: true, {0, 1}: true, {0, 2}: true}},
		{"MaxQ -3", 0, -3, map[[2]int]bool{{0, 0}: true, {1, 0}: true, {2, 0}: true}},
		{"both -1", -1, -1, map[[2]int]bool{{0, 0}: true}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			nid, err := prewhiten.IdentifyNoise(context.Background(), y, &prewhiten.NoiseSettings{MaxP: c.maxP, MaxQ: c.maxQ})
			if err != nil {
				t.Fatalf("MaxP %d, MaxQ %d: %v", c.maxP, c.maxQ, err)
			}
			got := map[[2]int]bool{}
			for _, cand := range nid.Candidates {
				got[[2]int{cand.Order.P, cand.Order.Q}] = true
			}
			if len(got) != len(c.want) || len(nid.Candidates) != len(c.want) {
				t.Errorf("orders tried %v, want %v", got, c.want)
			}
			for o := range c.want {
				if !got[o] {
					t.Errorf("order %v not tried (tried %v)", o, got)
				}
			}
			if c.maxP < 0 && c.maxQ < 0 && nid.Best != (arma.Order{}) {
				t.Errorf("white noise only: best order %v", nid.Best)
			}
		})
	}
}

// TestIdentifyNoiseBadInput: a negative Lags is refused by Validate, and
// one at or beyond n (the samples after the leading NaN run) is an
// *SettingError naming NoiseSettings.Lags with the value and the allowed
// range.
func TestIdentifyNoiseBadInput(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	y := make([]float64, 52)
	y[0], y[1] = math.NaN(), math.NaN()
	for i := 2; i < len(y); i++ {
		y[i] = rng.NormFloat64()
	}
	for _, c := range []struct {
		lags int
		want string
	}{
		{-1, "prewhiten.IdentifyNoise: NoiseSettings.Lags = -1: must be zero or positive (0 means min(24, n/4))"}, // NoiseSettings.Validate
		{50, "prewhiten.IdentifyNoise: NoiseSettings.Lags = 50: must lie in 1..49 for this series (0 means min(24, n/4))"},
	} {
		_, err := prewhiten.IdentifyNoise(context.Background(), y, &prewhiten.NoiseSettings{Lags: c.lags})
		var ae *prewhiten.SettingError
		if !errors.As(err, &ae) || ae.Setting != "NoiseSettings.Lags" || err.Error() != c.want {
			t.Errorf("Lags %d: %v, want a *SettingError %q", c.lags, err, c.want)
		}
	}
}

// TestIdentifyNoiseHighMA: MaxQ 40 fits MA polynomials of degree above
// 32 (beyond the stability test's stack buffer) on arma.Select's worker
// goroutines. Pure MA candidates (MaxP negative: order zero only) up to
// 40 fit without a panic; the AR(1) series picks a model.
func TestIdentifyNoiseHighMA(t *testing.T) {
	y, err := arma.Simulate(arma.Model{AR: []float64{0.5}, Sigma2: 1}, 300, &arma.SimSettings{Seed1: 1})
	if err != nil {
		t.Fatal(err)
	}
	id, err := prewhiten.IdentifyNoise(context.Background(), y, &prewhiten.NoiseSettings{MaxP: -1, MaxQ: 40})
	if err != nil {
		t.Fatal(err)
	}
	if len(id.Candidates) != 41 {
		t.Errorf("%d candidates, want 41", len(id.Candidates))
	}
	for _, c := range id.Candidates {
		if c.Order.Q > 32 && c.Result == nil {
			t.Errorf("%v: %v", c.Order, c.Err)
		}
	}
}
