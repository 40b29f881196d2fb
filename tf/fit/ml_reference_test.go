package fit_test

import (
	"context"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/fit"
)

// mlSarimaxRef is testdata/fit_ml/sarimax.json (make_sarimax.py).
type mlSarimaxRef struct {
	Y, X1, X2 []float64
	FutureX1  []float64  `json:"future_x1"`
	FutureX2  []float64  `json:"future_x2"`
	YGaps     []*float64 `json:"y_gaps"`
	Full      testutil.SARIMAXFit
	Gaps      testutil.SARIMAXFit
}

// nanGaps turns a JSON array with nulls into a series with NaN.
func nanGaps(p []*float64) []float64 {
	out := make([]float64, len(p))
	for i, v := range p {
		out[i] = math.NaN()
		if v != nil {
			out[i] = *v
		}
	}
	return out
}

// TestExactMLAgainstSARIMAX: a regression with ARMA(1,1) errors (a
// constant and two inputs without dynamics) on data of our own, with
// and without missing outputs, against statsmodels' SARIMAX (0.13.5,
// exact likelihood with a stationary start, the regression coefficients
// by maximum likelihood with the ARMA ones; testdata/fit_ml/
// make_sarimax.py).
//
// Tolerances: log-likelihood 1e-6 absolute (both maximise the same
// function; at the optimum a parameter error e changes it by O(e^2));
// estimates 1e-4 absolute (parameters of order one; SARIMAX's BFGS
// stops at gtol 1e-10); standard errors 1e-3 relative (both numerical
// Hessians of the log-likelihood: SARIMAX's cov_type "approx", ours
// central differences with step 1.2e-4); SSQ/N against SARIMAX's
// concentrated scale 1e-6 relative; smoothed missing outputs 1e-4 and
// their SEs 1e-3 relative (ours use Sigma2 = SSQ/(N - k), SARIMAX's
// SSQ/N: rescaled); forecasts 6 steps ahead with the inputs' future
// known, from a record whose last output is missing in the gaps case
// (get_forecast): means 1e-4 absolute, SEs 1e-3 relative, rescaled
// likewise.
func TestExactMLAgainstSARIMAX(t *testing.T) {
	var ref mlSarimaxRef
	testutil.ReadJSON(t, "testdata/fit_ml/sarimax.json", &ref)
	m := parse.MustModel("y = c + w1 x1 + w2 x2 + (1 + t1 B) / (1 - p1 B) a")
	for _, c := range []struct {
		name string
		y    []float64
		want testutil.SARIMAXFit
	}{{"full", ref.Y, ref.Full}, {"gaps", nanGaps(ref.YGaps), ref.Gaps}} {
		t.Run(c.name, func(t *testing.T) {
			data := map[string][]float64{"y": c.y, "x1": ref.X1, "x2": ref.X2}
			e, err := fit.Model(context.Background(), m, data, &fit.Settings{Method: fit.ExactML})
			if err != nil {
				t.Fatal(err)
			}
			if e.Method != fit.ExactML || !e.Converged {
				t.Fatalf("method %v, converged %v (%s)", e.Method, e.Converged, e.Reason)
			}
			if !scalar.EqualWithinAbs(e.LogLik, c.want.LLF, 1e-6) {
				t.Errorf("log-likelihood %.10f, SARIMAX %.10f", e.LogLik, c.want.LLF)
			}
			if got := e.SSQ / float64(e.N); !scalar.EqualWithinRel(got, c.want.Scale, 1e-6) {
				t.Errorf("SSQ/N %.10g, SARIMAX scale %.10g", got, c.want.Scale)
			}
			mlScale := math.Sqrt(float64(e.N-len(e.Params)) / float64(e.N))
			worst := 0.0
			for i, name := range c.want.Names {
				p, ok := e.Param(name)
				if !ok {
					t.Fatalf("no parameter %s", name)
				}
				worst = math.Max(worst, math.Abs(p.Value-c.want.Params[i]))
				if !scalar.EqualWithinAbs(p.Value, c.want.Params[i], 1e-4) {
					t.Errorf("%s = %.8f, SARIMAX %.8f", name, p.Value, c.want.Params[i])
				}
				if !scalar.EqualWithinRel(p.SE, c.want.BSE[i], 1e-3) {
					t.Errorf("SE(%s) = %.8f, SARIMAX %.8f", name, p.SE, c.want.BSE[i])
				}
			}
			t.Logf("log-likelihood %.10f (SARIMAX %.10f), largest estimate difference %.2g", e.LogLik, c.want.LLF, worst)
			if len(e.Missing) != len(c.want.Missing) {
				t.Fatalf("%d missing values, SARIMAX %d", len(e.Missing), len(c.want.Missing))
			}
			for i, mv := range e.Missing {
				if mv.Index != c.want.Missing[i] || !scalar.EqualWithinAbs(mv.Value, c.want.Smooth[i], 1e-4) ||
					!scalar.EqualWithinRel(mv.SE*mlScale, c.want.SmoothSE[i], 1e-3) {
					t.Errorf("missing %d: %.6f (SE %.6f), SARIMAX %d: %.6f (SE %.6f)", mv.Index, mv.Value, mv.SE*mlScale,
						c.want.Missing[i], c.want.Smooth[i], c.want.SmoothSE[i])
				}
			}
			for _, mv := range e.Missing {
				if !math.IsNaN(e.Resid[mv.Index]) {
					t.Errorf("residual at missing sample %d is %v, want NaN", mv.Index, e.Resid[mv.Index])
				}
			}
			fc, err := e.Forecast(data, 6, &fit.ForecastSettings{Future: map[string][]float64{"x1": ref.FutureX1, "x2": ref.FutureX2}})
			if err != nil {
				t.Fatal(err)
			}
			for j := range fc.Mean {
				if !scalar.EqualWithinAbs(fc.Mean[j], c.want.Forecast[j], 1e-4) || !scalar.EqualWithinRel(fc.SE[j]*mlScale, c.want.ForecastSE[j], 1e-3) {
					t.Errorf("forecast step %d: %.6f (SE %.6f), SARIMAX %.6f (SE %.6f)", j+1, fc.Mean[j], fc.SE[j]*mlScale, c.want.Forecast[j], c.want.ForecastSE[j])
				}
			}
		})
	}
}

// mlIndependentRef is testdata/fit_ml/independent.json
// (make_independent.py).
type mlIndependentRef struct {
	Names    []string
	X        []float64
	Y        []*float64
	Params   []float64
	LLF      float64
	LLFTruth float64 `json:"llf_truth"`
}

// TestExactMLAgainstIndependent: models with a transfer-function
// denominator and a gap of 12 output samples plus one more, against an
// independent implementation in Python written for this check (a
// hand-written Kalman filter, the stationary start from
// scipy.linalg.solve_discrete_lyapunov, maximised by
// scipy.optimize.minimize: testdata/fit_ml/make_independent.py), one
// without differencing (constant, ARMA(1,1) noise) and one with the
// output and the input differenced (the filter conditioned on the
// first observed sample).
//
// Tolerances: log-likelihood 1e-6 absolute (the same function
// maximised; Nelder-Mead then BFGS in the script); estimates 2e-4
// absolute (the script's optimiser stops where the log-likelihood is
// flat to 1e-9, which leaves the estimates uncertain to about
// sqrt(1e-9 / curvature), below 1e-4 for these records).
func TestExactMLAgainstIndependent(t *testing.T) {
	var ref map[string]mlIndependentRef
	testutil.ReadJSON(t, "testdata/fit_ml/independent.json", &ref)
	for _, c := range []struct{ name, spec string }{
		{"tf", "y = c + w0 / (1 - d1 B) B^2 x + (1 + t1 B) / (1 - p1 B) a"},
		{"diff", "(1 - B) y = w0 / (1 - d1 B) B ((1 - B) x) + 1 / (1 - p1 B) a"},
	} {
		t.Run(c.name, func(t *testing.T) {
			r := ref[c.name]
			data := map[string][]float64{"y": nanGaps(r.Y), "x": r.X}
			e, err := fit.Model(context.Background(), parse.MustModel(c.spec), data, &fit.Settings{Method: fit.ExactML})
			if err != nil {
				t.Fatal(err)
			}
			if !e.Converged {
				t.Fatalf("not converged: %s", e.Reason)
			}
			if !scalar.EqualWithinAbs(e.LogLik, r.LLF, 1e-6) {
				t.Errorf("log-likelihood %.10f, independent %.10f", e.LogLik, r.LLF)
			}
			for i, name := range r.Names {
				p, _ := e.Param(name)
				if !scalar.EqualWithinAbs(p.Value, r.Params[i], 2e-4) {
					t.Errorf("%s = %.8f, independent %.8f", name, p.Value, r.Params[i])
				}
			}
			t.Logf("log-likelihood %.10f (independent %.10f), %d observed samples", e.LogLik, r.LLF, e.N)
		})
	}
}
