package fit_test

import (
	"context"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/kalman"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/fit"
)

// tfMA1Case is one fit of testdata/arma_maboundary/tfma1.json.
type tfMA1Case struct {
	Seed   int
	Theta  float64
	Y      []*float64
	X      []float64
	Coef   []float64 // R's ma1, intercept, x
	LogLik float64
	NObs   int
}

// TestExactMLCrossesMABoundaryAgainstR: a regression with MA(1) noise,
// y = c + w x + (1 + t1 B) a, on short records of our own (n = 40 and
// 60, theta -0.95 and -1, half with two missing outputs), fitted by
// exact maximum likelihood, against R 4.2.2's arima(method = "ML") with
// xreg (base stats, testdata/arma_maboundary/make_tfma1.R, optimiser at
// reltol 1e-14). R ends every fit with its MA root on the unit circle
// (ma1 within 1e-9 of -1). A search that may not cross the boundary
// stalls inside; ours must reach R's log-likelihood less 1e-6 (the
// tolerance of TestExactMLAgainstSARIMAX: both maximise the same
// function), count R's observed samples, end with t1 within
// kalman.BoundaryTol of -1 with the NonInvertibleNoise warning (a zero
// at |z| >= BoundaryZ = 0.999), converged, and have R's c and w to 1e-4
// (the estimate tolerance of TestExactMLAgainstSARIMAX).
func TestExactMLCrossesMABoundaryAgainstR(t *testing.T) {
	var cases []tfMA1Case
	testutil.ReadJSON(t, "testdata/arma_maboundary/tfma1.json", &cases)
	if len(cases) != 8 {
		t.Fatalf("%d cases", len(cases))
	}
	m := parse.MustModel("y = c + w x + (1 + t1 B) a")
	for _, c := range cases {
		data := map[string][]float64{"y": nanGaps(c.Y), "x": c.X}
		e, err := fit.Model(context.Background(), m, data, &fit.Settings{Method: fit.ExactML})
		if err != nil {
			t.Fatalf("seed %d: %v", c.Seed, err)
		}
		t1, _ := e.Param("t1")
		cc, _ := e.Param("c")
		w, _ := e.Param("w")
		warned := false
		for _, wn := range e.Warnings {
			warned = warned || wn.Kind == fit.NonInvertibleNoise
		}
		t.Logf("seed %d: loglik %.9f (R %.9f, diff %.2g) t1 %.9f c %.6f w %.6f (R %.6f %.6f) iter %d %s", c.Seed, e.LogLik, c.LogLik, e.LogLik-c.LogLik, t1.Value, cc.Value, w.Value, c.Coef[1], c.Coef[2], e.Iter, e.Reason)
		ok := e.LogLik >= c.LogLik-1e-6 && e.N == c.NObs && math.Abs(t1.Value+1) <= kalman.BoundaryTol && warned && e.Converged &&
			math.Abs(cc.Value-c.Coef[1]) <= 1e-4 && math.Abs(w.Value-c.Coef[2]) <= 1e-4
		if !ok {
			t.Errorf("seed %d: loglik %.9f n %d t1 %.9f c %.6f w %.6f warned %v converged %v; R %.9f %d %v",
				c.Seed, e.LogLik, e.N, t1.Value, cc.Value, w.Value, warned, e.Converged, c.LogLik, c.NObs, c.Coef)
		}
	}
}
