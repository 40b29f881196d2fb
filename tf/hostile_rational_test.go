package tf_test

import (
	"errors"
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

// TestHostileNormalise checks that a den[0] whose division takes a
// coefficient out of float64 range is reported for den coefficient 0,
// with its value and the coefficient concerned, wrapping ErrNormalise,
// never as a numerator coefficient of +Inf, a value the caller never
// gave.
func TestHostileNormalise(t *testing.T) {
	for _, c := range []struct {
		name     string
		num, den []float64
		msg      string
	}{
		{"tiny den[0] overflows num", []float64{10}, []float64{1e-308},
			"tf.NewRational: den coefficient 0 (B^0) = 1e-308: normalising by den[0] (to make it 1) leaves float64 range: num coefficient 0 = 10 divided by it is +Inf"},
		{"tiny den[0] overflows den", []float64{1e-308}, []float64{1e-308, -2},
			"tf.NewRational: den coefficient 0 (B^0) = 1e-308: normalising by den[0] (to make it 1) leaves float64 range: den coefficient 1 = -2 divided by it is -Inf"},
		{"huge den[0] underflows num", []float64{1, 1e-300}, []float64{1e300},
			"tf.NewRational: den coefficient 0 (B^0) = 1e+300: normalising by den[0] (to make it 1) leaves float64 range: num coefficient 1 = 1e-300 divided by it is 0"},
		{"negative tiny den[0]", []float64{1e300}, []float64{-1e-300},
			"tf.NewRational: den coefficient 0 (B^0) = -1e-300: normalising by den[0] (to make it 1) leaves float64 range: num coefficient 0 = 1e+300 divided by it is -Inf"},
	} {
		t.Run(c.name, func(t *testing.T) {
			r, err := tf.NewRational(c.num, c.den, 0)
			var ce *tf.CoefError
			if !errors.As(err, &ce) || ce.Poly != "den" || ce.Index != 0 || ce.Value != c.den[0] || !errors.Is(err, tf.ErrNormalise) || !errors.Is(err, tf.ErrModel) {
				t.Fatalf("got %v, %v; want *tf.CoefError for den[0] wrapping ErrNormalise", r, err)
			}
			if err.Error() != c.msg {
				t.Errorf("message %q\nwant    %q", err.Error(), c.msg)
			}
		})
	}
	// A small den[0] that the coefficients survive is still fine.
	r, err := tf.NewRational([]float64{1e-300}, []float64{1e-300, -0.5e-300}, 0)
	if err != nil || r.Num()[0] != 1 || r.Den()[1] != -0.5 {
		t.Errorf("small den[0]: %v, %v", r, err)
	}
}
