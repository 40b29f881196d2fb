package prewhiten_test

import (
	"context"
	"testing"

	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/parse"
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
	for i, c := range id.Candidates {
		t.Logf("%d: b=%d r=%d s=%d score %.2f corner %v  %s", i, c.Delay, c.R, c.S, c.Score, c.Corner, c.Spec("sales", ""))
	}
	c := id.Candidates[0]
	if id.DeadTime != 3 || c.R != 1 || c.S != 0 {
		t.Errorf("top candidate b=%d r=%d s=%d, want the published b=3 r=1 s=0", id.DeadTime, c.R, c.S)
	}
}

// TestBJSalesSpec assembles the whole-model spec for BJsales from the
// identification (differenced input and output, the noise proposed from
// the preliminary noise series) and checks that it parses.
func TestBJSalesSpec(t *testing.T) {
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
	id, err := ccf.Identify(w, &ccf.IdentifySettings{InputDiff: []float64{1, -1}})
	if err != nil {
		t.Fatal(err)
	}
	best := id.Candidates[0]
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
	starts := map[string]float64{}
	for k, v := range best.Starts {
		starts[k] = v
	}
	for k, v := range nid.Starts {
		starts[k] = v
	}
	spec := "(1 - B) sales = " + best.Term + " + " + nid.Term + ccf.StartClause(append(append([]string(nil), best.Names...), nid.Names...), starts)
	t.Logf("noise order %v; spec: %s", nid.Best, spec)
	m, err := parse.Model(spec)
	if err != nil {
		t.Fatalf("%q: %v", spec, err)
	}
	if len(m.Inputs) != 1 || m.Inputs[0].Delay != 3 || m.Inputs[0].Diff.Degree() != 1 || m.Diff.Degree() != 1 || m.Noise == nil {
		t.Errorf("parsed model %+v", m)
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
