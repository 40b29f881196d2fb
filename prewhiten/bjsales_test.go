package prewhiten_test

import (
	"context"
	"math"
	"testing"

	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/prewhiten"
)

// TestBJSales identifies sales from the leading indicator, both first
// differenced: R 4.2.2 datasets BJsales (output) and BJsales.lead
// (input), documented as Series M of Box, Jenkins & Reinsel, Time Series
// Analysis: Forecasting and Control (exported by
// testdata/bjsales/export.R). The published identification is a dead
// time of 3 samples, one denominator term and no further numerator terms
// (b = 3, r = 1, s = 0); our top candidate must agree.
func TestBJSales(t *testing.T) {
	bj := testutil.ReadCSV(t, "testdata/bjsales/bjsales.csv")
	sales, lead := bj.Column(t, "sales"), bj.Column(t, "lead")
	pw, err := prewhiten.Pair(lead, sales, "sales", &prewhiten.Settings{Name: "lead", Diff: []float64{1, -1}})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("filter: %v (Ljung-Box p = %.3f)", pw.Filter, pw.Check.P)
	w, err := ccf.ImpulseWeights(pw.Alpha[pw.Start:], pw.Beta[pw.Start:], 15, "lead", nil)
	if err != nil {
		t.Fatal(err)
	}
	for k := range w.V {
		t.Logf("v_%d = %8.4f  (t = %6.2f)", k, w.V[k], w.T(k))
	}
	id, err := ccf.Identify(w, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, c := range id.Forms {
		t.Logf("%d: %s score %.2f corner %v  omega %.4g delta %.4g", i, c, c.Score, c.Corner, c.Num, c.Den)
	}
	c := id.Forms[0]
	if id.DeadTime != 3 || c.R != 1 || c.S != 0 {
		t.Errorf("top candidate b=%d r=%d s=%d, want the published b=3 r=1 s=0", id.DeadTime, c.R, c.S)
	}
}

// TestBJSalesNumbers runs the identification of BJsales as far as the
// numbers a whole model is built from (package tf turns them into a
// model): the form of the differenced input and the noise order
// proposed from the preliminary noise series, with finite fitted
// coefficients of the degrees the structure says.
func TestBJSalesNumbers(t *testing.T) {
	bj := testutil.ReadCSV(t, "testdata/bjsales/bjsales.csv")
	sales, lead := bj.Column(t, "sales"), bj.Column(t, "lead")
	pw, err := prewhiten.Pair(lead, sales, "sales", &prewhiten.Settings{Name: "lead", Diff: []float64{1, -1}})
	if err != nil {
		t.Fatal(err)
	}
	w, err := ccf.ImpulseWeights(pw.Alpha[pw.Start:], pw.Beta[pw.Start:], 15, "lead", nil)
	if err != nil {
		t.Fatal(err)
	}
	id, err := ccf.Identify(w, nil)
	if err != nil {
		t.Fatal(err)
	}
	best := id.Forms[0]
	// Preliminary noise of the differenced series with the fitted form's
	// weights (lags 0..30).
	ds, dl := diff(sales), diff(lead)
	v := make([]float64, 31)
	copy(v[best.Delay:], impulse(t, best.Num, best.Den, 31-best.Delay))
	noise, _, err := ccf.NoiseSeries(ds, [][]float64{dl}, []*ccf.Weights{{Input: "lead", V: v, SE: v}})
	if err != nil {
		t.Fatal(err)
	}
	nid, err := prewhiten.IdentifyNoise(context.Background(), noise, &prewhiten.NoiseSettings{MaxP: 1, MaxQ: 1})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("form %s, noise order %v", best, nid.Best)
	// The published structure of Series M (Box, Jenkins & Reinsel,
	// chapter 11): dead time 3, one denominator term.
	if best.Delay != 3 || len(best.Num) != best.S+1 || len(best.Den) != best.R+1 || best.Den[0] != 1 {
		t.Errorf("form %s with omega %v, delta %v", best, best.Num, best.Den)
	}
	if nid.Best.P > 1 || nid.Best.Q > 1 {
		t.Errorf("noise order %v beyond the bounds 1, 1", nid.Best)
	}
	for _, c := range nid.Candidates {
		if c.Order != nid.Best || c.Result == nil {
			continue
		}
		m := c.Result.Model
		if len(m.AR) != nid.Best.P || len(m.MA) != nid.Best.Q {
			t.Errorf("best noise %v holds AR %v, MA %v", nid.Best, m.AR, m.MA)
		}
		for _, v := range append(append([]float64(nil), m.AR...), m.MA...) {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Errorf("best noise coefficient %v", v)
			}
		}
	}
}

func diff(x []float64) []float64 {
	d := make([]float64, len(x)-1)
	for i := range d {
		d[i] = x[i+1] - x[i]
	}
	return d
}

// impulse returns n weights of num(B)/den(B) (den[0] = 1), by the
// project's power-series division.
func impulse(t *testing.T, num, den []float64, n int) []float64 {
	t.Helper()
	v, err := poly.Divide(num, den, n)
	if err != nil {
		t.Fatal(err)
	}
	return v
}
