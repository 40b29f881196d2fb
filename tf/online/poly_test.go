package online

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// The expanded coefficients and their derivatives, by the dual
// expansion of products and by the constant derivatives of one factor,
// agree with the model vocabulary's own expansion (tf.Poly.Coeffs) and
// product-rule derivatives (tf.Poly.Grad, internal/sym): an independent
// implementation of the same algebra. Tolerance 1e-12 relative: both
// sum a few products of numbers of order 1.
func TestPolyMapAgainstGrad(t *testing.T) {
	term := func(neg bool, name string, v float64, pow int) tf.Term {
		return tf.Term{Neg: neg, Coef: tf.Coef{Name: name, Value: v, Free: name != ""}, Power: pow}
	}
	polys := map[string]tf.Poly{
		"one factor":  {Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{term(false, "", 1, 0), term(true, "a", 0.7, 1), term(false, "b", 0.2, 2)}}}},
		"squared":     {Factors: []tf.Factor{{Exp: 2, Terms: []tf.Term{term(false, "", 1, 0), term(true, "a", 0.6, 1)}}}},
		"product":     {Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{term(false, "", 1, 0), term(true, "a", 0.5, 1)}}, {Exp: 3, Terms: []tf.Term{term(false, "", 1, 0), term(false, "b", 0.3, 2), term(true, "", 0.1, 1)}}}},
		"shared name": {Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{term(false, "a", 2, 0), term(true, "b", 0.4, 1)}}, {Exp: 1, Terms: []tf.Term{term(false, "", 1, 0), term(false, "a", 2, 3)}}}},
		"empty":       {},
	}
	names := []string{"a", "b"}
	idx := func(n string) int {
		for i, m := range names {
			if m == n {
				return i
			}
		}
		return -1
	}
	for name, p := range polys {
		t.Run(name, func(t *testing.T) {
			x := []float64{0, 0}
			p.Each(func(c *tf.Coef) {
				if k := idx(c.Name); k >= 0 {
					x[k] = c.Value
				}
			})
			m := newPolyMap(p, func(c tf.Coef) int { return idx(c.Name) }, x)
			c, d := p.Grad(idx, len(names))
			n := m.deg + 1
			for j := range n {
				want := 0.0
				if j < len(c) {
					want = c[j]
				}
				if math.Abs(m.c[j]-want) > 1e-12*math.Max(1, math.Abs(want)) {
					t.Errorf("c[%d] = %v, want %v (tf.Poly.Grad)", j, m.c[j], want)
				}
			}
			for l, k := range m.params {
				for j := range n {
					want := 0.0
					if d[k] != nil && j < len(d[k]) {
						want = d[k][j]
					}
					if got := m.d[l*n+j]; math.Abs(got-want) > 1e-12*math.Max(1, math.Abs(want)) {
						t.Errorf("d c[%d] / d %s = %v, want %v", j, names[k], got, want)
					}
				}
			}
		})
	}
}

// stable agrees with the root magnitudes from the companion-matrix
// eigenvalues (internal/poly.Roots, gonum mat.Eigen) on random
// polynomials of degree 1..6 whose roots are not within 1e-6 of the unit
// circle (where either test may round either way).
func TestStableAgainstRoots(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	buf := make([]float64, 8)
	checked := 0
	for range 3000 {
		deg := 1 + r.IntN(6)
		c := make([]float64, deg+1)
		c[0] = 1
		for j := 1; j <= deg; j++ {
			c[j] = (r.Float64()*2 - 1) * 1.5 / float64(j)
		}
		roots, err := poly.Roots(c)
		if err != nil {
			t.Fatal(err)
		}
		want, near := true, false
		for _, z := range roots {
			a := cmplx.Abs(z)
			want = want && a > 1
			near = near || math.Abs(a-1) < 1e-6
		}
		if near {
			continue
		}
		checked++
		if got := stable(c, buf); got != want {
			t.Fatalf("stable(%v) = %v, roots %v", c, got, roots)
		}
	}
	if checked < 2900 {
		t.Errorf("only %d polynomials checked", checked)
	}
	for _, tc := range []struct {
		c    []float64
		want bool
	}{
		{[]float64{1, -1}, false},     // a pole at z = 1
		{[]float64{1, -0.999}, true},  // just inside
		{[]float64{1, 0, 0}, true},    // poles at z = 0
		{[]float64{0, 1}, false},      // zero constant term
		{[]float64{1, -2, 1}, false},  // a double pole at z = 1
		{[]float64{1, 0, 0.25}, true}, // poles at +-0.5i
	} {
		if got := stable(tc.c, buf); got != tc.want {
			t.Errorf("stable(%v) = %v, want %v", tc.c, got, tc.want)
		}
	}
}
