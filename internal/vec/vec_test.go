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

// Dot4 must give Dot's four products bit for bit, through the AVX kernel
// (where the processor has it) and through the Go loop, for lengths that
// are and are not multiples of four; Dot itself is checked against exact
// sums in TestDotExact.
func TestDot4MatchesDot(t *testing.T) {
	rnd := rand.New(rand.NewPCG(11, 12))
	modes := []bool{false}
	if HasAVX {
		modes = append(modes, true)
	}
	defer func(v bool) { useAVX = v }(useAVX)
	for _, avx := range modes {
		useAVX = avx
		for _, n := range []int{0, 1, 3, 4, 5, 8, 255, 256, 1001} {
			a := make([]float64, n)
			var b [4][]float64
			for p := range b {
				b[p] = make([]float64, n+3)
			}
			for i := range a {
				a[i] = rnd.NormFloat64() * 1e3
				for p := range b {
					b[p][i] = rnd.NormFloat64() / float64(1+i%7)
				}
			}
			got := Dot4(a, b[0], b[1], b[2], b[3])
			for p := range b {
				if want := Dot(a, b[p]); got[p] != want {
					t.Fatalf("AVX %v, n=%d: product %d = %v, Dot gives %v", avx, n, p, got[p], want)
				}
			}
		}
	}
}

func BenchmarkDot4(b *testing.B) {
	a, c := make([]float64, 256), make([]float64, 256)
	for i := range a {
		a[i], c[i] = float64(i), float64(3*i)
	}
	b.Run("Dot4", func(b *testing.B) {
		for b.Loop() {
			Dot4(a, c, c, c, c)
		}
	})
	b.Run("Dot2x2", func(b *testing.B) {
		for b.Loop() {
			Dot2(a, c, c)
			Dot2(a, c, c)
		}
	})
}
