package predict_test

import (
	"encoding/binary"
	"errors"
	"math"
	"strings"
	"testing"
	"time"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/predict"
)

// offsetSpec has an index event of each kind before the live stream
// (record sample P = 50), inside it and after the record (N = 120):
// the step at record sample 0 with dynamics (held at 1 before the
// record, so in its steady state from the start in both predictors),
// a step at 20 and a pulse at 30 through numerators only (their effect
// at sample 50 is the same whether the record before 50 was seen or
// not), a step and a pulse inside with dynamics, a step and a pulse
// after the record (they show in the forecast), an input through B
// and AR(1) noise: every state of the predictor started at record
// sample 50 agrees with the one fed from 0 once its start-up samples
// (First) are past, when the events are placed alike.
const offsetSpec = "y = 1.5 + 0.5 B x + (1.5 + 0.5 B) / (1 - 0.4 B) step(0) + 2 B step(20) + (3 + B) pulse(30)" +
	" + (1 + 0.5 B) / (1 - 0.6 B) step(70) + 4 / (1 - 0.5 B) pulse(80) + 2 step(130) + 3 pulse(125) + 1 / (1 - 0.5 B) a"

// TestOffsetPlacement: a predictor with Settings.Offset P fed the record
// from sample P on predicts, from its first prediction (record sample P
// + First) on, what a predictor with Offset 0 fed the whole record
// predicts, and forecasts the same past the record's end, where the
// step at 130 and the pulse at 125 come. Exact identity of the
// placement (an event at record sample T is at fed sample T - P), no
// outside numbers; 1e-12 relative allows for the different order in
// which the held start-up level and the running terms sum (a few
// roundings of values near 10). With ZeroPreSample too: the step before
// the stream is still held at 1 (the pole 0.4 leaves 0.4^50 ~ 1e-20 of
// its rise at record sample 0 in the predictor fed from 0).
func TestOffsetPlacement(t *testing.T) {
	const n, P, h = 120, 50, 15
	m := fixture.MustModel(t, offsetSpec)
	x := make([]float64, n+h)
	y := make([]float64, n)
	for i := range x {
		x[i] = 10 + 3*math.Sin(0.3*float64(i))
	}
	for i := range y {
		y[i] = 20 + math.Cos(0.7*float64(i)) + 0.05*float64(i)
	}
	for _, zero := range []bool{false, true} {
		full := mustPredictor(t, m, 1, &predict.Settings{ZeroPreSample: zero})
		live := mustPredictor(t, m, 1, &predict.Settings{ZeroPreSample: zero, Offset: P})
		for i := range n {
			a, err := full.Update(x[i:i+1], y[i])
			if err != nil {
				t.Fatal(err)
			}
			if i < P {
				continue
			}
			b, err := live.Update(x[i:i+1], y[i])
			if err != nil {
				t.Fatal(err)
			}
			if b.Index != i-P {
				t.Fatalf("index %d at record sample %d", b.Index, i)
			}
			if i-P >= live.First() && (!close12(b.Mean, a.Mean) || !close12(b.SE, a.SE) || !close12(b.Innov, a.Innov)) {
				t.Errorf("ZeroPreSample %v, record sample %d: Offset %d gives %+v, Offset 0 %+v", zero, i, P, b, a)
			}
		}
		fa, fb := make([]predict.Point, h), make([]predict.Point, h)
		if err := full.Forecast(fa, [][]float64{x[n:]}); err != nil {
			t.Fatal(err)
		}
		if err := live.Forecast(fb, [][]float64{x[n:]}); err != nil {
			t.Fatal(err)
		}
		for j := range fa {
			if !close12(fb[j].Mean, fa[j].Mean) || !close12(fb[j].SE, fa[j].SE) {
				t.Errorf("ZeroPreSample %v, forecast of record sample %d: Offset %d gives %+v, Offset 0 %+v", zero, n+j, P, fb[j], fa[j])
			}
		}
		// The events after the record show in the forecast: the pulse at
		// 125 adds 3 at that sample only (the model's own equation).
		if d := fb[125-n].Mean - (fb[124-n].Mean+fb[126-n].Mean)/2; math.Abs(d) < 2 {
			t.Errorf("ZeroPreSample %v: the pulse at record sample 125 does not show in the forecast (%v)", zero, d)
		}
	}
}

// TestOffsetSteadyStart: a step that falls before the first sample fed
// (by Offset, or by Start for a timed event) starts in its steady
// state: the first prediction of y = 3 + 2/(1 - 0.8 B) step + a is 3 +
// 2/(1 - 0.8) = 13, the term's steady-state gain omega(1)/delta(1)
// (Box, Jenkins, Reinsel and Ljung 2015, Time Series Analysis, ch. 11,
// the steady-state gain of a transfer function), with ZeroPreSample
// too, and every prediction after it stays there; a pulse before the
// first sample never shows (the predictions are 3). 1e-12 relative: a
// few roundings.
func TestOffsetSteadyStart(t *testing.T) {
	timed := fixture.MustModel(t, "y = 3 + 2 / (1 - 0.8 B) step(2026-03-01T08:00) + 5 pulse(2026-03-01T08:30) + a")
	timed.Interval.Value, timed.Interval.Unit = 1, "min"
	for _, c := range []struct {
		name string
		m    tf.Model
		set  predict.Settings
	}{
		{"by Offset", fixture.MustModel(t, "y = 3 + 2 / (1 - 0.8 B) step(10) + 5 pulse(40) + a"), predict.Settings{Offset: 100}},
		{"by Offset, ZeroPreSample", fixture.MustModel(t, "y = 3 + 2 / (1 - 0.8 B) step(10) + 5 pulse(40) + a"), predict.Settings{Offset: 100, ZeroPreSample: true}},
		{"by Start", timed, predict.Settings{Start: time.Date(2026, 3, 1, 9, 0, 0, 0, time.UTC)}},
		{"by Start, ZeroPreSample", timed, predict.Settings{Start: time.Date(2026, 3, 1, 9, 0, 0, 0, time.UTC), ZeroPreSample: true}},
	} {
		p := mustPredictor(t, c.m, 1, &c.set)
		for i := range 5 {
			s, err := p.Update(nil, 13)
			if err != nil {
				t.Fatal(err)
			}
			if !close12(s.Mean, 13) {
				t.Errorf("%s, sample %d: prediction %v, want 13 (the step's steady state, no pulse)", c.name, i, s.Mean)
			}
		}
	}
	// The same step inside the stream starts from 0: the check can fail.
	p := mustPredictor(t, fixture.MustModel(t, "y = 3 + 2 / (1 - 0.8 B) step(10) + a"), 1, &predict.Settings{Offset: 5})
	if s, _ := p.Update(nil, 3); s.Mean != 3 {
		t.Errorf("a step after the first sample: first prediction %v, want 3", s.Mean)
	}
}

// TestOffsetSnapshot: the events' placement is part of the fingerprint.
// A snapshot taken with Offset 50 is refused by a predictor with Offset
// 60 or another Start (ErrOtherModel, the message saying that only the
// placement differs), and restored by one with Offset 50; for a model
// without events Offset changes nothing and the snapshot is accepted; a
// snapshot of the previous version (2, no second fingerprint) is still
// read.
func TestOffsetSnapshot(t *testing.T) {
	m := fixture.MustModel(t, "y = 0.5 B x + 2 step(70) + 3 pulse(2026-03-01T09:00) + a")
	m.Interval.Value, m.Interval.Unit = 1, "min"
	at := time.Date(2026, 3, 1, 8, 0, 0, 0, time.UTC)
	p := mustPredictor(t, m, 1, &predict.Settings{Offset: 50, Start: at})
	for i := range 10 {
		p.Update([]float64{float64(i)}, 1)
	}
	snap, _ := p.MarshalBinary()
	for _, c := range []struct {
		name string
		set  predict.Settings
	}{{"another Offset", predict.Settings{Offset: 60, Start: at}}, {"another Start", predict.Settings{Offset: 50, Start: at.Add(time.Minute)}}} {
		err := mustPredictor(t, m, 1, &c.set).UnmarshalBinary(snap)
		if !errors.Is(err, predict.ErrOtherModel) || !strings.Contains(err.Error(), "same model with its events placed otherwise") || !strings.Contains(err.Error(), "Settings.Offset") {
			t.Errorf("%s: %v", c.name, err)
		}
	}
	other := fixture.MustModel(t, "y = 0.6 B x + 2 step(70) + 3 pulse(2026-03-01T09:00) + a")
	other.Interval = m.Interval
	if err := mustPredictor(t, other, 1, &predict.Settings{Offset: 60, Start: at}).UnmarshalBinary(snap); !errors.Is(err, predict.ErrOtherModel) || !strings.Contains(err.Error(), "another model") {
		t.Errorf("another model: %v", err)
	}
	q := mustPredictor(t, m, 1, &predict.Settings{Offset: 50, Start: at})
	if err := q.UnmarshalBinary(snap); err != nil || q.Count() != 10 {
		t.Errorf("same placement: %v, Count %d", err, q.Count())
	}
	// Version 2: the same bytes without the second fingerprint (bytes
	// 25..32).
	v2 := append(append([]byte{2}, snap[1:25]...), snap[33:]...)
	q = mustPredictor(t, m, 1, &predict.Settings{Offset: 50, Start: at})
	if err := q.UnmarshalBinary(v2); err != nil || q.Count() != 10 {
		t.Errorf("a version 2 snapshot: %v, Count %d", err, q.Count())
	}
	if binary.LittleEndian.Uint64(snap[1:]) != p.Fingerprint() {
		t.Error("the snapshot does not start with the fingerprint")
	}
	plain := fixture.MustModel(t, "y = 0.5 B x + a")
	a := mustPredictor(t, plain, 1, &predict.Settings{Offset: 50})
	a.Update([]float64{1}, 1)
	s, _ := a.MarshalBinary()
	if err := mustPredictor(t, plain, 1, nil).UnmarshalBinary(s); err != nil {
		t.Errorf("a model without events, another Offset: %v", err)
	}
}

// TestOffsetBad: a negative Offset is a *SettingError naming the field,
// from New and from Validate.
func TestOffsetBad(t *testing.T) {
	m := fixture.MustModel(t, "y = 2 step(10) + a")
	_, err := predict.New(m, 1, &predict.Settings{Offset: -1})
	var se *predict.SettingError
	if !errors.As(err, &se) || se.Setting != "Settings.Offset" || se.Op != "predict.New" || !errors.Is(err, predict.ErrSetting) {
		t.Errorf("New with Offset -1: %v", err)
	}
	if err := (predict.Settings{Offset: -3}).Validate(); !errors.As(err, &se) || se.Setting != "Settings.Offset" {
		t.Errorf("Validate with Offset -3: %v", err)
	}
}

// close12 reports got within 1e-12 of want, relative to |want| when
// above 1.
func close12(got, want float64) bool { return near(got, want, 1e-12, math.Max(1, math.Abs(want))) }
