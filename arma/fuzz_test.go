package arma

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// fuzzSeries turns fuzz bytes into a short series with hostile values:
// each pair of bytes is one sample, the first byte choosing NaN, +-Inf,
// 1e300, 1e-300, a repeat of the previous sample (constant runs) or an
// ordinary value from the second byte.
func fuzzSeries(data []byte) []float64 {
	return testutil.HostileSeries(data, testutil.Hostile{Max: 80, Div: 16, Up: 1e12})
}

// FuzzFit: a short series with hostile values (NaN among them) and
// small random orders, fitted by either method (method odd: ExactML,
// where NaN samples are missing values), gives a typed error or a finite
// result, never a panic; a result's forecast is finite or a typed error;
// an exact-likelihood result lists every NaN sample in Missing with a
// finite estimate from Start on, and its Ljung-Box test runs.
func FuzzFit(f *testing.F) {
	f.Add([]byte{10, 3, 10, 40, 10, 250, 10, 7, 10, 100, 10, 33, 10, 1, 10, 200}, uint8(1), uint8(0), uint8(1), uint8(0))
	f.Add([]byte{5, 0, 5, 0, 5, 0, 5, 0, 5, 0, 5, 0}, uint8(1), uint8(1), uint8(0), uint8(0))
	f.Add([]byte{10, 3, 0, 40, 10, 250, 3, 7, 10, 100, 10, 33}, uint8(0), uint8(0), uint8(2), uint8(0))
	f.Add([]byte{9, 3, 9, 40, 9, 250, 9, 7, 9, 100, 9, 33, 9, 1, 9, 200, 9, 9, 9, 90}, uint8(2), uint8(1), uint8(1), uint8(0))
	f.Add([]byte{10, 3, 10, 40, 0, 250, 10, 7, 10, 100, 0, 33, 10, 1, 10, 200, 10, 9, 10, 90, 10, 50, 10, 60}, uint8(1), uint8(0), uint8(1), uint8(1))
	f.Add([]byte{0, 3, 10, 40, 10, 250, 0, 7, 0, 100, 10, 33, 10, 1, 10, 200, 10, 9, 10, 90, 10, 50, 0, 60}, uint8(2), uint8(1), uint8(1), uint8(1))
	f.Fuzz(func(t *testing.T, data []byte, p, d, q, method uint8) {
		y := fuzzSeries(data)
		keep := append([]float64(nil), y...)
		ord := Order{P: int(p % 3), D: int(d % 2), Q: int(q % 3)}
		o := &FitSettings{Name: "fuzz", MaxIter: 50, Method: Method(method % 2)}
		res, err := Fit(context.Background(), y, ord, o)
		for i := range y {
			if y[i] != keep[i] && !(math.IsNaN(y[i]) && math.IsNaN(keep[i])) {
				t.Fatalf("input modified at %d", i)
			}
		}
		if err != nil {
			var cv *ConvergenceError
			switch {
			case errors.As(err, &cv):
				if res == nil {
					t.Fatalf("ConvergenceError without a result: %v", err)
				}
			case kindOf(err) != nil:
				if res != nil {
					t.Fatalf("result with error %v", err)
				}
				return
			default:
				t.Fatalf("untyped error %T %v", err, err)
			}
		}
		if !(res.Sigma2 > 0) || math.IsInf(res.Sigma2, 0) || math.IsNaN(res.LogLik) {
			t.Fatalf("Sigma2 %v LogLik %v", res.Sigma2, res.LogLik)
		}
		for k, v := range ests(res) {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("%s = %v", names(res)[k], v)
			}
		}
		if o.Method == ExactML {
			checkExactResult(t, y, res)
		}
		fc, ferr := res.Forecast(5, 0.9, nil)
		if ferr != nil {
			if kindOf(ferr) == nil {
				t.Fatalf("forecast: untyped %T %v", ferr, ferr)
			}
			return
		}
		for h := range fc.Mean {
			if math.IsNaN(fc.Mean[h]) || math.IsInf(fc.Mean[h], 0) || math.IsNaN(fc.SE[h]) || math.IsInf(fc.SE[h], 0) {
				t.Fatalf("forecast step %d: %v +- %v", h+1, fc.Mean[h], fc.SE[h])
			}
		}
	})
}

// TestStartOverflowMessage: start values whose residuals overflow give a
// message that names the series and the settings to look at, not the
// optimiser's internal wording.
func TestStartOverflowMessage(t *testing.T) {
	y, err := Simulate(Model{AR: []float64{0.5}, Sigma2: 1}, 100, &SimSettings{Seed1: 2})
	if err != nil {
		t.Fatal(err)
	}
	_, err = Fit(context.Background(), y, Order{P: 1, Q: 1}, &FitSettings{Name: "flow", StartValues: map[string]float64{"phi1": 1e200}, AllowNonInvertible: true})
	var ae *ModelError
	if !errors.As(err, &ae) || !strings.Contains(err.Error(), "arma.Fit: start values: the residuals of flow at the start values are not finite") || strings.Contains(err.Error(), "lm:") {
		t.Errorf("%T %v", err, err)
	}
}

// checkExactResult checks an exact-likelihood result of y: every NaN
// sample in Missing, in order, with a finite estimate and SE from Start
// on; residuals NaN exactly where y is; the Ljung-Box test a result or a
// typed error.
func checkExactResult(t *testing.T, y []float64, res *Result) {
	k := 0
	for i, v := range y {
		if !math.IsNaN(v) {
			if i >= res.Start && math.IsNaN(res.Resid[i]) {
				t.Fatalf("residual %d NaN at an observed sample", i)
			}
			continue
		}
		if k >= len(res.Missing) || res.Missing[k].Index != i {
			t.Fatalf("missing sample %d not listed (%v)", i, res.Missing)
		}
		m := res.Missing[k]
		if i >= res.Start && (math.IsNaN(m.Value) || math.IsInf(m.Value, 0) || !(m.SE >= 0) || math.IsInf(m.SE, 0)) {
			t.Fatalf("missing %d: %v sd %v", i, m.Value, m.SE)
		}
		if !math.IsNaN(res.Resid[i]) {
			t.Fatalf("residual %d = %v at a missing sample", i, res.Resid[i])
		}
		k++
	}
	if k != len(res.Missing) {
		t.Fatalf("%d missing listed, %d in the series", len(res.Missing), k)
	}
	if _, err := res.LjungBox(3); err != nil && kindOf(err) == nil {
		t.Fatalf("LjungBox: untyped %T %v", err, err)
	}
}
