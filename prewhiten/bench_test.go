package prewhiten_test

import (
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/backshift/backshift/prewhiten"
)

// BenchmarkPair times fitting the prewhitening filter (Yule-Walker with
// the AIC order search up to the default bound 10 log10 n, that is 30 to
// 60) to an AR(2) input and applying it to the input and an output,
// with the Ljung-Box check, for n = 10^3..10^6.
func BenchmarkPair(b *testing.B) {
	rng := rand.New(rand.NewPCG(8, 8))
	const N = 1_000_000
	x := make([]float64, N)
	y := make([]float64, N)
	for i := 2; i < N; i++ {
		x[i] = 0.9*x[i-1] - 0.2*x[i-2] + rng.NormFloat64()
		y[i] = 0.7*y[i-1] + x[i-2] + rng.NormFloat64()
	}
	for _, n := range []int{1_000, 10_000, 100_000, 1_000_000} {
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := prewhiten.Pair(x[:n], y[:n], "y", nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkApply times applying a fitted AR(3) filter, the per-sample
// hot loop of prewhitening.
func BenchmarkApply(b *testing.B) {
	rng := rand.New(rand.NewPCG(8, 9))
	const N = 1_000_000
	x := make([]float64, N)
	for i := 1; i < N; i++ {
		x[i] = 0.6*x[i-1] + rng.NormFloat64()
	}
	f, err := prewhiten.Fit(x[:10000], &prewhiten.Settings{MaxOrder: 3})
	if err != nil {
		b.Fatal(err)
	}
	for _, n := range []int{1_000, 10_000, 100_000, 1_000_000} {
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, _, err := f.Apply(x[:n], "x"); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
