package poly_test

import (
	"fmt"

	"github.com/backshift/backshift/internal/poly"
)

// The denominator 1 - 1.2 B + 0.35 B^2 = (1 - 0.5 B)(1 - 0.7 B) has roots
// 2 and 1/0.7 in B; its z-plane poles are 0.5 and 0.7 (by hand:
// 0.5 + 0.7 = 1.2, 0.5 * 0.7 = 0.35; checked with numpy 1.24.2
// numpy.roots, which gives 2 and 1.42857143).
func ExampleRoots() {
	den := []float64{1, -1.2, 0.35}
	r, _ := poly.Roots(den)
	fmt.Printf("roots in B %.4f\n", r)
	z, _ := poly.Roots(poly.Reciprocal(den))
	fmt.Printf("poles in z %.4f\n", z)
	// Output:
	// roots in B [(1.4286+0.0000i) (2.0000+0.0000i)]
	// poles in z [(0.5000+0.0000i) (0.7000+0.0000i)]
}
