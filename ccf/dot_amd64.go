//go:build !purego

package ccf

import "github.com/backshift/backshift/internal/vec"

// dot8FMA is the AVX2/FMA kernel of lagSums (dot_amd64.s).
//
//go:noescape
func dot8FMA(a, b *float64, n int, out *[8]float64)

// hasFMA reports whether the processor and the operating system support
// AVX2 and FMA (internal/vec reads CPUID and XCR0); tests flip it to run
// the Go loops.
var hasFMA = vec.HasAVX2FMA

// dot8 returns sum_i a[i] b[i+q] for q = 0..7; len(b) >= len(a)+7.
func dot8(a, b []float64) [8]float64 {
	var s [8]float64
	m := len(a)
	m8 := m &^ 7
	if m8 > 0 {
		_ = b[m8+6] // the kernel reads b[0 .. m8+6]
		dot8FMA(&a[0], &b[0], m8, &s)
	}
	for i := m8; i < m; i++ {
		av := a[i]
		for q := range s {
			s[q] += av * b[i+q]
		}
	}
	return s
}
