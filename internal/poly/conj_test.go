package poly

import (
	"math/cmplx"
	"math/rand/v2"
	"testing"
)

// TestRootsConjugatePairs: the roots of a real polynomial come in exact
// conjugate pairs (z and its conjugate bit for bit), so that polynomials
// rebuilt from them are real and pole lists print symmetrically (a
// property of real polynomials, common practice). The check is exact
// equality by design.
func TestRootsConjugatePairs(t *testing.T) {
	rng := rand.New(rand.NewPCG(12, 34))
	complexSeen := 0
	for trial := 0; trial < 300; trial++ {
		a := make([]float64, 2+rng.IntN(40))
		for i := range a {
			a[i] = rng.NormFloat64()
		}
		r, err := Roots(a)
		if err != nil {
			t.Fatal(err)
		}
		for _, z := range r {
			if imag(z) == 0 {
				continue
			}
			complexSeen++
			n := 0
			for _, w := range r {
				if w == cmplx.Conj(z) {
					n++
				}
			}
			if n == 0 {
				t.Fatalf("trial %d: root %v has no exact conjugate among %v", trial, z, r)
			}
		}
	}
	// Random normal polynomials of degree up to 40 have mostly complex
	// roots; with none the loop above would have checked nothing.
	if complexSeen == 0 {
		t.Fatal("no complex root in 300 trials: nothing was checked")
	}
}
