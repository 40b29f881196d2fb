package tf

import (
	"context"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestCheckBJsales runs the diagnostic checks on the BJsales fit (R
// datasets package, Series M of Box, Jenkins & Reinsel): the model is
// adequate there, so both the residual Ljung-Box test and the
// residual-input cross-correlation test pass at the 5 % level.
func TestCheckBJsales(t *testing.T) {
	est, data := refNamed(t, "bjsales").fit(t)
	d, err := Check(est, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !d.Pass || !d.Residual.Pass || len(d.Cross) != 1 || !d.Cross[0].Pass {
		t.Errorf("checks fail on BJsales: Q %.2f df %d p %.3f; S %.2f df %d p %.3f",
			d.Residual.Q, d.Residual.DF, d.Residual.P, d.Cross[0].S, d.Cross[0].DF, d.Cross[0].P)
	}
	// Degrees of freedom: K - 1 MA parameter; K + 1 - 2 transfer-function
	// parameters (w0, d1).
	if d.Residual.DF != d.Residual.Lags-1 || d.Cross[0].DF != d.Cross[0].Lags+1-2 {
		t.Errorf("degrees of freedom %d (K %d), %d (K %d)", d.Residual.DF, d.Residual.Lags, d.Cross[0].DF, d.Cross[0].Lags)
	}
}

// TestCheckDetectsMisfit fits models that are wrong in known ways and
// expects the matching check to fail: a white-noise model of AR(1)
// noise (phi 0.7, n = 1000) fails the residual test; a transfer function
// with the wrong dead time (b = 1 instead of 3) fails the cross test.
// With these effect sizes the tests' p-values are far below 1e-6 (a
// property of the seeds and sizes, checked here).
func TestCheckDetectsMisfit(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	n := 1000
	x := simAR1(rng, n, 0.5)
	u := make([]float64, n)
	filter.Run(u[3:], []float64{2}, []float64{1, -0.5}, x[:n-3])
	e := simAR1(rng, n, 0.7)
	y := make([]float64, n)
	for i := range y {
		y[i] = u[i] + 0.5*e[i]
	}
	data := map[string][]float64{"y": y, "x": x}
	good := Model{Output: "y", Inputs: []Input{{Series: "x", Num: mkPoly(mkFactor(mkTerm(false, "w0", 0, 0))), Den: oneMinus("d1", 1), Delay: 3}},
		Noise: &arma.Noise{AR: oneMinus("p1", 1)}}
	white := good.Clone()
	white.Noise = &arma.Noise{}
	wrongB := good.Clone()
	wrongB.Inputs[0].Delay = 1
	for _, tc := range []struct {
		name             string
		m                Model
		residOK, crossOK bool
	}{
		{"adequate", good, true, true},
		{"white noise for AR(1)", white, false, true},
		{"dead time 1 for 3", wrongB, false, false},
	} {
		est, err := Fit(context.Background(), tc.m, data, nil)
		if err != nil {
			t.Fatal(err)
		}
		d, err := Check(est, data, nil)
		if err != nil {
			t.Fatal(err)
		}
		if d.Residual.Pass != tc.residOK || d.Cross[0].Pass != tc.crossOK || d.Pass != (tc.residOK && tc.crossOK) {
			t.Errorf("%s: residual p %.3g, cross p %.3g", tc.name, d.Residual.P, d.Cross[0].P)
		}
	}
}

// TestCheckAgainstScipy compares the diagnostic statistics with those the
// reference script testdata/fit/ref_fit.py computes at the scipy
// estimates (Ljung-Box by formula with numpy and scipy.stats.chi2 1.10.1;
// prewhitening by a numpy Durbin-Levinson Yule-Walker fit with AIC order
// choice). The estimates agree to ~1e-7, so the statistics agree to 1e-5
// relative.
func TestCheckAgainstScipy(t *testing.T) {
	for _, c := range readRef(t) {
		t.Run(c.Name, func(t *testing.T) {
			est, data := c.fit(t)
			d, err := Check(est, data, nil)
			if err != nil {
				t.Fatal(err)
			}
			want := c.Checks
			r := d.Residual
			if r.Lags != want.LBLags || r.DF != want.LBDF || !scalar.EqualWithinRel(r.Q, want.LBQ, 1e-5) || !scalar.EqualWithinAbsOrRel(r.P, want.LBP, 1e-6, 1e-5) {
				t.Errorf("Ljung-Box: K %d df %d Q %.8g p %.6g; scipy K %d df %d Q %.8g p %.6g", r.Lags, r.DF, r.Q, r.P, want.LBLags, want.LBDF, want.LBQ, want.LBP)
			}
			if len(d.Cross) != len(want.Cross) {
				t.Fatalf("%d cross checks, want %d", len(d.Cross), len(want.Cross))
			}
			for i, w := range want.Cross {
				g := d.Cross[i]
				if g.Input != w.Input || g.Prewhiten.Order() != w.AROrder || g.Lags != w.Lags || g.M != w.M || g.DF != w.DF ||
					!scalar.EqualWithinRel(g.S, w.S, 1e-5) || !scalar.EqualWithinAbsOrRel(g.P, w.P, 1e-6, 1e-5) {
					t.Errorf("cross %s: AR %d K %d M %d df %d S %.8g p %.6g; scipy AR %d K %d M %d df %d S %.8g p %.6g",
						g.Input, g.Prewhiten.Order(), g.Lags, g.M, g.DF, g.S, g.P, w.AROrder, w.Lags, w.M, w.DF, w.S, w.P)
				}
			}
		})
	}
}
