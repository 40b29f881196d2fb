package ccf

import (
	"fmt"
	"math"
	"strconv"
)

// Method selects how Cross computes the lag products.
type Method int

const (
	// Auto picks Direct or FFT by the measured crossover (see Cross).
	Auto Method = iota
	// Direct sums the lag products term by term: n(2K+1) multiply-adds.
	Direct
	// FFT accumulates the cross-spectrum of overlapping blocks with a real
	// FFT (the package's radix-2 transform, checked against gonum
	// dsp/fourier and more than twice as fast here) and
	// transforms back once.
	FFT
)

// String returns "auto", "direct" or "fft".
func (m Method) String() string {
	switch m {
	case Auto:
		return "auto"
	case Direct:
		return "direct"
	case FFT:
		return "fft"
	}
	return "Method(" + strconv.Itoa(int(m)) + ")"
}

// Settings tunes Cross. The zero value gives the defaults.
type Settings struct {
	// Method chooses the computation; the zero value Auto picks the
	// faster one for the lengths at hand.
	Method Method
	// Names are the names of x and y used in error messages. Empty names
	// default to "x" and "y".
	Names [2]string
}

func (s *Settings) names() [2]string {
	n := [2]string{"x", "y"}
	if s != nil {
		if s.Names[0] != "" {
			n[0] = s.Names[0]
		}
		if s.Names[1] != "" {
			n[1] = s.Names[1]
		}
	}
	return n
}

// Correlation is a sample cross-correlation function r_xy(k), k = -MaxLag..
// MaxLag, with divisor N at every lag and means removed (see the package
// documentation for the definition and the lag convention: positive k
// means x leads y).
type Correlation struct {
	// N is the common length of the two series.
	N int
	// MaxLag is K: R holds lags -K..K.
	MaxLag int
	// R[MaxLag+k] is r_xy(k).
	R []float64
	// MeanX, MeanY are the sample means; SDX, SDY the standard deviations
	// with divisor N.
	MeanX, MeanY float64
	SDX, SDY     float64
	// Method is the computation that was used (Direct or FFT).
	Method Method
}

// At returns r_xy(k). It panics if |k| > MaxLag (a programmer error).
func (c *Correlation) At(k int) float64 {
	if k < -c.MaxLag || k > c.MaxLag {
		panic("ccf: lag " + strconv.Itoa(k) + " outside -MaxLag..MaxLag")
	}
	return c.R[c.MaxLag+k]
}

// SE returns 1/sqrt(N), the approximate standard error of r_xy(k) when
// one of the two series is white and independent of the other.
func (c *Correlation) SE() float64 { return 1 / math.Sqrt(float64(c.N)) }

// Band returns the half-width z_{(1+level)/2}/sqrt(N) of the two-sided
// significance band at the given level (for example 0.95), valid when one
// series is white. It panics if level is not in (0, 1) (a programmer
// error; settings read from data are checked by the functions that take
// them).
func (c *Correlation) Band(level float64) float64 {
	if !(level > 0 && level < 1) {
		panic("ccf: band level must be in (0, 1)")
	}
	return normalQuantile((1+level)/2) / math.Sqrt(float64(c.N))
}

// Significant returns the lags k in -MaxLag..MaxLag, in increasing order,
// with |r_xy(k)| above Band(level). It panics like Band for a bad level.
func (c *Correlation) Significant(level float64) []int {
	b := c.Band(level)
	var out []int
	for i, r := range c.R {
		if math.Abs(r) > b {
			out = append(out, i-c.MaxLag)
		}
	}
	return out
}

// normalQuantile returns the standard normal quantile at p in (0, 1).
func normalQuantile(p float64) float64 {
	return math.Sqrt2 * math.Erfinv(2*p-1)
}

// Cross returns the sample cross-correlation r_xy(k) for k = -maxLag..
// maxLag. x and y must have the same length n > maxLag, hold only finite
// values and not be constant; otherwise Cross returns a *SeriesError
// (ErrLength, ErrShort, ErrConstant) or a *SampleError (with the index of
// the bad value) naming the series, and a nil *Correlation. A sample at or
// beyond sqrt(MaxFloat64/n) (4.2e153 for n = 10, 1.3e151 for n = 10^6),
// where a sum of n squares can overflow, is a *SampleError with its index
// and that Limit; a series whose deviations from its mean are below about
// 1e-140 (their squares underflow) a *SeriesError of kind ErrOverflow
// naming it. A negative maxLag or bad settings (Settings.Validate) give a
// *SettingError. x and y are not modified.
//
// With Method Auto, Cross sums directly for few lags and uses the blocked
// FFT for many, at the crossover measured on the development machine
// (BenchmarkCrossover: about 250 lags with the AVX2/FMA kernel, 25 in pure
// Go). Both agree with the definition to 1e-12 in r (tested).
func Cross(x, y []float64, maxLag int, s *Settings) (*Correlation, error) {
	r0, err := cross(x, y, maxLag, s)
	return r0, withOp("ccf.Cross", err)
}

func cross(x, y []float64, maxLag int, s *Settings) (*Correlation, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	names := s.names()
	if err := validatePair(x, y, maxLag, names); err != nil {
		return nil, err
	}
	n := len(x)
	method := Auto
	if s != nil {
		method = s.Method
	}
	switch method {
	case Auto:
		method = chooseMethod(n, maxLag)
	case Direct, FFT:
	default:
		return nil, &SettingError{Setting: "Settings.Method", Value: method.String(), Rule: "must be Auto, Direct or FFT (the zero value is Auto)"}
	}
	c := &Correlation{N: n, MaxLag: maxLag, R: make([]float64, 2*maxLag+1), Method: method}
	sxx, syy := c.accumulate(x, y)
	if !finite(sxx + syy + c.MeanX + c.MeanY) {
		return nil, overflowError(x, y, names)
	}
	fn := float64(n)
	c.SDX, c.SDY = math.Sqrt(sxx/fn), math.Sqrt(syy/fn)
	if sxx < minSumSquares || syy < minSumSquares {
		return nil, c.underflowError(x, y, sxx, names)
	}
	// Square roots taken separately: the product sxx*syy can overflow
	// or underflow where each factor does not.
	inv := 1 / (math.Sqrt(sxx) * math.Sqrt(syy))
	for i := range c.R {
		c.R[i] *= inv
	}
	return c, nil
}

// accumulate writes the unnormalised lag sums into c.R and the means into
// c.MeanX, c.MeanY by c.Method, and returns the centred sums of squares
// of x and y.
func (c *Correlation) accumulate(x, y []float64) (sxx, syy float64) {
	if c.Method == Direct {
		sxx, syy, c.MeanX, c.MeanY = crossDirect(c.R, x, y, c.MaxLag)
		return sxx, syy
	}
	// The means as a provisional level plus a small correction, so that
	// centring keeps full precision for series with a large offset (as
	// in crossDirect).
	n := float64(len(x))
	px, py := headMean(x), headMean(y)
	dx, dy := shiftedSum(x, px)/n, shiftedSum(y, py)/n
	c.MeanX, c.MeanY = px+dx, py+dy
	if finite(c.MeanX + c.MeanY) {
		sxx, syy = crossFFT(c.R, x, y, [2]float64{px, dx}, [2]float64{py, dy}, c.MaxLag)
	}
	return sxx, syy
}

// overflowError explains sums that are not finite: a NaN or infinite
// sample (a *SampleError naming it), a sample whose square can overflow
// a sum of n of them (a *SampleError with that Limit), or else the sums
// overflowing (a *SeriesError of kind ErrOverflow).
func overflowError(x, y []float64, names [2]string) error {
	for i, v := range [2][]float64{x, y} {
		if err := checkSeries(names[i], v); err != nil {
			return err
		}
	}
	// Finite samples whose squares overflow: name the first sample of
	// either series at or beyond sqrt(MaxFloat64/n), where a sum of n
	// such squares can overflow.
	lim := math.Sqrt(math.MaxFloat64 / float64(len(x)))
	for i, v := range [2][]float64{x, y} {
		for k, a := range v {
			if math.Abs(a) >= lim {
				return &SampleError{Series: names[i], Index: k, Value: a, Limit: lim}
			}
		}
	}
	return &SeriesError{Series: names[0] + ", " + names[1], Kind: ErrOverflow, Detail: fmt.Sprintf("the sums of squares overflow; keep magnitudes below about %.3g: rescale the series", lim)}
}

// underflowError names the series (x unless its sum of squares sxx is
// large enough, then y) whose deviations are so small that their
// squares lose precision or vanish: the normalisation would be wrong or
// infinite.
func (c *Correlation) underflowError(x, y []float64, sxx float64, names [2]string) error {
	i, v, m := 0, x, c.MeanX
	if sxx >= minSumSquares {
		i, v, m = 1, y, c.MeanY
	}
	dev := 0.0
	for _, a := range v {
		dev = math.Max(dev, math.Abs(a-m))
	}
	return &SeriesError{Series: names[i], Kind: ErrOverflow,
		Detail: fmt.Sprintf("deviations from its mean of at most %.3g lose their squares to underflow (they must exceed about 1e-140); rescale the series", dev)}
}

// minSumSquares is the smallest centred sum of squares Cross accepts:
// well inside the normal floating-point range (2^-1022 ~ 2.2e-308), so
// that the squares summed keep their 53 bits.
const minSumSquares = 1e-280

// validatePair checks the lengths and the lag bound, and that neither
// series is constant. Finiteness is checked by Cross from the sums it
// computes anyway.
func validatePair(x, y []float64, maxLag int, names [2]string) error {
	if maxLag < 0 {
		return &SettingError{Setting: "maxLag", Value: strconv.Itoa(maxLag), Rule: "must be zero or positive"}
	}
	if len(x) != len(y) {
		return lengthError(names[0], names[1], len(x), len(y))
	}
	need := maxLag
	if need < math.MaxInt {
		need++ // n > maxLag, without overflowing at math.MaxInt
	}
	need = max(need, 2)
	for i, v := range [2][]float64{x, y} {
		if len(v) < need {
			return shortError(names[i], len(v), need, "for lags up to "+strconv.Itoa(maxLag))
		}
	}
	for i, v := range [2][]float64{x, y} {
		if isConstant(v) {
			return constantError(names[i], v[0])
		}
	}
	return nil
}

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return v-v == 0 }

func isConstant(x []float64) bool {
	for _, v := range x[1:] {
		if v != x[0] {
			return false
		}
	}
	return true
}

// accurateSum returns the sum of x, summed in blocks of 512 samples with
// eight accumulators each and the block sums added with compensation
// (Neumaier), so that the rounding error stays near that of pairwise
// summation at the speed of a plain loop. It is NaN or infinite when x
// holds a NaN or an infinity.
func accurateSum(x []float64) float64 {
	var s, c float64
	for len(x) > 0 {
		blk := x[:min(512, len(x))]
		x = x[len(blk):]
		var a0, a1, a2, a3, a4, a5, a6, a7 float64
		i := 0
		for ; i+8 <= len(blk); i += 8 {
			q := blk[i : i+8 : i+8]
			a0 += q[0]
			a1 += q[1]
			a2 += q[2]
			a3 += q[3]
			a4 += q[4]
			a5 += q[5]
			a6 += q[6]
			a7 += q[7]
		}
		for ; i < len(blk); i++ {
			a0 += blk[i]
		}
		v := ((a0 + a1) + (a2 + a3)) + ((a4 + a5) + (a6 + a7))
		t := s + v
		if abs(s) >= abs(v) {
			c += (s - t) + v
		} else {
			c += (v - t) + s
		}
		s = t
	}
	return s + c
}

// shiftedSum returns sum_i (x_i - p) with eight accumulators.
func shiftedSum(x []float64, p float64) float64 {
	var a0, a1, a2, a3, a4, a5, a6, a7 float64
	i := 0
	for ; i+8 <= len(x); i += 8 {
		q := x[i : i+8 : i+8]
		a0 += q[0] - p
		a1 += q[1] - p
		a2 += q[2] - p
		a3 += q[3] - p
		a4 += q[4] - p
		a5 += q[5] - p
		a6 += q[6] - p
		a7 += q[7] - p
	}
	for ; i < len(x); i++ {
		a0 += x[i] - p
	}
	return ((a0 + a1) + (a2 + a3)) + ((a4 + a5) + (a6 + a7))
}

func abs(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}
