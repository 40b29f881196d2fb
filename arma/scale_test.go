package arma

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

// TestFitScaleEquivariant: conditional least squares is equivariant in
// the series' units (common practice: scaling y by c scales the mean,
// the regression coefficients and the residuals by c and the sum of
// squares by c^2, and leaves the ARMA coefficients alone). In the
// series' own units the fit would stall at the iteration limit for
// deviations of 1e8 and beyond (and 1e-10 and below) because the mean's
// column of the normal equations would be too small against the
// coefficients' for the Cholesky solver; it works in units of a power of
// two. Tolerances: 1e-9 relative for
// estimates, residuals, Sigma2 and forecasts (the optimiser's path
// differs only by the rounding of y*c and the power of two chosen);
// 1e-6 for standard errors, which come from the curvature at the last
// Newton iterate, and the polish may stop one step earlier or later (a
// step below 1e-6 relative leaves the curvature unchanged to that
// order, see polish).
func TestFitScaleEquivariant(t *testing.T) {
	ctx := context.Background()
	base, err := Simulate(Model{AR: []float64{0.5}, MA: []float64{-0.3}, Mean: 2, Sigma2: 1}, 300, &SimSettings{Seed1: 21, Seed2: 4})
	if err != nil {
		t.Fatal(err)
	}
	trend := make([]float64, len(base))
	for i := range trend {
		trend[i] = float64(i) * 1e9 // a regressor in large units
		base[i] += 3e-9 * trend[i]
	}
	opt := func() *FitSettings {
		return &FitSettings{Regressors: [][]float64{trend}, RegressorNames: []string{"time"}}
	}
	ref, err := Fit(ctx, base, Order{P: 1, Q: 1}, opt())
	if err != nil {
		t.Fatalf("unscaled fit: %v", err)
	}
	for _, c := range []float64{1e-150, 1e-100, 1e-10, 1e8, 1e10, 1e50, 1e130} {
		t.Run(fmt.Sprint(c), func(t *testing.T) {
			r, err := Fit(ctx, scaled(base, c), Order{P: 1, Q: 1}, opt())
			if err != nil {
				t.Fatalf("scale %g: %v", c, err)
			}
			checkScaledFit(t, r, ref, c)
		})
	}
	t.Run("held mean", func(t *testing.T) {
		// A mean held at a value and a start value for it are in the
		// series' units.
		r, err := Fit(ctx, scaled(base, 1e10), Order{P: 1, Q: 1}, &FitSettings{Regressors: [][]float64{trend}, Held: map[string]float64{"c": 2e10}, StartValues: map[string]float64{"x1": 3}})
		if err != nil || r.Model.Mean != 2e10 || math.Abs(r.Beta[0]/30-1) > 0.01 {
			t.Errorf("held mean: %v mean %v beta %v", err, r.Model.Mean, r.Beta)
		}
	})
}

// scaled returns y times c.
func scaled(y []float64, c float64) []float64 {
	out := make([]float64, len(y))
	for i := range y {
		out[i] = y[i] * c
	}
	return out
}

// checkScaledFit checks the fit r of the series of the fit ref scaled by
// c (with the same trend regressor "time") against ref scaled
// (tolerances in TestFitScaleEquivariant's doc).
func checkScaledFit(t *testing.T, r, ref *Result, c float64) {
	t.Helper()
	near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Abs(b) }
	nearSE := func(a, b float64) bool { return math.Abs(a-b) <= 1e-6*math.Abs(b) }
	for k, nm := range names(ref) {
		f := 1.0
		if nm == "c" || nm == "time" {
			f = c
		}
		if !near(ests(r)[k], ests(ref)[k]*f) || !nearSE(ses(r)[k], ses(ref)[k]*f) || !nearSE(r.SEHessian[k], ref.SEHessian[k]*f) {
			t.Errorf("scale %g, %s: %g +- %g (Hessian %g), want %g +- %g (%g)", c, nm, ests(r)[k], ses(r)[k], r.SEHessian[k], ests(ref)[k]*f, ses(ref)[k]*f, ref.SEHessian[k]*f)
		}
	}
	last := len(r.Resid) - 1
	if !near(r.Sigma2, ref.Sigma2*c*c) || !near(r.Resid[last], ref.Resid[last]*c) || !near(r.Model.Mean, ref.Model.Mean*c) || !near(r.Beta[0], ref.Beta[0]*c) {
		t.Errorf("scale %g: Sigma2 %g mean %g beta %g, want %g %g %g", c, r.Sigma2, r.Model.Mean, r.Beta[0], ref.Sigma2*c*c, ref.Model.Mean*c, ref.Beta[0]*c)
	}
	if !near(r.LogLik, ref.LogLik-float64(r.NUsed)*math.Log(c)) {
		t.Errorf("scale %g: LogLik %g, want %g", c, r.LogLik, ref.LogLik-float64(r.NUsed)*math.Log(c))
	}
	fc, err := r.Forecast(5, 0.9, [][]float64{{3e11, 3.01e11, 3.02e11, 3.03e11, 3.04e11}})
	fr, _ := ref.Forecast(5, 0.9, [][]float64{{3e11, 3.01e11, 3.02e11, 3.03e11, 3.04e11}})
	if err != nil || !near(fc.Mean[4], fr.Mean[4]*c) || !nearSE(fc.SE[4], fr.SE[4]*c) {
		t.Errorf("scale %g: forecast %v %v, want %g %g", c, fc, err, fr.Mean[4]*c, fr.SE[4]*c)
	}
}

// TestConstantMessage: a straight line under (1 - B) is reported as
// constant after the differencing, naming the differencing rather than
// blaming the data; a constant series prints its value to 6 digits.
func TestConstantMessage(t *testing.T) {
	line := make([]float64, 100)
	flat := make([]float64, 100)
	for i := range line {
		line[i] = 3 + 0.5*float64(i)
		flat[i] = 0.1 + 0.2
	}
	_, err := Fit(context.Background(), line, Order{P: 1, D: 1, Q: 1}, &FitSettings{Name: "level"})
	want := `arma.Fit: series "level" is constant (after the differencing (1 - B): every differenced sample is 0.5 over its 100 samples; its levels lie on a line or repeat; use less differencing)`
	if err == nil || !strings.HasPrefix(err.Error(), want) {
		t.Errorf("line: %v, want %q", err, want)
	}
	_, err = Fit(context.Background(), flat, Order{P: 1}, &FitSettings{Name: "level"})
	want = `arma.Fit: series "level" is constant (every sample is 0.3 over its 100 samples)`
	if err == nil || err.Error() != want {
		t.Errorf("flat: %v, want %q", err, want)
	}
	// Two samples under (1 - B) leave one: too short, not "constant".
	_, err = Fit(context.Background(), []float64{1, 2}, Order{D: 1}, &FitSettings{Name: "level"})
	var se *SeriesError
	if !errors.As(err, &se) || se.Kind != ErrShort || se.Need != 3 {
		t.Errorf("two samples, D = 1: %T %v, want a *SeriesError of kind ErrShort needing 3", err, err)
	}
	_, err = Fit(context.Background(), line, Order{SD: 1, Period: 4}, &FitSettings{Name: "level"})
	if err == nil || !strings.Contains(err.Error(), "after the differencing (1 - B^4): every differenced sample is 2 ") {
		t.Errorf("seasonal line: %v", err)
	}
}
