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
// x with fewer than 2 samples or a NaN or infinite sample, and a sample
// interval that is not a positive finite number, are errors
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
	}
	frequency, power = periodogram(x, sample)
	return frequency, power, nil
}

func periodogram(x []float64, sample float64) (frequency, power []float64) {
	n := len(x)
	c := fourier.NewFFT(n).Coefficients(nil, x)
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
