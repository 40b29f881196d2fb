package testsignal

import (
	"math"
	"math/cmplx"
	"strconv"

	"gonum.org/v1/gonum/dsp/fourier"

	"github.com/backshift/backshift/internal/errs"
)

// SampleError reports a NaN or infinite sample, naming the series and
// index; it unwraps to ErrSample. It is the shared shape of the library.
type SampleError = errs.SampleError

// Periodogram returns the periodogram of x sampled every sample time
// units: for k = 0 .. len(x)/2, frequency[k] = 2 pi k / (len(x) sample)
// in radians per time unit and power[k] = |X_k|^2 / len(x)^2, with
// X_k = sum_t x[t] exp(-2 pi i k t / len(x)) the discrete Fourier
// transform. power[k] is the mean square of the cosine at that frequency
// counted once; the mean square of x is power[0] plus twice every other
// line (once the line at half the sampling frequency, for even lengths).
// The mean is not removed: pass deviations from the operating point.
//
// x with fewer than 2 samples, a NaN or infinite sample or one of
// magnitude beyond MaxMagnitude (whose square would overflow), and a
// sample interval that is not a positive finite number, are errors
// (*SettingError, *SampleError).
func Periodogram(x []float64, sample float64) (frequency, power []float64, err error) {
	const op = "testsignal.Periodogram"
	if len(x) < 2 {
		return nil, nil, &SettingError{Op: op, Setting: "x", Value: "a series of " + strconv.Itoa(len(x)) + " samples", Rule: "needs at least 2 samples"}
	}
	if err := positive(op, "sample", sample, "the sample interval"); err != nil {
		return nil, nil, err
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, nil, &SampleError{Op: op, Series: "x", Index: i, Value: v}
		}
		if math.Abs(v) > MaxMagnitude {
			return nil, nil, &SampleError{Op: op, Series: "x", Index: i, Value: v, Limit: MaxMagnitude}
		}
	}
	frequency, power = periodogram(x, sample)
	return frequency, power, nil
}

func periodogram(x []float64, sample float64) (frequency, power []float64) {
	n := len(x)
	c := halfDFT(x)
	frequency = make([]float64, len(c))
	power = make([]float64, len(c))
	n2 := float64(n) * float64(n)
	for k, v := range c {
		frequency[k] = 2 * math.Pi * float64(k) / (float64(n) * sample)
		a := cmplx.Abs(v)
		power[k] = a * a / n2
	}
	return frequency, power
}

// maxDirectFactor is the largest prime factor of a length whose discrete
// Fourier transform is taken directly (gonum's mixed-radix FFT costs
// O(n p) for a prime factor p); a longer prime factor goes through
// Bluestein's chirp transform, O(n log n) for any n.
const maxDirectFactor = 1000

// halfDFT returns X_k = sum_t x[t] exp(-2 pi i k t / n) for k = 0..n/2.
func halfDFT(x []float64) []complex128 {
	n := len(x)
	if largestPrimeFactor(n) <= maxDirectFactor {
		return fourier.NewFFT(n).Coefficients(nil, x)
	}
	return bluestein(x)[:n/2+1]
}

// largestPrimeFactor returns the largest prime factor of n >= 2.
func largestPrimeFactor(n int) int {
	p := 1
	for f := 2; f*f <= n; f++ {
		for n%f == 0 {
			p, n = f, n/f
		}
	}
	if n > 1 {
		p = n
	}
	return p
}

// bluestein returns the whole discrete Fourier transform of x by
// Bluestein's chirp z-transform: with w_k = exp(-i pi k^2 / n), X_k =
// w_k sum_t (x_t w_t) conj(w_{k-t}), a convolution done with power-of-two
// FFTs. Reference: Bluestein, L. (1970). A linear filtering approach to
// the computation of the discrete Fourier transform. IEEE Transactions on
// Audio and Electroacoustics 18(4), 451-455.
func bluestein(x []float64) []complex128 {
	n := len(x)
	m := 1
	for m < 2*n-1 {
		m *= 2
	}
	w := make([]complex128, n)
	for k := range w {
		// k^2 mod 2n keeps the angle small, so that it stays exact.
		r := (uint64(k) * uint64(k)) % uint64(2*n)
		w[k] = cmplx.Rect(1, -math.Pi*float64(r)/float64(n))
	}
	a := make([]complex128, m)
	b := make([]complex128, m)
	for k := range x {
		a[k] = complex(x[k], 0) * w[k]
	}
	b[0] = cmplx.Conj(w[0])
	for k := 1; k < n; k++ {
		b[k] = cmplx.Conj(w[k])
		b[m-k] = b[k]
	}
	f := fourier.NewCmplxFFT(m)
	fa := f.Coefficients(nil, a)
	fb := f.Coefficients(nil, b)
	for k := range fa {
		fa[k] *= fb[k]
	}
	c := f.Sequence(nil, fa)
	out := make([]complex128, n)
	for k := range out {
		out[k] = w[k] * c[k] / complex(float64(m), 0)
	}
	return out
}
