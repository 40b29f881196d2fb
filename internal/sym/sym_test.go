package sym

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats"
)

func named(name string, v float64, neg bool, pow int) Term {
	return Term{Neg: neg, Coef: Coef{Name: name, Value: v, Free: true}, Power: pow}
}

func fixed(v float64, neg bool, pow int) Term {
	return Term{Neg: neg, Coef: Coef{Value: v}, Power: pow}
}

// (1 - p1 B)(1 - P1 B^12) expands to 1 - p1 B - P1 B^12 + p1 P1 B^13:
// multiplication of polynomials (common practice). By hand with p1 = 0.5,
// P1 = 0.3: p1 P1 = 0.15; 0.5 * 0.3 only halves the float64 of 0.3, which
// is the float64 of 0.15 (checked with /usr/bin/python3: 0.5*0.3 == 0.15), so
// every coefficient is exact and 1e-15 is slack, not error allowance.
func TestCoeffsSeasonalProduct(t *testing.T) {
	p := Poly{Factors: []Factor{
		{Terms: []Term{fixed(1, false, 0), named("p1", 0.5, true, 1)}, Exp: 1},
		{Terms: []Term{fixed(1, false, 0), named("P1", 0.3, true, 12)}, Exp: 1},
	}}
	want := make([]float64, 14)
	want[0], want[1], want[12], want[13] = 1, -0.5, -0.3, 0.15
	if got := p.Coeffs(); !floats.EqualApprox(got, want, 1e-15) {
		t.Fatalf("Coeffs = %v, want %v", got, want)
	}
	if d := p.Degree(); d != 13 {
		t.Fatalf("Degree = %d, want 13", d)
	}
}

// (1 - B)^2 = 1 - 2B + B^2 (binomial theorem); integers, compared exactly.
func TestCoeffsPower(t *testing.T) {
	p := Poly{Factors: []Factor{{Terms: []Term{fixed(1, false, 0), fixed(1, true, 1)}, Exp: 2}}}
	if got, want := p.Coeffs(), []float64{1, -2, 1}; !floats.Equal(got, want) {
		t.Fatalf("Coeffs = %v, want %v", got, want)
	}
}

// FromCoeffs then Coeffs gives back the input exactly (by construction:
// one factor of single terms, no arithmetic on the values).
func TestFromCoeffsRoundTrip(t *testing.T) {
	c := []float64{1, -0.25, 0, 1.5}
	p := FromCoeffs(c)
	if got := p.Coeffs(); !floats.Equal(got, c) {
		t.Fatalf("Coeffs = %v, want %v", got, c)
	}
	if len(p.Factors[0].Terms) != 3 || !p.Factors[0].Terms[1].Neg {
		t.Fatalf("FromCoeffs terms = %+v, want zero left out and a Neg term", p.Factors[0].Terms)
	}
	if q := FromCoeffs(nil); !q.IsOne() || len(q.Coeffs()) != 1 {
		t.Fatalf("FromCoeffs(nil) = %+v, want the constant 1", q)
	}
}

// Grad against central finite differences (common practice: step 1e-6,
// truncation error O(h^2) ~ 1e-12 times the third derivative, rounding
// error about eps |c| / h ~ 2.2e-10 |c|). With this seed the expanded
// coefficients stay below 4.6 in magnitude and the worst difference is
// 5.4e-10 (measured), so 1e-7 absolute leaves a margin of about 200.
func TestGradFiniteDifference(t *testing.T) {
	rnd := rand.New(rand.NewPCG(3, 4))
	names := []string{"a", "b", "c"}
	idx := func(s string) int {
		for i, n := range names {
			if n == s {
				return i
			}
		}
		return -1
	}
	for trial := 0; trial < 50; trial++ {
		var p Poly
		nf := 1 + rnd.IntN(3)
		for f := 0; f < nf; f++ {
			fa := Factor{Exp: 1 + rnd.IntN(3), Terms: []Term{fixed(1, false, 0)}}
			nt := 1 + rnd.IntN(3)
			for k := 0; k < nt; k++ {
				pow := 1 + rnd.IntN(4)
				if rnd.IntN(4) == 0 {
					fa.Terms = append(fa.Terms, fixed(rnd.Float64(), rnd.IntN(2) == 0, pow))
				} else {
					fa.Terms = append(fa.Terms, named(names[rnd.IntN(3)], rnd.Float64()-0.5, rnd.IntN(2) == 0, pow))
				}
			}
			p.Factors = append(p.Factors, fa)
		}
		c, d := p.Grad(idx, len(names))
		if !floats.Equal(c, p.Coeffs()) {
			t.Fatalf("Grad coefficients differ from Coeffs")
		}
		for k, name := range names {
			const h = 1e-6
			up, dn := p.Clone(), p.Clone()
			up.Each(func(c *Coef) {
				if c.Name == name {
					c.Value += h
				}
			})
			dn.Each(func(c *Coef) {
				if c.Name == name {
					c.Value -= h
				}
			})
			cu, cd := up.Coeffs(), dn.Coeffs()
			for m := range c {
				fd := (cu[m] - cd[m]) / (2 * h)
				var g float64
				if d[k] != nil {
					g = d[k][m]
				}
				if !(math.Abs(fd-g) <= 1e-7) { // a NaN fails too
					t.Fatalf("trial %d: d coef[%d]/d %s = %v, finite difference %v", trial, m, name, g, fd)
				}
			}
		}
	}
}

// Clone copies the terms: changing the clone leaves the original as it was.
func TestCloneIsDeep(t *testing.T) {
	p := Poly{Factors: []Factor{{Terms: []Term{fixed(1, false, 0), named("a", 0.5, true, 1)}, Exp: 1}}}
	q := p.Clone()
	q.Each(func(c *Coef) { c.Value = 9 })
	if p.Factors[0].Terms[1].Coef.Value != 0.5 {
		t.Fatal("Clone shares terms with the original")
	}
	if p.Equal(q) || !p.Equal(p.Clone()) {
		t.Fatal("Equal does not compare values")
	}
}

// EqualFunc walks the factors and terms in order and asks eq about each
// pair; a different shape (factor count, exponent, term count) is never
// equal, whatever eq says.
func TestEqualFunc(t *testing.T) {
	// 1 - 0.5 B written with the sign on the term, and 1 + (-0.5) B.
	p := Poly{Factors: []Factor{{Terms: []Term{fixed(1, false, 0), fixed(0.5, true, 1)}, Exp: 1}}}
	q := Poly{Factors: []Factor{{Terms: []Term{fixed(1, false, 0), fixed(-0.5, false, 1)}, Exp: 1}}}
	signed := func(t, u Term) bool { return t.Power == u.Power && t.Value() == u.Value() }
	always := func(t, u Term) bool { return true }
	squared := Poly{Factors: []Factor{{Terms: p.Factors[0].Terms, Exp: 2}}}
	longer := Poly{Factors: []Factor{{Terms: append(p.Clone().Factors[0].Terms, fixed(0.1, false, 2)), Exp: 1}}}
	twoFactors := Poly{Factors: []Factor{p.Factors[0], p.Factors[0]}}
	for _, c := range []struct {
		name string
		a, b Poly
		eq   func(t, u Term) bool
		want bool
	}{
		{"signed values agree", p, q, signed, true},
		{"Equal's terms differ in sign", p, q, nil, false},
		{"exponent", p, squared, always, false},
		{"term count", p, longer, always, false},
		{"factor count", p, twoFactors, always, false},
		{"empty", Poly{}, Poly{}, always, true},
	} {
		var got bool
		if c.eq == nil {
			got = c.a.Equal(c.b)
		} else {
			got = c.a.EqualFunc(c.b, c.eq)
		}
		if got != c.want {
			t.Errorf("%s: got %v, want %v", c.name, got, c.want)
		}
	}
}
