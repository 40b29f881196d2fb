package arma

import (
	"context"
	"errors"
	"math"
	"math/cmplx"
	"sort"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/poly"
)

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
