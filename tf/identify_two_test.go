package tf

import (
	"context"
	"testing"
)

// TestIdentifyTwoInputs identifies sim2 of testdata/fit (simulated by
// ref_fit.py: x1 with b = 1, r = 1, s = 0 and x2 with b = 4, r = 0,
// s = 1, AR(2) noise, n = 600): the best candidate has both forms and
// passes its checks.
func TestIdentifyTwoInputs(t *testing.T) {
	data := refNamed(t, "sim2").data(t)
	cands, err := Identify(context.Background(), "y", []string{"x1", "x2"}, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	best := cands[0]
	a, b := best.Structure.Inputs[0], best.Structure.Inputs[1]
	if a.Delay != 1 || a.Den.Degree() != 1 || a.Num.Degree() != 0 || b.Delay != 4 || b.Den.Degree() != 0 || b.Num.Degree() != 1 {
		t.Errorf("best: %s", best.Structure.String())
	}
	if best.Diagnostics == nil || !best.Diagnostics.Pass {
		t.Errorf("best fails its checks")
	}
	if _, ok := best.Estimate.Param("x1_d1"); !ok {
		t.Errorf("names: %v", best.Estimate.Params)
	}
	for _, cd := range cands[:min(4, len(cands))] {
		t.Logf("%d %.2f %s", cd.Rank, cd.Score, cd.Structure.String())
	}
}
