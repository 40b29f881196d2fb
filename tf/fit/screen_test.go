package fit

import (
	"math"
	"math/rand/v2"
	"testing"
)

// The screen's rules (common practice; thresholds in screen.go) on
// records of our own: a noisy output with a stuck stretch or a spike
// planted, against the clean record and a coarsely quantised one.
func TestScreen(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	n := 5000
	clean := make([]float64, n)
	level := 17.0
	for i := range clean {
		level = 0.95*level + 0.05*17 + 0.05*rng.NormFloat64()
		clean[i] = math.Round((level+0.03*rng.NormFloat64())*1e4) / 1e4
	}
	if r, bad := screenFlat(clean); bad {
		t.Errorf("clean record: flat run %+v reported", r)
	}
	if sp := screenSpikes(clean); len(sp) != 0 {
		t.Errorf("clean record: spikes %+v reported", sp)
	}
	stuck := append([]float64(nil), clean...)
	for i := 2000; i < 2600; i++ {
		stuck[i] = 17
	}
	if r, bad := screenFlat(stuck); !bad || r.Start != 2000 || r.Len != 600 || r.Value != 17 {
		t.Errorf("stuck stretch 2000..2599 at 17: got %+v, reported %v", r, bad)
	}
	// A steady output read to 0.1 (about its own SD) repeats many
	// samples, and its longest run is ordinary for that repeat rate
	// (n p^(L-1) large), so it is not reported.
	coarse := make([]float64, n)
	for i := range coarse {
		coarse[i] = math.Round(clean[i]*10) / 10
	}
	if r, bad := screenFlat(coarse); bad || r.Len < screenMinRun {
		t.Errorf("record read to 0.1: longest run %+v, reported %v (want a run of %d or more, not reported)", r, bad, screenMinRun)
	}
	spiky := append([]float64(nil), clean...)
	spiky[3000] = 999
	sp := screenSpikes(spiky)
	if len(sp) != 1 || sp[0].Index != 3000 || sp[0].Value != 999 || sp[0].Before != clean[2999] || sp[0].After != clean[3001] || sp[0].SDs < 1000 {
		t.Errorf("spike at 3000: got %+v", sp)
	}
	// A step (a level shift) is one jump, not a spike.
	step := append([]float64(nil), clean...)
	for i := 2500; i < n; i++ {
		step[i] += 50
	}
	if sp := screenSpikes(step); len(sp) != 0 {
		t.Errorf("level shift read as spikes: %+v", sp)
	}
}
