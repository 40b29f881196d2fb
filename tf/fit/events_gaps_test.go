package fit_test

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// gapRecord returns the record of stepRecord (n 400, AR(1) 0.5, a step of
// 3 from 200) with a pulse of 2 at 300 and the output missing (NaN) at
// the samples of gaps.
func gapRecord(gaps ...[2]int) map[string][]float64 {
	x, y := stepRecord(rand.New(rand.NewPCG(11, 12)), 400, 0.5, 200, 3)
	y[300] += 2
	for _, g := range gaps {
		for t := g[0]; t <= g[1]; t++ {
			y[t] = math.NaN()
		}
	}
	return map[string][]float64{"y": y, "x": x}
}

// TestEventInsideOutputGap: under ExactML an event whose effect on the
// output falls only on missing samples cannot be estimated (the
// likelihood does not depend on its size: a singular information
// matrix, common practice); it is refused by name and place, like a
// pulse before Conditioning.First, instead of a fit whose standard
// errors are all NaN (before: j pulse(300) with the
// output missing at 290..309 gave j = -0.42 and NaN for every SE).
// Events whose effect reaches an observed sample are fitted, with a
// finite SE.
func TestEventInsideOutputGap(t *testing.T) {
	base := "y = c + w0 B x + k step(200) + "
	refused := []struct {
		name, terms, where string
		gaps               [][2]int
	}{
		{"pulse in a gap", "j pulse(300)", "sample 300, all inside the missing output samples 290..309", [][2]int{{290, 309}}},
		{"pulse with dead time", "j B^3 pulse(300)", "sample 303, all inside the missing output samples 301..305", [][2]int{{301, 305}}},
		{"numerator, first sample missing", "(j0 + j1 B) pulse(300)", "coefficient j0 on the output falls on sample 300, all inside the missing output samples 299..300", [][2]int{{299, 300}}},
		{"numerator, second sample missing", "(j0 + j1 B) pulse(300)", "coefficient j1 on the output falls on sample 301, all inside the missing output samples 301..305", [][2]int{{301, 305}}},
		{"step in the end gap", "j pulse(300) + k2 step(390)", "samples 390..399 (to the record's end), all inside the missing output samples 385..399", [][2]int{{385, 399}}},
		{"decay in the end gap", "j / (1 - 0.5 B) pulse(390)", "samples 390..399 (to the record's end)", [][2]int{{385, 399}}},
	}
	for _, c := range refused {
		m := parse.MustModel(base + c.terms + " + 1 / (1 - p1 B) a")
		_, err := fit.Model(context.Background(), m, gapRecord(c.gaps...), &fit.Settings{Method: fit.ExactML})
		var me *tf.ModelError
		if !errors.As(err, &me) || !errors.Is(err, tf.ErrModel) || !strings.Contains(err.Error(), c.where) || !strings.Contains(err.Error(), "pulse(") && !strings.Contains(err.Error(), "step(") {
			t.Errorf("%s: got %v, want a *ModelError naming the event and %q", c.name, err, c.where)
		}
	}
	fitted := []struct {
		name, terms string
		gaps        [][2]int
	}{
		{"pulse before the gap", "j pulse(300)", [][2]int{{301, 309}}},
		{"numerator seen before the gap", "(j0 + j1 B) pulse(300)", [][2]int{{302, 305}}},
		{"decay seen after the gap", "j / (1 - 0.5 B) pulse(300)", [][2]int{{300, 302}}},
		{"step into a gap", "j pulse(300) + k2 step(350)", [][2]int{{345, 360}}},
	}
	for _, c := range fitted {
		m := parse.MustModel(base + c.terms + " + 1 / (1 - p1 B) a")
		e, err := fit.Model(context.Background(), m, gapRecord(c.gaps...), &fit.Settings{Method: fit.ExactML})
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		for _, p := range e.Params {
			if math.IsNaN(p.SE) || !(p.SE > 0) {
				t.Errorf("%s: %s = %v, SE %v", c.name, p.Name, p.Value, p.SE)
			}
		}
	}
}

// TestDifferencedEventInsideOutputGap: on a (1 - B) model the additive
// outlier's term ao (1 - B) pulse(T) (tf.Model.WithOutliers) acts on
// the observed output at T only (the (1 - B) cancels against the
// output's differencing: common practice), so a gap covering T refuses
// it; a plain pulse(T) on the differenced equation is a step of the
// output and is fitted when the output is seen after the gap.
func TestDifferencedEventInsideOutputGap(t *testing.T) {
	data := gapRecord([2]int{298, 302})
	m := parse.MustModel("(1 - B) y = w0 B x + k pulse(200) + ao300 (1 - B) pulse(300) + (1 - t1 B) a")
	_, err := fit.Model(context.Background(), m, data, &fit.Settings{Method: fit.ExactML})
	if !errors.Is(err, tf.ErrModel) || !strings.Contains(err.Error(), "input pulse(300): the effect of its coefficient ao300 on the output falls on sample 300, all inside the missing output samples 298..302") {
		t.Errorf("got %v", err)
	}
	m = parse.MustModel("(1 - B) y = w0 B x + k pulse(200) + ls300 pulse(300) + (1 - t1 B) a")
	if _, err := fit.Model(context.Background(), m, data, &fit.Settings{Method: fit.ExactML}); err != nil {
		t.Errorf("a level shift into a gap: %v", err)
	}
}

// TestEventForecastShortData: an event's future is known from the model
// (its indicator over the horizon), also when the data forecast from
// are shorter than the fit's record and the event lies in the horizon or
// beyond it. The record of TestEventForecast (300 samples, a step of 3
// at 150, AR(1) 0.5 noise); forecast from its first 140 samples, 200
// ahead: far ahead the forecast of y = c + k step(150) + 1/(1 - p1 B) a
// is c + k, the AR(1) part decaying as p1^h (Box, Jenkins, Reinsel &
// Ljung 2015, the forecasting chapter: an AR(1)'s forecast tends to its
// mean; 0.5^190 is below 1e-50, so the tolerance 1e-9 is rounding
// only), and 9 and 10 steps ahead (samples 149 and 150) the step shows
// as k up to the AR part's decay 0.5^9 times the last noise value (below
// 0.05 here). From the first 100 samples 30 ahead the step (at 150)
// lies beyond the horizon and the forecast tends to c. Both methods.
// Before, Forecast refused: "the event falls at sample 150, after the
// record's last sample".
func TestEventForecastShortData(t *testing.T) {
	y := eventForecastRecord()
	m := parse.MustModel("y = c + k step(150) + 1 / (1 - p1 B) a")
	for _, meth := range []fit.Method{fit.LeastSquares, fit.ExactML} {
		est, err := fit.Model(context.Background(), m, map[string][]float64{"y": y}, &fit.Settings{Method: meth})
		if err != nil {
			t.Fatal(err)
		}
		c, _ := est.Param("c")
		k, _ := est.Param("k")
		fc, err := est.Forecast(map[string][]float64{"y": y[:140]}, 200, nil)
		if err != nil {
			t.Fatalf("%v: %v", meth, err)
		}
		if got := fc.Mean[199]; math.Abs(got-(c.Value+k.Value)) > 1e-9 {
			t.Errorf("%v: forecast 200 steps ahead of sample 139: %.12g, want c + k = %.12g", meth, got, c.Value+k.Value)
		}
		if jump := fc.Mean[10] - fc.Mean[9]; math.Abs(jump-k.Value) > 0.05 {
			t.Errorf("%v: the forecast moves by %.4f at the step, want k = %.4f", meth, jump, k.Value)
		}
		if len(fc.Warnings) != 0 {
			t.Errorf("%v: warnings %v", meth, fc.Warnings)
		}
		t.Logf("%v: c %.4f k %.4f; from sample 139: mean at 149 %.4f, at 150 %.4f, at 339 %.6f", meth, c.Value, k.Value, fc.Mean[9], fc.Mean[10], fc.Mean[199])
		fc, err = est.Forecast(map[string][]float64{"y": y[:100]}, 30, nil)
		if err != nil {
			t.Fatalf("%v: %v", meth, err)
		}
		if got := fc.Mean[29]; math.Abs(got-c.Value) > 1e-6 {
			t.Errorf("%v: forecast 30 steps ahead of sample 99: %.9g, want c = %.9g (the step at 150 is beyond the horizon)", meth, got, c.Value)
		}
	}
}
