package fit_test

import (
	"context"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// fillWarning returns the message of e's FilledGapMove warning, or "".
func fillWarning(e *fit.Estimate) string {
	for _, w := range e.Warnings {
		if w.Kind == fit.FilledGapMove {
			return w.Message
		}
	}
	return ""
}

// withGap returns a copy of data with series name missing (NaN) at
// from..to.
func withGap(data map[string][]float64, name string, from, to int) map[string][]float64 {
	out := map[string][]float64{}
	for k, v := range data {
		out[k] = v
	}
	x := append([]float64(nil), data[name]...)
	for t := from; t <= to; t++ {
		x[t] = math.NaN()
	}
	out[name] = x
	return out
}

// TestFillAcrossInputMove: an input gap filled by Settings.InputGaps
// while the input moved (the case: a 15-sample staircase whose
// move at sample 600 falls in the gap 599..601) gives filled values far
// from the truth; the fit warns (FilledGapMove, with the gap and the
// move, and the report shows it) instead of passing silently. Truth
// temp = 20 + 0.5/(1 - 0.8 B) B^2 valve + (1 + 0.4 B)/(1 - 0.6 B) a,
// sigma 0.2, n 1000. A gap inside a stair (605..607: the input holds its
// value, so the fill is exact) does not warn. The staircase fires both
// rules of the warning (a move where the input usually holds, and a
// residual of 12 to 18 SD at 602); the residual rule is also checked
// alone, on a white-noise input (its move across a gap is a typical
// one) with gain 2, so that the fill error of about one input SD shows
// in the residuals as 10 SD or more. The thresholds
// are the warning's own (see fit.FilledGapMove: 3 times the typical
// steps, 5 SD; common practice).
func TestFillAcrossInputMove(t *testing.T) {
	const n = 1000
	v := staircase(n, 1)
	truth := parse.MustModel("temp = 20 + 0.5 / (1 - 0.8 B) B^2 valve + (1 + 0.4 B) / (1 - 0.6 B) a")
	y, err := truth.Simulate(map[string][]float64{"valve": v}, &tf.SimSettings{Seed1: 3, Sigma: 0.2})
	if err != nil {
		t.Fatal(err)
	}
	data := map[string][]float64{"temp": y, "valve": v}
	m := parse.MustModel("temp = c + w0 / (1 - d1 B) B^2 valve + (1 + t1 B) / (1 - p1 B) a")
	for _, rule := range []fit.FillRule{fit.HoldFill, fit.LinearFill} {
		for _, meth := range []fit.Method{fit.LeastSquares, fit.ExactML} {
			set := &fit.Settings{Method: meth, InputGaps: fit.GapFill{Rule: rule}}
			e, err := fit.Model(context.Background(), m, withGap(data, "valve", 599, 601), set)
			if err != nil {
				t.Fatal(err)
			}
			msg := fillWarning(e)
			t.Logf("%v, %v: %s", rule, meth, msg)
			for _, key := range []string{`input "valve": the gap at 599..601 (3 samples)`, "the input moved across it", "input moving during the gap"} {
				if !strings.Contains(msg, key) {
					t.Errorf("%v, %v: warning %q lacks %q", rule, meth, msg, key)
				}
			}
			if !strings.Contains(e.String(), "input moving during the gap") {
				t.Errorf("%v, %v: the report does not show the warning", rule, meth)
			}
			e, err = fit.Model(context.Background(), m, withGap(data, "valve", 605, 607), set)
			if err != nil {
				t.Fatal(err)
			}
			if msg := fillWarning(e); msg != "" {
				t.Errorf("%v, %v: a gap where the input holds its value: %s", rule, meth, msg)
			}
		}
	}
	// The residual rule: a white-noise input.
	rng := rand.New(rand.NewPCG(21, 22))
	x := make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64()
	}
	truth = parse.MustModel("temp = 20 + 2 B x + 1 / (1 - 0.6 B) a")
	y, err = truth.Simulate(map[string][]float64{"x": x}, &tf.SimSettings{Seed1: 5, Sigma: 0.2})
	if err != nil {
		t.Fatal(err)
	}
	m = parse.MustModel("temp = c + w0 B x + 1 / (1 - p1 B) a")
	e, err := fit.Model(context.Background(), m, withGap(map[string][]float64{"temp": y, "x": x}, "x", 500, 502), &fit.Settings{InputGaps: fit.GapFill{Rule: fit.LinearFill}})
	if err != nil {
		t.Fatal(err)
	}
	msg := fillWarning(e)
	t.Logf("white-noise input: %s (the input's values at 499..503: %.2f %.2f %.2f %.2f %.2f)", msg, x[499], x[500], x[501], x[502], x[503])
	if !strings.Contains(msg, "standard deviations") || strings.Contains(msg, "moved across") {
		t.Errorf("white-noise input: warning %q, want the residual rule only", msg)
	}
}
