package sym

import (
	"math"

	"github.com/backshift/backshift/internal/poly"
)

// Pos is a position in a spec text. Line and Column are 1-based and
// Column counts bytes; Offset is the 0-based byte offset. The zero Pos
// means "not from a spec" (a model built in code).
type Pos struct {
	Offset int
	Line   int
	Column int
}

// IsValid reports whether p points into a spec.
func (p Pos) IsValid() bool { return p.Line > 0 }

// Coef is one coefficient of a polynomial: a number written in the spec
// (Name == ""), or a named parameter. A named parameter is Free when it is
// to be estimated, with Value its start value (or, after a fit, the
// estimate); a named parameter that is not Free is held at Value.
// The same Name in two places of one model is one parameter.
type Coef struct {
	Name  string
	Value float64
	Free  bool
	Pos   Pos
}

// Term is the summand Sign * Coef * B^Power of a factor, Sign being -1
// when Neg.
type Term struct {
	Neg   bool
	Coef  Coef
	Power int
}

// Value returns the signed coefficient of the term.
func (t Term) Value() float64 {
	if t.Neg {
		return -t.Coef.Value
	}
	return t.Coef.Value
}

// Factor is (sum of Terms)^Exp, Exp >= 1.
type Factor struct {
	Terms []Term
	Exp   int
	Pos   Pos
}

// Coeffs returns the expanded coefficients of the factor before the power.
func (f Factor) base() []float64 {
	deg := 0
	for _, t := range f.Terms {
		deg = max(deg, t.Power)
	}
	c := make([]float64, deg+1)
	for _, t := range f.Terms {
		c[t.Power] += t.Value()
	}
	return c
}

// Poly is the product of its Factors; no factors is the constant 1.
type Poly struct {
	Factors []Factor
}

// FromCoeffs returns a Poly of one factor holding the fixed numbers c
// (index k = coefficient of B^k). Zero coefficients are left out, except
// that the constant term is always kept; negative numbers become Neg
// terms so that the polynomial prints as written by hand. An empty c gives
// the constant 1.
func FromCoeffs(c []float64) Poly {
	if len(c) == 0 {
		return Poly{}
	}
	f := Factor{Exp: 1}
	for k, v := range c {
		if v == 0 && k > 0 {
			continue
		}
		f.Terms = append(f.Terms, Term{Neg: math.Signbit(v) && v != 0, Coef: Coef{Value: math.Abs(v)}, Power: k})
	}
	return Poly{Factors: []Factor{f}}
}

// Coeffs returns the expanded coefficients, index k = coefficient of B^k.
// The result has at least one element.
func (p Poly) Coeffs() []float64 {
	c := []float64{1}
	for _, f := range p.Factors {
		c = poly.Mul(c, poly.Pow(f.base(), f.Exp))
	}
	return c
}

// Degree returns the degree of the expanded product as written (the sum
// of each factor's highest power times its exponent), whatever the values.
func (p Poly) Degree() int {
	d := 0
	for _, f := range p.Factors {
		m := 0
		for _, t := range f.Terms {
			m = max(m, t.Power)
		}
		d += m * f.Exp
	}
	return d
}

// IsOne reports whether p has no factors (the constant 1 as written).
func (p Poly) IsOne() bool { return len(p.Factors) == 0 }

// Clone returns a deep copy of p.
func (p Poly) Clone() Poly {
	if p.Factors == nil {
		return Poly{}
	}
	q := Poly{Factors: make([]Factor, len(p.Factors))}
	for i, f := range p.Factors {
		q.Factors[i] = Factor{Terms: append([]Term(nil), f.Terms...), Exp: f.Exp, Pos: f.Pos}
	}
	return q
}

// Each calls fn with a pointer to every coefficient of p in written order,
// so that a caller may read or set values. Use it on a Clone when the
// original must stay unchanged.
func (p Poly) Each(fn func(c *Coef)) {
	for i := range p.Factors {
		for j := range p.Factors[i].Terms {
			fn(&p.Factors[i].Terms[j].Coef)
		}
	}
}

// Equal reports whether p and q are written alike: the same factors,
// terms, signs, powers, names, freedom and values (values compared
// exactly), ignoring positions.
func (p Poly) Equal(q Poly) bool {
	return p.EqualFunc(q, func(t, u Term) bool {
		return t.Neg == u.Neg && t.Power == u.Power && t.Coef.Equal(u.Coef)
	})
}

// EqualFunc reports whether p and q have as many factors, with the same
// exponents and as many terms each, and eq holds for every pair of terms
// in the same place (in order); positions are ignored. Equal is
// EqualFunc with eq comparing sign, power and coefficient.
func (p Poly) EqualFunc(q Poly, eq func(t, u Term) bool) bool {
	if len(p.Factors) != len(q.Factors) {
		return false
	}
	for i, f := range p.Factors {
		g := q.Factors[i]
		if f.Exp != g.Exp || len(f.Terms) != len(g.Terms) {
			return false
		}
		for j, t := range f.Terms {
			if !eq(t, g.Terms[j]) {
				return false
			}
		}
	}
	return true
}

// Equal reports whether two coefficients agree in name, freedom and value
// (exactly, with NaN equal to NaN), ignoring positions.
func (c Coef) Equal(d Coef) bool {
	same := c.Value == d.Value || (math.IsNaN(c.Value) && math.IsNaN(d.Value))
	return c.Name == d.Name && c.Free == d.Free && same
}

// Grad returns the expanded coefficients of p and their derivatives with
// respect to the free parameters: index(name) gives a parameter's position
// in 0..n-1, or -1 for a coefficient that is held fixed. d[k] is the
// derivative of the coefficients with respect to parameter k, padded to
// len(c), or nil when p does not depend on parameter k.
//
// By the product rule, for a term s c B^m in factor j with exponent e_j,
//
//	dP/dc = s B^m e_j F_j^(e_j - 1) prod_{i != j} F_i^(e_i)
//
// where F_j is the factor's base polynomial.
func (p Poly) Grad(index func(name string) int, n int) (c []float64, d [][]float64) {
	c = p.Coeffs()
	d = make([][]float64, n)
	for j, f := range p.Factors {
		var rest []float64 // product of all but the base of factor j, computed once
		for _, t := range f.Terms {
			if t.Coef.Name == "" {
				continue
			}
			k := index(t.Coef.Name)
			if k < 0 {
				continue
			}
			if rest == nil {
				rest = []float64{float64(f.Exp)}
				rest = poly.Mul(rest, poly.Pow(f.base(), f.Exp-1))
				for i, g := range p.Factors {
					if i != j {
						rest = poly.Mul(rest, poly.Pow(g.base(), g.Exp))
					}
				}
			}
			s := 1.0
			if t.Neg {
				s = -1
			}
			if d[k] == nil {
				d[k] = make([]float64, len(c))
			}
			for m, v := range rest {
				if m+t.Power < len(c) {
					d[k][m+t.Power] += s * v
				}
			}
		}
	}
	return c, d
}
