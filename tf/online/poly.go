package online

import (
	"math"

	"github.com/backshift/backshift/tf"
)

// termMap is one term of a factor: Sign * coefficient * B^power, the
// coefficient being parameter k (k >= 0, local index l among the
// polynomial's parameters) or the fixed number value (k < 0).
type termMap struct {
	power int
	sign  float64
	k, l  int
	value float64
}

// freeTerm is a free term of an affine polynomial: sign * x[k] B^power.
type freeTerm struct {
	power, k int
	sign     float64
}

// factorMap is one factor (sum of terms)^exp.
type factorMap struct {
	terms []termMap
	exp   int
	deg   int
}

// polyMap evaluates one polynomial of the model, written as a product
// of factors, at the current parameter vector: its expanded
// coefficients c (index j = coefficient of B^j) and their derivatives
// d[l*(deg+1)+j] = dc_j / dp_params[l]. A polynomial of one factor
// written once (the usual case) is affine in its parameters, so its
// derivatives are constant and eval only sums terms; a product of
// factors is expanded in forward-mode dual numbers (value and
// derivatives carried together through each multiplication) into
// buffers allocated once.
type polyMap struct {
	deg     int
	factors []factorMap
	params  []int
	affine  bool
	c, d    []float64
	// base and terms: an affine polynomial's fixed part and its free
	// terms, so that eval only adds the terms.
	base  []float64
	terms []freeTerm
	// scratch of the dual expansion: a factor's base (fc, fd) and a
	// product (pc, pd).
	fc, fd, pc, pd []float64
}

// newPolyMap binds p to the parameter vector (index gives a free
// coefficient's parameter index, -1 for a fixed or held one) and
// evaluates it at x.
func newPolyMap(p tf.Poly, index func(tf.Coef) int, x []float64) *polyMap {
	m := &polyMap{deg: p.Degree()}
	local := map[int]int{}
	for _, f := range p.Factors {
		fm := factorMap{exp: f.Exp}
		for _, t := range f.Terms {
			tm := termMap{power: t.Power, sign: 1, k: index(t.Coef), l: -1, value: t.Coef.Value}
			if t.Neg {
				tm.sign = -1
			}
			if tm.k >= 0 {
				l, ok := local[tm.k]
				if !ok {
					l = len(m.params)
					local[tm.k] = l
					m.params = append(m.params, tm.k)
				}
				tm.l = l
			}
			fm.deg = max(fm.deg, t.Power)
			fm.terms = append(fm.terms, tm)
		}
		m.factors = append(m.factors, fm)
	}
	m.affine = len(m.factors) == 0 || len(m.factors) == 1 && m.factors[0].exp == 1
	n := m.deg + 1
	m.c = make([]float64, n)
	m.d = make([]float64, len(m.params)*n)
	if !m.affine {
		m.fc, m.pc = make([]float64, n), make([]float64, n)
		m.fd, m.pd = make([]float64, len(m.d)), make([]float64, len(m.d))
	} else {
		m.base = make([]float64, n)
		if len(m.factors) == 0 {
			m.base[0] = 1
		}
		for _, f := range m.factors {
			for _, t := range f.terms {
				if t.l >= 0 {
					m.d[t.l*n+t.power] += t.sign
					m.terms = append(m.terms, freeTerm{power: t.power, k: t.k, sign: t.sign})
				} else {
					m.base[t.power] += t.sign * t.value
				}
			}
		}
	}
	m.eval(x)
	return m
}

// free reports whether the polynomial depends on a free parameter.
func (m *polyMap) free() bool { return len(m.params) > 0 }

// eval sets c (and, for a product, d) at the parameter vector x.
func (m *polyMap) eval(x []float64) {
	if !m.affine {
		m.evalProduct(x)
		return
	}
	c := m.c
	for j, v := range m.base[:len(c)] {
		c[j] = v
	}
	for _, t := range m.terms {
		c[t.power] += t.sign * x[t.k]
	}
}

// evalProduct is eval for a product of factors: the dual expansion.
func (m *polyMap) evalProduct(x []float64) {
	n := m.deg + 1
	clear(m.c)
	clear(m.d)
	m.c[0] = 1
	top := 0 // degree of the product so far
	for _, f := range m.factors {
		clear(m.fc)
		clear(m.fd)
		for _, t := range f.terms {
			v := t.value
			if t.k >= 0 {
				v = x[t.k]
				m.fd[t.l*n+t.power] += t.sign
			}
			m.fc[t.power] += t.sign * v
		}
		for e := 0; e < f.exp; e++ {
			m.mulFactor(top, f.deg)
			top += f.deg
		}
	}
}

// mulFactor multiplies the dual polynomial (c, d) of degree top by the
// factor base (fc, fd) of degree fdeg, by the product rule.
func (m *polyMap) mulFactor(top, fdeg int) {
	n := m.deg + 1
	clear(m.pc)
	clear(m.pd)
	for i := 0; i <= top; i++ {
		for j := 0; j <= fdeg; j++ {
			m.pc[i+j] += m.c[i] * m.fc[j]
		}
	}
	for l := range m.params {
		d, fd, pd := m.d[l*n:(l+1)*n], m.fd[l*n:(l+1)*n], m.pd[l*n:(l+1)*n]
		for i := 0; i <= top; i++ {
			for j := 0; j <= fdeg; j++ {
				pd[i+j] += d[i]*m.fc[j] + m.c[i]*fd[j]
			}
		}
	}
	copy(m.c, m.pc)
	copy(m.d, m.pd)
}

// sum returns the sum of the coefficients, the polynomial at B = 1.
func (m *polyMap) sum() float64 {
	s := 0.0
	for _, v := range m.c {
		s += v
	}
	return s
}

// stable reports whether every root of the polynomial c(B) (index j =
// coefficient of B^j) lies strictly outside the unit circle, that is
// every pole z = 1/root of the reversed polynomial c_0 z^r + c_1 z^(r-1)
// + ... + c_r strictly inside it, by the Schur-Cohn step-down recursion:
// with k = c_r/c_0, the polynomial is stable exactly when |k| < 1 and
// the polynomial of degree r-1 with coefficients c_j - k c_(r-j) is
// stable (Astrom & Wittenmark, Computer-Controlled Systems, 3rd ed.,
// ch. 3, the Jury/Schur-Cohn test, chapter from memory; the reflection
// coefficients of the Levinson recursion). buf holds at least len(c) values and is
// overwritten. A zero leading coefficient c_r lowers the degree (a pole
// at z = 0); a zero c_0 is not stable.
func stable(c, buf []float64) bool {
	if len(c) == 2 && c[1] != 0 {
		return math.Abs(c[1]) < math.Abs(c[0]) // |k| < 1 without the division
	}
	r := len(c) - 1
	for r > 0 && c[r] == 0 {
		r--
	}
	a := buf[:r+1]
	copy(a, c)
	if !(a[0] != 0) || math.IsInf(a[0], 0) {
		return false
	}
	if r == 1 {
		return math.Abs(a[1]/a[0]) < 1
	}
	for n := r; n >= 1; n-- {
		k := a[n] / a[0]
		if !(math.Abs(k) < 1) {
			return false
		}
		for i, j := 0, n; i <= j; i, j = i+1, j-1 {
			ai, aj := a[i], a[j]
			a[i] = ai - k*aj
			if i != j {
				a[j] = aj - k*ai
			}
		}
	}
	return true
}
