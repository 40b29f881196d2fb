package tf_test

import (
	"math"
	"testing"

	"github.com/backshift/backshift/tf"
)

// TestGainPhaseLongDeadTime: B^300 has unit magnitude and phase -300 w exactly
// (by hand); on a grid of spacing 0.1 rad/sample a wrapped phase would
// jump, the exact dead-time term does not.
func TestGainPhaseLongDeadTime(t *testing.T) {
	r := tf.MustRational([]float64{1}, []float64{1}, 300)
	w := []float64{0, 0.1, 0.2, 0.3, 1, 2, 3}
	mag, ph, err := r.GainPhase(w)
	if err != nil {
		t.Fatal(err)
	}
	for i := range w {
		if math.Abs(mag[i]-1) > 1e-15 || math.Abs(ph[i]+300*w[i]) > 1e-12 {
			t.Errorf("w=%v: mag %v phase %v, want 1 and %v", w[i], mag[i], ph[i], -300*w[i])
		}
	}
	h := r.Freq([]float64{0.1})
	if math.Abs(real(h[0])-math.Cos(30)) > 1e-12 || math.Abs(imag(h[0])+math.Sin(30)) > 1e-12 {
		t.Errorf("G(e^{-0.1i}) = %v, want e^{-30i}", h[0])
	}
}
