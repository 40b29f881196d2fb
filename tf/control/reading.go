package control

import (
	"errors"
	"math"
	"math/cmplx"
	"sort"

	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// Reading is the continuous-time reading of a discrete plant model that
// the tuning rules work from:
//
//	G(s) = Gain prod_j (Lead_j s + 1) prod_k (-Inverse_k s + 1) e^{-DeadTime s} / prod_i (Lag_i s + 1),
//
// divided by s when Integrating (Gain is then the slope, output units per
// time unit per input unit). Times are in the time unit of Interval.
type Reading struct {
	Gain        float64
	Integrating bool
	// Lags are the lag time constants, longest first.
	Lags []float64
	// Leads are the time constants of zeros with a continuous meaning in
	// the left half plane (discrete zeros in (0, 1)).
	Leads []float64
	// Inverse are the time constants of inverse-response zeros (discrete
	// zeros on the real axis beyond 1, right-half-plane zeros).
	Inverse []float64
	// DeadTime is the dead time, >= 0.
	DeadTime float64
	// Interval is the sample interval T the model was read with.
	Interval float64
	// How says which reading was used: "first-order image" (exact, by
	// tf.Rational.AsFOPDT), "second-order image" (exact, by
	// AsSecondOrder) or "poles, zeros and group delay"; in a
	// Tuning by Dahlin's rule of a model Read refuses, "dead time only".
	How string
	// Notes record approximations made (a complex pole pair read as two
	// lags, a dead time clamped at 0).
	Notes []string
}

// Read returns the continuous-time reading of the discrete plant p for
// the sample interval T (in the caller's time unit; 1 reads times in
// samples), taking p as the zero-order-hold image of a continuous
// process.
//
// A first-order term that AsFOPDT accepts (denominator 1 - a B, one or
// two numerator coefficients, dead time >= 1) is read exactly by it, and
// the exact image of an overdamped second-order lag (AsSecondOrder with a
// numerator mismatch below 1e-9) by AsSecondOrder. Any other term is read
// from its poles and zeros (tf.Rational.Poles, Zeros):
// a real pole z in (0, 1) is a lag of time constant -T/ln z; a pole at
// z = 1 (one only) makes the reading integrating; a complex pair with
// damping zeta >= 0.5 (of s = ln(z)/T) is read as two equal lags
// zeta/wn, which keeps its group delay 2 zeta/wn; other poles (on the
// negative real axis, outside the unit circle, a lightly damped pair)
// are refused. A real zero z in (0, 1) is a lead -T/ln z, a real zero
// beyond 1 an inverse response T/ln z; zeros on the negative real axis
// and complex zeros are the sampling zeros of the hold and have no
// continuous counterpart of their own.
//
// The dead time is chosen so that the reading, plus the hold's delay of
// T/2, has the discrete model's group delay at w = 0 (the mean of its
// impulse response, gd = b + omega'(1)/omega(1) - delta'(1)/delta(1)
// samples, with ' the derivative in B):
//
//	DeadTime = T gd - sum Lags + sum Leads - sum Inverse - T/2,
//
// for an integrating term with the integrator's factor removed from
// delta and T in place of T/2 (derived here: each sampled lag has group
// delay tau/T - 1/2 + O(T/tau), each sampling zero of the hold about
// 1/2). The reading keeps the group delay exactly; its dead time is
// accurate to O(T^2/tau) per lag. A negative result is clamped to 0 with
// a note.
//
// It returns a *SettingError for an interval that is not positive and
// finite, and a *ModelError for a term that has no such reading (zero
// gain, a pole it refuses, two integrators).
func Read(p tf.Rational, T float64) (Reading, error) {
	const op = "control.Read"
	if !(T > 0) || math.IsInf(T, 0) {
		return Reading{}, fsetting(op, "T", T, "the sample interval must be positive and finite")
	}
	if p.DenDegree() == 1 && p.Stable() {
		if f, err := p.AsFOPDT(T); err == nil {
			return Reading{Gain: f.Gain, Lags: []float64{f.TimeConstant}, DeadTime: f.DeadTime, Interval: T, How: "first-order image"}, nil
		}
	}
	if r, ok := readSecondOrder(p, T); ok {
		return r, nil
	}
	r, err := readPolesZeros(p, T)
	if err != nil {
		err.(*ModelError).Op = op
		return Reading{}, err
	}
	return r, nil
}

// readSecondOrder reads p exactly by tf.Rational.AsSecondOrder when p is
// the zero-order-hold image of an overdamped second-order lag with dead
// time (numerator mismatch below 1e-9, damping >= 1).
func readSecondOrder(p tf.Rational, T float64) (Reading, bool) {
	if p.DenDegree() != 2 || !p.Stable() {
		return Reading{}, false
	}
	f, mismatch, err := p.AsSecondOrder(T)
	if err != nil || !(mismatch < 1e-9) || f.Damping < 1 {
		return Reading{}, false
	}
	q := math.Sqrt(f.Damping*f.Damping - 1)
	t1 := 1 / (f.NaturalFrequency * (f.Damping - q))
	t2 := 1 / (f.NaturalFrequency * f.NaturalFrequency * t1)
	return Reading{Gain: f.Gain, Lags: []float64{t1, t2}, DeadTime: f.DeadTime, Interval: T, How: "second-order image"}, true
}

// leadingDelay returns p's numerator without its leading zero
// coefficients, its denominator, and its dead time with those
// coefficients counted in ((0 + 0.5 B) B^2 reads as 0.5 B^3).
func leadingDelay(p tf.Rational) (num, den []float64, b int) {
	num, den, b = p.Num(), p.Den(), p.Delay()
	for len(num) > 1 && num[0] == 0 {
		num = num[1:]
		b++
	}
	return num, den, b
}

// readPolesZeros is the general reading of Read.
func readPolesZeros(p tf.Rational, T float64) (Reading, error) {
	num, den, b := leadingDelay(p)
	r := Reading{Interval: T, How: "poles, zeros and group delay"}
	var ge *tf.GainError
	if _, err := p.Gain(); errors.As(err, &ge) {
		den = deflate(den)
		if vanishes(den) {
			return Reading{}, &ModelError{Part: "plant poles", Problem: "two or more integrators (poles at z = 1): the tuning rules cover one"}
		}
		r.Integrating = true
	}
	n1, d1 := poly.EvalReal(num, 1), poly.EvalReal(den, 1)
	if n1 == 0 || math.Abs(n1) <= 1e-12*absSum(num) {
		return Reading{}, &ModelError{Part: "plant gain", Problem: "is 0 (a zero at z = 1): there is no steady-state effect to control"}
	}
	r.Gain = n1 / d1
	if r.Integrating {
		r.Gain /= T
	}
	if err := r.readPoles(den, T); err != nil {
		return Reading{}, err
	}
	r.readZeros(num, T)
	gd := float64(b) + poly.EvalReal(poly.Derivative(num), 1)/n1 - poly.EvalReal(poly.Derivative(den), 1)/d1
	theta := T*gd - T/2
	if r.Integrating {
		theta -= T / 2
	}
	for _, v := range r.Lags {
		theta -= v
	}
	for _, v := range r.Leads {
		theta += v
	}
	for _, v := range r.Inverse {
		theta -= v
	}
	if theta < 0 {
		r.Notes = append(r.Notes, "the dead time read from the group delay was "+fmtG(theta)+", clamped to 0")
		theta = 0
	}
	r.DeadTime = theta
	sort.Sort(sort.Reverse(sort.Float64Slice(r.Lags)))
	sort.Sort(sort.Reverse(sort.Float64Slice(r.Leads)))
	return r, nil
}

// readPoles reads the poles of den (no integrator left) as lags.
func (r *Reading) readPoles(den []float64, T float64) error {
	for _, z := range zplane(den) {
		switch {
		case imag(z) == 0 && real(z) > 0 && real(z) < 1:
			r.Lags = append(r.Lags, -T/math.Log(real(z)))
		case imag(z) > 0 && cmplx.Abs(z) < 1:
			s := cmplx.Log(z) / complex(T, 0)
			wn := cmplx.Abs(s)
			zeta := -real(s) / wn
			if zeta < 0.5 {
				return &ModelError{Part: "plant poles", Problem: "a lightly damped pair (damping " + fmtG(zeta) + " below 0.5): the half rule and SIMC cover well damped modes; tune by Dahlin's rule or check a controller with Analyze"}
			}
			r.Lags = append(r.Lags, zeta/wn, zeta/wn)
			r.Notes = append(r.Notes, "a complex pole pair (damping "+fmtG(zeta)+") read as two lags of "+fmtG(zeta/wn))
		case imag(z) < 0 && cmplx.Abs(z) < 1:
			// the conjugate, counted with its partner
		default:
			return &ModelError{Part: "plant poles", Problem: "pole " + fmtC(z) + " has no continuous lag reading (on the negative real axis, or on or outside the unit circle)"}
		}
	}
	return nil
}

// readZeros reads the real positive zeros of num as leads and inverse
// responses; the others are sampling zeros, counted in the group delay.
func (r *Reading) readZeros(num []float64, T float64) {
	for _, z := range zplane(num) {
		if imag(z) != 0 || real(z) <= 0 {
			continue
		}
		switch x := real(z); {
		case x < 1:
			r.Leads = append(r.Leads, -T/math.Log(x))
		case x > 1:
			r.Inverse = append(r.Inverse, T/math.Log(x))
		}
	}
}

// zplane returns the z-plane roots of c (a polynomial in B), nil for a
// constant; a root whose imaginary part is below 1e-10 of its magnitude
// is taken as real.
func zplane(c []float64) []complex128 {
	c = trim(c)
	if len(c) < 2 {
		return nil
	}
	rs, err := poly.Roots(poly.Reciprocal(c))
	if err != nil {
		return nil
	}
	for i, z := range rs {
		if math.Abs(imag(z)) <= 1e-10*cmplx.Abs(z) {
			rs[i] = complex(real(z), 0)
		}
	}
	return rs
}

// deflate returns den/(1 - B), the quotient's cumulative sums, dropping
// the remainder (zero to rounding for a pole at z = 1).
func deflate(den []float64) []float64 {
	q := make([]float64, len(den)-1)
	s := 0.0
	for k := range q {
		s += den[k]
		q[k] = s
	}
	return q
}

// vanishes reports whether c(1) is zero to rounding.
func vanishes(c []float64) bool {
	return math.Abs(poly.EvalReal(c, 1)) <= 8*0x1p-52*absSum(c)*float64(len(c))
}

func absSum(c []float64) float64 {
	s := 0.0
	for _, v := range c {
		s += math.Abs(v)
	}
	return s
}
