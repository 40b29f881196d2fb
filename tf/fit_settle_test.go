package tf

import (
	"context"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/filter"
)

// TestFitSettle simulates a slow process (pole 0.95) whose input was not
// at its first value before the record (the record starts in the middle
// of a transient from an earlier level) and checks that Settle moves
// the first residual index past ln 0.01/ln 0.95 = 90 samples and brings
// the pole estimate back within 3 SE of the truth, where the plain fit
// is biased.
func TestFitSettle(t *testing.T) {
	rng := newRand(41)
	n := 2000
	pre := 300
	x := make([]float64, n+pre)
	for i := range x {
		x[i] = 0.2 * rng.NormFloat64()
		if i < pre {
			x[i] += 10 // an earlier operating level
		}
	}
	u := make([]float64, n+pre)
	filter.Run(u[1:], []float64{0.5}, []float64{1, -0.95}, x[:n+pre-1])
	y := make([]float64, n)
	for i := range y {
		y[i] = u[pre+i] + 0.05*rng.NormFloat64()
	}
	data := map[string][]float64{"y": y, "x": x[pre:]}
	m := Model{Output: "y", Const: &Coef{Name: "c", Free: true},
		Inputs: []Input{{Series: "x", Num: mkPoly(mkFactor(mkTerm(false, "w0", 0, 0))), Den: oneMinus("d1", 1), Delay: 1}}}
	plain, err := Fit(context.Background(), m, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	settled, err := Fit(context.Background(), m, data, &FitSettings{Settle: true})
	if err != nil {
		t.Fatal(err)
	}
	d0, _ := plain.Param("d1")
	d1, _ := settled.Param("d1")
	if settled.Conditioning.First < 90 || settled.Conditioning.First > n/10 {
		t.Errorf("settled first index %d", settled.Conditioning.First)
	}
	if math.Abs(d1.Value-0.95) > 3*d1.SE {
		t.Errorf("settled d1 = %v (SE %v), truth 0.95", d1.Value, d1.SE)
	}
	if math.Abs(d0.Value-0.95) < 10*d0.SE {
		t.Errorf("plain fit d1 = %v (SE %v) should be biased by the start-up transient", d0.Value, d0.SE)
	}
	t.Logf("plain d1 %.4f (%.4f) first %d; settled d1 %.4f (%.4f) first %d", d0.Value, d0.SE, plain.Conditioning.First, d1.Value, d1.SE, settled.Conditioning.First)
}
