//go:build !purego

package vec

// dot8FMA is the AVX2/FMA kernel of LagSums (lags_amd64.s).
//
//go:noescape
func dot8FMA(a, b *float64, n int, out *[8]float64)

// useFMA selects the AVX2/FMA kernel of LagSums; tests flip it to run
// the Go loops.
var useFMA = HasAVX2FMA

// lagSums8 adds the lag sums of the whole groups of eight lags of out
// through the kernel and returns the number of lags done.
func lagSums8(out, a, b []float64) int {
	m := len(a)
	j := 0
	for ; j+8 <= len(out); j += 8 {
		s := dot8(a, b[j:j+m+7])
		for q, v := range s {
			out[j+q] += v
		}
	}
	return j
}

// dot8 returns sum_i a[i] b[i+q] for q = 0..7; len(b) >= len(a)+7: the
// kernel over the whole groups of eight samples, Go for the rest.
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
