package tf_test

import (
	"math"
	"runtime"
	"testing"

	"github.com/backshift/backshift/tf"
)

// TestHostileResponseLength checks the documented lengths of Impulse and
// Step: nil for every n <= 0, including math.MinInt, and for a length no
// slice can have (math.MaxInt) the runtime panic of make, recoverable,
// rather than a hang or a wrong result.
func TestHostileResponseLength(t *testing.T) {
	r := tf.MustRational([]float64{0.5}, []float64{1, -0.8}, 2)
	for _, n := range []int{0, -1, -1000, math.MinInt} {
		if h := r.Impulse(n); h != nil {
			t.Errorf("Impulse(%d) = %v, want nil", n, h)
		}
		if y := r.Step(n); y != nil {
			t.Errorf("Step(%d) = %v, want nil", n, y)
		}
	}
	for name, f := range map[string]func(int) []float64{"Impulse": r.Impulse, "Step": r.Step} {
		func() {
			defer func() {
				if _, ok := recover().(runtime.Error); !ok {
					t.Errorf("%s(math.MaxInt): want a runtime error panic", name)
				}
			}()
			f(math.MaxInt)
		}()
	}
}
