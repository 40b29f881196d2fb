package poly

import (
	"errors"
	"math"
	"math/cmplx"
	"sort"

	"gonum.org/v1/gonum/mat"
)

// ErrRoots is returned when the eigenvalue solver behind Roots fails, or
// when a coefficient is NaN or infinite.
var ErrRoots = errors.New("poly: root finding failed")

// ErrTooLong is returned by Roots for polynomials of degree above MaxDegree.
var ErrTooLong = errors.New("poly: degree above the root finder's limit")

// Roots returns the roots in B of a, that is the values where a(B) = 0,
// sorted by increasing magnitude and then by argument. The zero polynomial
// and constants have no roots (nil, nil). Zero low-order coefficients give
// roots exactly at 0.
//
// The roots are the eigenvalues of the companion matrix of a (gonum
// mat.Eigen), each polished by up to eight Newton steps on a itself that
// are kept only while they reduce |a(r)|. For well separated roots this
// gives about 1e-12 relative accuracy; multiple roots are accurate only to
// about eps^(1/m) for multiplicity m, as for any method.
func Roots(a []float64) ([]complex128, error) {
	for _, v := range a {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, ErrRoots
		}
	}
	n := Degree(a)
	if n <= 0 {
		return nil, nil
	}
	if n > MaxDegree {
		return nil, ErrTooLong
	}
	// Roots at zero.
	z := 0
	for a[z] == 0 {
		z++
	}
	c := a[z : n+1]
	m := len(c) - 1
	roots := make([]complex128, 0, n)
	for i := 0; i < z; i++ {
		roots = append(roots, 0)
	}
	switch {
	case m == 1:
		roots = append(roots, complex(-c[0]/c[1], 0))
	case m == 2:
		roots = append(roots, quadratic(c[0], c[1], c[2])...)
	case m > 2:
		rs, err := companionRoots(c)
		if err != nil {
			return nil, err
		}
		roots = append(roots, rs...)
	}
	sort.SliceStable(roots, func(i, j int) bool {
		ai, aj := cmplx.Abs(roots[i]), cmplx.Abs(roots[j])
		if ai != aj {
			return ai < aj
		}
		return cmplx.Phase(roots[i]) < cmplx.Phase(roots[j])
	})
	return roots, nil
}

// companionRoots returns the roots of c (degree m > 2, c[m] != 0) as the
// eigenvalues of the companion matrix of the monic c/c[m], each polished
// on c, with imaginary parts below 1e-14 of the magnitude set to 0 so
// that conjugate symmetry is exact for real polynomials.
func companionRoots(c []float64) ([]complex128, error) {
	m := len(c) - 1
	roots := make([]complex128, 0, m)
	// Companion matrix of the monic c/c[m]: ones on the subdiagonal,
	// -c[k]/c[m] in the last column.
	comp := mat.NewDense(m, m, nil)
	for i := 1; i < m; i++ {
		comp.Set(i, i-1, 1)
	}
	for i := 0; i < m; i++ {
		comp.Set(i, m-1, -c[i]/c[m])
	}
	var eig mat.Eigen
	if !eig.Factorize(comp, mat.EigenNone) {
		return nil, ErrRoots
	}
	for _, r := range eig.Values(nil) {
		roots = append(roots, polish(c, r))
	}
	for i, r := range roots {
		if math.Abs(imag(r)) <= 1e-14*cmplx.Abs(r) {
			roots[i] = complex(real(r), 0)
		}
	}
	return roots, nil
}

// quadratic returns the roots of c0 + c1 x + c2 x^2 without cancellation.
func quadratic(c0, c1, c2 float64) []complex128 {
	d := c1*c1 - 4*c2*c0
	if d >= 0 {
		s := math.Sqrt(d)
		q := -0.5 * (c1 + math.Copysign(s, c1))
		if q == 0 {
			return []complex128{0, 0}
		}
		return []complex128{complex(q/c2, 0), complex(c0/q, 0)}
	}
	re := -c1 / (2 * c2)
	im := math.Sqrt(-d) / (2 * math.Abs(c2))
	return []complex128{complex(re, -im), complex(re, im)}
}

// polish refines a root r of c by Newton's method while |c(r)| decreases.
func polish(c []float64, r complex128) complex128 {
	best := cmplx.Abs(Eval(c, r))
	for it := 0; it < 8 && best > 0; it++ {
		var p, dp complex128
		for k := len(c) - 1; k >= 0; k-- {
			dp = dp*r + p
			p = p*r + complex(c[k], 0)
		}
		if dp == 0 {
			break
		}
		next := r - p/dp
		v := cmplx.Abs(Eval(c, next))
		if !(v < best) {
			break
		}
		r, best = next, v
	}
	return r
}

// InvertInside returns a with every root in B strictly inside the unit
// circle (|B| < 1, a z-plane root z = 1/B outside it) replaced by its
// inverse 1/B, the constant term kept: a(B) = a_0 prod_i (1 - z_i B)
// becomes a_0 prod_i (1 - w_i B) with w_i = 1/z_i where |z_i| > 1 and
// w_i = z_i otherwise. ratio is prod |z_i|^2 over the inverted roots, so
// that an MA polynomial a with innovation variance s2 and the result
// with variance s2*ratio have the same autocovariances (Brockwell &
// Davis 1991, section 4.4): the exact Gaussian likelihood of an MA part
// is the same for both. changed reports whether any root was inverted
// (out is then a new slice of len(a); otherwise out is a copy of a).
// Roots on the circle are kept. The error is the root finder's
// (ErrRoots, ErrTooLong), or ErrRoots when a_0 is 0.
func InvertInside(a []float64) (out []float64, ratio float64, changed bool, err error) {
	out = append([]float64(nil), a...)
	d := Degree(a)
	if d <= 0 {
		return out, 1, false, nil
	}
	if a[0] == 0 {
		return out, 1, false, ErrRoots
	}
	zs, err := Roots(Reciprocal(a[:d+1]))
	if err != nil {
		return out, 1, false, err
	}
	ratio = 1
	for i, z := range zs {
		if m := cmplx.Abs(z); m > 1 {
			zs[i] = 1 / z
			ratio *= m * m
			changed = true
		}
	}
	if !changed {
		return out, 1, false, nil
	}
	c := FromInverseRoots(zs)
	for k := range out {
		out[k] = 0
		if k < len(c) {
			out[k] = a[0] * c[k]
		}
	}
	return out, ratio, true, nil
}

// FactorMap ties one factor of a product polynomial to a parameter
// vector x: the factor is C0 + sum_p Sign[p] x[Index[p]] B^p over the
// powers p >= 1 with Index[p] >= 0 (Index[0] and Sign[0] are unused).
// A factor is rewritable by InvertFactors when it has one such term (all
// its roots then have one modulus, so inverting them keeps its form) or
// one at every power 1..len(Index)-1.
type FactorMap struct {
	C0    float64
	Index []int
	Sign  []float64
}

// InvertFactors inverts, in x, the roots of each factor fs[i] inside
// the unit circle in B (z-plane roots outside it), as InvertInside: the
// MA part that is their product then has the same exact Gaussian
// likelihood with sigma^2 concentrated out. A one-term factor
// C0 + c B^s becomes C0 + (C0^2/c) B^s when |c| > |C0|. changed reports
// whether x was modified; the error is the root finder's (the factors
// before it are inverted).
func InvertFactors(fs []FactorMap, x []float64) (changed bool, err error) {
	for _, f := range fs {
		base := make([]float64, len(f.Index))
		base[0] = f.C0
		nfree, last := 0, 0
		for p := 1; p < len(f.Index); p++ {
			if k := f.Index[p]; k >= 0 {
				base[p] = f.Sign[p] * x[k]
				nfree, last = nfree+1, p
			}
		}
		var out []float64
		if nfree == 1 {
			c := base[last]
			if !(math.Abs(c) > math.Abs(f.C0)) {
				continue
			}
			out = append([]float64(nil), base...)
			out[last] = f.C0 * f.C0 / c
		} else {
			var ch bool
			if out, _, ch, err = InvertInside(base); err != nil {
				return changed, err
			}
			if !ch {
				continue
			}
		}
		for p := 1; p < len(f.Index); p++ {
			if k := f.Index[p]; k >= 0 {
				x[k] = f.Sign[p] * out[p]
			}
		}
		changed = true
	}
	return changed, nil
}

// TermRef is one term of a factor as NewFactorMap reads it: Sign * v *
// B^Power, where v is x[Index] for a free coefficient (Index >= 0) and
// Value for a fixed one (Index < 0).
type TermRef struct {
	Power int
	Index int
	Sign  float64
	Value float64
}

// NewFactorMap returns the FactorMap of a factor with terms ts, where
// uses(k) counts the coefficients of the whole model that x[k] sets.
// free reports whether the factor has free terms; ok whether
// InvertFactors can rewrite it in its own coefficients (a factor without
// free terms never changes: ok): one fixed non-zero constant term, every
// other term free with a power of its own and a parameter used nowhere
// else, and one free term or one at every power up to the degree
// (inverting some roots of a sparse factor would give powers it does not
// have).
func NewFactorMap(ts []TermRef, uses func(k int) int) (fm FactorMap, free, ok bool) {
	m, nfree := 0, 0
	for _, t := range ts {
		m = max(m, t.Power)
		if t.Index >= 0 {
			nfree++
		}
	}
	if nfree == 0 {
		return fm, false, true
	}
	fm = FactorMap{Index: make([]int, m+1), Sign: make([]float64, m+1)}
	for p := range fm.Index {
		fm.Index[p] = -1
	}
	c0set := false
	for _, t := range ts {
		switch {
		case t.Power == 0 && t.Index < 0 && !c0set:
			fm.C0, c0set = t.Sign*t.Value, true
		case t.Power > 0 && t.Index >= 0 && fm.Index[t.Power] < 0 && uses(t.Index) == 1:
			fm.Index[t.Power], fm.Sign[t.Power] = t.Index, t.Sign
		default:
			return fm, true, false
		}
	}
	return fm, true, c0set && fm.C0 != 0 && (nfree == 1 || nfree == m)
}
