package poly

import (
	"errors"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

type rootsFile struct {
	Source string `json:"source"`
	Cases  []struct {
		Name     string    `json:"name"`
		Coef     []float64 `json:"coef"`
		RootsRe  []float64 `json:"roots_re"`
		RootsIm  []float64 `json:"roots_im"`
		ChosenRe []float64 `json:"chosen_re"`
		ChosenIm []float64 `json:"chosen_im"`
		Exact    bool      `json:"exact"`
	} `json:"cases"`
}

// backwardErr returns max over roots of |a(r)| / sum_k |a_k| |r|^k, the
// relative backward error: how much the coefficients must change for r
// to be an exact root. A backward-stable root finder keeps it at a small
// multiple of eps whatever the conditioning.
func backwardErr(a []float64, roots []complex128) float64 {
	worst := 0.0
	for _, r := range roots {
		num := cmplx.Abs(Eval(a, r))
		den := 0.0
		m := cmplx.Abs(r)
		for k := len(a) - 1; k >= 0; k-- {
			den = den*m + math.Abs(a[k])
		}
		worst = math.Max(worst, num/den)
	}
	return worst
}

// TestRootsNumpy compares Roots with numpy.roots (numpy 1.24.2, LAPACK
// dgeev on the companion matrix) for degrees 1..64, reference file
// testdata/scipy/roots.json from testdata/scipy/make_roots.py.
//
// Checks and tolerances:
//   - backward error <= 1e-14 (about 45 eps) for every root: what the
//     polishing step is for;
//   - for the chosen, well separated roots: 1e-12 relative to the
//     chosen values (the rounding of the expanded coefficients moves
//     these roots by less than that) and to numpy.roots;
//   - for random normal coefficients, whose roots crowd the unit circle
//     and are less well conditioned as the degree grows: agreement with
//     numpy.roots within 1e-9 relative.
//
// Measured over the 34 cases: backward error 6.2e-16, chosen roots
// 1.5e-14 (both against the chosen values and numpy), random cases
// 6.2e-15, so each bound has a margin of 15 or more.
func TestRootsNumpy(t *testing.T) {
	var f rootsFile
	testutil.ReadJSON(t, "testdata/scipy/roots.json", &f)
	if len(f.Cases) == 0 {
		t.Fatal("no cases")
	}
	for _, c := range f.Cases {
		got, err := Roots(c.Coef)
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		if len(got) != len(c.Coef)-1 {
			t.Fatalf("%s: %d roots, want %d", c.Name, len(got), len(c.Coef)-1)
		}
		if e := backwardErr(c.Coef, got); !(e <= 1e-14) { // a NaN root fails too
			t.Errorf("%s: backward error %.3g", c.Name, e)
		}
		tol := 1e-9
		if c.Exact {
			tol = 1e-12
			if e := testutil.RootsErr(got, testutil.Complex(c.ChosenRe, c.ChosenIm)); e > tol {
				t.Errorf("%s: error %.3g vs the chosen roots", c.Name, e)
			}
		}
		e := testutil.RootsErr(got, testutil.Complex(c.RootsRe, c.RootsIm))
		if e > tol {
			t.Errorf("%s: error %.3g vs numpy.roots", c.Name, e)
		}
		t.Logf("%s: relative difference to numpy.roots %.2g, backward error %.2g", c.Name, e, backwardErr(c.Coef, got))
	}
}

// TestRootsAnalytic: B^n - 2 has the roots 2^(1/n) e^{2 pi i k/n} (by
// hand: the n-th roots of 2), well conditioned for every n (distinct
// roots on one circle); 1e-12 relative, measured worst 1.2e-15 over
// n = 1..64.
func TestRootsAnalytic(t *testing.T) {
	for n := 1; n <= 64; n++ {
		a := make([]float64, n+1)
		a[0], a[n] = -2, 1
		got, err := Roots(a)
		if err != nil {
			t.Fatal(err)
		}
		want := make([]complex128, n)
		for k := range want {
			want[k] = cmplx.Rect(math.Pow(2, 1/float64(n)), 2*math.Pi*float64(k)/float64(n))
		}
		if e := testutil.RootsErr(got, want); e > 1e-12 {
			t.Errorf("degree %d: error %.3g", n, e)
		}
	}
}

// TestRootsSpecialCases: values by hand, noted at each case.
func TestRootsSpecialCases(t *testing.T) {
	if r, err := Roots(nil); r != nil || err != nil {
		t.Errorf("empty: %v %v", r, err)
	}
	if r, err := Roots([]float64{3, 0, 0}); r != nil || err != nil {
		t.Errorf("constant with trailing zeros: %v %v", r, err)
	}
	// Zero low-order coefficients give exact zero roots: B^2 (B - 0.5).
	r, err := Roots([]float64{0, 0, -0.5, 1})
	if err != nil || len(r) != 3 || r[0] != 0 || r[1] != 0 || r[2] != 0.5 {
		t.Errorf("B^2 (B - 0.5): %v %v", r, err)
	}
	// Sorted by magnitude: (1 - 2B)(1 - 0.5B) = 1 - 2.5 B + B^2 has roots
	// 0.5 and 2 (by hand). 1e-15 absolute is a few ulps (ulp(2) is
	// 4.4e-16); measured: exact.
	r, _ = Roots([]float64{1, -2.5, 1})
	if len(r) != 2 || !(math.Abs(real(r[0])-0.5) <= 1e-15) || !(math.Abs(real(r[1])-2) <= 1e-15) || imag(r[0]) != 0 || imag(r[1]) != 0 {
		t.Errorf("quadratic roots %v, want [0.5 2]", r)
	}
	// Complex quadratic 1 + B^2: roots -i, +i (by hand: B^2 = -1); 1e-15
	// absolute is about 4 ulps at |z| = 1; measured: exact.
	r, _ = Roots([]float64{1, 0, 1})
	if len(r) != 2 || !(cmplx.Abs(r[0]-(-1i)) <= 1e-15) || !(cmplx.Abs(r[1]-1i) <= 1e-15) {
		t.Errorf("1 + B^2 roots %v", r)
	}
	if _, err := Roots([]float64{1, math.NaN()}); !errors.Is(err, ErrRoots) {
		t.Errorf("NaN: %v", err)
	}
	long := make([]float64, MaxDegree+2)
	long[0], long[MaxDegree+1] = 1, 1
	if _, err := Roots(long); !errors.Is(err, ErrTooLong) {
		t.Errorf("degree %d: %v", MaxDegree+1, err)
	}
	// Real polynomials give exact conjugate pairs. This one has three
	// complex pairs and no real root (checked with numpy 1.24.2
	// numpy.roots: -0.809 +- 0.682i, 0.789 +- 0.677i, 0.131 +- 0.950i),
	// so the loop below has six roots to check.
	r, _ = Roots([]float64{1, -0.3, 0.8, 0.1, 0.5, -0.2, 0.9})
	if len(r) != 6 {
		t.Fatalf("degree 6: %d roots %v", len(r), r)
	}
	for _, z := range r {
		if imag(z) == 0 {
			t.Errorf("root %v is real; numpy.roots finds none", z)
			continue
		}
		found := false
		for _, w := range r {
			if w == cmplx.Conj(z) {
				found = true
			}
		}
		if !found {
			t.Errorf("root %v has no exact conjugate in %v", z, r)
		}
	}
}

// TestRootsConjugatePairs: the roots of a real polynomial come in exact
// conjugate pairs (z and its conjugate bit for bit), so that polynomials
// rebuilt from them are real and pole lists print symmetrically (a
// property of real polynomials, common practice). The check is exact
// equality by design.
func TestRootsConjugatePairs(t *testing.T) {
	rng := rand.New(rand.NewPCG(12, 34))
	complexSeen := 0
	for trial := 0; trial < 300; trial++ {
		a := make([]float64, 2+rng.IntN(40))
		for i := range a {
			a[i] = rng.NormFloat64()
		}
		r, err := Roots(a)
		if err != nil {
			t.Fatal(err)
		}
		for _, z := range r {
			if imag(z) == 0 {
				continue
			}
			complexSeen++
			n := 0
			for _, w := range r {
				if w == cmplx.Conj(z) {
					n++
				}
			}
			if n == 0 {
				t.Fatalf("trial %d: root %v has no exact conjugate among %v", trial, z, r)
			}
		}
	}
	// Random normal polynomials of degree up to 40 have mostly complex
	// roots; with none the loop above would have checked nothing.
	if complexSeen == 0 {
		t.Fatal("no complex root in 300 trials: nothing was checked")
	}
}
