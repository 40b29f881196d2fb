package arma

import (
	"context"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// curvCase is one entry of testdata/arma_curv/curv.json (make_curv.R).
type curvCase struct {
	Y      []float64 `json:"y"`
	P      int       `json:"p"`
	Coef   []float64 `json:"coef"`
	LogLik []float64 `json:"loglik"`
	SE     []float64 `json:"se"`
}

// TestExactMLSENearUnitCircle: standard errors of exact-likelihood fits
// whose AR part is close to the unit circle, against the observed
// information of R's exact log-likelihood (R 4.2.2 stats::arima(method =
// "ML", SSinit = "Rossignol2011") with every coefficient fixed,
// differentiated in testdata/arma_curv/make_curv.R by Richardson-
// extrapolated central differences, accurate to about 2e-6): an AR(2)
// with roots 0.99 and 0.9 (n = 2000; the conditional standard error of
// phi1 is 1/29 of its marginal one) and an AR(1) with phi = 0.999 (n =
// 5000). Estimates to 1e-4 relative and the log-likelihood to 1e-6, as
// in TestExactMLAgainstR; standard errors to 2e-3 relative (the
// estimates agree to 1e-4, and the Hessian's steps leave about 1e-3).
// On the AR(2), the former fixed steps 2^-13 max(|x_k|, 1) left the
// Hessian not positive definite (SEs NaN), and steps of 0.1 conditional
// SE along the parameters' axes (tf/fit's former rule) put the SEs of
// phi1 and phi2 10 % high (0.01149 against 0.01040): with a correlation
// of -0.9993 the inverse cancels the Hessian's entries, so their
// truncation error of 1e-4 grows 800-fold. kalman.Information
// differences along the axes the Gauss-Newton information makes
// uncorrelated and meets R here.
func TestExactMLSENearUnitCircle(t *testing.T) {
	var cases map[string]curvCase
	testutil.ReadJSON(t, "testdata/arma_curv/curv.json", &cases)
	for name, c := range cases {
		t.Run(name, func(t *testing.T) {
			res, err := Fit(context.Background(), c.Y, Order{P: c.P}, &FitSettings{Method: ExactML})
			if err != nil {
				t.Fatal(err)
			}
			if !relClose(res.LogLik, c.LogLik[0], 1e-6) {
				t.Errorf("loglik %.10g, R %.10g", res.LogLik, c.LogLik[0])
			}
			for k, p := range res.Params {
				if !relClose(p.Value, c.Coef[k], 1e-4) || !relClose(p.SE, c.SE[k], 2e-3) {
					t.Errorf("%s = %.8g (SE %.6g), R %.8g (SE %.6g)", p.Name, p.Value, p.SE, c.Coef[k], c.SE[k])
				}
			}
		})
	}
}
