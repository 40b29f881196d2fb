package arma

import (
	"context"
	"strconv"
	"testing"
)

// benchModel is the ARMA(2,1) of the benchmarks and of the peer script
// testdata/peer/arma_peer.R: phi = (0.6, -0.3), theta1 = -0.4 (R's ma1 =
// 0.4), mean 10, unit innovation variance.
var benchModel = Model{AR: []float64{0.6, -0.3}, MA: []float64{-0.4}, Mean: 10, Sigma2: 1}

func BenchmarkFitARMA21(b *testing.B) { benchFitARMA21(b, LeastSquares) }

// benchFitARMA21 times the fit of benchModel's ARMA(2,1) with a free
// mean by method at n = 10^4, 10^5 and 10^6, reporting the iterations
// and the likelihood evaluations (ExactML) per fit.
func benchFitARMA21(b *testing.B, method Method) {
	for _, n := range []int{10_000, 100_000, 1_000_000} {
		y, err := Simulate(benchModel, n, &SimSettings{Seed1: 1, Seed2: uint64(n)})
		if err != nil {
			b.Fatal(err)
		}
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				res, err := Fit(context.Background(), y, Order{P: 2, Q: 1}, &FitSettings{Method: method})
				if err != nil {
					b.Fatal(err)
				}
				b.ReportMetric(float64(res.Iter), "iter")
				if method == ExactML {
					b.ReportMetric(float64(res.Evals), "evals")
				}
			}
		})
	}
}

func BenchmarkACF40(b *testing.B) {
	for _, n := range []int{10_000, 100_000, 1_000_000} {
		y, _ := Simulate(benchModel, n, &SimSettings{Seed1: 2, Seed2: uint64(n)})
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := ACF(y, 40); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkSimulate(b *testing.B) {
	for _, n := range []int{10_000, 100_000, 1_000_000} {
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Simulate(benchModel, n, &SimSettings{Seed1: 3, Seed2: 4}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkForecastMaxHorizon forecasts an ARIMA(1,1,0) fit MaxHorizon
// steps ahead (the exact forecast is O(h) in the horizon: the
// integration of the state is a recursion over the last D u's).
func BenchmarkForecastMaxHorizon(b *testing.B) {
	y, err := Simulate(benchModel, 2000, &SimSettings{Seed1: 3, Seed2: 4})
	if err != nil {
		b.Fatal(err)
	}
	res, err := Fit(context.Background(), y, Order{P: 1, D: 1}, nil)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := res.Forecast(MaxHorizon, 0, nil); err != nil {
			b.Fatal(err)
		}
	}
}
