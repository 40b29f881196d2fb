package tf

import (
	"errors"
	"fmt"
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/sym"
)

// MaxDegree is the largest degree accepted for the numerator omega(B) and
// the denominator delta(B) of a Rational.
const MaxDegree = 64

// MaxDelay is the largest dead time, in samples, accepted by NewRational.
const MaxDelay = 10000

// Rational is the discrete transfer function
//
//	G(B) = omega(B) / delta(B) * B^b
//
// with omega the numerator, delta the denominator (constant term 1) and b
// >= 0 the dead time in samples. Polynomials are in ascending powers of B:
// index k holds the coefficient of B^k, with signs as written, so the
// first-order term 0.5 B^2 / (1 - 0.8 B) has numerator {0.5}, denominator
// {1, -0.8} and dead time 2. As a difference equation,
//
//	y_t = 0.8 y_{t-1} + 0.5 x_{t-2}.
//
// A Rational is an immutable value, safe for concurrent use; the zero
// Rational is the zero transfer function (numerator {0}, denominator {1}).
// Build one with NewRational.
type Rational struct {
	num   []float64
	den   []float64
	delay int
}

// NewRational returns the transfer function num(B)/den(B) * B^delay. The
// slices are copied, never kept or modified. The result is normalised so
// that den[0] = 1 (both polynomials divided by den[0]), and exact zero
// coefficients at the high-power end are dropped (a numerator of zeros
// becomes {0}).
//
// Errors carry Op "tf.NewRational". It returns a *CoefError (matching
// ErrModel and its precise cause) for an empty polynomial, a denominator with a
// zero constant term, a NaN or infinite coefficient, a degree (after
// dropping trailing zeros) above MaxDegree, or a den[0] that the
// normalisation cannot divide by (ErrNormalise, reported for den
// coefficient 0 with its value); and a *DelayError for a
// delay outside 0..MaxDelay. On error the returned Rational is the zero
// value.
func NewRational(num, den []float64, delay int) (Rational, error) {
	r, err := newRational(num, den, delay)
	if err != nil {
		return Rational{}, withOp("tf.NewRational", err)
	}
	return r, nil
}

// newRational is NewRational with errors carrying no Op, for the
// exported functions that build a Rational and set their own.
func newRational(num, den []float64, delay int) (Rational, error) {
	if err := checkPoly("num", num); err != nil {
		return Rational{}, err
	}
	if err := checkPoly("den", den); err != nil {
		return Rational{}, err
	}
	if den[0] == 0 {
		return Rational{}, &CoefError{Poly: "den", Index: 0, Value: 0, Err: ErrZeroConstant}
	}
	if delay < 0 || delay > MaxDelay {
		return Rational{}, &DelayError{Delay: delay}
	}
	n := trimZeros(num)
	d := trimZeros(den)
	if len(n)-1 > MaxDegree {
		return Rational{}, &CoefError{Poly: "num", Index: len(n) - 1, Value: n[len(n)-1], Err: ErrDegree}
	}
	if len(d)-1 > MaxDegree {
		return Rational{}, &CoefError{Poly: "den", Index: len(d) - 1, Value: d[len(d)-1], Err: ErrDegree}
	}
	if d0 := d[0]; d0 != 1 {
		if err := normalise("num", n, d0); err != nil {
			return Rational{}, err
		}
		if err := normalise("den", d[1:], d0); err != nil {
			return Rational{}, err
		}
		d[0] = 1
	}
	return Rational{num: n, den: d, delay: delay}, nil
}

// ErrNormalise says that dividing the coefficients by the denominator's
// constant term den[0], which NewRational does to make it 1, takes a
// coefficient out of float64 range: to +-Inf when den[0] is tiny against
// it (den[0] = 1e-308 and a coefficient 10, say), or from non-zero to 0
// when den[0] is huge against it. NewRational reports it as a *CoefError
// for den coefficient 0, whose Err wraps ErrNormalise with the
// coefficient concerned, so errors.Is(err, ErrNormalise) holds.
var ErrNormalise = errors.New("normalising by den[0] (to make it 1) leaves float64 range")

// normalise divides c (polynomial name; for "den" c starts at the
// coefficient of B^1) by d0 in place, returning a *CoefError for den[0]
// wrapping ErrNormalise when a quotient overflows or a non-zero one
// underflows to zero.
func normalise(name string, c []float64, d0 float64) error {
	off := 0
	if name == "den" {
		off = 1
	}
	for k, v := range c {
		q := v / d0
		if math.IsInf(q, 0) || (q == 0 && v != 0) {
			return &CoefError{Poly: "den", Index: 0, Value: d0, Err: fmt.Errorf("%w: %s coefficient %d = %v divided by it is %v",
				ErrNormalise, name, k+off, v, q)}
		}
		c[k] = q
	}
	return nil
}

// MustRational is NewRational for fixed coefficients written in code; it
// panics on error.
func MustRational(num, den []float64, delay int) Rational {
	r, err := NewRational(num, den, delay)
	if err != nil {
		panic(withOp("tf.MustRational", err))
	}
	return r
}

func checkPoly(name string, c []float64) error {
	if len(c) == 0 {
		return &CoefError{Poly: name, Index: -1, Err: ErrEmpty}
	}
	for k, v := range c {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return &CoefError{Poly: name, Index: k, Value: v, Err: ErrNotFinite}
		}
	}
	return nil
}

// trimZeros returns a copy of c without exact zeros at the high-power end,
// keeping at least one coefficient.
func trimZeros(c []float64) []float64 {
	n := len(c)
	for n > 1 && c[n-1] == 0 {
		n--
	}
	return append([]float64(nil), c[:n]...)
}

// Num returns a copy of the numerator omega(B), ascending powers of B.
func (r Rational) Num() []float64 {
	if r.den == nil {
		return []float64{0}
	}
	return append([]float64(nil), r.num...)
}

// Den returns a copy of the denominator delta(B), ascending powers of B,
// with constant term 1.
func (r Rational) Den() []float64 {
	if r.den == nil {
		return []float64{1}
	}
	return append([]float64(nil), r.den...)
}

// Delay returns the dead time b in samples.
func (r Rational) Delay() int { return r.delay }

// NumDegree returns the degree s of the numerator.
func (r Rational) NumDegree() int { return max(len(r.num)-1, 0) }

// DenDegree returns the degree r of the denominator.
func (r Rational) DenDegree() int { return max(len(r.den)-1, 0) }

// coefs returns the internal polynomials, mapping the zero value to 0/1.
func (r Rational) coefs() (num, den []float64) {
	if r.den == nil {
		return []float64{0}, []float64{1}
	}
	return r.num, r.den
}

// Impulse returns the impulse response h_0..h_{n-1}, the output for the
// input 1, 0, 0, ... from rest: h_k = 0 exactly for k < b, then the power
// series of omega(B)/delta(B). It returns nil for n <= 0 (any negative
// n included).
//
// n is the length of the result, so it must be a length the caller can
// allocate (8n bytes): like make, Impulse panics with a runtime error for
// a length no slice can have (such as math.MaxInt) and a length beyond
// the memory at hand exhausts it. Callers choosing n from data should
// bound it first; there is no error return to report it.
func (r Rational) Impulse(n int) []float64 {
	if n <= 0 {
		return nil
	}
	num, den := r.coefs()
	h := make([]float64, n)
	if r.delay < n {
		// den[0] = 1 by construction, so DivideTo cannot fail.
		_ = poly.DivideTo(h[r.delay:], num, den)
	}
	return h
}

// Step returns the unit step response y_0..y_{n-1}, the output for the
// input 1, 1, 1, ... from rest: zero for k < b. It is computed by the
// difference equation itself (not by summing the impulse response), so
// it has the rounding of Filter. It returns nil for n <= 0 (any
// negative n included). As for Impulse, n is the length of the result
// and must be a length the caller can allocate.
func (r Rational) Step(n int) []float64 {
	if n <= 0 {
		return nil
	}
	x := make([]float64, n)
	for i := range x {
		x[i] = 1
	}
	r.filterTo(x, x)
	return x
}

// Filter returns the output of the transfer function for the input series
// x (index 0 oldest), with zero initial conditions: inputs and outputs
// before index 0 are taken as zero. The output at t depends on inputs up
// to t - b only. It returns a *SampleError (Series "input") for a NaN or
// infinite sample, and nil output. The output itself is not checked: an
// unstable term (see Stable) grows without bound and may overflow to
// +-Inf and then NaN within the series, as its difference equation does.
func (r Rational) Filter(x []float64) ([]float64, error) {
	y := make([]float64, len(x))
	if err := r.filterChecked(y, x); err != nil {
		return nil, withOp("tf.Rational.Filter", err)
	}
	return y, nil
}

// FilterTo is Filter writing into dst, which must have the length of x
// (FilterTo panics otherwise, a programmer error) and may be x itself,
// but must not overlap it otherwise.
// It allocates nothing. On a *SampleError dst holds unspecified values.
func (r Rational) FilterTo(dst, x []float64) error {
	if len(dst) != len(x) {
		panic("tf: FilterTo: dst and x lengths differ")
	}
	if err := r.filterChecked(dst, x); err != nil {
		return withOp("tf.Rational.FilterTo", err)
	}
	return nil
}

// filterChecked is FilterTo without the length check and the Op.
func (r Rational) filterChecked(dst, x []float64) error {
	num, den := r.coefs()
	n := len(x)
	b := min(r.delay, n)
	ok := true
	if b == 0 || n == 0 || &dst[0] != &x[0] {
		// The finiteness check runs inside the filter loop; the last b
		// inputs, which do not reach the output, are checked here.
		ok = filter.RunChecked(dst[b:], num, den, x[:n-b]) && filter.FirstNonFinite(x[n-b:]) < 0
		clear(dst[:b])
	} else {
		if err := checkSeries("input", x); err != nil {
			return err
		}
		r.filterTo(dst, x)
	}
	if !ok {
		return checkSeries("input", x)
	}
	return nil
}

// filterTo writes the zero-state response to x into dst (same length,
// may be the same slice).
func (r Rational) filterTo(dst, x []float64) {
	num, den := r.coefs()
	n := len(x)
	b := min(r.delay, n)
	if b == 0 {
		filter.Run(dst, num, den, x)
		return
	}
	// Shift the input by the dead time: dst[b:] = G0 x[:n-b] where G0 is
	// the rational part. Run works in place, so copy first.
	copy(dst[b:], x[:n-b])
	for i := 0; i < b; i++ {
		dst[i] = 0
	}
	filter.Run(dst[b:], num, den, dst[b:])
}

func checkSeries(name string, x []float64) error {
	if i := filter.FirstNonFinite(x); i >= 0 {
		return &SampleError{Series: name, Index: i, Value: x[i]}
	}
	return nil
}

// Past is the history of a term before the first sample of a series,
// oldest first, so that the last element of each slice is the value at
// t = -1. Input holds past inputs x_t and Output past outputs y_t. Values
// older than a slice supplies are taken as zero; a term uses the last
// b+s inputs and the last r outputs. The zero Past is rest.
type Past struct {
	Input  []float64
	Output []float64
}

// SteadyPast returns the history of the steady state for the constant
// input u: b+s past inputs equal to u and r past outputs equal to
// Gain()*u. Filtering the constant u from it gives the constant output
// Gain()*u. It returns a *GainError when the gain does not exist (pole at
// z = 1) and a *SampleError for a non-finite u.
func (r Rational) SteadyPast(u float64) (Past, error) {
	if math.IsNaN(u) || math.IsInf(u, 0) {
		return Past{}, &SampleError{Op: "tf.Rational.SteadyPast", Series: "steady input", Index: 0, Value: u}
	}
	g, err := r.gain()
	if err != nil {
		return Past{}, withOp("tf.Rational.SteadyPast", err)
	}
	xh, yh := steadyHistory(r, u, g*u)
	return Past{Input: xh, Output: yh}, nil
}

// FilterFrom returns the output for the input series x continuing from
// the history p (see Past), by the difference equation with no
// approximation. With the zero Past it equals Filter. It returns a
// *SampleError (Series "input", "past input" or "past output") for a NaN
// or infinite value. p is read, never modified.
func (r Rational) FilterFrom(x []float64, p Past) ([]float64, error) {
	for _, c := range [...]struct {
		name string
		x    []float64
	}{{"input", x}, {"past input", p.Input}, {"past output", p.Output}} {
		if err := checkSeries(c.name, c.x); err != nil {
			return nil, withOp("tf.Rational.FilterFrom", err)
		}
	}
	num, den := r.coefs()
	n, b := len(x), r.delay
	y := make([]float64, n)
	if b == 0 {
		filter.RunInit(y, num, den, x, p.Input, p.Output)
		return y, nil
	}
	// The rational part sees v_t = x_{t-b}: its history is the past input
	// without its last b values, and its first b samples come from the
	// last b past inputs (zero where not given).
	v := y // reuse the output buffer for the shifted input (in place is fine)
	for t := 0; t < n; t++ {
		k := t - b
		switch {
		case k >= 0:
			v[t] = x[k]
		case len(p.Input)+k >= 0:
			v[t] = p.Input[len(p.Input)+k]
		default:
			v[t] = 0
		}
	}
	var vh []float64
	if len(p.Input) > b {
		vh = p.Input[:len(p.Input)-b]
	}
	filter.RunInit(y, num, den, v, vh, p.Output)
	return y, nil
}

// String returns r for reading, in the notation of the spec language with
// numbers for coefficients: numerator, then "/ denominator" unless it is
// 1, then B^b for the dead time, such as "(0.5) / (1 - 0.8 B) B^2".
// Coefficients print in full precision.
func (r Rational) String() string {
	num, den := r.coefs()
	s := FormatPoly(sym.FromCoeffs(num))
	if len(den) > 1 {
		s += " / " + FormatPoly(sym.FromCoeffs(den))
	}
	switch {
	case r.delay == 1:
		s += " B"
	case r.delay > 1:
		s += " B^" + strconv.Itoa(r.delay)
	}
	return s
}
