package arma

import (
	"math"
	"math/rand/v2"
	"testing"
)

// arxSeries returns n samples of y_t = level + gain x_t + e_t + ar y_{t-1}
// (y_{-1} = 0) with x_t and e_t standard normal from the seeds, and x.
func arxSeries(seed1, seed2 uint64, n int, level, gain, ar float64) (y, x []float64) {
	rng := rand.New(rand.NewPCG(seed1, seed2))
	y = make([]float64, n)
	x = make([]float64, n)
	for i := range y {
		x[i] = rng.NormFloat64()
		y[i] = level + gain*x[i] + rng.NormFloat64()
		if i > 0 {
			y[i] += ar * y[i-1]
		}
	}
	return y, x
}

// bindEngine returns the engine a fit of ord to y works with (bind), so
// that a test can probe eval and hessian directly.
func bindEngine(t *testing.T, name string, y []float64, ord Order, opt *FitSettings) *engine {
	t.Helper()
	if err := checkInputs(y, *opt); err != nil {
		t.Fatal(name, err)
	}
	noise, diff := ord.terms()
	e, err := bind(y, noise, diff, ord.D+ord.SD > 0, *opt)
	if err != nil {
		t.Fatal(name, err)
	}
	return e
}

// TestJacobianFiniteDifference checks the analytic Jacobian (filtered
// derivative series) against central differences of the residuals for a
// seasonal ARIMA with mean and a regressor, and for the Nile ARMA(1,1).
// Tolerance 1e-6 relative to the column scale: central differences with
// step 1e-6 have truncation error ~1e-12 and rounding ~1e-10.
func TestJacobianFiniteDifference(t *testing.T) {
	y, xr := arxSeries(7, 8, 300, 5, 0.3, 0.5)
	cases := []struct {
		name string
		y    []float64
		ord  Order
		opt  FitSettings
		x    []float64
	}{
		{"seasonal", y, Order{P: 1, Q: 1, SP: 1, SQ: 1, Period: 4}, FitSettings{Regressors: [][]float64{xr}}, []float64{0.4, 0.3, 0.2, -0.3, 9, 0.25}},
		{"diff+drift", y, Order{P: 2, D: 1, Q: 2}, FitSettings{Constant: ConstantFree}, []float64{0.3, -0.2, 0.5, 0.1, 0.02}},
		{"Nile", datasets(t)["Nile"], Order{P: 1, Q: 1}, FitSettings{}, []float64{0.88, 0.6, 889}},
	}
	for _, c := range cases {
		eng := bindEngine(t, c.name, c.y, c.ord, &c.opt)
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
			xp, xm, h := centralStep(c.x, k)
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
