package fit

import (
	"context"
	"math"
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/tf"
)

// twoInputModel is the model of the speed comparison: two first-order
// inputs and ARMA(1,1) noise with a constant,
//
//	y = c + w1/(1 - d1 B) B^2 x1 + w2/(1 - d2 B) B x2 + (1 + t1 B)/(1 - p1 B) a.
func twoInputModel() tf.Model {
	c := tf.Coef{Name: "c", Free: true}
	one := func(name string) tf.Poly { return mkPoly(mkFactor(mkTerm(false, name, 0, 0))) }
	return tf.Model{Output: "y", Const: &c,
		Inputs: []tf.Input{{Series: "x1", Num: one("w1"), Den: oneMinus("d1", 1), Delay: 2},
			{Series: "x2", Num: one("w2"), Den: oneMinus("d2", 1), Delay: 1}},
		Noise: &arma.Noise{AR: oneMinus("p1", 1), MA: mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(false, "t1", 0, 1)))}}
}

// twoInputData simulates twoInputModel with c = 1, w1 = 0.8, d1 = 0.6,
// w2 = -0.5, d2 = 0.3, t1 = 0.4, p1 = 0.7, sigma = 0.5 and AR(1)
// inputs (0.5 and 0.8), settled at the start (long burn-in).
func twoInputData(n int, seed uint64) map[string][]float64 {
	rng := rand.New(rand.NewPCG(seed, 11))
	x1 := simAR1(rng, n, 0.5)
	x2 := simAR1(rng, n, 0.8)
	u1 := make([]float64, n)
	u2 := make([]float64, n)
	filter.Run(u1[2:], []float64{0.8}, []float64{1, -0.6}, x1[:n-2])
	filter.Run(u2[1:], []float64{-0.5}, []float64{1, -0.3}, x2[:n-1])
	e := simNoise(rng, n, []float64{1, -0.7}, []float64{1, 0.4}, 0.5)
	y := make([]float64, n)
	for i := range y {
		y[i] = 1 + u1[i] + u2[i] + e[i]
	}
	return map[string][]float64{"y": y, "x1": x1, "x2": x2}
}

// BenchmarkModelML fits twoInputModel by conditional least squares and
// by exact maximum likelihood, side by side.
func BenchmarkModelML(b *testing.B) {
	m := twoInputModel()
	for _, n := range []int{1000, 10000, 100000} {
		data := twoInputData(n, 1)
		for _, meth := range []Method{LeastSquares, ExactML} {
			name := "CLS"
			if meth == ExactML {
				name = "ML"
			}
			b.Run(name+"/"+strconv.Itoa(n), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					if _, err := Model(context.Background(), m, data, &Settings{Method: meth}); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}

var _ = math.NaN
