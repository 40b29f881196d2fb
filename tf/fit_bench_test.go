package tf

import (
	"context"
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
)

// benchModel is the benchmark model: b = 3, s = 2, r = 1, AR(2) noise
// and a constant,
//
//	y_t = c + (w0 + w1 B + w2 B^2)/(1 - d1 B) B^3 x_t + 1/(1 - p1 B - p2 B^2) a_t.
func benchModel() Model {
	c := Coef{Name: "c", Free: true}
	num := mkPoly(mkFactor(mkTerm(false, "w0", 0, 0), mkTerm(false, "w1", 0, 1), mkTerm(false, "w2", 0, 2)))
	ar := mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, "p1", 0, 1), mkTerm(true, "p2", 0, 2)))
	return Model{Output: "y", Const: &c,
		Inputs: []Input{{Series: "x", Num: num, Den: oneMinus("d1", 1), Delay: 3}},
		Noise:  &arma.Noise{AR: ar}}
}

// benchData simulates benchModel with c = 1, omega = (1.2, 0.6,
// -0.3), d1 = 0.7, phi = (0.9, -0.2), sigma = 0.5 and an AR(1) input.
func benchData(n int, seed uint64) map[string][]float64 {
	rng := rand.New(rand.NewPCG(seed, 7))
	x := simAR1(rng, n, 0.6)
	u := make([]float64, n)
	filter.Run(u[3:], []float64{1.2, 0.6, -0.3}, []float64{1, -0.7}, x[:n-3])
	e := simNoise(rng, n, []float64{1, -0.9, 0.2}, []float64{1}, 0.5)
	y := make([]float64, n)
	for i := range y {
		y[i] = 1 + u[i] + e[i]
	}
	return map[string][]float64{"y": y, "x": x}
}

func BenchmarkFit(b *testing.B) {
	m := benchModel()
	for _, n := range []int{1000, 10000, 100000, 1000000} {
		data := benchData(n, 1)
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Fit(context.Background(), m, data, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkIdentify(b *testing.B) {
	for _, n := range []int{10000} {
		data := benchData(n, 2)
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Identify(context.Background(), "y", []string{"x"}, data, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
