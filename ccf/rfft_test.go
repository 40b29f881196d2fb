package ccf

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"
)

// TestRFFT compares the package's real FFT with gonum dsp/fourier's
// (FFTPACK) on random data, forward and inverse, to 1e-12 relative to the
// largest coefficient.
func TestRFFT(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 7))
	for _, m := range []int{4, 8, 16, 64, 1024, 4096} {
		x := make([]float64, m)
		for i := range x {
			x[i] = rng.NormFloat64()
		}
		g := fourier.NewFFT(m)
		want := g.Coefficients(nil, x)
		r := newRFFT(m)
		got := make([]complex128, m/2+1)
		r.forward(got, x)
		scale := 0.0
		for _, v := range want {
			scale = math.Max(scale, math.Hypot(real(v), imag(v)))
		}
		for f := range want {
			d := got[f] - want[f]
			if math.Hypot(real(d), imag(d)) > 1e-12*scale {
				t.Fatalf("M=%d f=%d: got %v want %v", m, f, got[f], want[f])
			}
		}
		back := make([]float64, m)
		r.inverse(back, want)
		wantBack := g.Sequence(nil, want)
		for i := range back {
			if math.Abs(back[i]-wantBack[i]) > 1e-12*float64(m)*scale {
				t.Fatalf("M=%d inverse t=%d: got %v want %v", m, i, back[i], wantBack[i])
			}
		}
	}
}
