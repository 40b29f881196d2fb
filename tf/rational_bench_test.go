package tf_test

import (
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/backshift/backshift/tf"
)

// benchTerms are the benchmarked (s, r) orders, stable, of our own; the
// same coefficients are used by testdata/peer/lfilter_peer.py.
var benchTerms = []struct {
	name string
	r    tf.Rational
}{
	{"1,1", tf.MustRational([]float64{0.4, 0.2}, []float64{1, -0.7}, 0)},
	{"2,2", tf.MustRational([]float64{0.2, 0.1, 0.05}, []float64{1, -1.2, 0.5}, 0)},
	{"4,4", tf.MustRational([]float64{0.1, 0.05, -0.02, 0.01, 0.003}, []float64{1, -1.9, 1.35, -0.42, 0.048}, 0)},
}

// BenchmarkFilter times Rational.Filter, which checks the input for
// NaN/Inf and allocates the output (as scipy.signal.lfilter does), over
// 10^3..10^7 samples; ns/sample is reported.
func BenchmarkFilter(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	x := make([]float64, 10_000_000)
	for i := range x {
		x[i] = rng.NormFloat64()
	}
	for _, o := range benchTerms {
		for n := 1000; n <= len(x); n *= 10 {
			b.Run(o.name+"/"+strconv.Itoa(n), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					if _, err := o.r.Filter(x[:n]); err != nil {
						b.Fatal(err)
					}
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/sample")
			})
		}
	}
}
