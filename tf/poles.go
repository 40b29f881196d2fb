package tf

import (
	"math"
	"math/cmplx"

	"github.com/backshift/backshift/internal/poly"
)

// Poles returns the poles of the rational part in the z-plane (z = 1/B):
// the roots of z^r delta(1/z), one per degree r of delta(B), sorted by
// increasing magnitude and then by argument. The dead time and the
// numerator degree add further poles at z = 0 that do not affect
// stability; they are not listed. A pole at z = 1 is an integrator.
//
// Roots come from the companion matrix with Newton polishing (see
// internal/poly.Roots); well separated poles are accurate to about 1e-12
// relative, a pole of multiplicity m to about eps^(1/m). It returns nil
// for a constant denominator, and nil if the eigenvalue solver fails
// (which it does not for finite coefficients in practice).
func (r Rational) Poles() []complex128 {
	_, den := r.coefs()
	return zPlaneRoots(den)
}

// Zeros returns the zeros of the numerator in the z-plane: the roots of
// z^s omega(1/z), sorted like Poles. Leading zero coefficients of omega
// (extra delay written into the numerator) give no zeros; zero
// coefficients at the high-power end were dropped by NewRational. A zero
// outside the unit circle makes the term non-minimum-phase (an inverse
// response). It returns nil for a constant numerator.
func (r Rational) Zeros() []complex128 {
	num, _ := r.coefs()
	return zPlaneRoots(num)
}

// zPlaneRoots returns the z-plane roots of the polynomial c in B, nil
// for a constant.
func zPlaneRoots(c []float64) []complex128 {
	zs, err := poly.Roots(poly.Reciprocal(c))
	if err != nil {
		return nil
	}
	return zs
}

// MaxPoleMagnitude returns the largest |z| over the poles, the spectral
// radius that sets how fast the impulse response decays (like
// MaxPoleMagnitude^k); 0 for a constant denominator.
func (r Rational) MaxPoleMagnitude() float64 {
	m := 0.0
	for _, z := range r.Poles() {
		m = max(m, cmplx.Abs(z))
	}
	return m
}

// Stable reports whether every pole lies strictly inside the unit circle,
// equivalently every root of delta(B) strictly outside it. A pole on the
// circle (an integrator) is not stable: besides |z| < 1 for the computed
// poles, delta(1) and delta(-1) must not vanish to within rounding (the
// test of Gain), so that a pole at z = 1 or -1 computed as 1 - 1e-16 is
// not taken as stable. A constant denominator is stable.
func (r Rational) Stable() bool {
	_, den := r.coefs()
	if len(den) > 1 && (vanishesAt(den, 1) || vanishesAt(den, -1)) {
		return false
	}
	return r.MaxPoleMagnitude() < 1
}

// vanishesAt reports whether c(x) is zero to within 8 eps of the
// rounding of its evaluation (scaled by sum |c_k| |x|^k), for |x| = 1.
func vanishesAt(c []float64, x float64) bool {
	v := poly.EvalReal(c, x)
	scale := 0.0
	for _, ck := range c {
		scale += math.Abs(ck)
	}
	return math.Abs(v) <= 8*machineEps*scale
}

// IsMinimumPhase reports whether every zero lies strictly inside the unit
// circle.
func (r Rational) IsMinimumPhase() bool {
	for _, z := range r.Zeros() {
		if !(cmplx.Abs(z) < 1) {
			return false
		}
	}
	return true
}
