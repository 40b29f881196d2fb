package vec

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// TestLagSumsExact runs LagSums (through the AVX2/FMA kernel where the
// processor has it, see HasAVX2FMA) and LagSumsGo on the same data and
// checks both against the lag sums evaluated exactly in 300-bit floating
// point (math/big).
//
// Tolerance: a dot product of m terms in floating point, in any summation
// order, with or without fused multiply-add, is within gamma_m sum|a_i b_i|
// of the exact value, gamma_m = m u / (1 - m u), u = 2^-53 (Higham,
// Accuracy and Stability of Numerical Algorithms, 2nd ed., eq. 3.5). The
// test allows m 2^-52 sum|a_i b_i|, just above that bound, for each path,
// and twice that between them. Lengths cover the kernel's whole groups
// of eight samples and the Go tail after them; lag counts cover one and
// several groups of eight lags and a remainder left to the Go loops.
func TestLagSumsExact(t *testing.T) {
	if !HasAVX2FMA {
		t.Log("no AVX2/FMA kernel in this build or on this processor: both paths run the Go loops")
	}
	rng := rand.New(rand.NewPCG(11, 13))
	for _, m := range []int{1, 7, 8, 9, 15, 16, 17, 63, 100, 2048, 2051} {
		for _, L := range []int{1, 8, 13, 16, 48} {
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
			kern := make([]float64, L)
			gogo := make([]float64, L)
			LagSums(kern, a, b)
			LagSumsGo(gogo, a, b)
			for i := range a {
				if a[i] != a0[i] {
					t.Fatalf("m=%d L=%d: LagSums modified its input a[%d]", m, L, i)
				}
			}
			for i := range b {
				if b[i] != b0[i] {
					t.Fatalf("m=%d L=%d: LagSums modified its input b[%d]", m, L, i)
				}
			}
			for j := 0; j < L; j++ {
				exact, abs := exactDot(a, b[j:j+m])
				tol := float64(m) * 0x1p-52 * abs
				if d := math.Abs(kern[j] - exact); d > tol {
					t.Errorf("m=%d L=%d lag %d: LagSums %.17g, exact %.17g (diff %g > %g)", m, L, j, kern[j], exact, d, tol)
				}
				if d := math.Abs(gogo[j] - exact); d > tol {
					t.Errorf("m=%d L=%d lag %d: LagSumsGo %.17g, exact %.17g (diff %g > %g)", m, L, j, gogo[j], exact, d, tol)
				}
				if d := math.Abs(kern[j] - gogo[j]); d > 2*tol {
					t.Errorf("m=%d L=%d lag %d: LagSums %.17g and LagSumsGo %.17g differ by %g > %g", m, L, j, kern[j], gogo[j], d, 2*tol)
				}
			}
		}
	}
}

// TestLagSumsShortB: a b too short for the lags asked is a programmer
// error and panics before anything is written (common practice for Go
// slices: an index out of range).
func TestLagSumsShortB(t *testing.T) {
	for name, f := range map[string]func(out, a, b []float64){"LagSums": LagSums, "LagSumsGo": LagSumsGo} {
		out := make([]float64, 8)
		if !testutil.Panics(func() { f(out, make([]float64, 4), make([]float64, 10)) }) {
			t.Errorf("%s: no panic for len(b) = 10 < len(a)+len(out)-1 = 11", name)
		}
		for j, v := range out {
			if v != 0 {
				t.Errorf("%s: out[%d] = %v written before the panic", name, j, v)
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
