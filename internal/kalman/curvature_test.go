package kalman

import (
	"math"
	"testing"
)

// TestCurvatureQuadratic: central differences are exact for a quadratic
// up to rounding (their truncation error holds third and higher
// derivatives only: Abramowitz & Stegun 1964, 25.3.23 and 25.3.27), so
// Curvature of f(x) = 1/2 x'Ax + b'x returns A and Ax + b to about
// eps |f| / h^2 (below 1e-6 here, with steps 2^-13 max(|x_k|, 1)).
func TestCurvatureQuadratic(t *testing.T) {
	A := []float64{4, 1, -0.5, 1, 3, 0.25, -0.5, 0.25, 2}
	b := []float64{1, -2, 0.5}
	f := func(x []float64) float64 {
		s := 0.0
		for i := 0; i < 3; i++ {
			s += b[i] * x[i]
			for j := 0; j < 3; j++ {
				s += 0.5 * x[i] * A[i*3+j] * x[j]
			}
		}
		return s
	}
	x := []float64{0.3, -1.7, 12}
	f0, g, H, ok := Curvature(f, x, Steps(x, CurvatureStep))
	if !ok || f0 != f(x) {
		t.Fatalf("ok %v, f0 %v", ok, f0)
	}
	for i := 0; i < 3; i++ {
		gi := b[i]
		for j := 0; j < 3; j++ {
			gi += A[i*3+j] * x[j]
			if d := math.Abs(H[i*3+j] - A[i*3+j]); d > 1e-6 {
				t.Errorf("H[%d][%d] = %v, want %v", i, j, H[i*3+j], A[i*3+j])
			}
		}
		if math.Abs(g[i]-gi) > 1e-8*math.Max(1, math.Abs(gi)) {
			t.Errorf("g[%d] = %v, want %v", i, g[i], gi)
		}
	}
	if _, _, _, ok := Curvature(func([]float64) float64 { return math.Inf(1) }, x, Steps(x, CurvatureStep)); ok {
		t.Error("ok for a function that is not finite")
	}
}
