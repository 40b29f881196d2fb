package poly

import (
	"errors"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// Hand-computed cases (by hand, exact in binary floating point).
func TestArithmetic(t *testing.T) {
	a := []float64{1, -0.5}    // 1 - 0.5 B
	b := []float64{2, 0, 0.25} // 2 + 0.25 B^2
	eq := func(name string, got, want []float64) {
		t.Helper()
		if len(got) != len(want) || !Equal(got, want, 0) {
			t.Errorf("%s = %v, want %v", name, got, want)
		}
	}
	// By hand, a = 1 - 0.5 B, b = 2 + 0.25 B^2:
	// a + b = 3 - 0.5 B + 0.25 B^2; a - b = -1 - 0.5 B - 0.25 B^2;
	// a b = 2 - B + 0.25 B^2 - 0.125 B^3; a^2 = 1 - B + 0.25 B^2;
	// B^2 a = B^2 - 0.5 B^3; b' = 0.5 B; B^2 b(1/B) = 0.25 + 2 B^2;
	// (x - 2)(x - 0.5) = 1 - 2.5 x + x^2; (1 - 0.5 B)(1 - 0.25 B) =
	// 1 - 0.75 B + 0.125 B^2; (1 - z B)(1 - conj(z) B) = 1 - 2 Re z B +
	// |z|^2 B^2 = 1 - B + 0.5 B^2 for z = 0.5 + 0.5i. All exact dyadics.
	eq("Add", Add(a, b), []float64{3, -0.5, 0.25})
	eq("Sub", Sub(a, b), []float64{-1, -0.5, -0.25})
	eq("Scale", Scale(-2, a), []float64{-2, 1})
	eq("Mul", Mul(a, b), []float64{2, -1, 0.25, -0.125})
	eq("Pow", Pow(a, 2), []float64{1, -1, 0.25})
	eq("Pow0", Pow(a, 0), []float64{1})
	eq("Shift", Shift(a, 2), []float64{0, 0, 1, -0.5})
	eq("Derivative", Derivative(b), []float64{0, 0.5})
	eq("Reciprocal", Reciprocal(b), []float64{0.25, 0, 2})
	eq("FromRoots", FromRoots([]complex128{2, 0.5}), []float64{1, -2.5, 1})
	eq("FromInverseRoots", FromInverseRoots([]complex128{0.5, 0.25}), []float64{1, -0.75, 0.125})
	eq("FromInverseRoots pair", FromInverseRoots([]complex128{0.5 + 0.5i, 0.5 - 0.5i}), []float64{1, -1, 0.5})
	eq("Trim", Trim([]float64{1, 2, 1e-20, 0}, 1e-15), []float64{1, 2})
	eq("Trim zero", Trim([]float64{0, 0}, 0), []float64{})
	if Mul(nil, a) != nil {
		t.Errorf("Mul with empty is not empty")
	}
	if Degree([]float64{1, 2, 0, 0}) != 1 || Degree(nil) != -1 || Degree([]float64{0}) != -1 {
		t.Errorf("Degree wrong")
	}
	// By hand: b(2) = 2 + 0.25*4 = 3; b(2i) = 2 + 0.25*(-4) = 1; the
	// largest of |i|, |-3|, |2| is 3.
	if v := EvalReal(b, 2); v != 3 {
		t.Errorf("EvalReal = %v, want 3", v)
	}
	if v := Eval(b, 2i); v != 1 {
		t.Errorf("Eval(2i) = %v, want 1", v)
	}
	if Equal([]float64{1, 2}, []float64{1, 2, 1e-9}, 1e-10) || !Equal([]float64{1, 2}, []float64{1, 2, 1e-9}, 1e-8) {
		t.Errorf("Equal tolerance wrong")
	}
	if Equal([]float64{math.NaN()}, []float64{math.NaN()}, 1) {
		t.Errorf("NaN compared equal")
	}
	if MaxAbsRoot([]complex128{1i, -3, 2}) != 3 || MaxAbsRoot(nil) != 0 {
		t.Errorf("MaxAbsRoot wrong")
	}
	for name, f := range map[string]func(){"Pow": func() { Pow(a, -1) }, "Shift": func() { Shift(a, -1) }} {
		if !testutil.Panics(f) {
			t.Errorf("%s with a negative argument did not panic", name)
		}
	}
}

// TestDivide: 1/(1 - 0.5 B) = sum 0.5^k B^k (geometric series; powers of
// two, so exact) and (1 + B)/(1 - B) = 1 + 2 B + 2 B^2 + ... (by hand:
// q_0 = 1, q_1 = 1 + q_0 = 2, q_k = q_{k-1} = 2), and for random
// polynomials the defining identity q * den = num up to degree n-1.
// Tolerance 1e-13 times 1 + sum |den_j q_{k-j}|: forming q_k and then
// (q * den)_k are two sums of at most six products and a division, so by
// the standard bound for floating-point summation (about n eps times
// the sum of magnitudes, common practice) they are off by at most about
// 13 eps, 3e-15, times that sum; measured worst 1.5e-16 with this seed.
func TestDivide(t *testing.T) {
	q, err := Divide([]float64{1}, []float64{1, -0.5}, 6)
	if err != nil {
		t.Fatal(err)
	}
	for k, v := range q {
		if v != math.Pow(0.5, float64(k)) {
			t.Errorf("1/(1-0.5B)[%d] = %v", k, v)
		}
	}
	q, _ = Divide([]float64{1, 1}, []float64{1, -1}, 5)
	if !Equal(q, []float64{1, 2, 2, 2, 2}, 0) {
		t.Errorf("(1+B)/(1-B) = %v", q)
	}
	if _, err := Divide([]float64{1}, []float64{0, 1}, 3); !errors.Is(err, ErrZeroConstant) {
		t.Errorf("zero constant: %v", err)
	}
	if _, err := Divide([]float64{1}, nil, 3); !errors.Is(err, ErrZeroConstant) {
		t.Errorf("empty divisor: %v", err)
	}
	rng := rand.New(rand.NewPCG(9, 9))
	for trial := 0; trial < 200; trial++ {
		num := make([]float64, 1+rng.IntN(6))
		den := make([]float64, 1+rng.IntN(6))
		for i := range num {
			num[i] = rng.NormFloat64()
		}
		for i := range den {
			den[i] = 0.3 * rng.NormFloat64()
		}
		den[0] = 1 + rng.Float64()
		n := 30
		q, _ := Divide(num, den, n)
		p := Mul(q, den)
		for k := 0; k < n; k++ {
			want := 0.0
			if k < len(num) {
				want = num[k]
			}
			scale := 1.0
			for j := 0; j <= k && j < len(den); j++ {
				scale += math.Abs(den[j] * q[k-j])
			}
			if !(math.Abs(p[k]-want) <= 1e-13*scale) { // a NaN fails too
				t.Fatalf("trial %d: (q*den)[%d] = %v, want %v", trial, k, p[k], want)
			}
		}
	}
}

// TestFromRootsRoundTrip: expanding the roots found gives back the monic
// polynomial within 1e-12 relative to its largest coefficient (the
// expected value is the input itself divided by its leading
// coefficient). Measured worst with this seed (degrees up to 20):
// 1.4e-14, so the margin is about 70; the loss comes from expanding up
// to 20 factors whose roots are only backward-stable.
func TestFromRootsRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 64))
	for trial := 0; trial < 50; trial++ {
		n := 1 + rng.IntN(20)
		a := make([]float64, n+1)
		for i := range a {
			a[i] = rng.NormFloat64()
		}
		r, err := Roots(a)
		if err != nil {
			t.Fatal(err)
		}
		got := FromRoots(r)
		scale := 0.0
		for _, v := range a {
			scale = math.Max(scale, math.Abs(v/a[n]))
		}
		for k := range a {
			if !(math.Abs(got[k]-a[k]/a[n]) <= 1e-12*scale) {
				t.Fatalf("trial %d degree %d: coefficient %d = %v, want %v", trial, n, k, got[k], a[k]/a[n])
			}
		}
		// Roots are sorted by magnitude.
		for i := 1; i < len(r); i++ {
			if cmplx.Abs(r[i]) < cmplx.Abs(r[i-1]) {
				t.Fatalf("roots not sorted: %v", r)
			}
		}
	}
}
