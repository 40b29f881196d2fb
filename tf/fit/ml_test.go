package fit

import (
	"context"
	"errors"
	"github.com/backshift/backshift/internal/testutil"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/internal/kalman"
	"github.com/backshift/backshift/tf"
)

// twoInputModel is the model of the speed comparison: two first-order
// inputs and ARMA(1,1) noise with a constant,
//
//	y = c + w1/(1 - d1 B) B^2 x1 + w2/(1 - d2 B) B x2 + (1 + t1 B)/(1 - p1 B) a.
func twoInputModel() tf.Model {
	c := tf.Coef{Name: "c", Free: true}
	one := func(name string) tf.Poly { return fixture.Poly(fixture.Factor(fixture.Term(false, name, 0, 0))) }
	return tf.Model{Output: "y", Const: &c,
		Inputs: []tf.Input{{Series: "x1", Num: one("w1"), Den: fixture.OneMinus("d1", 1), Delay: 2},
			{Series: "x2", Num: one("w2"), Den: fixture.OneMinus("d2", 1), Delay: 1}},
		Noise: &arma.Noise{AR: fixture.OneMinus("p1", 1), MA: fixture.Poly(fixture.Factor(fixture.Term(false, "", 1, 0), fixture.Term(false, "t1", 0, 1)))}}
}

// twoInputData simulates twoInputModel with c = 1, w1 = 0.8, d1 = 0.6,
// w2 = -0.5, d2 = 0.3, t1 = 0.4, p1 = 0.7, sigma = 0.5 and AR(1)
// inputs (0.5 and 0.8), settled at the start (long burn-in).
func twoInputData(n int, seed uint64) map[string][]float64 {
	rng := rand.New(rand.NewPCG(seed, 11))
	x1 := fixture.AR1(rng, n, 0.5)
	x2 := fixture.AR1(rng, n, 0.8)
	u1 := make([]float64, n)
	u2 := make([]float64, n)
	filter.Run(u1[2:], []float64{0.8}, []float64{1, -0.6}, x1[:n-2])
	filter.Run(u2[1:], []float64{-0.5}, []float64{1, -0.3}, x2[:n-1])
	e := fixture.Noise(rng, n, []float64{1, -0.7}, []float64{1, 0.4}, 0.5)
	y := make([]float64, n)
	for i := range y {
		y[i] = 1 + u1[i] + u2[i] + e[i]
	}
	return map[string][]float64{"y": y, "x1": x1, "x2": x2}
}

// BenchmarkModelML fits twoInputModel by conditional least squares and
// by exact maximum likelihood, side by side.
func BenchmarkModelML(b *testing.B) {
	m := twoInputModel()
	for _, n := range []int{1000, 10000, 100000} {
		data := twoInputData(n, 1)
		for _, meth := range []Method{LeastSquares, ExactML} {
			name := "CLS"
			if meth == ExactML {
				name = "ML"
			}
			b.Run(name+"/"+strconv.Itoa(n), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					if _, err := Model(context.Background(), m, data, &Settings{Method: meth}); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}

// withGaps returns a copy of x with the samples at idx set to NaN.
func withGaps(x []float64, idx ...int) []float64 {
	out := append([]float64(nil), x...)
	for _, i := range idx {
		out[i] = math.NaN()
	}
	return out
}

// TestBadInputGaps: missing samples are refused with their positions
// and the remedy, or filled by the stated rule and reported.
func TestBadInputGaps(t *testing.T) {
	m := twoInputModel()
	data := twoInputData(400, 2)
	yGap := withGaps(data["y"], 10, 11, 12, 300)
	x1Gap := withGaps(data["x1"], 50, 51, 200)
	cases := []struct {
		name string
		y, x []float64
		set  Settings
		want []string
	}{
		{"output gap, least squares", yGap, data["x1"], Settings{},
			[]string{`series "y" sample 10 is NaN`, "4 missing (NaN) at 10..12 (3 samples), 300", "fit.ExactML"}},
		{"input gap, no rule", data["y"], x1Gap, Settings{Method: ExactML},
			[]string{`series "x1" sample 50 is NaN`, "3 missing (NaN) at 50..51 (2 samples), 200", "Settings.InputGaps"}},
		{"input gap too long", data["y"], withGaps(data["x1"], 60, 61, 62, 63), Settings{InputGaps: GapFill{Rule: HoldFill}},
			[]string{`series "x1" sample 60 is NaN`, "60..63 (4 samples) cannot be filled", "MaxLen = 3"}},
		{"input gap at the start", data["y"], withGaps(data["x1"], 0), Settings{InputGaps: GapFill{Rule: LinearFill}},
			[]string{"at the start of the record"}},
		{"input gap at the end, linear", data["y"], withGaps(data["x1"], 399), Settings{InputGaps: GapFill{Rule: LinearFill}},
			[]string{"at the end of the record"}},
		{"bad method", data["y"], data["x1"], Settings{Method: 7}, []string{"Settings.Method"}},
		{"bad rule", data["y"], data["x1"], Settings{InputGaps: GapFill{Rule: 9}}, []string{"Settings.InputGaps.Rule"}},
		{"negative MaxLen", data["y"], data["x1"], Settings{InputGaps: GapFill{Rule: HoldFill, MaxLen: -1}}, []string{"Settings.InputGaps.MaxLen"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Model(context.Background(), m, map[string][]float64{"y": c.y, "x1": c.x, "x2": data["x2"]}, &c.set)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q lacks %q", err, w)
				}
			}
			if !hasKind(err) {
				t.Errorf("error of no kind: %v", err)
			}
			var se *errs.SampleError
			if strings.Contains(c.name, "gap") && !errors.As(err, &se) {
				t.Errorf("no *SampleError in %v", err)
			}
		})
	}
}

// TestInputGapsFilled: HoldFill and LinearFill fill short input gaps
// with the values the rules define, report them, and leave the
// caller's data alone.
func TestInputGapsFilled(t *testing.T) {
	m := twoInputModel()
	data := twoInputData(400, 3)
	x1 := withGaps(data["x1"], 50, 51, 200)
	for _, c := range []struct {
		rule FillRule
		want []float64 // the filled values at 50, 51, 200
	}{
		{HoldFill, []float64{data["x1"][49], data["x1"][49], data["x1"][199]}},
		{LinearFill, []float64{data["x1"][49] + (data["x1"][52]-data["x1"][49])/3, data["x1"][49] + 2*(data["x1"][52]-data["x1"][49])/3,
			(data["x1"][199] + data["x1"][201]) / 2}},
	} {
		t.Run(c.rule.String(), func(t *testing.T) {
			in := map[string][]float64{"y": data["y"], "x1": x1, "x2": data["x2"]}
			set := Settings{InputGaps: GapFill{Rule: c.rule}}
			out, _, filled, err := prepareGaps(m, in, set)
			if err != nil {
				t.Fatal(err)
			}
			for i, idx := range []int{50, 51, 200} {
				if got := out["x1"][idx]; math.Abs(got-c.want[i]) > 1e-15*math.Abs(c.want[i]) {
					t.Errorf("x1[%d] filled with %v, want %v", idx, got, c.want[i])
				}
			}
			want := []InputFill{{"x1", 50, 2, c.rule}, {"x1", 200, 1, c.rule}}
			if len(filled) != 2 || filled[0] != want[0] || filled[1] != want[1] {
				t.Errorf("filled %v, want %v", filled, want)
			}
			if !math.IsNaN(x1[50]) {
				t.Error("the caller's input was modified")
			}
			e, err := Model(context.Background(), m, in, &set)
			if err != nil {
				t.Fatal(err)
			}
			if len(e.Filled) != 2 || !strings.Contains(e.String(), "x1: 2 samples from index 50, "+c.rule.String()) {
				t.Errorf("fill not reported: %v\n%s", e.Filled, e)
			}
			if _, err := Check(e, in, nil); err != nil {
				t.Errorf("Check with the filled input: %v", err)
			}
		})
	}
}

// TestExactMLGapsCheckForecast: an exact-likelihood fit on a record
// with missing outputs reports its method and the missing samples,
// and Check and Forecast work from that record. The smoothed missing
// outputs lie within 4 SE of the values removed (a Gaussian tail of
// 6e-5 per sample, 8 samples).
func TestExactMLGapsCheckForecast(t *testing.T) {
	m := twoInputModel()
	data := twoInputData(600, 4)
	gaps := []int{100, 101, 102, 103, 104, 350, 598, 599}
	in := map[string][]float64{"y": withGaps(data["y"], gaps...), "x1": data["x1"], "x2": data["x2"]}
	e, err := Model(context.Background(), m, in, &Settings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	s := e.String()
	for _, w := range []string{"estimated by exact maximum likelihood", "exact log-likelihood", "8 output samples missing", "observed information"} {
		if !strings.Contains(s, w) {
			t.Errorf("report lacks %q:\n%s", w, s)
		}
	}
	if len(e.Missing) != len(gaps) {
		t.Fatalf("%d missing values, want %d", len(e.Missing), len(gaps))
	}
	for i, mv := range e.Missing {
		if mv.Index != gaps[i] || !(math.Abs(mv.Value-data["y"][mv.Index]) < 4*mv.SE) {
			t.Errorf("missing %d: %.4f (SE %.4f), removed value %.4f", mv.Index, mv.Value, mv.SE, data["y"][mv.Index])
		}
	}
	d, err := Check(e, in, nil)
	if err != nil {
		t.Fatal(err)
	}
	if d.Residual.Lags == 0 || math.IsNaN(d.Residual.Q) || len(d.Cross) != 2 || math.IsNaN(d.Cross[0].S) {
		t.Errorf("checks: %+v", d.Residual)
	}
	if n := e.N - len(gaps); d.Cross[0].M > e.N {
		t.Errorf("cross-check on %d samples, more than the %d observed (%d)", d.Cross[0].M, e.N, n)
	}
	fc, err := e.Forecast(in, 3, nil)
	if err != nil {
		t.Fatal(err)
	}
	// The last two outputs are missing: the one-step forecast's SE
	// exceeds sigma (the state at the end is uncertain).
	if !(fc.SE[0] > math.Sqrt(e.Sigma2)*1.01) {
		t.Errorf("one-step SE %.4f not above sigma %.4f with the last outputs missing", fc.SE[0], math.Sqrt(e.Sigma2))
	}
}

// TestExactMLAgreesOnLongRecord: on a long record the exact and the
// conditional likelihood differ only through the first p + q samples,
// so the two estimators agree to a small fraction of a standard error
// and their standard errors (observed information against sigma^2
// (J'J)^-1) nearly coincide (asymptotic equivalence: Box, Jenkins,
// Reinsel & Ljung 2015, the chapter on estimation, from memory).
// n = 5000, the two-input ARMA(1,1) model; bounds: estimates within 0.1
// SE, SEs within 5 % (measured: 0.015 SE and 2.4 %; the observed
// information holds the second-derivative term that sigma^2 (J'J)^-1
// leaves out, whose relative size is of order n^(-1/2)).
func TestExactMLAgreesOnLongRecord(t *testing.T) {
	m := twoInputModel()
	data := twoInputData(5000, 9)
	cls, err := Model(context.Background(), m, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	ml, err := Model(context.Background(), m, data, &Settings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	if !ml.Converged || ml.Method != ExactML || cls.Method != LeastSquares {
		t.Fatalf("ML converged %v (%s), methods %v, %v", ml.Converged, ml.Reason, ml.Method, cls.Method)
	}
	worstD, worstS := 0.0, 0.0
	for i, p := range ml.Params {
		q := cls.Params[i]
		d := math.Abs(p.Value-q.Value) / q.SE
		s := math.Abs(p.SE/q.SE - 1)
		worstD, worstS = math.Max(worstD, d), math.Max(worstS, s)
		if d > 0.1 || s > 0.05 {
			t.Errorf("%s: ML %.5f (SE %.5f), CLS %.5f (SE %.5f)", p.Name, p.Value, p.SE, q.Value, q.SE)
		}
	}
	t.Logf("largest difference %.3f SE, largest SE ratio - 1 %.4f", worstD, worstS)
}

// TestExactMLGapAtEndNotStuck: a long output gap at the end of the
// record is not reported as a stuck sensor (the screen reads the output
// with its NaN, not the interpolated record that the start values use).
func TestExactMLGapAtEndNotStuck(t *testing.T) {
	data := twoInputData(400, 5)
	y := append([]float64(nil), data["y"]...)
	for i := 370; i < 400; i++ {
		y[i] = math.NaN()
	}
	e, err := Model(context.Background(), twoInputModel(), map[string][]float64{"y": y, "x1": data["x1"], "x2": data["x2"]}, &Settings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range e.Warnings {
		if w.Kind == StuckOutput {
			t.Errorf("stuck-output warning for a gap: %s", w.Message)
		}
	}
	if len(e.Missing) != 30 {
		t.Errorf("%d missing values, want 30", len(e.Missing))
	}
}

// TestExactMLUnitsInvariant: recording an input in other units (times
// 1e4 or 1e-4) scales its gain by the inverse and its standard error
// alike and changes nothing else. The likelihood is invariant, so the
// estimates agree to the search's precision (1e-6 relative); the
// standard errors to 1e-3 relative (numerical Hessians with steps
// scaled to each parameter's size, see kalman.Information: a step of 2^-13
// on a gain of 8e-5 would make its SE 77 % too large).
func TestExactMLUnitsInvariant(t *testing.T) {
	m := twoInputModel()
	data := twoInputData(2000, 1)
	ref, err := Model(context.Background(), m, data, &Settings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	for _, sc := range []float64{1e4, 1e-4} {
		x1 := make([]float64, len(data["x1"]))
		for i, v := range data["x1"] {
			x1[i] = v * sc
		}
		e, err := Model(context.Background(), m, map[string][]float64{"y": data["y"], "x1": x1, "x2": data["x2"]}, &Settings{Method: ExactML})
		if err != nil {
			t.Fatal(err)
		}
		for i, p := range e.Params {
			q := ref.Params[i]
			f := 1.0
			if p.Name == "w1" {
				f = sc
			}
			if math.Abs(p.Value*f-q.Value) > 1e-6*math.Max(math.Abs(q.Value), 1e-3) || math.Abs(p.SE*f/q.SE-1) > 1e-3 {
				t.Errorf("x1 times %g: %s = %.8g (SE %.6g), unscaled %.8g (SE %.6g)", sc, p.Name, p.Value*f, p.SE*f, q.Value, q.SE)
			}
		}
	}
}

// TestExactMLCurvatureSteps: the standard errors of an exact fit do
// not depend on the steps of the numerical Hessian: they equal those
// from steps 2^-17 max(|x_k|, 1) (the central differences converge as
// O(h^2), so the finer steps give the limit to about 1e-4 here) within
// 0.5 %. The model has a gain and a slow pole (0.9) whose estimates
// correlate strongly, so that the log-likelihood departs from its
// quadratic form within a fraction of the pole's marginal standard
// error: the fixed steps 2^-13 max(|x_k|, 1) put the gain's SE 14 %
// low here (0.00280 against 0.00326), the differences of
// kalman.Information (along the axes the Gauss-Newton information makes
// uncorrelated) do not.
func TestExactMLCurvatureSteps(t *testing.T) {
	n := 600
	rng := rand.New(rand.NewPCG(5, 6))
	power := make([]float64, n)
	level := 5.0
	for i := range power {
		if rng.Float64() < 0.05 {
			level = 10 * rng.Float64()
		}
		power[i] = level
	}
	c := tf.Coef{Name: "c", Free: true}
	m := tf.Model{Output: "temp", Const: &c, Inputs: []tf.Input{{Series: "power", Num: fixture.Poly(fixture.Factor(fixture.Term(false, "w0", 0.8, 0))), Den: fixture.OneMinus("d1", 1), Delay: 2}},
		Noise: &arma.Noise{AR: fixture.OneMinus("p1", 1), MA: fixture.Poly(fixture.Factor(fixture.Term(false, "", 1, 0), fixture.Term(false, "t1", 0.5, 1)))}}
	truth := m.Clone()
	truth.Const.Value = 20
	truth.Inputs[0].Den.Factors[0].Terms[1].Coef.Value = 0.9
	truth.Noise.AR.Factors[0].Terms[1].Coef.Value = 0.6
	y, err := truth.Simulate(map[string][]float64{"power": power}, &tf.SimSettings{Seed1: 7, Seed2: 8, Sigma: 0.2, BurnIn: 100})
	if err != nil {
		t.Fatal(err)
	}
	data := map[string][]float64{"temp": y, "power": power}
	e, err := Model(context.Background(), m, data, &Settings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	w, err := newWork(m, data, Settings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	defer w.release()
	p, err := newMLProblem(w, w.obs, 0)
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, len(e.Params))
	for i, q := range e.Params {
		x[i] = q.Value
	}
	_, _, h, err := kalman.Curvature(context.Background(), p.negLogLik, x, kalman.Steps(x, 0x1p-17))
	if err != nil {
		t.Fatal(err)
	}
	inv := invertInformation(mat.NewSymDense(len(x), h), len(x))
	if inv == nil {
		t.Fatal("no Hessian with the fine steps")
	}
	for i, q := range e.Params {
		if se := math.Sqrt(inv.At(i, i)); math.Abs(q.SE/se-1) > 5e-3 {
			t.Errorf("SE(%s) = %.6g, with fine steps %.6g", q.Name, q.SE, se)
		}
	}
}

// TestExactMLCanceledInHessian: a context done during the final
// Hessian (after the search has converged) stops the fit there with the
// best point and an *InterruptedError matching context.Canceled, as a
// cancelled search does. The context is done from the first check of
// the last Hessian's stencil on (2k + k(k-1) checks for k parameters
// before the run's end, counted in an uncancelled run): the search's
// iterations are those of the full fit, and the stencil's remaining
// evaluations are not made. (A check of the wiring; no outside value.)
func TestExactMLCanceledInHessian(t *testing.T) {
	m := twoInputModel()
	data := twoInputData(2000, 1)
	full := &testutil.CountingContext{Context: context.Background(), After: 1 << 30}
	ref, err := Model(full, m, data, &Settings{Method: ExactML})
	if err != nil {
		t.Fatal(err)
	}
	k := len(ref.Params)
	stencil := 2*k + k*(k-1)
	ctx := &testutil.CountingContext{Context: context.Background(), After: full.Calls - stencil}
	e, err := Model(ctx, m, data, &Settings{Method: ExactML})
	var ie *InterruptedError
	if !errors.Is(err, context.Canceled) || !errors.As(err, &ie) {
		t.Fatalf("cancelled in the Hessian: err %v, want an *InterruptedError wrapping context.Canceled", err)
	}
	if e == nil {
		t.Fatalf("cancelled in the Hessian: no estimate returned with the error")
	}
	if e.Iter != ref.Iter || e.Converged {
		t.Fatalf("cancelled in the Hessian: %d iterations, converged %v; want the full search's %d, not converged", e.Iter, e.Converged, ref.Iter)
	}
	if e.Evals > ref.Evals-stencil+1 {
		t.Errorf("cancelled in the Hessian: %d evaluations, the full fit %d: the stencil's %d were not skipped", e.Evals, ref.Evals, stencil-1)
	}
	t.Logf("full fit: %d context checks, %d evaluations; cancelled: %d checks, %d evaluations", full.Calls, ref.Evals, ctx.Calls, e.Evals)
}
