package vec

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"
)

// Dot against the exact inner product in 300-bit floats (math/big):
// the error of a recursive sum of n products is bounded by about
// n eps sum|a_i b_i| (Higham, Accuracy and Stability of Numerical
// Algorithms, 2nd ed., section 3.1), which the test uses as tolerance.
func TestDotExact(t *testing.T) {
	rnd := rand.New(rand.NewPCG(5, 6))
	for _, n := range []int{0, 1, 3, 4, 7, 100, 1001} {
		a, b, c := make([]float64, n), make([]float64, n+2), make([]float64, n)
		exact := new(big.Float).SetPrec(300)
		abs := 0.0
		for i := range a {
			a[i], b[i], c[i] = rnd.NormFloat64(), rnd.NormFloat64()*1e3, rnd.NormFloat64()
			p := new(big.Float).SetPrec(300).SetFloat64(a[i])
			p.Mul(p, new(big.Float).SetPrec(300).SetFloat64(b[i]))
			exact.Add(exact, p)
			abs += math.Abs(a[i] * b[i])
		}
		want, _ := exact.Float64()
		got := Dot(a, b)
		if tol := float64(n+1) * 0x1p-52 * abs; math.Abs(got-want) > tol {
			t.Fatalf("n=%d: Dot = %v, exact %v (tolerance %v)", n, got, want, tol)
		}
		g1, g2 := Dot2(a, b, c)
		if g1 != got || g2 != Dot(a, c) {
			t.Fatalf("n=%d: Dot2 = (%v, %v), Dot gives (%v, %v)", n, g1, g2, got, Dot(a, c))
		}
	}
}
