package arma

import (
	"context"
	"math"
	"testing"
)

// TestHighDegreeMA: every MA polynomial of degree above 32 panicked in
// the stability test (a 33-element stack buffer was sliced before its
// size was checked). Each model below is simulated, checked for
// stationarity and invertibility, fitted and forecast. The truth of a
// simulated model is the outside source of the estimates; each must lie
// within 4 standard errors of it (a normal deviate beyond 4 has
// probability 6e-5; the seeds are fixed, so the test is deterministic).
func TestHighDegreeMA(t *testing.T) {
	ma33 := make([]float64, 33)
	ma33[32] = 0.5
	cases := []struct {
		name string
		m    Model
		n    int
	}{
		{"(0,0,33)", Model{MA: ma33, Sigma2: 1}, 800},
		{"(0,0,1)x(0,0,3)_12", Model{MA: []float64{0.4}, SMA: []float64{0.3, -0.2, 0.1}, Period: 12, Sigma2: 1}, 800},
		{"(1,1,0)x(0,1,1)_52", Model{AR: []float64{0.5}, D: 1, SD: 1, SMA: []float64{0.6}, Period: 52, Sigma2: 1}, 52 * 16},
	}
	for i, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := c.m.Order().String(); got != c.name {
				t.Fatalf("order %s, want %s", got, c.name)
			}
			if ok, bad, err := c.m.Stationary(); err != nil || !ok {
				t.Errorf("Stationary = %v %v %v, want true", ok, bad, err)
			}
			if ok, bad, err := c.m.Invertible(); err != nil || !ok {
				t.Errorf("Invertible = %v %v %v, want true", ok, bad, err)
			}
			y, err := Simulate(c.m, c.n, &SimSettings{Seed1: uint64(i + 11), Seed2: 7})
			if err != nil {
				t.Fatal(err)
			}
			res, err := Fit(context.Background(), y, c.m.Order(), &Options{Mean: MeanNone})
			if err != nil {
				t.Fatal(err)
			}
			truth := append(append(append(append([]float64(nil), c.m.AR...), c.m.SAR...), c.m.MA...), c.m.SMA...)
			if len(res.Est) != len(truth) {
				t.Fatalf("%d estimates %v, want %d", len(res.Est), res.Names, len(truth))
			}
			for k, v := range truth {
				if d := math.Abs(res.Est[k]-v) / res.SE[k]; !(d <= 4) {
					t.Errorf("%s = %.4f +- %.4f, truth %.4f (%.1f SE)", res.Names[k], res.Est[k], res.SE[k], v, d)
				}
			}
			fc, err := res.Forecast(60, 0.95, nil)
			if err != nil {
				t.Fatal(err)
			}
			for h := range fc.Mean {
				if math.IsNaN(fc.Mean[h]) || math.IsInf(fc.Mean[h], 0) || !(fc.SE[h] > 0) || math.IsInf(fc.SE[h], 0) {
					t.Fatalf("step %d: mean %v se %v", h+1, fc.Mean[h], fc.SE[h])
				}
			}
		})
	}
}
