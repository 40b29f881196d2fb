package tf_test

import (
	"math"
	"testing"

	"github.com/backshift/backshift/tf"
)

// TestBIBOFirstOrder: for 0.5/(1 - a B) with 0 < a < 1 the weights are
// 0.5 a^k, so sum |h_k| = 0.5/(1-a); for a < 0 the same with |a| (by hand).
func TestBIBOFirstOrder(t *testing.T) {
	for _, a := range []float64{0.5, 0.99, -0.9, 0.999} {
		r := tf.MustRational([]float64{0.5}, []float64{1, -a}, 2)
		b, err := r.BIBOBound()
		if err != nil {
			t.Fatal(err)
		}
		want := 0.5 / (1 - math.Abs(a))
		if !(b.Sum <= want*(1+1e-12) && b.Sum+b.Tail >= want*(1-1e-12)) || b.Tail > 1e-5*want {
			t.Errorf("a=%v: bound %+v, want sum %v", a, b, want)
		}
	}
}
