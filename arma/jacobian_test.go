package arma

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"testing"
)

// TestJacobianFiniteDifference checks the analytic Jacobian (filtered
// derivative series) against central differences of the residuals for a
// seasonal ARIMA with mean and a regressor, and for the Nile ARMA(1,1).
// Tolerance 1e-6 relative to the column scale: central differences with
// step 1e-6 have truncation error ~1e-12 and rounding ~1e-10.
func TestJacobianFiniteDifference(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	n := 300
	y := make([]float64, n)
	xr := make([]float64, n)
	for i := range y {
		xr[i] = rng.NormFloat64()
		y[i] = 5 + 0.3*xr[i] + rng.NormFloat64()
		if i > 0 {
			y[i] += 0.5 * y[i-1]
		}
	}
	cases := []struct {
		name string
		y    []float64
		ord  Order
		opt  Options
		x    []float64
	}{
		{"seasonal", y, Order{P: 1, Q: 1, SP: 1, SQ: 1, Period: 4}, Options{X: [][]float64{xr}}, []float64{0.4, 0.3, 0.2, -0.3, 9, 0.25}},
		{"diff+drift", y, Order{P: 2, D: 1, Q: 2}, Options{Mean: MeanFree}, []float64{0.3, -0.2, 0.5, 0.1, 0.02}},
		{"Nile", datasets(t)["Nile"], Order{P: 1, Q: 1}, Options{}, []float64{0.88, 0.6, 889}},
	}
	for _, c := range cases {
		// Build the engine through a fit, then probe eval directly.
		var eng *engine
		probe := func(e *engine) { eng = e }
		testEngineHook = probe
		_, err := Fit(context.Background(), c.y, c.ord, &c.opt)
		testEngineHook = nil
		var ce *ConvergenceError
		if err != nil && !errors.As(err, &ce) {
			t.Fatal(c.name, err)
		}
		np := len(c.x)
		r := make([]float64, eng.m)
		jac := make([][]float64, np)
		for k := range jac {
			jac[k] = make([]float64, eng.m)
		}
		if err := eng.eval(c.x, r, jac); err != nil {
			t.Fatal(err)
		}
		rp := make([]float64, eng.m)
		rm := make([]float64, eng.m)
		for k := 0; k < np; k++ {
			h := 1e-6 * math.Max(1, math.Abs(c.x[k]))
			xp := append([]float64(nil), c.x...)
			xm := append([]float64(nil), c.x...)
			xp[k] += h
			xm[k] -= h
			eng.eval(xp, rp, nil)
			eng.eval(xm, rm, nil)
			scale := 0.0
			for i := range r {
				scale = math.Max(scale, math.Abs(jac[k][i]))
			}
			for i := range r {
				fd := (rp[i] - rm[i]) / (2 * h)
				if math.Abs(fd-jac[k][i]) > 1e-6*scale {
					t.Errorf("%s: d r[%d]/d x[%d] = %.10g, finite difference %.10g", c.name, i, k, jac[k][i], fd)
					break
				}
			}
		}
	}
}
