package poly

import (
	"math"
	"math/rand/v2"
	"testing"
)

// maAutocov returns s2 * sum_j a_j a_{j+k}, k = 0..len(a)-1: the
// autocovariances of the MA process a(B) e_t with var(e_t) = s2
// (Brockwell & Davis 1991, eq. 3.2.3).
func maAutocov(a []float64, s2 float64) []float64 {
	g := make([]float64, len(a))
	for k := range a {
		for j := 0; j+k < len(a); j++ {
			g[k] += s2 * a[j] * a[j+k]
		}
	}
	return g
}

// TestInvertInsideMA1: 1 + 2B becomes 1 + 0.5B with the variance ratio
// 4, the textbook pair theta, 1/theta with sigma^2 theta^2 (Brockwell &
// Davis 1991, section 3.1, example 3.1.2; exact in floating point here:
// one real root, tolerance 1e-15).
func TestInvertInsideMA1(t *testing.T) {
	out, ratio, changed, err := InvertInside([]float64{1, 2})
	if err != nil || !changed {
		t.Fatal(err, changed)
	}
	if math.Abs(out[0]-1) > 1e-15 || math.Abs(out[1]-0.5) > 1e-15 || math.Abs(ratio-4) > 1e-14 {
		t.Errorf("got %v ratio %v, want [1 0.5] ratio 4", out, ratio)
	}
	in := []float64{1, -0.4}
	out, ratio, changed, err = InvertInside(in)
	if err != nil || changed || ratio != 1 || out[1] != -0.4 {
		t.Errorf("invertible 1 - 0.4B: got %v %v %v %v", out, ratio, changed, err)
	}
	out[1] = 9
	if in[1] != -0.4 {
		t.Error("the input was modified")
	}
}

// TestInvertInsideKeepsAutocovariances: for random polynomials of degree
// 1 to 6 with some roots inside the unit circle (seeded), the result has
// no root inside, its constant term is kept, and with the variance
// scaled by ratio its autocovariances equal those of the input, the
// invariance of Brockwell & Davis 1991, section 4.4 (proposition 3.5.1
// / the spectral density |theta(e^-iw)|^2 sigma^2 is unchanged when a
// root factor (1 - zB) becomes |z|^2 (1 - B/z)); tolerance 1e-10
// relative to gamma_0, a few hundred eps of the root finder's accuracy.
func TestInvertInsideKeepsAutocovariances(t *testing.T) {
	rng := rand.New(rand.NewPCG(14, 3))
	for trial := 0; trial < 200; trial++ {
		q := 1 + rng.IntN(6)
		a := make([]float64, q+1)
		a[0] = 0.5 + rng.Float64()
		for k := 1; k <= q; k++ {
			a[k] = 3 * (rng.Float64() - 0.5)
		}
		out, ratio, _, err := InvertInside(a)
		if err != nil {
			t.Fatal(err)
		}
		if out[0] != a[0] {
			t.Fatalf("%v: constant %v", a, out[0])
		}
		zs, err := Roots(Reciprocal(out))
		if err != nil {
			t.Fatal(err)
		}
		if m := MaxAbsRoot(zs); m > 1+1e-9 {
			t.Errorf("%v -> %v: z-plane root of modulus %v", a, out, m)
		}
		g0, g1 := maAutocov(a, 1), maAutocov(out, ratio)
		for k := range g0 {
			if math.Abs(g0[k]-g1[k]) > 1e-10*g0[0] {
				t.Errorf("%v -> %v (ratio %v): gamma_%d %v vs %v", a, out, ratio, k, g0[k], g1[k])
			}
		}
	}
}

// TestInvertInsideErrors: a zero constant term and NaN coefficients
// are ErrRoots.
func TestInvertInsideErrors(t *testing.T) {
	if _, _, _, err := InvertInside([]float64{0, 1}); err != ErrRoots {
		t.Errorf("zero constant: %v", err)
	}
	if _, _, _, err := InvertInside([]float64{1, math.NaN()}); err != ErrRoots {
		t.Errorf("NaN: %v", err)
	}
}

// TestInvertFactors: (1 + x0 B - x1 B^2) (1 + x2 B^4) with x = (2.5, -1,
// 3): the first factor 1 + 2.5B + B^2 = (1 + 2B)(1 + 0.5B) becomes
// (1 + 0.5B)^2 = 1 + B + 0.25B^2, so x0 = 1, x1 = -0.25; the one-term
// factor 1 + 3B^4 becomes 1 + B^4/3 (all four roots inverted,
// Brockwell & Davis 1991, section 4.4). Hand-computed; tolerance 1e-13,
// the root finder's accuracy for well separated roots. An invertible x
// is left as it is.
func TestInvertFactors(t *testing.T) {
	fs := []FactorMap{
		{C0: 1, Index: []int{-1, 0, 1}, Sign: []float64{0, 1, -1}},
		{C0: 1, Index: []int{-1, -1, -1, -1, 2}, Sign: []float64{0, 0, 0, 0, 1}},
	}
	x := []float64{2.5, -1, 3}
	changed, err := InvertFactors(fs, x)
	want := []float64{1, -0.25, 1.0 / 3}
	if err != nil || !changed {
		t.Fatal(changed, err)
	}
	for k := range x {
		if math.Abs(x[k]-want[k]) > 1e-13 {
			t.Errorf("x = %v, want %v", x, want)
			break
		}
	}
	changed, err = InvertFactors(fs, x)
	if err != nil || changed {
		t.Errorf("invertible x changed: %v %v", changed, err)
	}
}

// TestNewFactorMap: which factors InvertFactors can rewrite (the rule
// of NewFactorMap's doc): 1 + x0 B - x1 B^2 (dense) yes, 1 + x0 B^12
// (one term) yes, 1 + x0 B + x1 B^12 (sparse) no, a parameter used twice
// no, a fixed coefficient beside a free one no, a fixed factor yes with
// no free terms.
func TestNewFactorMap(t *testing.T) {
	once := func(int) int { return 1 }
	one := TermRef{Power: 0, Index: -1, Sign: 1, Value: 1}
	cases := []struct {
		name     string
		ts       []TermRef
		uses     func(int) int
		free, ok bool
	}{
		{"dense", []TermRef{one, {1, 0, 1, 0}, {2, 1, -1, 0}}, once, true, true},
		{"seasonal", []TermRef{one, {12, 0, 1, 0}}, once, true, true},
		{"sparse", []TermRef{one, {1, 0, 1, 0}, {12, 1, 1, 0}}, once, true, false},
		{"shared", []TermRef{one, {1, 0, 1, 0}}, func(int) int { return 2 }, true, false},
		{"held beside free", []TermRef{one, {1, -1, 1, 0.3}, {2, 0, 1, 0}}, once, true, false},
		{"fixed", []TermRef{one, {1, -1, 1, 0.3}}, once, false, true},
	}
	for _, c := range cases {
		fm, free, ok := NewFactorMap(c.ts, c.uses)
		if free != c.free || ok != c.ok {
			t.Errorf("%s: free %v ok %v, want %v %v", c.name, free, ok, c.free, c.ok)
		}
		if c.name == "dense" && (fm.C0 != 1 || fm.Index[2] != 1 || fm.Sign[2] != -1) {
			t.Errorf("dense: %+v", fm)
		}
	}
}
