package fit

import (
	"math"
	"math/cmplx"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
)

// inputRootMargin is the margin beyond the unit circle within which an input
// model's AR root counts as on it (a unit root, integration), not
// outside: 1e-6, well above the rounding of the companion-matrix roots of
// a low-order polynomial and far below any real explosive root.
const inputRootMargin = 1e-6

// maxInputModelDegree bounds the degree of an input model's polynomials:
// their roots are found from a companion matrix in O(degree^3) time, a
// second or so at 1000, which is beyond any seasonal model (a weekly
// period of 52 with two seasonal AR factors has degree 104).
const maxInputModelDegree = 1000

// validate reports what makes im unusable for forecasting input name.
// The rules: Sigma2 finite and not negative; C finite; AR and MA
// coefficients finite with a non-zero constant term, degree at most
// 1000; the MA invertible
// (every zero |z| < 1, otherwise the innovations recursion, started
// from zero, does not forget its start); no AR root outside the unit
// circle (|z| > 1 + 1e-6 makes the forecasts grow without bound; a root
// on it, integration, is allowed).
func (im InputModel) validate(name string) error {
	bad := func(field string, v float64, rule string) error {
		return errs.Setting("ForecastSettings.InputModels["+strconv.Quote(name)+"]."+field, errs.Num(v), rule)
	}
	if math.IsNaN(im.Sigma2) || math.IsInf(im.Sigma2, 0) || im.Sigma2 < 0 {
		return bad("Sigma2", im.Sigma2, "the innovation variance must be zero or positive and finite")
	}
	if math.IsNaN(im.C) || math.IsInf(im.C, 0) {
		return bad("C", im.C, "the constant c must be a finite number")
	}
	for _, p := range []struct {
		field string
		c     []float64
	}{{"AR", im.AR}, {"MA", im.MA}} {
		for k, v := range p.c {
			if math.IsNaN(v) || math.IsInf(v, 0) || math.Abs(v) > MaxMagnitude {
				return bad(p.field+"["+strconv.Itoa(k)+"]", v, "the coefficient must be a finite number (at most 1e150 in magnitude)")
			}
		}
		if len(p.c) > 0 && p.c[0] != 1 {
			return bad(p.field+"[0]", p.c[0], "the constant term must be 1: polynomials are stored with constant term 1 (divide every coefficient by it)")
		}
		if len(p.c) > maxInputModelDegree+1 {
			return bad(p.field, float64(len(p.c)-1), "the degree must be at most "+strconv.Itoa(maxInputModelDegree))
		}
	}
	mz := func(c []float64) (float64, bool) {
		c = poly.Trim(c, 0)
		if len(c) <= 1 {
			return 0, true
		}
		zs, err := poly.Roots(poly.Reciprocal(c))
		if err != nil {
			return math.NaN(), false
		}
		m := 0.0
		for _, z := range zs {
			m = math.Max(m, cmplx.Abs(z))
		}
		return m, !math.IsNaN(m)
	}
	if m, ok := mz(im.AR); !ok {
		return bad("AR", m, "its roots cannot be computed; give coefficients of moderate size")
	} else if m > 1+inputRootMargin {
		return bad("AR", m, "has a root outside the unit circle (largest |z| shown): the input forecast would grow without bound; the AR part must be stationary, or integrating at most (|z| = 1)")
	}
	if m, ok := mz(im.MA); !ok {
		return bad("MA", m, "its roots cannot be computed; give coefficients of moderate size")
	} else if m >= 1 {
		return bad("MA", m, "has a zero on or outside the unit circle (largest |z| shown): the MA part must be invertible (every zero |z| < 1)")
	}
	return nil
}
