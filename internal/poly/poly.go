package poly

import (
	"math"
	"math/cmplx"
)

// MaxDegree is the largest degree the root finder is tested for. Longer
// polynomials work for arithmetic; Roots rejects them.
const MaxDegree = 256

// Degree returns the index of the highest non-zero coefficient, or -1 for
// the zero polynomial (an empty slice or all zeros).
func Degree(a []float64) int {
	for k := len(a) - 1; k >= 0; k-- {
		if a[k] != 0 {
			return k
		}
	}
	return -1
}

// Trim returns a copy of a without the highest-power coefficients whose
// magnitude is at most tol times the largest magnitude in a. The zero
// polynomial trims to an empty slice.
func Trim(a []float64, tol float64) []float64 {
	m := 0.0
	for _, v := range a {
		m = math.Max(m, math.Abs(v))
	}
	n := len(a)
	for n > 0 && math.Abs(a[n-1]) <= tol*m {
		n--
	}
	return append([]float64(nil), a[:n]...)
}

// Add returns a + b.
func Add(a, b []float64) []float64 {
	n := max(len(a), len(b))
	c := make([]float64, n)
	copy(c, a)
	for k, v := range b {
		c[k] += v
	}
	return c
}

// Sub returns a - b.
func Sub(a, b []float64) []float64 {
	n := max(len(a), len(b))
	c := make([]float64, n)
	copy(c, a)
	for k, v := range b {
		c[k] -= v
	}
	return c
}

// Scale returns s*a.
func Scale(s float64, a []float64) []float64 {
	c := make([]float64, len(a))
	for k, v := range a {
		c[k] = s * v
	}
	return c
}

// Mul returns the product a*b. The product with an empty polynomial is empty.
func Mul(a, b []float64) []float64 {
	if len(a) == 0 || len(b) == 0 {
		return nil
	}
	c := make([]float64, len(a)+len(b)-1)
	for i, x := range a {
		if x == 0 {
			continue
		}
		for j, y := range b {
			c[i+j] += x * y
		}
	}
	return c
}

// Pow returns a^k for k >= 0; a^0 is {1}. Pow panics if k < 0.
func Pow(a []float64, k int) []float64 {
	if k < 0 {
		panic("poly: negative power")
	}
	r := []float64{1}
	for ; k > 0; k-- {
		r = Mul(r, a)
	}
	return r
}

// Shift returns B^d a, that is a with d zeros prepended. Shift panics if d < 0.
func Shift(a []float64, d int) []float64 {
	if d < 0 {
		panic("poly: negative shift")
	}
	c := make([]float64, d+len(a))
	copy(c[d:], a)
	return c
}

// Eval returns a(x) at a complex point by Horner's rule.
func Eval(a []float64, x complex128) complex128 {
	var s complex128
	for k := len(a) - 1; k >= 0; k-- {
		s = s*x + complex(a[k], 0)
	}
	return s
}

// EvalReal returns a(x) at a real point.
func EvalReal(a []float64, x float64) float64 {
	s := 0.0
	for k := len(a) - 1; k >= 0; k-- {
		s = s*x + a[k]
	}
	return s
}

// Derivative returns da/dB.
func Derivative(a []float64) []float64 {
	if len(a) <= 1 {
		return nil
	}
	c := make([]float64, len(a)-1)
	for k := 1; k < len(a); k++ {
		c[k-1] = float64(k) * a[k]
	}
	return c
}

// Equal reports whether a and b agree coefficient by coefficient within
// tol, absolute, treating missing high-order coefficients as zero.
func Equal(a, b []float64, tol float64) bool {
	n := max(len(a), len(b))
	for k := 0; k < n; k++ {
		var x, y float64
		if k < len(a) {
			x = a[k]
		}
		if k < len(b) {
			y = b[k]
		}
		if !(math.Abs(x-y) <= tol) {
			return false
		}
	}
	return true
}

// FromRoots returns the monic polynomial prod_i (B - r_i). Complex roots
// must come in conjugate pairs for the result to be real; the imaginary
// parts that remain from rounding are dropped.
func FromRoots(roots []complex128) []float64 {
	c := []complex128{1}
	for _, r := range roots {
		n := make([]complex128, len(c)+1)
		for k, v := range c {
			n[k+1] += v
			n[k] -= r * v
		}
		c = n
	}
	return realParts(c)
}

// FromInverseRoots returns prod_i (1 - z_i B), the polynomial with constant
// term 1 whose roots are 1/z_i. This builds a denominator delta(B) from its
// z-plane poles z_i. Conjugate pairs give a real result.
func FromInverseRoots(zs []complex128) []float64 {
	c := []complex128{1}
	for _, z := range zs {
		n := make([]complex128, len(c)+1)
		for k, v := range c {
			n[k] += v
			n[k+1] -= z * v
		}
		c = n
	}
	return realParts(c)
}

func realParts(c []complex128) []float64 {
	out := make([]float64, len(c))
	for k, v := range c {
		out[k] = real(v)
	}
	return out
}

// Reciprocal returns the coefficients in reverse order: B^n a(1/B) for
// n = len(a)-1. The roots of the reciprocal are the inverses of the roots
// of a, which is how z-plane poles (z = 1/B) are read off a polynomial in B.
func Reciprocal(a []float64) []float64 {
	c := make([]float64, len(a))
	for k, v := range a {
		c[len(a)-1-k] = v
	}
	return c
}

// MaxAbsRoot helps callers compare root sets; it returns max |r|, or 0 for none.
func MaxAbsRoot(roots []complex128) float64 {
	m := 0.0
	for _, r := range roots {
		m = math.Max(m, cmplx.Abs(r))
	}
	return m
}
