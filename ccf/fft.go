package ccf

import (
	"math/bits"

	"github.com/backshift/backshift/internal/vec"
)

// fftLen returns the block FFT length used for K lags: the power of two
// at least fftFactor(2K+1) and at least 256, so that each block of
// L = M - 2K samples carries most of the transform.
func fftLen(K int) int {
	need := max(fftFactor*(2*K+1), 256)
	return 1 << bits.Len(uint(need-1))
}

// crossFFT writes the unnormalised lag sums n*c_xy(k) into r (r[K+k],
// k = -K..K) and returns the sums of squares of the centred series.
//
// The series are cut into blocks of L = M - 2K samples of x; block j
// contributes sum_{t in block} x_t y_{t+k} for all |k| <= K, the circular
// cross-correlation of the zero-padded x block with the y segment that
// starts K samples before it, which fits in M points without wrapping.
// The products conj(X_j) Y_j are summed over blocks and transformed back
// once. The transforms are the package's radix-2 real FFT (rfft.go),
// checked against gonum dsp/fourier.
//
// mx and my are the means as a level and a correction, {p, d}: a sample
// is centred as (x - p) - d, which is exact to rounding of the small
// difference.
func crossFFT(r, x, y []float64, mx, my [2]float64, K int) (sxx, syy float64) {
	n := len(x)
	M := fftLen(K)
	if M > 2*(n+K) {
		// Short series: one block covering everything.
		M = max(8, 1<<bits.Len(uint(n+2*K-1)))
	}
	L := M - 2*K
	fft := newRFFT(M)
	xb := make([]float64, M)
	ys := make([]float64, M)
	X := make([]complex128, M/2+1)
	Y := make([]complex128, M/2+1)
	acc := make([]complex128, M/2+1)
	for _, v := range x {
		d := (v - mx[0]) - mx[1]
		sxx += d * d
	}
	for _, v := range y {
		d := (v - my[0]) - my[1]
		syy += d * d
	}
	for j := 0; j < n; j += L {
		// x block, centred and zero padded.
		e := min(j+L, n)
		k := 0
		for i := j; i < e; i++ {
			xb[k] = (x[i] - mx[0]) - mx[1]
			k++
		}
		for ; k < M; k++ {
			xb[k] = 0
		}
		// y segment y[j-K .. j-K+M), centred, zero outside 0..n-1.
		for m := 0; m < M; m++ {
			idx := j - K + m
			if idx >= 0 && idx < n {
				ys[m] = (y[idx] - my[0]) - my[1]
			} else {
				ys[m] = 0
			}
		}
		fft.forward(X, xb)
		fft.forward(Y, ys)
		for f, xv := range X {
			yv := Y[f]
			// conj(xv) * yv
			acc[f] += complex(real(xv)*real(yv)+imag(xv)*imag(yv), real(xv)*imag(yv)-imag(xv)*real(yv))
		}
	}
	fft.inverse(xb, acc)
	cc := xb
	inv := 1 / float64(M)
	for d := 0; d <= 2*K; d++ {
		r[d] = cc[d] * inv
	}
	return sxx, syy
}

// chooseMethod returns Direct or FFT for n samples and K lags by the
// measured crossover: direct costs about n(2K+1) multiply-adds, the
// blocked FFT about 2 n/L real transforms of M points, that is a cost per
// sample proportional to log2 M. BenchmarkCrossover (n = 10^5, K =
// 10..640) put the crossover near K = 250 with the AVX2/FMA kernel and
// near K = 25 in pure Go; the factors below place the switch there.
func chooseMethod(n, K int) Method {
	M := fftLen(K)
	lg := bits.Len(uint(M))
	f := crossoverPureGo
	if vec.HasAVX2FMA {
		f = crossoverFMA
	}
	if 2*K+1 <= f*lg {
		return Direct
	}
	return FFT
}

// Crossover factors of chooseMethod: Direct while 2K+1 <= factor*log2(M).
const (
	crossoverFMA    = 40
	crossoverPureGo = 4
)

// fftFactor sets the block length: with the package's FFT, 8 was the
// fastest of 2, 4, 8, 16 over K = 40 and K = 2000 at n = 10^6 (measured
// on the development machine).
const fftFactor = 8
