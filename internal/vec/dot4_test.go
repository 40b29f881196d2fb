package vec

import (
	"math/rand/v2"
	"testing"
)

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
