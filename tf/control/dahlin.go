package control

import (
	"errors"
	"math"
	"math/cmplx"
	"strconv"

	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// dahlin returns Dahlin's controller for the plant p, sample interval T
// and closed-loop time constant lambda (see the Dahlin rule):
//
//	C(B) = delta(B) (1 - q) / (omega~(B) (1 - B) E(B)),
//
// derived here from C = T/(G (1 - T)) with T(B) = (1 - q) B^b/(1 - q B):
// 1 - q B - (1 - q) B^b = (1 - B) + (1 - q)(B - B^b) = (1 - B) E(B).
func dahlin(p tf.Rational, T, lambda float64) (tf.Rational, error) {
	num, den, b := leadingDelay(p)
	if b < 1 {
		return tf.Rational{}, &ModelError{Part: "plant dead time", Problem: "is 0: Dahlin's rule needs at least the one sample of the hold"}
	}
	if lambda <= 0 {
		return tf.Rational{}, &ModelError{Part: "closed-loop time", Problem: "is 0 or negative: Dahlin's rule needs a positive lambda"}
	}
	q := math.Exp(-T / lambda)
	e := make([]float64, b)
	e[0] = 1
	for k := 1; k < b; k++ {
		e[k] = 1 - q
	}
	cden := poly.Mul(smoothNumerator(num), e)
	var ge *tf.GainError
	if _, err := p.Gain(); errors.As(err, &ge) {
		den = deflate(den) // the plant's integrator cancels the loop's
	} else {
		cden = poly.Mul(cden, []float64{1, -1})
	}
	if len(cden)-1 > tf.MaxDegree || len(den)-1 > tf.MaxDegree {
		return tf.Rational{}, &ModelError{Part: "Dahlin controller", Problem: "would have degree " + strconv.Itoa(len(cden)-1) + " (the plant's dead time " + strconv.Itoa(b) + " samples enters it), above tf.MaxDegree: resample slower or use a PI"}
	}
	c, err := tf.NewRational(poly.Scale(1-q, den), cden, 0)
	if err != nil {
		return tf.Rational{}, &ModelError{Part: "Dahlin controller", Problem: "cannot be formed: " + err.Error(), Err: err}
	}
	return c, nil
}

// dahlinPlant refuses a plant with a pole on or outside the unit circle
// (besides one integrator, whose (1 - B) the loop's own cancels):
// Dahlin's controller has the plant's denominator delta(B) in its
// numerator, so it would cancel such a pole with a controller zero. The
// cancelled mode is then hidden from the set point but not from a load
// or the slightest model error: the loop is internally unstable
// (Franklin, Powell & Workman 1998, the internal stability of
// direct-design controllers). Zeros outside the unit circle or on the
// negative real axis are not cancelled (smoothNumerator).
func dahlinPlant(p tf.Rational) error {
	den := p.Den()
	var ge *tf.GainError
	if _, err := p.Gain(); errors.As(err, &ge) {
		den = deflate(den)
	}
	for _, z := range zplane(den) {
		if cmplx.Abs(z) >= 1-1e-9 {
			return &ModelError{Part: "plant poles", Problem: "pole " + fmtC(z) + " is on or outside the unit circle: Dahlin's controller would cancel it with a zero, leaving the loop internally unstable (the cancelled mode still grows from any load or model error); stabilise the plant first or use a controller checked with Analyze"}
		}
	}
	return nil
}

// smoothNumerator returns omega with every zero on the negative real
// axis or on or outside the unit circle (z-plane) replaced by its
// factor's value at B = 1, so that the controller neither rings nor
// cancels an inverse response.
func smoothNumerator(num []float64) []float64 {
	zs := zplane(num)
	if len(zs) == 0 {
		return append([]float64(nil), num...)
	}
	lead := num[0]
	var keep []complex128
	scale := complex(1, 0)
	for _, z := range zs {
		if real(z) < 0 || cmplx.Abs(z) >= 1 {
			scale *= 1 - z
			continue
		}
		keep = append(keep, z)
	}
	return poly.Scale(lead*real(scale), poly.FromInverseRoots(keep))
}
