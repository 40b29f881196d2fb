package tf

import (
	"math"
	"strconv"

	"gonum.org/v1/gonum/mat"

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
	g, err := r.gain()
	if err != nil {
		return 0, withOp("tf.Rational.Gain", err)
	}
	return g, nil
}

// gain is Gain with an error carrying no Op.
func (r Rational) gain() (float64, error) {
	num, den := r.coefs()
	n1, d1 := poly.EvalReal(num, 1), poly.EvalReal(den, 1)
	// delta(1) within a few roundings of zero is a pole at z = 1 that the
	// coefficients cannot resolve: 8 eps times the sum of |delta_k| bounds
	// the rounding of the sum that forms delta(1).
	if vanishesAt(den, 1) || math.IsInf(n1/d1, 0) {
		return 0, &GainError{Num1: n1, Den1: d1}
	}
	return n1 / d1, nil
}

// machineEps is the float64 machine epsilon 2^-52.
const machineEps = 0x1p-52

// UnstableError reports that a quantity defined only for stable terms was
// asked of a term with a pole on or outside the unit circle; MaxPole is
// the largest pole magnitude. It matches ErrModel.
type UnstableError struct {
	Op      string
	What    string
	MaxPole float64
}

// Error describes the problem in one line.
func (e *UnstableError) Error() string {
	return opPrefix(e.Op) + e.What + " needs a stable term; largest pole magnitude " + strconv.FormatFloat(e.MaxPole, 'g', 6, 64)
}

// Unwrap returns ErrModel.
func (e *UnstableError) Unwrap() error { return ErrModel }

// Bound is the bounded-input bounded-output gain sum_k |h_k| of a stable
// term, the largest output magnitude for an input bounded by 1: Sum is the
// sum over the first Terms impulse-response weights, and Tail a bound on
// the sum of the rest, so that Sum <= sum_k |h_k| <= Sum + Tail (up to
// rounding).
type Bound struct {
	Sum   float64
	Tail  float64
	Terms int
}

// BIBOBound returns the bounded-input bounded-output gain sum_{k>=0} |h_k|
// of a stable term, with a bound on the truncated tail.
//
// Beyond N = b + s the weights follow the homogeneous recursion
// v_{k+1} = A v_k, with v_k = (h_k, ..., h_{k-r+1}) and A the companion
// matrix of delta. With M a power of two for which q = ||A^M||_inf <= 1e-6
// (found by repeated squaring), the weights beyond N + M satisfy
//
//	sum_{k > N+M} |h_k| <= q/(1-q) * sum_{i=1..M} ||v_{N+i}||_inf,
//
// which is the returned Tail; Sum adds |h_k| for k <= N + M. It returns an
// *UnstableError for a term with a pole on or outside the unit circle, or
// with poles so close to it that M would exceed 2^22 samples (|z| above
// about 1 - 3e-6), where the impulse response would not fit in a
// reasonable amount of memory.
func (r Rational) BIBOBound() (Bound, error) {
	num, den := r.coefs()
	rho := r.MaxPoleMagnitude()
	if !(rho < 1) {
		return Bound{}, &UnstableError{Op: "tf.Rational.BIBOBound", What: "BIBO bound", MaxPole: rho}
	}
	deg := len(den) - 1
	nStart := r.delay + len(num) - 1
	if deg == 0 {
		h := r.Impulse(nStart + 1)
		s := 0.0
		for _, v := range h {
			s += math.Abs(v)
		}
		return Bound{Sum: s, Terms: len(h)}, nil
	}
	// Companion matrix of h_k = -delta_1 h_{k-1} - ... - delta_r h_{k-r}.
	a := mat.NewDense(deg, deg, nil)
	for j := 0; j < deg; j++ {
		a.Set(0, j, -den[j+1])
	}
	for i := 1; i < deg; i++ {
		a.Set(i, i-1, 1)
	}
	m := 1
	q := mat.Norm(a, math.Inf(1))
	for q > 1e-6 {
		if m >= 1<<22 {
			return Bound{}, &UnstableError{Op: "tf.Rational.BIBOBound", What: "BIBO bound (poles too close to the unit circle)", MaxPole: rho}
		}
		a.Mul(a, a)
		m *= 2
		q = mat.Norm(a, math.Inf(1))
		if math.IsNaN(q) || math.IsInf(q, 0) {
			return Bound{}, &UnstableError{Op: "tf.Rational.BIBOBound", What: "BIBO bound", MaxPole: rho}
		}
	}
	terms := nStart + m + 1
	h := r.Impulse(terms)
	s := 0.0
	for _, v := range h {
		s += math.Abs(v)
	}
	block := 0.0
	for i := 1; i <= m; i++ {
		w := 0.0
		for l := 0; l < deg; l++ {
			if k := nStart + i - l; k >= 0 {
				w = max(w, math.Abs(h[k]))
			}
		}
		block += w
	}
	return Bound{Sum: s, Tail: q / (1 - q) * block, Terms: terms}, nil
}
