package arma

import (
	"context"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// TestInformationCriteriaR checks LogLik, K, AIC, AICc and BIC of CLS fits
// of pure autoregressions with a mean against testdata/arma/ic.json (R
// 4.2.2 stats::logLik, AIC and BIC of stats::lm on the lagged series,
// written by testdata/arma/make_ic.R): for an AR(p) with a mean, CLS is
// that regression, so the minimum sum of squares, the residual count and
// the criteria must agree. Tolerance 1e-9 relative: both sums of squares
// are minima to ~1e-14 relative (our optimiser's tolerance; QR in lm),
// and the criteria carry N/2 times that through log(SSQ).
func TestInformationCriteriaR(t *testing.T) {
	ds := datasets(t)
	var refs []struct {
		Name, Series string
		P            int
		SSQ          float64
		LogLik       float64
		K, NObs      int
		AIC, AICc    float64
		BIC          float64
	}
	testutil.ReadJSON(t, "testdata/arma/ic.json", &refs)
	if len(refs) != 3 {
		t.Fatalf("ic.json holds %d fits, want 3", len(refs))
	}
	for _, ref := range refs {
		res, err := Fit(context.Background(), ds[ref.Series], Order{P: ref.P}, &FitSettings{Constant: ConstantFree})
		if err != nil {
			t.Fatalf("%s: %v", ref.Name, err)
		}
		if res.NUsed != ref.NObs || res.K != ref.K {
			t.Errorf("%s: NUsed %d K %d, R's lm nobs %d df %d", ref.Name, res.NUsed, res.K, ref.NObs, ref.K)
		}
		for _, c := range []struct {
			what      string
			got, want float64
		}{
			{"SSQ", res.SSQ, ref.SSQ}, {"LogLik", res.LogLik, ref.LogLik}, {"AIC", res.AIC, ref.AIC},
			{"AICc", res.AICc, ref.AICc}, {"BIC", res.BIC, ref.BIC},
		} {
			if !closeTo(c.got, c.want, 1e-9, 0) {
				t.Errorf("%s: %s %.15g, R %.15g", ref.Name, c.what, c.got, c.want)
			}
		}
	}
}
