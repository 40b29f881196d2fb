//go:build !purego

package ccf

// dot8FMA is the AVX2/FMA kernel of lagSums (dot_amd64.s).
//
//go:noescape
func dot8FMA(a, b *float64, n int, out *[8]float64)

func cpuid(eaxArg, ecxArg uint32) (eax, ebx, ecx, edx uint32)

func xgetbv() (eax, edx uint32)

// hasFMA reports whether the processor and the operating system support
// AVX2 and FMA (CPUID leaf 1 ECX bits 12 FMA, 27 OSXSAVE, 28 AVX; XCR0
// bits 1-2 for XMM and YMM state; leaf 7 EBX bit 5 AVX2).
var hasFMA = func() bool {
	maxID, _, _, _ := cpuid(0, 0)
	if maxID < 7 {
		return false
	}
	_, _, c1, _ := cpuid(1, 0)
	const fma, osxsave, avx = 1 << 12, 1 << 27, 1 << 28
	if c1&fma == 0 || c1&osxsave == 0 || c1&avx == 0 {
		return false
	}
	if x, _ := xgetbv(); x&6 != 6 {
		return false
	}
	_, b7, _, _ := cpuid(7, 0)
	return b7&(1<<5) != 0
}()

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
