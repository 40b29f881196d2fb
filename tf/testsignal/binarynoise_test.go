package testsignal

import (
	"math"
	"slices"
	"testing"
)

// The rule of SwitchProbability: at the p it returns, the spectrum of a
// first-order autoregression with a = 1 - 2p (the spectrum of generalised
// binary noise, Tulleken 1990) is half its zero-frequency value at
// BandFactor / timeConstant. The formula is evaluated directly; 1e-12 is
// rounding of a few operations on numbers of order one.
func TestSwitchProbabilityHalfPower(t *testing.T) {
	for _, tc := range []struct{ tau, ts float64 }{{10, 1}, {100, 1}, {1, 0.1}, {2, 3}, {3600, 60}} {
		p, err := SwitchProbability(tc.tau, tc.ts)
		if err != nil {
			t.Fatal(err)
		}
		a := 1 - 2*p
		w := BandFactor / tc.tau * tc.ts
		ratio := (1 - a) * (1 - a) / (1 - 2*a*math.Cos(w) + a*a)
		if math.Abs(ratio-0.5) > 1e-12 || !(p > 0 && p < 0.5) {
			t.Errorf("tau %v, sample %v: p = %v gives S(w)/S(0) = %v, want 1/2", tc.tau, tc.ts, p, ratio)
		}
	}
}

// The half-power property holds for sample intervals many orders shorter
// than the time constant (w = BandFactor sample / tau down to 2e-12
// rad/sample), where p ~ w/2 is small: the ratio S(w)/S(0) is computed
// without cancellation, 1 - 2a cos w + a^2 = (1-a)^2 + 4a sin^2(w/2) and
// 1 - a = 2p (algebra of the spectrum above, derived). Tolerance 1e-12
// as above.
func TestSwitchProbabilitySlowPlant(t *testing.T) {
	for _, ratio := range []float64{1e3, 1e6, 1e9, 1e12} {
		p, err := SwitchProbability(ratio, 1)
		if err != nil {
			t.Fatal(err)
		}
		a := 1 - 2*p
		sh := math.Sin(BandFactor / ratio / 2)
		got := 4 * p * p / (4*p*p + 4*a*sh*sh)
		if math.Abs(got-0.5) > 1e-12 || !(p > 0 && p < 0.5) {
			t.Errorf("tau/sample %g: p = %v gives S(w)/S(0) = %v, want 1/2", ratio, p, got)
		}
	}
}

// The sample autocorrelation of a long BinaryNoise run follows
// (1-2p)^k (the switching process of Tulleken 1990; a first-order
// Markov chain on +-1). Tolerance: five standard errors of a sample
// autocorrelation of a first-order autoregression,
// sqrt((1+a^2)/(1-a^2)/N) (Bartlett's formula, Box, Jenkins & Reinsel,
// from memory), a bound a correct generator exceeds with negligible
// chance.
func TestBinaryNoiseAutocorrelation(t *testing.T) {
	const n = 200000
	for _, p := range []float64{0.05, 0.2, 0.5} {
		x, err := BinaryNoise(n, p, 7)
		if err != nil {
			t.Fatal(err)
		}
		a := 1 - 2*p
		tol := 5 * math.Sqrt((1+a*a)/(1-a*a)/n)
		for k := 1; k <= 5; k++ {
			s := 0.0
			for i := k; i < n; i++ {
				s += x[i] * x[i-k]
			}
			got, want := s/n, math.Pow(a, float64(k))
			if math.Abs(got-want) > tol {
				t.Errorf("p %v lag %d: autocorrelation %v, want %v within %v", p, k, got, want, tol)
			}
		}
	}
}

func TestBinaryNoiseSeeded(t *testing.T) {
	a, _ := BinaryNoise(500, 0.1, 3)
	b, _ := BinaryNoise(500, 0.1, 3)
	c, _ := BinaryNoise(500, 0.1, 4)
	if !slices.Equal(a, b) {
		t.Error("one seed gave two signals")
	}
	if slices.Equal(a, c) {
		t.Error("two seeds gave one signal")
	}
}

func TestBinaryNoiseBadInput(t *testing.T) {
	for _, tc := range []struct {
		name string
		err  error
		want []string
	}{
		{"n zero", second(BinaryNoise(0, 0.1, 1)), []string{"testsignal.BinaryNoise", "n = 0", "between 1 and MaxSamples = 10000000"}},
		{"n huge", second(BinaryNoise(MaxSamples+1, 0.1, 1)), []string{"n = 10000001"}},
		{"p zero", second(BinaryNoise(10, 0, 1)), []string{"p = 0", "strictly between 0 and 1"}},
		{"p one", second(BinaryNoise(10, 1, 1)), []string{"p = 1"}},
		{"p NaN", second(BinaryNoise(10, math.NaN(), 1)), []string{"p = NaN"}},
		{"tau zero", second(SwitchProbability(0, 1)), []string{"testsignal.SwitchProbability", "timeConstant = 0", "positive finite"}},
		{"sample inf", second(SwitchProbability(10, math.Inf(1))), []string{"sample = +Inf"}},
		{"sample coarse", second(SwitchProbability(10, 20)), []string{"sample = 20", "shorter than", "15.71", "sample faster"}},
	} {
		checkSettingError(t, tc.name, tc.err, tc.want)
	}
}

func second[T any](_ T, err error) error { return err }
