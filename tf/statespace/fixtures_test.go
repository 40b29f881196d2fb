package statespace

import (
	"context"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// fixtures are models with every coefficient fixed, covering each shape
// Realise handles: dead time with fewer numerator than denominator
// coefficients (delay states taken up by the lag), more numerator than
// denominator coefficients, no dead time (feedthrough), input
// differencing equal to, part of and unrelated to the output's, seasonal
// and ARMA noise, constants with and without differencing, no noise,
// several inputs. want is the state count of the package doc's formula,
// worked out by hand for each.
var fixtures = []struct {
	name, spec string
	want       int
}{
	// max(0+3, 1) = 3, noise max(1, 0) = 1, constant 1.
	{"fopdt", "y = 20 + 0.5 / (1 - 0.8 B) B^3 x + 1 / (1 - 0.5 B) a", 5},
	// max(2+1, 1) = 3, noise max(0, 1) = 1.
	{"numerator", "y = (1 + 0.5 B - 0.3 B^2) / (1 - 0.6 B) B x + (1 - 0.4 B) a", 4},
	// max(1+0, 2) = 2; white noise 0.
	{"feedthrough", "y = (2 - 1.4 B) / (1 - 1.1 B + 0.3 B^2) x + a", 2},
	// (1-B) cancels: max(0+2, 1) = 2; noise theta/(phi (1-B)): max(1+1, 1) = 2.
	{"differenced", "(1 - B) y = 0.7 / (1 - 0.5 B) B^2 ((1 - B) x) + (1 - 0.3 B) / (1 - 0.6 B) a", 4},
	// (1-B) of x cancels one of (1-B)^2: path 0.4 B^3/((1-0.7B)(1-B)): max(0+3, 2) = 3;
	// noise (1-0.2B)/(1-B)^2: max(2, 1) = 2; constant: 1.
	{"partial", "(1 - B)^2 y = 0.05 + 0.4 / (1 - 0.7 B) B^3 ((1 - B) x) + (1 - 0.2 B) a", 6},
	// integrating: x undifferenced, y differenced: 0.3 B/((1-0.5B)(1-B)): max(1, 2) = 2;
	// noise 1/(1-B): 1.
	{"integrating", "(1 - B) y = 0.3 / (1 - 0.5 B) B x + a", 3},
	// no noise, constant with D = 1: path max(1+2, 1) = 3; noise part order 0; constant 1.
	{"noisefree", "y = 4 + (0.5 + 0.2 B) / (1 - 0.9 B) B^2 x", 4},
	// no noise, constant with D = (1 - B): constant part 1/(1-B): 1; path cancels to max(0+1, 1) = 1.
	{"drift", "(1 - B) y = 0.1 + 0.6 / (1 - 0.4 B) B ((1 - B) x)", 3},
	// two inputs and seasonal noise: max(0+2, 1) = 2; max(1+0, 2) = 2;
	// noise (1-0.3B)/((1-0.5B)(1-0.4B^4)): max(5, 1) = 5; constant 1.
	{"two", "y = 1.5 + 0.8 / (1 - 0.7 B) B^2 u + (0.3 - 0.1 B) / (1 - 1.2 B + 0.35 B^2) v + (1 - 0.3 B) / ((1 - 0.5 B)(1 - 0.4 B^4)) a", 10},
	// a zero numerator realises nothing: 0 states, noise 0.
	{"zero", "y = 0 x + a", 0},
	// a static gain without dead time beside a dynamic input: max(0+1, 1)
	// = 1; v 0 states, only its feedthrough 0.2 in D; noise max(0, 1) =
	// 1; constant 1.
	{"static", "y = 2 + 0.5 / (1 - 0.8 B) B x + 0.2 v + (1 - 0.3 B) a", 3},
}

// series returns n seeded standard normal draws times s (the draws of
// fixture.WhiteInput with the PCG source seeded (seed, 7)).
func series(n int, s float64, seed uint64) []float64 {
	x := fixture.WhiteInput(seed, 7, n)
	for i := range x {
		x[i] *= s
	}
	return x
}

// mustRealise parses spec and realises it, or ends the test.
func mustRealise(t testing.TB, spec string) (tf.Model, *Realisation) {
	t.Helper()
	m := fixture.MustModel(t, spec)
	r, err := Realise(m)
	if err != nil {
		t.Fatalf("%s: %v", spec, err)
	}
	return m, r
}

// drive returns the inputs of fixture k of model m, n seeded standard
// normal draws plus offset for each input (as a record, and in the
// model's order), and n innovations of SD 0.3 when m has noise (nil
// when not).
func drive(m tf.Model, n, k int, offset float64) (data map[string][]float64, inputs [][]float64, a []float64) {
	data = map[string][]float64{}
	for i, in := range m.Inputs {
		x := series(n, 1, uint64(10*k+i))
		for j := range x {
			x[j] += offset
		}
		data[in.Series] = x
		inputs = append(inputs, x)
	}
	if m.Noise != nil {
		a = series(n, 0.3, uint64(100+k))
	}
	return data, inputs, a
}

// maxAbs returns the largest magnitude in x (at least 1, so that it
// serves as the scale of a relative tolerance on small values).
func maxAbs(x []float64) float64 {
	m := 1.0
	for _, v := range x {
		m = max(m, math.Abs(v))
	}
	return m
}

// fitModel fits m to data with the library's estimator: the one call of
// the estimation API in this package's tests (renamed fit.Model at the
// merge).
func fitModel(t testing.TB, m tf.Model, data map[string][]float64) (tf.Model, []float64, int) {
	t.Helper()
	est, err := fit.Model(context.Background(), m, data, nil)
	if err != nil {
		t.Fatalf("fit: %v", err)
	}
	return est.Held(), est.Resid, est.Conditioning.First
}
