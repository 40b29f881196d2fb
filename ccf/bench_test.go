package ccf

import (
	"math/rand/v2"
	"strconv"
	"testing"
	"time"
)

// reportCPU reports the CPU time per operation since c0 as "cpu-ns/op".
func reportCPU(b *testing.B, c0 time.Duration) {
	if b.N > 0 {
		b.ReportMetric(float64(cpuTime()-c0)/float64(b.N), "cpu-ns/op")
	}
}

// BenchmarkCross times Cross on both paths: K = 40 lags (direct) and
// K = 2000 lags (FFT), n = 10^3..10^6. The peer figures come from
// testdata/peer/ccf_numpy.py on the same sizes.
func BenchmarkCross(b *testing.B) {
	x, y := benchSeries(1_000_000)
	for _, tc := range []struct {
		m Method
		K int
	}{{Direct, 40}, {FFT, 40}, {FFT, 2000}} {
		for _, n := range []int{1_000, 10_000, 100_000, 1_000_000} {
			if n <= tc.K {
				continue
			}
			b.Run(tc.m.String()+"/K="+strconv.Itoa(tc.K)+"/n="+strconv.Itoa(n), func(b *testing.B) {
				b.ReportAllocs()
				s := &Settings{Method: tc.m}
				c0 := cpuTime()
				for b.Loop() {
					if _, err := Cross(x[:n], y[:n], tc.K, s); err != nil {
						b.Fatal(err)
					}
				}
				reportCPU(b, c0)
			})
		}
	}
}

// BenchmarkCrossover times both paths at n = 10^5 over K = 10..640, the
// measurement behind chooseMethod.
func BenchmarkCrossover(b *testing.B) {
	x, y := benchSeries(100_000)
	for _, K := range []int{10, 20, 40, 80, 160, 320, 640} {
		for _, m := range []Method{Direct, FFT} {
			b.Run(m.String()+"/K="+strconv.Itoa(K), func(b *testing.B) {
				b.ReportAllocs()
				s := &Settings{Method: m}
				for b.Loop() {
					if _, err := Cross(x, y, K, s); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}

// BenchmarkDistributedLag times the joint fit of two inputs with 24 lags
// each and AR(1) noise, n = 10^3..10^6.
func BenchmarkDistributedLag(b *testing.B) {
	const N = 1_000_000
	x1, x2 := benchSeries(N)
	y := make([]float64, N)
	e := 0.0
	rng := rand.New(rand.NewPCG(5, 6))
	for t := 3; t < N; t++ {
		e = 0.6*e + rng.NormFloat64()
		y[t] = 0.8*x1[t-2] + 0.5*x2[t-3] + 0.3*y[t-1] + e
	}
	for _, n := range []int{1_000, 10_000, 100_000, 1_000_000} {
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := DistributedLag(y[:n], [][]float64{x1[:n], x2[:n]}, &DistributedLagSettings{Lags: 24}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
