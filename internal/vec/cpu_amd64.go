//go:build !purego

package vec

func cpuid(eaxArg, ecxArg uint32) (eax, ebx, ecx, edx uint32)

func xgetbv() (eax, edx uint32)

// dot4AVX is the AVX kernel of Dot4 (cpu_amd64.s).
//
//go:noescape
func dot4AVX(a, b0, b1, b2, b3 *float64, n int, out *[16]float64)

// HasAVX reports whether the processor and the operating system support
// AVX (CPUID leaf 1 ECX bits 27 OSXSAVE and 28 AVX; XCR0 bits 1-2 for
// XMM and YMM state): Dot4 then runs its AVX kernel. HasAVX2FMA reports
// that they also support AVX2 (leaf 7 EBX bit 5) and FMA (leaf 1 ECX
// bit 12): LagSums then runs its AVX2/FMA kernel.
var HasAVX, HasAVX2FMA = cpuFeatures()

func cpuFeatures() (avx, avx2fma bool) {
	maxID, _, _, _ := cpuid(0, 0)
	if maxID < 1 {
		return false, false
	}
	_, _, c1, _ := cpuid(1, 0)
	const fma, osxsave, avxBit = 1 << 12, 1 << 27, 1 << 28
	if c1&osxsave == 0 || c1&avxBit == 0 {
		return false, false
	}
	if x, _ := xgetbv(); x&6 != 6 {
		return false, false
	}
	if maxID < 7 || c1&fma == 0 {
		return true, false
	}
	_, b7, _, _ := cpuid(7, 0)
	return true, b7&(1<<5) != 0
}

// useAVX selects the AVX kernel of Dot4; tests flip it to run the Go loop.
var useAVX = HasAVX

func dot4Lanes(a, b0, b1, b2, b3 []float64, out *[16]float64) {
	if useAVX {
		dot4AVX(&a[0], &b0[0], &b1[0], &b2[0], &b3[0], len(a), out)
		return
	}
	dot4Go(a, b0, b1, b2, b3, out)
}
