package tf

import (
	"math"

	"github.com/backshift/backshift/internal/poly"
)

// Gain returns the steady-state gain G(1) = omega(1)/delta(1): the final
// change in output per unit change in a constant input, for a stable term.
// It is defined (and returned) whenever delta(1) != 0, also for an unstable
// term where no steady state is reached; check Stable. For delta(1) = 0
// (a pole at z = 1, an integrator) it returns 0 and a *GainError rather
// than an infinity; delta(1) counts as 0 when it is within 8 eps of
// rounding of zero (eps = 2^-52, scaled by sum |delta_k|).
func (r Rational) Gain() (float64, error) {
	num, den := r.coefs()
	n1, d1 := poly.EvalReal(num, 1), poly.EvalReal(den, 1)
	scale := 0.0
	for _, v := range den {
		scale += math.Abs(v)
	}
	// delta(1) within a few roundings of zero is a pole at z = 1 that the
	// coefficients cannot resolve: 8 ratEps times the sum of |delta_k| bounds
	// the rounding of the sum that forms delta(1).
	if math.Abs(d1) <= 8*ratEps*scale || math.IsInf(n1/d1, 0) {
		return 0, &GainError{Num1: n1, Den1: d1}
	}
	return n1 / d1, nil
}

// ratEps is the float64 machine epsilon 2^-52.
const ratEps = 0x1p-52
