package predict_test

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf/predict"
)

// Event inputs are built by the predictor from the sample count, not
// fed: for y = 0.5 B x + 2 step(10) + 3 pulse(12) + a (white noise) the
// one-step prediction is, by the model's own equation, 0.5 x_{t-1} + 2
// [t >= 10] + 3 [t = 12] (the term of x held at x_0 before sample 0,
// the fit's convention), Inputs() lists x only, Warm needs no event
// series, and Forecast continues the indicators. Exact to 1e-15
// relative: one or two roundings.
func TestEvents(t *testing.T) {
	p := mustPredictor(t, fixture.MustModel(t, "y = 0.5 B x + 2 step(10) + 3 pulse(12) + a"), 1, nil)
	if got := p.Inputs(); !slices.Equal(got, []string{"x"}) {
		t.Fatalf("Inputs() = %q, want [x]", got)
	}
	x := make([]float64, 20)
	for i := range x {
		x[i] = math.Sin(float64(i))
	}
	want := func(i int) float64 {
		v := 0.5 * x[max(i-1, 0)]
		if i >= 10 {
			v += 2
		}
		if i == 12 {
			v += 3
		}
		return v
	}
	for i := range 15 {
		s, err := p.Update([]float64{x[i]}, want(i)+0.1)
		if err != nil {
			t.Fatal(err)
		}
		if i >= p.First() && !near(s.Mean, want(i), 1e-15, 4) {
			t.Errorf("sample %d: prediction %v, want %v", i, s.Mean, want(i))
		}
	}
	w := p.Clone()
	hist := map[string][]float64{"x": x[:8], "y": make([]float64, 8)}
	if err := w.Warm(hist); err != nil {
		t.Fatalf("Warm without event series: %v", err)
	}
	fc := make([]predict.Point, 6)
	if err := w.Forecast(fc, [][]float64{x[8:14]}); err != nil {
		t.Fatal(err)
	}
	for j, f := range fc {
		if i := 8 + j; !near(f.Mean, want(i), 1e-15, 4) {
			t.Errorf("forecast of sample %d: %v, want %v", i, f.Mean, want(i))
		}
	}
}

// An event given as a time is placed by Settings.Start and the model's
// sample interval: with samples every minute from 08:00, step(08:10) is
// the step at sample 10 (tf.Event.Sample). Without a sample interval the
// timed event cannot be placed: a *ModelError naming the input.
func TestEventTimes(t *testing.T) {
	m := fixture.MustModel(t, "y = 2 step(2026-03-01T08:10) + a")
	m.Interval.Value, m.Interval.Unit = 1, "min"
	start := time.Date(2026, 3, 1, 8, 0, 0, 0, time.UTC)
	p := mustPredictor(t, m, 1, &predict.Settings{Start: start})
	for i := range 12 {
		s, err := p.Update(nil, 0)
		if err != nil {
			t.Fatal(err)
		}
		if want := map[bool]float64{true: 2, false: 0}[i >= 10]; s.Mean != want {
			t.Errorf("sample %d: prediction %v, want %v", i, s.Mean, want)
		}
	}
	m.Interval.Value, m.Interval.Unit = 0, ""
	_, err := predict.New(m, 1, &predict.Settings{Start: start})
	var me *predict.ModelError
	if !errors.As(err, &me) || !strings.Contains(me.Part, "step(2026-03-01T08:10)") || !strings.Contains(err.Error(), "Settings.Start") {
		t.Errorf("timed event without an interval: %v", err)
	}
}
