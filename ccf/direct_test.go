package ccf

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/vec"
)

// TestCrossKernelsAgree runs the whole direct path once with the
// AVX2/FMA kernel and once with the pure-Go loops on the same series (a
// large offset, lags beyond one cache block) and requires the two
// correlations to agree to 1e-13: both are within about 1e-15 of the
// definition at this size (see TestLagSumsExact for the bound per
// sum, in internal/vec), so 1e-13 leaves room for the centring
// corrections. The package's lagSums is set to the Go loops for the
// second run; no other test in the package runs in parallel with this one.
func TestCrossKernelsAgree(t *testing.T) {
	if !vec.HasAVX2FMA {
		t.Skip("no AVX2/FMA kernel in this build or on this processor: only the pure-Go path runs")
	}
	rng := rand.New(rand.NewPCG(3, 17))
	n := 20011
	x := make([]float64, n)
	y := make([]float64, n)
	for i := range x {
		x[i] = 1e3 + rng.NormFloat64()
		y[i] = -40 + 0.5*rng.NormFloat64()
		if i >= 5 {
			y[i] += 0.7 * x[i-5]
		}
	}
	for _, K := range []int{0, 7, 40, 130} {
		withFMA, err := Cross(x, y, K, &Settings{Method: Direct})
		if err != nil {
			t.Fatal(err)
		}
		lagSums = vec.LagSumsGo
		withGo, err := Cross(x, y, K, &Settings{Method: Direct})
		lagSums = vec.LagSums
		if err != nil {
			t.Fatal(err)
		}
		for i := range withFMA.R {
			if d := math.Abs(withFMA.R[i] - withGo.R[i]); d > 1e-13 {
				t.Errorf("K=%d lag %d: AVX2/FMA %.17g, Go %.17g (diff %g)", K, i-K, withFMA.R[i], withGo.R[i], d)
			}
		}
	}
}
