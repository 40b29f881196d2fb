package tf

import (
	"strconv"

	"github.com/backshift/backshift/internal/poly"
)

// Path returns the whole path from the input named series to the output
// y itself: the effect of that input on y, with every coefficient at its
// Value,
//
//	Num(B) / Den(B) * B^b * D_i(B) / D(B),
//
// D_i(B) being the input's differencing (Input.Diff, which multiplies the
// numerator) and D(B) the model's output differencing (Model.Diff, which
// moves to the denominator: D(B) y = G(B) x is y = G(B)/D(B) x). This is
// the plant a controller acting through the input sees, and the path
// whose step response is the model's response of y to a unit step of the
// input (Model.Simulate with every other input zero, the noise off and
// the run started from rest). Input.Rational is the term alone, the
// effect on the differenced output D(B) y; for a model without
// differencing the two are the same.
//
// Common factors of the two sides (Num(B) D_i(B) over Den(B) D(B))
// cancel exactly where they meet, so that they do not leave a pole and a
// zero at the same point: each factor written with fixed numbers (no
// named coefficient) is split into its powers of (1 - B) (by exact
// division in float64, checked by multiplying back; (1 - B^12) =
// (1 - B)(1 + B + ... + B^11)) and what remains; the powers of (1 - B)
// common to both sides cancel, and so do remaining fixed factors equal
// coefficient for coefficient. So a (1 - B) on both sides is a plain
// static path, and (1 - B)^2 y = G(B) ((1 - B) x) is G(B)/(1 - B), an
// integrator. A factor with a named coefficient never cancels, nor does
// anything else (Rational.Cancel does that on request, to a tolerance).
// For a model without differencing whose terms have no such common
// factor, Path equals Input.Rational.
//
// An output differenced by (1 - B) and not the input gives a path with a
// pole at z = 1 (an integrating plant: Gain returns a *GainError, Stable
// reports false); an input differenced and not the output gives a path
// whose gain is 0 (the output answers a change of the input, not its
// level).
//
// series is matched against Input.Series. An event input (step(T),
// pulse(T)) is handled as any other: its Series is the event's text
// (Event.String), and its path is the effect of its indicator on y (for
// an outlier added by WithOutliers, whose numerator carries D(B), the
// outlier's own shape on y). It is not a path a controller acts through.
//
// Errors (Op "tf.Model.Path"): a *SeriesError (ErrName) when no input, or
// more than one, has that Series; a *ModelError for a polynomial that
// Model.Validate refuses; NewRational's errors for the product (a
// *CoefError with ErrDegree when the path's numerator or denominator is
// of degree above MaxDegree, ErrZeroConstant when D(B) has constant term
// 0; a *DelayError for a dead time outside 0..MaxDelay).
func (m Model) Path(series string) (Rational, error) {
	r, err := m.path(series)
	return r, composeErr("tf.Model.Path", err)
}

// path is Path with errors carrying no Op.
func (m Model) path(series string) (Rational, error) {
	idx := -1
	for i, in := range m.Inputs {
		if in.Series != series {
			continue
		}
		if idx >= 0 {
			return Rational{}, &SeriesError{Series: series, Kind: ErrName,
				Detail: "the model has inputs " + strconv.Itoa(idx+1) + " and " + strconv.Itoa(i+1) +
					" of this name, so there is no one path; combine their terms into one transfer function"}
		}
		idx = i
	}
	if idx < 0 {
		return Rational{}, &SeriesError{Series: series, Kind: ErrName, Detail: "the model has no input of this name"}
	}
	in := m.Inputs[idx]
	part := "input " + strconv.Quote(in.Series)
	if err := modelCheckPoly(in.Diff, part+" differencing"); err != nil {
		return Rational{}, err
	}
	if err := modelCheckPoly(m.Diff, "output "+m.Output+" differencing"); err != nil {
		return Rational{}, err
	}
	if _, err := in.rational(); err != nil {
		return Rational{}, err
	}
	num, den := pathPolys(in.Num, in.Diff, in.Den, m.Diff)
	return newRational(num, den, in.Delay)
}

// pathPolys returns Num D_i / (Den D) with the common factors of the
// two sides cancelled (see Model.Path).
func pathPolys(num, inDiff, den, outDiff Poly) (n, d []float64) {
	ui, ri := splitFactors(num, inDiff)
	uo, ro := splitFactors(den, outDiff)
	c := min(ui, uo)
	ui, uo = ui-c, uo-c
	for i := 0; i < len(ri); i++ {
		if !ri[i].fixed {
			continue
		}
		for j := range ro {
			if ro[j].fixed && len(ri[i].c) == len(ro[j].c) && poly.Equal(ri[i].c, ro[j].c, 0) {
				ri = append(ri[:i], ri[i+1:]...)
				ro = append(ro[:j], ro[j+1:]...)
				i--
				break
			}
		}
	}
	return expand(ri, ui), expand(ro, uo)
}

// expand multiplies out the factors rest times (1 - B)^unit, in order,
// as Poly.Coeffs does.
func expand(rest []diffFactor, unit int) []float64 {
	c := []float64{1}
	for _, f := range rest {
		c = poly.Mul(c, f.c)
	}
	return poly.Mul(c, poly.Pow([]float64{1, -1}, unit))
}

// diffFactor is one power of a factor's base other than (1 - B): its
// coefficients and whether they are all fixed numbers (only those
// cancel).
type diffFactor struct {
	c     []float64
	fixed bool
}

// splitFactors writes the product of the polynomials ps as (1 - B)^unit
// times rest, one entry of rest per power of each remaining factor base
// (a base equal to the constant 1 left out). Only factors written with
// fixed numbers give up their (1 - B) powers.
func splitFactors(ps ...Poly) (unit int, rest []diffFactor) {
	var fs []Factor
	for _, p := range ps {
		fs = append(fs, p.Factors...)
	}
	for _, f := range fs {
		base := Poly{Factors: []Factor{{Terms: f.Terms, Exp: 1}}}.Coeffs()
		fixed := true
		for _, t := range f.Terms {
			if t.Coef.Name != "" {
				fixed = false
			}
		}
		k := 0
		for fixed {
			q, ok := divFirstDiff(base)
			if !ok {
				break
			}
			base, k = q, k+1
		}
		unit += k * f.Exp
		if len(base) == 1 && base[0] == 1 {
			continue
		}
		for range f.Exp {
			rest = append(rest, diffFactor{c: base, fixed: fixed})
		}
	}
	return unit, rest
}

// divFirstDiff returns q with p = (1 - B) q exactly in float64 (each
// coefficient of the product computed back from q equal to p's), and
// whether there is one.
func divFirstDiff(p []float64) ([]float64, bool) {
	n := len(p)
	if n < 2 {
		return nil, false
	}
	q := make([]float64, n-1)
	s := 0.0
	for k := range q {
		s += p[k]
		q[k] = s
	}
	if q[0] != p[0] || -q[n-2] != p[n-1] {
		return nil, false
	}
	for k := 1; k < n-1; k++ {
		if q[k]-q[k-1] != p[k] {
			return nil, false
		}
	}
	return q, true
}
