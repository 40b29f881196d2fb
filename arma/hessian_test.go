package arma

import (
	"math"
	"testing"

	"github.com/backshift/backshift/internal/vec"
)

// TestHessianFiniteDifference checks hessian() (adjoint-based second
// derivatives) against central differences of the analytic gradient J'r
// for a seasonal ARIMA with a regressor and for a model with drift.
// Tolerance 1e-5 relative to the largest entry (difference step 1e-6).
func TestHessianFiniteDifference(t *testing.T) {
	y, xr := arxSeries(17, 18, 400, 2, 0.4, 0.6)
	cases := []struct {
		name string
		ord  Order
		opt  FitSettings
		x    []float64
	}{
		{"seasonal", Order{P: 1, Q: 1, SP: 1, SQ: 1, Period: 4}, FitSettings{Regressors: [][]float64{xr}}, []float64{0.5, 0.3, 0.2, -0.3, 5, 0.35}},
		{"drift", Order{P: 2, D: 1, Q: 1}, FitSettings{Constant: ConstantFree}, []float64{0.3, -0.2, 0.5, 0.01}},
	}
	for _, c := range cases {
		eng := bindEngine(t, c.name, y, c.ord, &c.opt)
		np := len(c.x)
		H, ok := eng.hessian(c.x)
		if !ok {
			t.Fatal("no Hessian")
		}
		grad := func(x []float64) []float64 {
			r := make([]float64, eng.m)
			jac := make([][]float64, np)
			for k := range jac {
				jac[k] = make([]float64, eng.m)
			}
			eng.eval(x, r, jac)
			g := make([]float64, np)
			for k := range g {
				g[k] = vec.Dot(jac[k], r)
			}
			return g
		}
		scale := 0.0
		for j := 0; j < np; j++ {
			for k := 0; k < np; k++ {
				scale = math.Max(scale, math.Abs(H.At(j, k)))
			}
		}
		for k := 0; k < np; k++ {
			xp, xm, h := centralStep(c.x, k)
			gp, gm := grad(xp), grad(xm)
			for j := 0; j < np; j++ {
				fd := (gp[j] - gm[j]) / (2 * h)
				if math.Abs(fd-H.At(j, k)) > 1e-5*scale {
					t.Errorf("%s: H[%d,%d] = %.10g, difference of gradients %.10g", c.name, j, k, H.At(j, k), fd)
				}
			}
		}
	}
}
