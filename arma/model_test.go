package arma

import (
	"context"
	"errors"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"sort"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/testutil"
)

type weightsRef struct {
	Innov  []jnum `json:"innov"`
	Models []struct {
		AR   []jnum  `json:"ar"`
		MA   []jnum  `json:"ma"`
		D    int     `json:"d"`
		Mean float64 `json:"mean"`
		Psi  []jnum  `json:"psi"`
		ZMod []jnum  `json:"zmod"`
		Y    []jnum  `json:"y"`
	} `json:"models"`
}

// rModel converts R's coefficients (MA written 1 + ma1 B) to a Model.
func rModel(ar, ma []float64, d int, mean float64) Model {
	m := Model{AR: ar, D: d, Mean: mean, Sigma2: 1}
	for _, v := range ma {
		m.MA = append(m.MA, -v)
	}
	return m
}

// TestWeightsRootsFilterR checks psi weights against R 4.2.2
// stats::ARMAtoMA, the z-plane AR roots against 1/polyroot, and Simulate
// with given innovations against stats::filter (convolution then
// recursive, pre-sample zero) and cumsum for d = 1. Tolerances 1e-12
// relative: the same recursions in double precision.
func TestWeightsRootsFilterR(t *testing.T) {
	var ref weightsRef
	testutil.ReadJSON(t, "testdata/arma/weights.json", &ref)
	e := floats(ref.Innov)
	for i, r := range ref.Models {
		m := rModel(floats(r.AR), floats(r.MA), r.D, r.Mean)
		psi, err := Psi(m.ARPoly(), m.MAPoly(), 31)
		if err != nil {
			t.Fatal(err)
		}
		checkSlice(t, "psi", psi[1:], floats(r.Psi), 1e-12, 1e-14)
		zs, err := zRoots(m.ARPoly())
		if err != nil {
			t.Fatal(err)
		}
		mods := make([]float64, len(zs))
		for k, z := range zs {
			mods[k] = cmplx.Abs(z)
		}
		sort.Float64s(mods)
		checkSlice(t, "AR root moduli", mods, floats(r.ZMod), 1e-12, 0)
		y, err := Simulate(m, len(e), &SimSettings{Innovations: e})
		if err != nil {
			t.Fatal(err)
		}
		checkSlice(t, "simulated from innovations "+itoa(i), y, floats(r.Y), 1e-12, 1)
	}
}

func TestStationaryInvertible(t *testing.T) {
	m := Model{AR: []float64{1.2, -0.2}, MA: []float64{1.5}}
	// phi(B) = 1 - 1.2B + 0.2B^2 = (1-B)(1-0.2B): z-plane roots 1 and 0.2.
	ok, bad, err := m.Stationary()
	if err != nil || ok || len(bad) != 1 || math.Abs(real(bad[0])-1) > 1e-12 {
		t.Errorf("Stationary = %v %v %v, want false with root 1", ok, bad, err)
	}
	// theta(B) = 1 - 1.5B: z-plane root 1.5.
	ok, bad, err = m.Invertible()
	if err != nil || ok || len(bad) != 1 || math.Abs(real(bad[0])-1.5) > 1e-12 {
		t.Errorf("Invertible = %v %v %v, want false with root 1.5", ok, bad, err)
	}
	good := Model{AR: []float64{0.5}, SAR: []float64{0.3}, MA: []float64{-0.4}, Period: 4}
	if ok, _, _ := good.Stationary(); !ok {
		t.Error("stationary seasonal model reported non-stationary")
	}
	// The seasonal product is expanded: (1-0.5B)(1-0.3B^4).
	want := []float64{1, -0.5, 0, 0, -0.3, 0.15}
	checkSlice(t, "ARPoly", good.ARPoly(), want, 1e-15, 1)
	// Simulation of a non-stationary model needs BurnIn < 0.
	var ae *ModelError
	if _, err := Simulate(m, 10, nil); !errors.As(err, &ae) || !strings.Contains(err.Error(), "arma.Simulate: model AR part: not stationary") {
		t.Errorf("Simulate non-stationary: %v", err)
	}
	if _, err := Simulate(m, 10, &SimSettings{BurnIn: -1}); err != nil {
		t.Errorf("Simulate without burn-in: %v", err)
	}
}

// TestPiInvertsPsi checks that pi and psi weights are inverse power
// series: sum_j pi_j psi_{k-j} = [k == 0] (common practice: Box, Jenkins &
// Reinsel, sec. 3.1).
func TestPiInvertsPsi(t *testing.T) {
	m := Model{AR: []float64{0.6, -0.3}, MA: []float64{-0.4, 0.2}, SMA: []float64{0.5}, Period: 3}
	psi, _ := Psi(m.ARPoly(), m.MAPoly(), 40)
	pi, _ := m.Pi(40)
	for k := 0; k < 40; k++ {
		s := 0.0
		for j := 0; j <= k; j++ {
			s += pi[j] * psi[k-j]
		}
		want := 0.0
		if k == 0 {
			want = 1
		}
		if math.Abs(s-want) > 1e-12 {
			t.Fatalf("convolution at %d = %g, want %g", k, s, want)
		}
	}
}

func TestSimulateDeterministic(t *testing.T) {
	m := Model{AR: []float64{0.6, -0.3}, MA: []float64{-0.4}, Mean: 10, Sigma2: 2}
	a, _ := Simulate(m, 1000, &SimSettings{Seed1: 1, Seed2: 2})
	b, _ := Simulate(m, 1000, &SimSettings{Seed1: 1, Seed2: 2})
	c, _ := Simulate(m, 1000, &SimSettings{Seed1: 1, Seed2: 3})
	for i := range a {
		if a[i] != b[i] {
			t.Fatal("equal seeds gave different series")
		}
	}
	if a[0] == c[0] {
		t.Error("different seeds gave the same first sample")
	}
	// Stationary start: the sample variance of a long series matches
	// the model's, sigma^2 sum psi_j^2, within 5 % (n = 1e5, relative SE
	// of a variance estimate of an ARMA series ~ 1 %).
	long, _ := Simulate(m, 100000, &SimSettings{Seed1: 5, Seed2: 6})
	c2, _ := ACF(long, 0)
	psi, _ := m.Psi(200)
	v := 0.0
	for _, p := range psi {
		v += p * p
	}
	v *= m.Sigma2
	if math.Abs(c2.Cov[0]/v-1) > 0.05 || math.Abs(c2.Mean-10) > 0.05 {
		t.Errorf("variance %g (model %g), mean %g", c2.Cov[0], v, c2.Mean)
	}
}

// TestSchurStable compares the step-down test with the root finder on
// random polynomials of degree 1..8 (common practice: Schur-Cohn).
func TestSchurStable(t *testing.T) {
	rng := rand.New(rand.NewPCG(51, 52))
	for it := 0; it < 2000; it++ {
		d := 1 + it%8
		a := make([]float64, d+1)
		a[0] = 1
		for j := 1; j <= d; j++ {
			a[j] = rng.NormFloat64() * 0.6
		}
		bad, err := outside(a, 0)
		if err != nil {
			t.Fatal(err)
		}
		zs, _ := zRoots(a)
		near := false
		for _, z := range zs {
			if math.Abs(cmplx.Abs(z)-1) < 1e-9 {
				near = true
			}
		}
		if !near && schurStable(a) != (len(bad) == 0) {
			t.Fatalf("%v: schurStable %v, roots %v", a, schurStable(a), zs)
		}
	}
	// Degrees 30..40 cross the 32 of the stack buffer: polynomials built from z-plane roots of known moduli,
	// all inside (stable) or one at 1.05 (unstable).
	for it := 0; it < 200; it++ {
		d := 30 + it%11
		zs := make([]complex128, 0, d)
		for len(zs) < d {
			r, th := 0.2+0.7*rng.Float64(), math.Pi*rng.Float64()
			if len(zs) == d-1 {
				zs = append(zs, complex(r, 0))
				continue
			}
			zs = append(zs, cmplx.Rect(r, th), cmplx.Rect(r, -th))
		}
		unstable := it%2 == 1
		if unstable {
			zs[0], zs[1] = cmplx.Rect(1.05, 0.3), cmplx.Rect(1.05, -0.3)
		}
		a := poly.FromInverseRoots(zs)
		if len(a) != d+1 || schurStable(a) == unstable {
			t.Fatalf("degree %d (len %d), unstable %v: schurStable %v", d, len(a), unstable, schurStable(a))
		}
	}
}

func TestModelConstant(t *testing.T) {
	m := Model{AR: []float64{0.5}, SAR: []float64{0.2}, Period: 4, Mean: 10}
	// (1 - 0.5)(1 - 0.2) * 10 = 4
	if c := m.EquationConstant(); math.Abs(c-4) > 1e-12 {
		t.Errorf("Constant = %v, want 4", c)
	}
}

// TestHighDegreeMA: MA polynomials of degree above 32, beyond the stack
// buffer of the stability test (schurStable), are judged, fitted and
// forecast like shorter ones. Each model below is simulated, checked for
// stationarity and invertibility, fitted and forecast. The truth of a
// simulated model is the outside source of the estimates; each must lie
// within 4 standard errors of it (a normal deviate beyond 4 has
// probability 6e-5; the seeds are fixed, so the test is deterministic).
func TestHighDegreeMA(t *testing.T) {
	ma33 := make([]float64, 33)
	ma33[32] = 0.5
	cases := []struct {
		name string
		m    Model
		n    int
	}{
		{"(0,0,33)", Model{MA: ma33, Sigma2: 1}, 800},
		{"(0,0,1)x(0,0,3)_12", Model{MA: []float64{0.4}, SMA: []float64{0.3, -0.2, 0.1}, Period: 12, Sigma2: 1}, 800},
		{"(1,1,0)x(0,1,1)_52", Model{AR: []float64{0.5}, D: 1, SD: 1, SMA: []float64{0.6}, Period: 52, Sigma2: 1}, 52 * 16},
	}
	for i, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := c.m.Order().String(); got != c.name {
				t.Fatalf("order %s, want %s", got, c.name)
			}
			if ok, bad, err := c.m.Stationary(); err != nil || !ok {
				t.Errorf("Stationary = %v %v %v, want true", ok, bad, err)
			}
			if ok, bad, err := c.m.Invertible(); err != nil || !ok {
				t.Errorf("Invertible = %v %v %v, want true", ok, bad, err)
			}
			y, err := Simulate(c.m, c.n, &SimSettings{Seed1: uint64(i + 11), Seed2: 7})
			if err != nil {
				t.Fatal(err)
			}
			res, err := Fit(context.Background(), y, c.m.Order(), &FitSettings{Constant: ConstantZero})
			if err != nil {
				t.Fatal(err)
			}
			truth := append(append(append(append([]float64(nil), c.m.AR...), c.m.SAR...), c.m.MA...), c.m.SMA...)
			if len(res.Params) != len(truth) {
				t.Fatalf("%d estimates %v, want %d", len(res.Params), names(res), len(truth))
			}
			for k, v := range truth {
				if d := math.Abs(ests(res)[k]-v) / ses(res)[k]; !(d <= 4) {
					t.Errorf("%s = %.4f +- %.4f, truth %.4f (%.1f SE)", names(res)[k], ests(res)[k], ses(res)[k], v, d)
				}
			}
			fc, err := res.Forecast(60, 0.95, nil)
			if err != nil {
				t.Fatal(err)
			}
			for h := range fc.Mean {
				if math.IsNaN(fc.Mean[h]) || math.IsInf(fc.Mean[h], 0) || !(fc.SE[h] > 0) || math.IsInf(fc.SE[h], 0) {
					t.Fatalf("step %d: mean %v se %v", h+1, fc.Mean[h], fc.SE[h])
				}
			}
		})
	}
}

// TestRootsOfHugeFactors: MA(1) x seasonal MA(1) with coefficients 1e200
// expands to a B^3 coefficient of 1e400, which overflows float64, so
// the roots of the expanded polynomial cannot be found. They are found
// per factor:
// theta(B) = 1 - 1e200 B has its z-plane root at 1e200 and Theta(B^2) =
// 1 - 1e200 B^2 at z = +-1e100 (by hand: z^2 = 1e200).
func TestRootsOfHugeFactors(t *testing.T) {
	m := Model{MA: []float64{1e200}, SMA: []float64{1e200}, AR: []float64{-1e200}, SAR: []float64{1e200}, Period: 2}
	for _, part := range []string{"AR", "MA"} {
		var ok bool
		var bad []complex128
		var err error
		if part == "AR" {
			ok, bad, err = m.Stationary()
		} else {
			ok, bad, err = m.Invertible()
		}
		if err != nil || ok || len(bad) != 3 {
			t.Fatalf("%s: %v %v %v, want false with 3 roots", part, ok, bad, err)
		}
		mods := []float64{cmplx.Abs(bad[0]), cmplx.Abs(bad[1]), cmplx.Abs(bad[2])}
		sort.Float64s(mods)
		// Relative 1e-12: the roots of a linear factor are one division;
		// the square root adds a rounding or two.
		for k, want := range []float64{1e100, 1e100, 1e200} {
			if math.Abs(mods[k]/want-1) > 1e-12 {
				t.Errorf("%s root moduli %v, want 1e100, 1e100, 1e200", part, mods)
			}
		}
	}
	// Simulation names the non-stationary AR part instead of a root
	// finder failure.
	if _, err := Simulate(m, 10, nil); err == nil || !strings.Contains(err.Error(), "arma.Simulate: model AR part: not stationary") {
		t.Errorf("Simulate: %v", err)
	}
	// A failure of the root finder itself (not reachable with finite
	// coefficients of degree <= MaxLag in 21500 random trials over
	// magnitudes 1e-323..1e307) is a *ModelError naming the factor.
	err := rootError("MA", true, poly.ErrRoots)
	var re *ModelError
	if !errors.As(err, &re) || re.Part != "MA polynomial Theta(B^s)" || !errors.Is(err, ErrModel) {
		t.Fatalf("%T %v", err, err)
	}
	for _, w := range []string{"MA polynomial Theta(B^s)", "invertibility", "check their scale"} {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("%q lacks %q", err, w)
		}
	}
	if strings.Contains(err.Error(), "poly:") {
		t.Errorf("%q uses the internal package's name", err)
	}
}

// TestWeightsOfHugeFactors: psi and pi weights of a model whose factors
// expand beyond float64 give an error that names the expanded polynomial
// that overflows.
func TestWeightsOfHugeFactors(t *testing.T) {
	m := Model{MA: []float64{1e200}, SMA: []float64{1e200}, Period: 2}
	for name, f := range map[string]func() error{
		"Psi": func() error { _, err := m.Psi(4); return err },
		"Pi":  func() error { _, err := m.Pi(4); return err },
	} {
		err := f()
		var ae *ModelError
		if !errors.As(err, &ae) || ae.Part != "MA polynomial theta(B)Theta(B^s)" || ae.Op != "arma.Model."+name ||
			!strings.Contains(err.Error(), "its expanded coefficients overflow float64") {
			t.Errorf("%s: %T %v", name, err, err)
		}
	}
}
