package testsignal

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Bluestein's transform agrees with gonum's mixed-radix FFT (an
// independent algorithm) on lengths with a large prime factor, to 1e-9
// of the largest coefficient (rounding of O(log m) FFT stages on both
// sides; measured about 1e-13).
func TestBluesteinAgainstFFT(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 5))
	for _, n := range []int{1009, 2 * 1013, 3 * 4099} {
		x := make([]float64, n)
		for i := range x {
			x[i] = rng.NormFloat64()
		}
		want := fourier.NewFFT(n).Coefficients(nil, x)
		got := bluestein(x)
		top := 0.0
		for _, v := range want {
			top = math.Max(top, cmplx.Abs(v))
		}
		for k := range want {
			if d := cmplx.Abs(got[k] - want[k]); d > 1e-9*top {
				t.Fatalf("n = %d, k = %d: %v against %v", n, k, got[k], want[k])
			}
		}
	}
	if largestPrimeFactor(2*3*1009) != 1009 || largestPrimeFactor(8191) != 8191 || largestPrimeFactor(1024) != 2 {
		t.Error("largestPrimeFactor")
	}
}
