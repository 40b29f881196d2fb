package arma

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// mlCase is one entry of testdata/arma_ml/ml.json (make_ml.R): R's
// stats::arima(method = "ML") fit of an R dataset, with the smoothed
// missing samples from stats::KalmanSmooth.
type mlCase struct {
	Y        []*float64 `json:"y"`
	Order    []int      `json:"order"`
	Mean     bool       `json:"mean"`
	Trend    bool       `json:"trend"`
	Seasonal []int      `json:"seasonal"`
	Names    []string   `json:"names"`
	Coef     []float64  `json:"coef"`
	SE       []float64  `json:"se"`
	Sigma2   []float64  `json:"sigma2"`
	LogLik   []float64  `json:"loglik"`
	NObs     []float64  `json:"nobs"`
	Missing  []float64  `json:"missing"`
	Smooth   []float64  `json:"smooth"`
	SmoothSE []float64  `json:"smooth_se"`
	Pred     []float64  `json:"pred"`
	PredSE   []float64  `json:"pred_se"`
}

func readML(t *testing.T) map[string]mlCase {
	var raw map[string]json.RawMessage
	testutil.ReadJSON(t, "testdata/arma_ml/ml.json", &raw)
	out := map[string]mlCase{}
	for k, v := range raw {
		var c mlCase
		if err := json.Unmarshal(v, &c); err != nil {
			t.Fatal(err)
		}
		out[k] = c
	}
	return out
}

func (c mlCase) series() []float64 {
	y := make([]float64, len(c.Y))
	for i, p := range c.Y {
		y[i] = math.NaN()
		if p != nil {
			y[i] = *p
		}
	}
	return y
}

// fitML fits the case's model by ExactML and returns the result and the
// estimates in R's order and signs (ar, ma with R's sign 1 + ma1 B,
// intercept, trend).
func fitML(t *testing.T, c mlCase) (*Result, []float64) {
	y := c.series()
	o := &FitSettings{Method: ExactML}
	if c.Trend {
		x := make([]float64, len(y))
		for i := range x {
			x[i] = float64(i)
		}
		o.Regressors = [][]float64{x}
	}
	ord := Order{P: c.Order[0], D: c.Order[1], Q: c.Order[2], SP: c.Seasonal[0], SD: c.Seasonal[1], SQ: c.Seasonal[2]}
	if ord.SP+ord.SD+ord.SQ > 0 {
		ord.Period = 12
	}
	res, err := Fit(context.Background(), y, ord, o)
	if err != nil {
		t.Fatal(err)
	}
	var got []float64
	for _, p := range res.Params {
		v := p.Value
		if strings.HasPrefix(p.Name, "theta") || strings.HasPrefix(p.Name, "Theta") {
			v = -v
		}
		got = append(got, v)
	}
	return res, got
}

// TestExactMLAgainstR: estimates, standard errors, log-likelihood,
// sigma^2 and smoothed missing samples against R's arima(method = "ML")
// (R 4.2.2 base stats, testdata/arma_ml/make_ml.R) on R's datasets lh
// (AR(1)), LakeHuron with a linear trend (AR(2)), Nile (ARMA(1,1)),
// WWWusage (ARIMA(1,1,1)), presidents (6 NAs; AR(1), ARMA(1,1)) and
// log(AirPassengers) (the airline model (0,1,1)x(0,1,1)_12),
// and the same series with stretches set to NA.
//
// Tolerances: estimates 1e-4 relative, log-likelihood 1e-6 relative and
// n.used exactly, as the issue asks; sigma^2 1e-4 relative (it moves
// with the estimates); standard errors 2e-3 relative (R's come from
// optimHess, central differences with step 1e-3 on a transformed scale,
// whose O(h^2) error is about 1e-4..1e-3; ours from steps of 1.2e-4);
// smoothed missing values and their SEs 1e-4 relative (they move with
// the estimates; R's SEs rescaled to the library's Sigma2 convention).
// For the airline model R's reference runs with kappa = 1e8 (at R's
// default 1e6 its diffuse approximation is 1.2e-5 off in the
// log-likelihood; make_ml.R) and its SEs, from the kappa = 1e6 fit, are
// held to 1e-2 (the approximation moves them by 5e-3).
// For WWWusage (d = 1) R uses a diffuse prior of variance 1e6 where we
// condition on the first sample (the exact diffuse likelihood); the two
// differ by O(1e-6), so its log-likelihood is held to 1e-6 too.
func TestExactMLAgainstR(t *testing.T) {
	for name, c := range readML(t) {
		t.Run(name, func(t *testing.T) {
			res, got := fitML(t, c)
			if len(got) != len(c.Coef) {
				t.Fatalf("%d estimates, R has %d (%v)", len(got), len(c.Coef), c.Names)
			}
			seTol := 2e-3
			if name == "airline" {
				seTol = 1e-2 // R's SEs at kappa = 1e6: the diffuse approximation moves them 5e-3
			}
			worst, worstSE := 0.0, 0.0
			for k := range got {
				worst = math.Max(worst, math.Abs(got[k]-c.Coef[k])/math.Abs(c.Coef[k]))
				worstSE = math.Max(worstSE, math.Abs(res.Params[k].SE-c.SE[k])/c.SE[k])
			}
			t.Logf("largest relative deviation: estimates %.1e, SE %.1e, loglik %.1e", worst, worstSE, math.Abs(res.LogLik-c.LogLik[0])/math.Abs(c.LogLik[0]))
			for k := range got {
				if !relClose(got[k], c.Coef[k], 1e-4) {
					t.Errorf("%s = %.8g, R %.8g", c.Names[k], got[k], c.Coef[k])
				}
				if !relClose(res.Params[k].SE, c.SE[k], seTol) {
					t.Errorf("se(%s) = %.6g, R %.6g", c.Names[k], res.Params[k].SE, c.SE[k])
				}
			}
			if !relClose(res.LogLik, c.LogLik[0], 1e-6) {
				t.Errorf("loglik %.10g, R %.10g", res.LogLik, c.LogLik[0])
			}
			if res.NUsed != int(c.NObs[0]) {
				t.Errorf("NUsed %d, R n.used %v", res.NUsed, c.NObs[0])
			}
			if s2 := res.SSQ / float64(res.NUsed); !relClose(s2, c.Sigma2[0], 1e-4) {
				t.Errorf("SSQ/NUsed %.8g, R sigma2 %.8g", s2, c.Sigma2[0])
			}
			if res.Method != ExactML {
				t.Errorf("Method %v", res.Method)
			}
			if len(res.Missing) != len(c.Missing) {
				t.Fatalf("%d missing, R %d", len(res.Missing), len(c.Missing))
			}
			// R scales the smoother's variance by its ML sigma2 =
			// SSQ/NUsed, we by the library's Sigma2 = SSQ/(NUsed - k).
			conv := math.Sqrt(float64(res.NUsed) / float64(res.NUsed-len(res.Params)))
			for i, m := range res.Missing {
				if m.Index != int(c.Missing[i]) || !relClose(m.Value, c.Smooth[i], 1e-4) || !relClose(m.SE, c.SmoothSE[i]*conv, 1e-4) {
					t.Errorf("missing %d: %.8g sd %.6g, R at %v: %.8g sd %.6g", m.Index, m.Value, m.SE, c.Missing[i], c.Smooth[i], c.SmoothSE[i])
				}
			}
		})
	}
}

// TestExactMLForecastAgainstR: forecasts 1..5 steps after the end of
// each exact-likelihood fit (gaps included) against R's predict on the
// arima(method = "ML") fit (testdata/arma_ml/make_ml.R), 1e-4 relative:
// they move with the estimates; R's SEs rescaled to the library's
// Sigma2 convention (SSQ/(NUsed - k) where R uses SSQ/NUsed).
func TestExactMLForecastAgainstR(t *testing.T) {
	for name, c := range readML(t) {
		t.Run(name, func(t *testing.T) {
			res, _ := fitML(t, c)
			var fx [][]float64
			if c.Trend {
				col := make([]float64, 5)
				for h := range col {
					col[h] = float64(len(c.Y) + h)
				}
				fx = [][]float64{col}
			}
			fc, err := res.Forecast(5, 0.95, fx)
			if err != nil {
				t.Fatal(err)
			}
			conv := math.Sqrt(float64(res.NUsed) / float64(res.NUsed-len(res.Params)))
			for h := range fc.Mean {
				if !fc.Exact || !relClose(fc.Mean[h], c.Pred[h], 1e-4) || !relClose(fc.SE[h], c.PredSE[h]*conv, 1e-4) {
					t.Errorf("h=%d: %.8g sd %.6g (exact %v), R %.8g sd %.6g", h+1, fc.Mean[h], fc.SE[h], fc.Exact, c.Pred[h], c.PredSE[h]*conv)
				}
			}
		})
	}
}

func relClose(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(math.Abs(b), 1e-300)
}

// TestExactMLRefusals: the method's setting is checked, least squares
// still refuses NaN samples with their index, the exact method refuses
// infinite samples and a series with no observed sample, and neither
// modifies the series.
func TestExactMLRefusals(t *testing.T) {
	y := []float64{1, 2, math.NaN(), 1.5, 0.7, 1.1, 2.2, 0.3, 1.9, 1.2, 0.8, 1.4}
	keep := append([]float64(nil), y...)
	ctx := context.Background()
	_, err := Fit(ctx, y, Order{P: 1}, &FitSettings{Method: 7})
	var se *SettingError
	if !errors.As(err, &se) || se.Setting != "FitSettings.Method" {
		t.Errorf("Method 7: %T %v", err, err)
	}
	_, err = Fit(ctx, y, Order{P: 1}, nil)
	var sa *SampleError
	if !errors.As(err, &sa) || sa.Index != 2 {
		t.Errorf("least squares with NaN: %T %v", err, err)
	}
	inf := append([]float64(nil), y...)
	inf[5] = math.Inf(1)
	_, err = Fit(ctx, inf, Order{P: 1}, &FitSettings{Method: ExactML})
	if !errors.As(err, &sa) || sa.Index != 5 {
		t.Errorf("exact with +Inf: %T %v", err, err)
	}
	_, err = Fit(ctx, []float64{math.NaN(), math.NaN(), math.NaN()}, Order{P: 1}, &FitSettings{Method: ExactML})
	if !errors.Is(err, ErrShort) {
		t.Errorf("all missing: %T %v", err, err)
	}
	res, err := Fit(ctx, y, Order{P: 1}, &FitSettings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	for i := range y {
		if y[i] != keep[i] && !(math.IsNaN(y[i]) && math.IsNaN(keep[i])) {
			t.Fatalf("series modified at %d", i)
		}
	}
	s := res.String()
	for _, want := range []string{"exact maximum likelihood", "observed information", "missing sample 2: estimate"} {
		if !strings.Contains(s, want) {
			t.Errorf("report lacks %q:\n%s", want, s)
		}
	}
	if res.Method.String() != "exact maximum likelihood" || LeastSquares.String() != "conditional least squares" {
		t.Errorf("Method strings %q %q", res.Method, LeastSquares)
	}
	if _, err := res.LjungBox(3); err != nil {
		t.Errorf("LjungBox on an exact fit with a gap: %v", err)
	}
}

// TestExactMLBoundaryStart: an over-fitted model whose least-squares
// start has its MA root on the unit circle (AR(1) data, seed 3, fitted
// as (1,0,1)x(1,0,0)_4 with a gap) still moves: the exact search starts
// inside and reaches the interior maximum theta1 = -0.6467 (the same
// likelihood, -87.1314, as the non-invertible solution theta1 = -1/0.6467
// found with AllowNonInvertible: the exact likelihood is invariant to
// flipping an MA root, Box, Jenkins, Reinsel & Ljung 2016, sec. 6.4.1).
// Tolerance 1e-6 relative: both are converged searches.
func TestExactMLBoundaryStart(t *testing.T) {
	y, err := Simulate(Model{AR: []float64{0.5}, Sigma2: 1}, 60, &SimSettings{Seed1: 3})
	if err != nil {
		t.Fatal(err)
	}
	y[10] = math.NaN()
	ord := Order{P: 1, Q: 1, SP: 1, Period: 4}
	in, err := Fit(context.Background(), y, ord, &FitSettings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	out, err := Fit(context.Background(), y, ord, &FitSettings{Method: ExactML, AllowNonInvertible: true, StartValues: map[string]float64{"theta1": -1.5}})
	if err != nil {
		t.Fatal(err)
	}
	th := in.Params[2].Value
	if !relClose(in.LogLik, out.LogLik, 1e-6) || !relClose(th, 1/out.Params[2].Value, 1e-4) {
		t.Errorf("invertible: theta1 %.6g loglik %.8g; flipped: theta1 %.6g loglik %.8g", th, in.LogLik, out.Params[2].Value, out.LogLik)
	}
}

// TestExactMLNearUnitRoot: a random walk fitted as AR(1) (seed 5), where
// the least-squares estimate, the start, is beyond the unit circle
// (1.0059), still gives an exact-likelihood estimate: the start is moved
// inside and the estimate is stationary and near 1 (above 0.9; common
// practice: the ML estimate of a random walk's AR(1) coefficient is
// close to 1; 0.9935 here).
func TestExactMLNearUnitRoot(t *testing.T) {
	y := make([]float64, 200)
	a, err := Simulate(Model{Sigma2: 1}, len(y), &SimSettings{Seed1: 5})
	if err != nil {
		t.Fatal(err)
	}
	for i := 1; i < len(y); i++ {
		y[i] = y[i-1] + a[i]
	}
	cls, err := Fit(context.Background(), y, Order{P: 1}, nil)
	if err != nil || !(cls.Params[0].Value > 1) {
		t.Fatalf("the least-squares start is meant to be explosive: %v %v", cls.Params[0].Value, err)
	}
	res, err := Fit(context.Background(), y, Order{P: 1}, &FitSettings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	if phi := res.Params[0].Value; !(phi > 0.9 && phi < 1) {
		t.Errorf("phi1 = %v", phi)
	}
}

// TestBadInputExactMLFewObserved: a record of 100 samples with 3
// observed is too short for an ARMA(1,1) with a constant (3 parameters,
// 4 observations needed); the message counts the observed samples, not
// the record's length.
func TestBadInputExactMLFewObserved(t *testing.T) {
	y := make([]float64, 100)
	for i := range y {
		y[i] = math.NaN()
	}
	y[10], y[50], y[90] = 1, 2, 1.5
	_, err := Fit(context.Background(), y, Order{P: 1, Q: 1}, &FitSettings{Method: ExactML})
	if !errors.Is(err, ErrShort) || !strings.Contains(err.Error(), "3 samples, at least 4 needed") || !strings.Contains(err.Error(), "of the record's 100") {
		t.Errorf("got %v", err)
	}
}

// TestExactMLCanceledInHessian: a context done during the final
// Hessian (after the search has converged) stops the fit there, with an
// error matching context.Canceled and ErrConvergence, as a cancelled
// search does. The context is done from the first check of the last
// Hessian's stencil on (2k + k(k-1) checks for k parameters before the
// run's end, counted in an uncancelled run): the search's iterations are those of the full fit, and
// the stencil's remaining evaluations are not made. (A check of the
// wiring on R's Nile series; the values are not compared with R here.)
func TestExactMLCanceledInHessian(t *testing.T) {
	y := readML(t)["Nile"].series()
	ord := Order{P: 1, Q: 1}
	full := &testutil.CountingContext{Context: context.Background(), After: 1 << 30}
	ref, err := Fit(full, y, ord, &FitSettings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	k := len(ref.Params)
	stencil := 2*k + k*(k-1) // checks of one Hessian
	ctx := &testutil.CountingContext{Context: context.Background(), After: full.Calls - stencil}
	res, err := Fit(ctx, y, ord, &FitSettings{Method: ExactML})
	if !errors.Is(err, context.Canceled) || !errors.Is(err, ErrConvergence) {
		t.Fatalf("cancelled in the Hessian: err %v, want context.Canceled and ErrConvergence", err)
	}
	if res == nil {
		t.Fatalf("cancelled in the Hessian: no result returned with the error")
	}
	if res.Iter != ref.Iter || res.Converged {
		t.Fatalf("cancelled in the Hessian: %d iterations, converged %v; want the full search's %d, not converged", res.Iter, res.Converged, ref.Iter)
	}
	if res.Evals > ref.Evals-stencil+1 {
		t.Errorf("cancelled in the Hessian: %d evaluations, the full fit %d: the stencil's %d were not skipped", res.Evals, ref.Evals, stencil-1)
	}
	t.Logf("full fit: %d context checks, %d evaluations; cancelled: %d checks, %d evaluations", full.Calls, ref.Evals, ctx.Calls, res.Evals)
}
