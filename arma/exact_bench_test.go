package arma

import (
	"context"
	"strconv"
	"testing"
)

// BenchmarkFitExactARMA21 times the exact-likelihood fit of the
// benchmarks' ARMA(2,1) (benchModel) with a free mean; the peer script
// testdata/peer/arma_ml_peer.R times R's arima(method = "ML") and
// statsmodels' SARIMAX on series of the same model.
func BenchmarkFitExactARMA21(b *testing.B) {
	for _, n := range []int{10_000, 100_000, 1_000_000} {
		y, err := Simulate(benchModel, n, &SimSettings{Seed1: 1, Seed2: uint64(n)})
		if err != nil {
			b.Fatal(err)
		}
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				res, err := Fit(context.Background(), y, Order{P: 2, Q: 1}, &FitSettings{Method: ExactML})
				if err != nil {
					b.Fatal(err)
				}
				b.ReportMetric(float64(res.Iter), "iter")
				b.ReportMetric(float64(res.Evals), "evals")
			}
		})
	}
}
