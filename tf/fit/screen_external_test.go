package fit_test

import (
	"context"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
	"github.com/backshift/backshift/tf/identify"
)

// A record of our own (a valve around 50 % driving a first-order
// temperature) with a stuck output stretch or one bad reading planted:
// Model converges and the residual checks may well pass, but the estimate
// carries a serious warning naming the samples, and Check's verdict fails.
func TestModelScreensTheOutput(t *testing.T) {
	n := 3000
	valve := make([]float64, n)
	for i := range valve {
		valve[i] = 50 + 10*float64((i/40)%2) // a square wave of period 80
	}
	data := map[string][]float64{"valve": valve}
	y := fixture.MustRecord(t, "temp = 5 + 0.02 / (1 - 0.9 B) B^2 valve + 1 / (1 - 0.5 B) a", data, &tf.SimSettings{Sigma: 0.05, Seed1: 7, Seed2: 8})["temp"]
	spec := parse.MustModel("temp = c + w0 / (1 - d1 B) B^2 valve + AR(1)")
	estimateAndCheck := func(y []float64) (*fit.Estimate, *fit.Diagnostics) {
		d := map[string][]float64{"valve": valve, "temp": y}
		e, err := fit.Model(context.Background(), spec, d, nil)
		if err != nil {
			t.Fatal(err)
		}
		dg, err := fit.Check(e, d, nil)
		if err != nil {
			t.Fatal(err)
		}
		return e, dg
	}
	has := func(e *fit.Estimate, k fit.WarningKind) string {
		for _, w := range e.Warnings {
			if w.Kind == k {
				return w.Message
			}
		}
		return ""
	}
	clean, dg := estimateAndCheck(y)
	if has(clean, fit.StuckOutput) != "" || has(clean, fit.OutputSpike) != "" || !dg.Pass {
		t.Fatalf("clean record: warnings %v, failures %v", clean.Warnings, dg.Failures)
	}
	stuck := append([]float64(nil), y...)
	for i := 1200; i < 1500; i++ {
		stuck[i] = stuck[1199]
	}
	e, dg := estimateAndCheck(stuck)
	if m := has(e, fit.StuckOutput); !strings.Contains(m, `output "temp" holds the value`) || !strings.Contains(m, "for 301 samples, 1199..1499") {
		t.Errorf("stuck stretch: warning %q", m)
	}
	if dg.Pass || !fit.StuckOutput.Serious() {
		t.Errorf("stuck stretch: the verdict passes (%v)", dg.Failures)
	}
	spiky := append([]float64(nil), y...)
	spiky[2000] += 40
	e, dg = estimateAndCheck(spiky)
	if m := has(e, fit.OutputSpike); !strings.Contains(m, `output "temp" sample 2000 is`) {
		t.Errorf("spike: warning %q", m)
	}
	if dg.Pass {
		t.Errorf("spike: the verdict passes")
	}
}

// When identification fails on a record with a bad reading, the error
// names the reading (the screen's hint) beside the stage that failed.
func TestScreenReachesCandidates(t *testing.T) {
	n := 600
	rng := rand.New(rand.NewPCG(11, 12))
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64() // an input the output does not follow
		y[i] = rng.NormFloat64()
	}
	y[300] = 999
	_, err := identify.Candidates(context.Background(), "y", []string{"x"}, map[string][]float64{"y": y, "x": x}, nil)
	if err == nil {
		t.Fatal("identification succeeded on a record whose output does not follow its input")
	}
	if !strings.Contains(err.Error(), `the record may explain it: output "y" sample 300 is 999`) {
		t.Errorf("error without the spike's hint: %v", err)
	}
}
