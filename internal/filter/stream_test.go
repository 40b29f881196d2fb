package filter

import (
	"math/rand/v2"
	"testing"
)

// TestStreamDelay: a Stream with input delay d equals Run on the input
// shifted by d with zeros, bit for bit (by construction: B^d x_t is
// x_{t-d}, zero before the start; the same sums in the same order).
func TestStreamDelay(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := 0; trial < 100; trial++ {
		d := rng.IntN(12)
		b := randPoly(rng, 1+rng.IntN(4), 1)
		a := randStableDen(rng, rng.IntN(4))
		x := randPoly(rng, 100, 1)
		sh := make([]float64, len(x))
		copy(sh[d:], x)
		want := make([]float64, len(x))
		Run(want, b, a, sh)
		s := NewStream(b, a, d)
		c := s.Clone()
		for i, v := range x {
			if got := s.Step(v); got != want[i] {
				t.Fatalf("trial %d d=%d: y[%d] = %v, want %v", trial, d, i, got, want[i])
			}
		}
		// The clone was taken at rest and is independent.
		if got := c.Step(x[0]); got != want[0] {
			t.Fatalf("clone: %v, want %v", got, want[0])
		}
	}
}

// TestStepAllocs: Stream.Step allocates nothing per sample, and Run
// keeps the package doc's allocation bound.
func TestStepAllocs(t *testing.T) {
	s := NewStream([]float64{0.2, 0.1, 0.05}, []float64{1, -1.2, 0.5}, 3)
	if n := testing.AllocsPerRun(100, func() { s.Step(1) }); n != 0 {
		t.Errorf("Stream.Step allocates %v times", n)
	}
	x := make([]float64, 1000)
	y := make([]float64, 1000)
	for _, ord := range [][2]int{{1, 1}, {2, 2}, {4, 4}, {6, 6}, {0, 13}} {
		b := make([]float64, ord[0]+1)
		a := make([]float64, ord[1]+1)
		a[0] = 1
		// The package doc (doc.go) promises at most two small buffers per
		// call and none for orders up to 4. This holds the orders with a
		// numerator of degree <= 4 to none, including (0, 13), stricter
		// than the doc for that denominator; measured: 0 for every order
		// listed.
		if n := testing.AllocsPerRun(10, func() { Run(y, b, a, x) }); n > 2 || ord[0] <= 4 && n != 0 {
			t.Errorf("Run order %v allocates %v times per call", ord, n)
		}
	}
}
