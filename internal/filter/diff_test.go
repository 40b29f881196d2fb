package filter

import (
	"math/rand/v2"
	"testing"
)

// TestDiff compares Diff with the definition of the differencing
// operator, D(B) x_t = sum_k d_k x_{t-k} for t >= deg D, zeros before
// (common practice: Box, Jenkins & Reinsel, Time Series Analysis, 4th
// ed., section 4.1), written out in the documented order; the results
// must agree bit for bit, for the copy (D = 1), the unrolled first-order
// path and the general loop (a seasonal operator).
func TestDiff(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	x := make([]float64, 40)
	for i := range x {
		x[i] = 10 * rng.NormFloat64()
	}
	keep := append([]float64(nil), x...)
	for _, tc := range []struct {
		name string
		dc   []float64
	}{
		{"none", []float64{1}},
		{"1-B", []float64{1, -1}},
		{"scaled first order", []float64{2, -0.7}},
		{"(1-B)^2", []float64{1, -2, 1}},
		{"1-B^12", append(append([]float64{1}, make([]float64, 11)...), -1)},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for _, n := range []int{0, 1, len(tc.dc) - 1, len(x)} {
				out := make([]float64, n)
				for i := range out {
					out[i] = 99 // Diff must overwrite every value
				}
				got := Diff(out, x[:n], tc.dc)
				d := len(tc.dc) - 1
				for i := range n {
					want := 0.0
					if i >= d {
						for k, c := range tc.dc {
							want += c * x[i-k]
						}
					}
					if got[i] != want {
						t.Fatalf("n=%d: out[%d] = %v, want %v", n, i, got[i], want)
					}
				}
			}
		})
	}
	for i := range x {
		if x[i] != keep[i] {
			t.Fatalf("x[%d] modified", i)
		}
	}
}
