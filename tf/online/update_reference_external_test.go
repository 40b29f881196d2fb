package online_test

import (
	"math"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf/online"
)

// The recursion against an outside source: an ARX regression,
//
//	y_t = a1 y_(t-1) + a2 y_(t-2) + w0 x_(t-1) + w1 x_(t-2) + e_t,
//
// is the model y = (w0 + w1 B)/(1 - a1 B - a2 B^2) B x + 1/(1 - a1 B -
// a2 B^2) a with the denominator and the noise AR polynomial tied by
// their names, for which the prediction error is exactly the
// regression's residual and the gradient exactly its regressor (the
// filters cancel), so the Estimator is plain recursive least squares.
// testdata/online/rls.json holds, for every sample after the warm-up,
// the batch weighted least-squares solution from numpy.linalg.solve
// (numpy 1.24.2, testdata/online/make_rls.py) with the same start,
// warm-up, ridge and forgetting. Tolerance 1e-9 absolute on estimates
// of order 1: the recursion and the direct solution differ only by
// rounding, amplified by the condition number of the information
// matrix (about 1e3 here), well below 1e-9.
func TestUpdateReferenceRLS(t *testing.T) {
	var ref struct {
		Warmup int
		Start  []float64
		Names  []string
		X, Y   []float64
		Cases  []struct {
			Lambda float64
			Theta  [][]float64
		}
	}
	testutil.ReadJSON(t, "testdata/online/rls.json", &ref)
	m := fixture.MustModel(t, "y = (w0 + w1 B) / (1 - a1 B - a2 B^2) B x + 1 / (1 - a1 B - a2 B^2) a"+
		"; where w0 ~ 0.5, w1 ~ 0, a1 ~ 1, a2 ~ -0.3")
	for _, c := range ref.Cases {
		e, err := online.New(m, &online.Settings{Forgetting: c.Lambda, Warmup: ref.Warmup})
		if err != nil {
			t.Fatal(err)
		}
		if got := e.Names(); len(got) != 4 || got[0] != ref.Names[0] || got[3] != ref.Names[3] {
			t.Fatalf("names %v, want %v", got, ref.Names)
		}
		worst, ps := 0.0, make([]online.Param, 0, 4)
		x := []float64{0}
		for i := range ref.X {
			x[0] = ref.X[i]
			if err := e.Update(x, ref.Y[i]); err != nil {
				t.Fatal(err)
			}
			if i < ref.Warmup {
				continue
			}
			ps = e.Params(ps[:0])
			for k, p := range ps {
				worst = math.Max(worst, math.Abs(p.Value-c.Theta[i-ref.Warmup][k]))
			}
		}
		if cn := e.Counts(); cn.Rejected+cn.Bounded+cn.Resets != 0 {
			t.Errorf("lambda %v: a safeguard acted (%+v), so the recursion is not plain least squares", c.Lambda, cn)
		}
		if !(worst <= 1e-9) {
			t.Errorf("lambda %v: largest difference from numpy's weighted least squares %.3g, want <= 1e-9", c.Lambda, worst)
		}
		t.Logf("lambda %v: largest difference from numpy %.2g over %d samples", c.Lambda, worst, len(ref.X)-ref.Warmup)
	}
}
