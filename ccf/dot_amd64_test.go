//go:build !purego

package ccf

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"
)

// TestLagBlockKernels runs the AVX2/FMA kernel (dot_amd64.s) and the
// pure-Go loops on the same data and checks both against the lag sums
// evaluated exactly in 300-bit floating point (math/big).
//
// Tolerance: a dot product of m terms in floating point, in any summation
// order, with or without fused multiply-add, is within gamma_m sum|a_i b_i|
// of the exact value, gamma_m = m u / (1 - m u), u = 2^-53 (Higham,
// Accuracy and Stability of Numerical Algorithms, 2nd ed., eq. 3.5). The
// test allows m 2^-52 sum|a_i b_i|, just above that bound, for each path,
// and twice that between them. Lengths cover the kernel's whole groups
// of eight samples and the Go tail after them; lag counts cover one and
// several groups of eight lags.
func TestLagBlockKernels(t *testing.T) {
	if !hasFMA {
		t.Skip("no AVX2/FMA on this processor: only the pure-Go path runs (as under -tags purego)")
	}
	rng := rand.New(rand.NewPCG(11, 13))
	for _, m := range []int{1, 7, 8, 9, 15, 16, 17, 63, 100, 2048, 2051} {
		for _, L := range []int{8, 16, 48} {
			a := make([]float64, m)
			b := make([]float64, m+L+7)
			for i := range a {
				a[i] = 3 + rng.NormFloat64()
			}
			for i := range b {
				b[i] = -1 + 2*rng.NormFloat64()
			}
			a0 := append([]float64(nil), a...)
			b0 := append([]float64(nil), b...)
			fma := make([]float64, L)
			gogo := make([]float64, L)
			lagBlockFMA(fma, a, b)
			lagBlockGo(gogo, a, b)
			for i := range a {
				if a[i] != a0[i] {
					t.Fatalf("m=%d L=%d: kernel modified its input a[%d]", m, L, i)
				}
			}
			for i := range b {
				if b[i] != b0[i] {
					t.Fatalf("m=%d L=%d: kernel modified its input b[%d]", m, L, i)
				}
			}
			for j := 0; j < L; j++ {
				exact, abs := exactDot(a, b[j:j+m])
				tol := float64(m) * 0x1p-52 * abs
				if d := math.Abs(fma[j] - exact); d > tol {
					t.Errorf("m=%d L=%d lag %d: AVX2/FMA %.17g, exact %.17g (diff %g > %g)", m, L, j, fma[j], exact, d, tol)
				}
				if d := math.Abs(gogo[j] - exact); d > tol {
					t.Errorf("m=%d L=%d lag %d: Go %.17g, exact %.17g (diff %g > %g)", m, L, j, gogo[j], exact, d, tol)
				}
				if d := math.Abs(fma[j] - gogo[j]); d > 2*tol {
					t.Errorf("m=%d L=%d lag %d: AVX2/FMA %.17g and Go %.17g differ by %g > %g", m, L, j, fma[j], gogo[j], d, 2*tol)
				}
			}
		}
	}
}

// TestCrossKernelsAgree runs the whole direct path once with the
// AVX2/FMA kernel and once with the pure-Go loops on the same series (a
// large offset, lags beyond one cache block) and requires the two
// correlations to agree to 1e-13: both are within about 1e-15 of the
// definition at this size (see TestLagBlockKernels for the bound per
// sum), so 1e-13 leaves room for the centring corrections. The
// package's hasFMA switch is flipped for the second run; no other test
// in the package runs in parallel with this one.
func TestCrossKernelsAgree(t *testing.T) {
	if !hasFMA {
		t.Skip("no AVX2/FMA on this processor: only the pure-Go path runs (as under -tags purego)")
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
		hasFMA = false
		withGo, err := Cross(x, y, K, &Settings{Method: Direct})
		hasFMA = true
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

// exactDot returns sum a[i] b[i] rounded once from 300-bit arithmetic and
// sum |a[i] b[i]|.
func exactDot(a, b []float64) (float64, float64) {
	s := new(big.Float).SetPrec(300)
	p := new(big.Float).SetPrec(300)
	q := new(big.Float).SetPrec(300)
	abs := 0.0
	for i := range a {
		p.SetFloat64(a[i])
		q.SetFloat64(b[i])
		p.Mul(p, q)
		s.Add(s, p)
		abs += math.Abs(a[i] * b[i])
	}
	v, _ := s.Float64()
	return v, abs
}
