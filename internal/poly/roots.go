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
