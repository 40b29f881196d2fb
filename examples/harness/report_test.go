package main

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf/control"
)

// TestReport checks the loop's report of the default run.
//
// The test signal's figures are by hand from the rules stated on
// testsignal.DesignSettings for T = 20 min, theta = 3 min, a 1 min
// sample and a 1440 min budget: the clock is floor(2.783 T/BandFactor) =
// floor(27.83) = 27 min; the slowest dynamics need max(2 pi LowFactor T,
// theta + 4 T) = max(377, 83) = 377 min, 13.96 clocks, so 4 stages
// (2^4 - 1 = 15 clocks, 405 min); 3 whole periods fit in 1440 min; the
// band runs from the period's fundamental 2 pi/405 = 0.0155 rad/min to
// the held sequence's half-power frequency 2.783/27 = 0.103 rad/min.
//
// Each rule's settings are checked against its formula on the reduced
// model the rule reports (Skogestad 2003: SIMC PI Kc = tau1/(k (tc +
// theta)), Ti = min(tau1, 4 (tc + theta)), tc = theta + T/2 by default;
// Rivera, Morari & Skogestad 1986: IMC PI Kc = tau1/(k (lambda +
// theta)), Ti = tau1, lambda = 1.7 (theta + T/2) by default, from
// control.Tune's doc: the default counts the sampling's half sample
// beyond the hold's), to 1e-12 relative.
func TestReport(t *testing.T) {
	out := defaultRunOutput(t)
	testutil.CheckWords(t, "report", out, []string{
		"  signal     maximum-length binary sequence, 4 stages, valve 50 +- 5 %\n",
		"  clock      27 min; period 405 min, 3 periods: 1215 min of the 1440 min allowed\n",
		"  band       0.0155 .. 0.103 rad/min (periods of 61 .. 405 min)\n",
		"  record     simulated on the plant spec with noise SD 0.03 degC (seed 1)",
		"identified model (fit.Model on the known structure; identify.Candidates is for an unknown one)\n  " + testStructure + "\n",
		"  checks (fit.Check, 0.05 level): adequate\n",
		"controller tests of each tuning on the plant itself",
	}, nil)
	wk := defaultWalk(t)
	blocks := strings.Split(out, " tuning, closed-loop time ")[1:]
	if len(blocks) != len(wk.Rules) {
		t.Fatalf("%d tuning blocks, want %d:\n%s", len(blocks), len(wk.Rules), out)
	}
	for i, r := range wk.Rules {
		checkRuleFormula(t, r.Tuning)
		b := blocks[i]
		b = b[:strings.Index(b, "\n\n")+1]
		rb, wc := r.Robust, r.Worst
		for _, want := range []string{
			fmt.Sprintf("Kc = %.4g %%/degC, Ti = %.4g min;", r.Tuning.PID.Gain, r.Tuning.PID.Integral),
			fmt.Sprintf("PI, %s form", r.Tuning.PID.Form),
			fmt.Sprintf("Ms %.2f at ", r.Nominal.SensitivityPeak),
			fmt.Sprintf("%d plants from the estimate's covariance (seed 1): %.1f %% stable", robustDraws, 100*rb.FractionStable),
			fmt.Sprintf("quantiles 5/50/95 %%: Ms %.2f/%.2f/%.2f,", rb.SensitivityPeak.Values[0], rb.SensitivityPeak.Values[1], rb.SensitivityPeak.Values[2]),
			fmt.Sprintf("%d of 10 cases unstable, Ms up to %.2f", wc.Unstable, wc.SensitivityPeak.Value),
			tuningCaution,
		} {
			if !strings.Contains(b, want) {
				t.Errorf("%s block lacks %q:\n%s", r.Tuning.Rule, want, b)
			}
		}
	}
	if n := strings.Count(out, tuningCaution); n != len(wk.Rules) {
		t.Errorf("the tuning caution appears %d times, want once per tuning (%d)", n, len(wk.Rules))
	}
}

// checkRuleFormula checks a PI tuning against its rule's formula on the
// reduced model (see TestReport).
func checkRuleFormula(t *testing.T, tu control.Tuning) {
	t.Helper()
	m := tu.Model
	// The default closed-loop time counts half a sample beyond the
	// model's dead time (control.Tune's doc).
	th := m.DeadTime + tu.Interval.Value/2
	var kc, ti float64
	switch tu.Rule {
	case control.SIMC:
		tc := th
		kc, ti = m.Tau1/(m.Gain*(tc+m.DeadTime)), math.Min(m.Tau1, 4*(tc+m.DeadTime))
	case control.IMC:
		lambda := 1.7 * th
		kc, ti = m.Tau1/(m.Gain*(lambda+m.DeadTime)), m.Tau1
	default:
		t.Fatalf("no formula for %s", tu.Rule)
	}
	if m.Order != 1 || math.Abs(tu.PID.Gain/kc-1) > 1e-12 || math.Abs(tu.PID.Integral/ti-1) > 1e-12 || tu.PID.Derivative != 0 {
		t.Errorf("%s on %v: %v, by the formula Kc %v, Ti %v", tu.Rule, m, tu.PID, kc, ti)
	}
}

// TestCheckStopsTuning fits a structure without the noise model to the
// test record, whose noise is ARMA(1,1) with phi 0.8: the residuals are
// autocorrelated, fit.Check fails the model, and the loop stops before
// tuning with the reasons, the caution, and a *CheckError.
func TestCheckStopsTuning(t *testing.T) {
	const white = "temp = c + w0 / (1 - d1 B) B^3 valve + v0 / (1 - e1 B) B outdoor + a; every 1 min"
	var buf bytes.Buffer
	err := runWith(&buf, options{spec: PlantSpec, noise: NoiseSD, loop: true, structure: white})
	var ce *CheckError
	if !errors.As(err, &ce) || len(ce.Failures) == 0 || !strings.Contains(err.Error(), "Ljung-Box") {
		t.Fatalf("error %v, want a *CheckError naming the residuals' autocorrelation", err)
	}
	out := buf.String()
	testutil.CheckWords(t, "report", out, []string{"  checks (fit.Check, 0.05 level): NOT adequate\n    - ", ce.Failures[0],
		"  tuning stopped: a controller tuned on a model that fails its checks would rest on a wrong model", "licensed practice"},
		[]string{"SIMC", "controller tests"})
}
