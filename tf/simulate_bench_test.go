package tf_test

import (
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// simBenchModel is a typical two-input model with ARMA(2, 1) noise and a
// differenced output.
var simBenchModel = parse.MustModel("(1 - B) temp = 0.01 + (0.8 + 0.3 B) / (1 - 0.7 B) B^4 burner + (0.2 - 0.1 B) B^2 ((1 - B) feed) + ARMA(2, 1) " +
	"where phi1 = 0.5, phi2 = -0.2, theta1 = 0.3")

func BenchmarkSimulate(b *testing.B) {
	for _, n := range []int{1000, 10000, 100000, 1000000} {
		rng := rand.New(rand.NewPCG(1, uint64(n)))
		in := map[string][]float64{"burner": make([]float64, n), "feed": make([]float64, n)}
		for i := range n {
			in["burner"][i], in["feed"][i] = rng.NormFloat64(), rng.NormFloat64()
		}
		s := &tf.SimSettings{Seed1: 1, Seed2: 2, Sigma: 0.1}
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			b.SetBytes(int64(8 * n))
			for b.Loop() {
				if _, err := simBenchModel.Simulate(in, s); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkSystemStep(b *testing.B) {
	sys, err := tf.NewSystem(simBenchModel, &tf.SimSettings{Seed1: 1, Seed2: 2, Sigma: 0.1})
	if err != nil {
		b.Fatal(err)
	}
	u := []float64{1, 2}
	b.ReportAllocs()
	for b.Loop() {
		sys.Step(u)
	}
}
