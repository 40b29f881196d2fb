package predict_test

import (
	"math"
	"slices"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/internal/testutil"
)

// gapReference is testdata/predict/gap.json (make_gap.py).
type gapReference struct {
	Sigma2  float64 `json:"sigma2"`
	Missing []int   `json:"missing"`
	Cases   []struct {
		Name, Spec      string
		X, Y            []float64
		Error, Variance []float64
	} `json:"cases"`
}

// TestGapReference checks the one-step predictions across gaps in the
// output against statsmodels' Kalman filter of the same model
// (SARIMAX with fixed parameters, exact diffuse start, no steady-state
// shortcut; testdata/predict/make_gap.py): from sample 150 on, the
// prediction errors and their variances SE^2, at observed and missing
// samples, over a gap of 60 outputs and one of 5, for ARIMA(0,1,1)
// (the loop), ARMA(1,1) and ARIMA(2,1,1) noise. Tolerance:
// 1e-9 of sigma for the errors and 1e-9 relative for the variances. The
// predictor starts by the fit's conditioning, the filter from a diffuse
// start; by sample 150 the difference has decayed by the slowest root
// of the models (0.7) to below 1e-23, and rounding over 400 steps of
// two different sums stays near 1e-14, so 1e-9 is a wide margin that
// still catches a wrong gain (a restart of the recursion after the
// 60-sample gap, with SE back to sigma at sample 261, misses the
// reference variances there, 0.01087, 0.01113 and 0.02106 against
// sigma^2 = 0.01, by 9 to 110 %).
func TestGapReference(t *testing.T) {
	var ref gapReference
	testutil.ReadJSON(t, "testdata/predict/gap.json", &ref)
	if len(ref.Cases) != 3 {
		t.Fatalf("%d cases in gap.json, want 3", len(ref.Cases))
	}
	sigma := math.Sqrt(ref.Sigma2)
	for _, c := range ref.Cases {
		t.Run(c.Name, func(t *testing.T) {
			p := mustPredictor(t, fixture.MustModel(t, c.Spec), ref.Sigma2, nil)
			for i := range c.Y {
				y := c.Y[i]
				missing := slices.Contains(ref.Missing, i)
				if missing {
					y = math.NaN()
				}
				s, err := p.Update([]float64{c.X[i]}, y)
				if err != nil {
					t.Fatal(err)
				}
				if i < 150 {
					continue
				}
				if v := s.SE * s.SE; !near(v, c.Variance[i], 1e-9, c.Variance[i]) {
					t.Fatalf("sample %d: variance %.15g, statsmodels %.15g", i, v, c.Variance[i])
				}
				if missing {
					continue
				}
				if !near(s.Error, c.Error[i], 1e-9, sigma) {
					t.Fatalf("sample %d: error %.15g, statsmodels %.15g", i, s.Error, c.Error[i])
				}
				if z := c.Error[i] / math.Sqrt(c.Variance[i]); !near(s.Z, z, 1e-8, 1) {
					t.Fatalf("sample %d: Z %.15g, statsmodels %.15g", i, s.Z, z)
				}
			}
		})
	}
}
