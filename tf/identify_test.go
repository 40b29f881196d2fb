package tf

import (
	"context"
	"errors"
	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
	"math"
	"testing"
)

// TestIdentifyBJsales runs the one-call identification on BJsales (R
// datasets package, Series M of Box, Jenkins & Reinsel) with both series
// differenced once. The identification published for Series M is a dead
// time of 3 samples with a first-order denominator and no numerator
// lags (b = 3, r = 1, s = 0; from memory); the best-ranked candidate must
// have that transfer function and pass its checks, and all candidates
// must be ranked by BIC over the same residuals.
func TestIdentifyBJsales(t *testing.T) {
	data := refNamed(t, "bjsales").data(t)
	cands, err := Identify(context.Background(), "sales", []string{"lead"}, data, &IdentifySettings{OutputDiff: []float64{1, -1}})
	if err != nil {
		t.Fatal(err)
	}
	if len(cands) < 2 {
		t.Fatalf("%d candidates", len(cands))
	}
	best := cands[0]
	in := best.Structure.Inputs[0]
	if best.Rank != 1 || in.Delay != 3 || in.Num.Degree() != 0 || in.Den.Degree() != 1 {
		t.Errorf("best candidate %s", best.Structure.String())
	}
	if best.Diagnostics == nil || !best.Diagnostics.Pass {
		t.Errorf("best candidate fails its checks: %v", best.CheckErr)
	}
	if len(best.Identification) != 1 || best.Identification[0].DeadTime != 3 {
		t.Errorf("identification %+v", best.Identification)
	}
	for i := 1; i < len(cands); i++ {
		if cands[i].Score < cands[i-1].Score || cands[i].Rank != i+1 {
			t.Errorf("ranking not by BIC at %d", i)
		}
		if cands[i].Err == nil && cands[i].Estimate.Conditioning.First != best.Estimate.Conditioning.First {
			t.Errorf("candidate %d sums residuals from %d, the best from %d", i, cands[i].Estimate.Conditioning.First, best.Estimate.Conditioning.First)
		}
	}
	for _, cd := range cands {
		t.Logf("%d %.2f %s", cd.Rank, cd.Score, cd.Structure.String())
	}
}

// TestIdentifyErrors checks the typed data errors of Identify.
func TestIdentifyErrors(t *testing.T) {
	y, x := mcSim(newRand(3), 100)
	var fe *SeriesError
	if _, err := Identify(context.Background(), "y", []string{"u"}, map[string][]float64{"y": y, "x": x}, nil); !errors.As(err, &fe) || !errors.Is(err, ErrName) || fe.Series != "u" ||
		err.Error() != `tf.Identify: series "u" is not known (an input is not in the data; check the series names)` {
		t.Errorf("missing input: %v", err)
	}
	if _, err := Identify(context.Background(), "y", []string{"x"}, map[string][]float64{"y": y, "x": x[:90]}, nil); !errors.As(err, &fe) || !errors.Is(err, ErrLength) || fe.Have != 90 || fe.Need != 100 {
		t.Errorf("unequal: %v", err)
	}
	x2 := append([]float64(nil), x...)
	x2[4] = math.NaN()
	var se *errs.SampleError
	if _, err := Identify(context.Background(), "y", []string{"x"}, map[string][]float64{"y": y, "x": x2}, nil); !errors.As(err, &se) || se.Index != 4 || se.Op != "tf.Identify" {
		t.Errorf("NaN: %v", err)
	}
}

// TestIdentifyProgressAndCancel checks the progress callback and that a
// done context stops the identification with its error.
func TestIdentifyProgressAndCancel(t *testing.T) {
	data := refNamed(t, "bjsales").data(t)
	calls, last := 0, 0
	cands, err := Identify(context.Background(), "sales", []string{"lead"}, data, &IdentifySettings{OutputDiff: []float64{1, -1},
		Progress: func(done, total int) {
			calls++
			if done != calls || total < done {
				t.Errorf("progress %d/%d at call %d", done, total, calls)
			}
			last = total
		}})
	if err != nil {
		t.Fatal(err)
	}
	if calls != len(cands) || last != len(cands) {
		t.Errorf("%d progress calls (last total %d) for %d candidates", calls, last, len(cands))
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Identify(ctx, "sales", []string{"lead"}, data, &IdentifySettings{OutputDiff: []float64{1, -1}}); !errors.Is(err, context.Canceled) {
		t.Errorf("canceled: %v", err)
	}
}

// TestCandidateLabel checks the structure labels: one spelling,
// "noise ARMA(p, q)", whatever p and q are.
func TestCandidateLabel(t *testing.T) {
	m := mcModel()
	if got, want := (FittedCandidate{Structure: m}).Label(), "x (b=3, r=1, s=1), noise ARMA(1, 0)"; got != want {
		t.Errorf("label %q, want %q", got, want)
	}
	m.Noise.MA = oneMinus("t1", 1)
	if got, want := (FittedCandidate{Structure: m}).Label(), "x (b=3, r=1, s=1), noise ARMA(1, 1)"; got != want {
		t.Errorf("label %q, want %q", got, want)
	}
	m.Noise = &arma.Noise{}
	m.Inputs = nil
	if got, want := StructureLabel(m), "noise ARMA(0, 0)"; got != want {
		t.Errorf("label %q, want %q", got, want)
	}
	m.Noise = nil
	if got, want := StructureLabel(m), "no noise term"; got != want {
		t.Errorf("label %q, want %q", got, want)
	}
}
