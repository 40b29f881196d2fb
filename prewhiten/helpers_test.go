package prewhiten_test

// Shared fixtures of the prewhiten tests.

import (
	"math/rand/v2"
)

// walk returns an integrated series with drift: x_t = x_{t-1} + 0.3 +
// a_t - 0.4 a_{t-1}, an ARIMA(0,1,1) with a drift of 0.3 per sample.
func walk(n int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 99))
	x := make([]float64, n)
	prev := 0.0
	for i := 1; i < n; i++ {
		a := rng.NormFloat64()
		x[i] = x[i-1] + 0.3 + a - 0.4*prev
		prev = a
	}
	return x
}

// second keeps only the error of a two-result call, for tables of calls.
func second[T any](_ T, err error) error { return err }
