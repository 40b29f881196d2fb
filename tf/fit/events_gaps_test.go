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
// errors are all NaN (the review's finding: j pulse(300) with the
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
