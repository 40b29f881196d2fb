package prewhiten_test

// Shared fixtures of the prewhiten tests.

import (
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/prewhiten"
)

// walk returns an integrated series with drift: x_t = x_{t-1} + 0.3 +
// a_t - 0.4 a_{t-1}, an ARIMA(0,1,1) with a drift of 0.3 per sample.
func walk(n int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 99))
	x := make([]float64, n)
	prev := 0.0
	for i := 1; i < n; i++ {
		a := rng.NormFloat64()
		x[i] = x[i-1] + 0.3 + a - 0.4*prev
		prev = a
	}
	return x
}

// second keeps only the error of a two-result call, for tables of calls.
func second[T any](_ T, err error) error { return err }

// bestForm prewhitens y against x with s, estimates the impulse weights
// at lags 0..lags of the prewhitened pair and returns the best (b, r, s)
// form ccf.Identify proposes: the first half of the identification the
// noise and BJsales tests share.
func bestForm(t *testing.T, x, y []float64, yName string, s *prewhiten.Settings, lags int, xName string) ccf.Form {
	t.Helper()
	pw, err := prewhiten.Pair(x, y, yName, s)
	if err != nil {
		t.Fatal(err)
	}
	w, err := ccf.ImpulseWeights(pw.Alpha[pw.Start:], pw.Beta[pw.Start:], lags, xName, nil)
	if err != nil {
		t.Fatal(err)
	}
	id, err := ccf.Identify(w, nil)
	if err != nil {
		t.Fatal(err)
	}
	return id.Forms[0]
}

// formNoise returns the preliminary noise series of y after the impulse
// weights of form (lags 0..30) applied to x: the second half.
func formNoise(t *testing.T, form ccf.Form, y, x []float64, xName string) []float64 {
	t.Helper()
	v := make([]float64, 31)
	copy(v[form.Delay:], impulse(t, form.Num, form.Den, 31-form.Delay))
	noise, _, err := ccf.NoiseSeries(y, [][]float64{x}, []*ccf.Weights{{Input: xName, V: v, SE: v}})
	if err != nil {
		t.Fatal(err)
	}
	return noise
}

func diff(x []float64) []float64 {
	d := make([]float64, len(x)-1)
	for i := range d {
		d[i] = x[i+1] - x[i]
	}
	return d
}

// impulse returns n weights of num(B)/den(B) (den[0] = 1), by the
// project's power-series division.
func impulse(t *testing.T, num, den []float64, n int) []float64 {
	t.Helper()
	v, err := poly.Divide(num, den, n)
	if err != nil {
		t.Fatal(err)
	}
	return v
}
