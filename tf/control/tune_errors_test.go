package control

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/tf"
)

// TestTuneBadInput checks each trap of Tune and PID: a typed error that
// names the field or the part at fault.
func TestTuneBadInput(t *testing.T) {
	p, _ := tf.NewRational([]float64{0.2}, []float64{1, -0.9}, 2)
	alternating, _ := tf.NewRational([]float64{0.2}, []float64{1, 0.5}, 2)
	unstable, _ := tf.NewRational([]float64{0.2}, []float64{1, -1.2}, 2)
	twoInt, _ := tf.NewRational([]float64{0.2}, []float64{1, -2, 1}, 2)
	zeroGain, _ := tf.NewRational([]float64{0.2, -0.2}, []float64{1, -0.9}, 2)
	ringing, _ := tf.NewRational([]float64{0.2}, []float64{1, -1.6, 0.95}, 2)
	pure, _ := tf.NewRational([]float64{0.5}, []float64{1}, 3)
	feedthrough, _ := tf.NewRational([]float64{0.2}, []float64{1, -0.9}, 0)
	for _, c := range []struct {
		name string
		p    tf.Rational
		iv   tf.Interval
		s    TuneSettings
		kind error
		word string
	}{
		{"unknown rule", p, tf.Interval{}, TuneSettings{Rule: "ZN"}, ErrSetting, "TuneSettings.Rule"},
		{"unknown form", p, tf.Interval{}, TuneSettings{Form: "ideal"}, ErrSetting, "TuneSettings.Form"},
		{"unknown method", p, tf.Interval{}, TuneSettings{Method: "euler"}, ErrSetting, "TuneSettings.Method"},
		{"negative time", p, tf.Interval{}, TuneSettings{ClosedLoopTime: -1}, ErrSetting, "TuneSettings.ClosedLoopTime"},
		{"Ms below 1", p, tf.Interval{}, TuneSettings{MaxSensitivity: 0.9}, ErrSetting, "TuneSettings.MaxSensitivity"},
		{"filter above 1", p, tf.Interval{}, TuneSettings{Filter: 2}, ErrSetting, "TuneSettings.Filter"},
		{"negative interval", p, tf.Interval{Value: -1, Unit: "s"}, TuneSettings{}, ErrSetting, "Interval.Value"},
		{"NaN interval", p, tf.Interval{Value: math.NaN(), Unit: "s"}, TuneSettings{}, ErrSetting, "Interval.Value"},
		{"alternating pole", alternating, tf.Interval{}, TuneSettings{}, ErrModel, "negative real axis"},
		{"unstable pole", unstable, tf.Interval{}, TuneSettings{}, ErrModel, "outside the unit circle"},
		{"two integrators", twoInt, tf.Interval{}, TuneSettings{}, ErrModel, "two or more integrators"},
		{"zero gain", zeroGain, tf.Interval{}, TuneSettings{}, ErrModel, "no steady-state effect"},
		{"lightly damped", ringing, tf.Interval{}, TuneSettings{}, ErrModel, "lightly damped"},
		{"pure dead time", pure, tf.Interval{}, TuneSettings{}, ErrModel, "pure dead time"},
		{"algebraic loop", feedthrough, tf.Interval{}, TuneSettings{}, ErrModel, "algebraic loop"},
		{"Ms unreachable", p, tf.Interval{}, TuneSettings{MaxSensitivity: 1.0001}, ErrModel, "MaxSensitivity target"},
	} {
		_, err := Tune(c.p, c.iv, c.s)
		if !errors.Is(err, c.kind) || !strings.Contains(err.Error(), c.word) || !strings.Contains(err.Error(), "control.Tune") {
			t.Errorf("%s: %v", c.name, err)
		}
	}
	for _, c := range []PID{{Gain: 0}, {Gain: math.Inf(1)}, {Gain: 1, Integral: -1}, {Gain: 1, Derivative: math.NaN()}, {Gain: 1, Filter: -0.1}, {Gain: 1, Form: "ideal"}} {
		if _, err := c.Discrete(1, ""); !errors.Is(err, ErrSetting) {
			t.Errorf("%+v: %v", c, err)
		}
	}
	if _, err := (PID{Gain: 1}).Discrete(0, ""); !errors.Is(err, ErrSetting) {
		t.Errorf("interval 0: %v", err)
	}
	if _, err := (PID{Gain: 1}).Discrete(1, "euler"); !errors.Is(err, ErrSetting) {
		t.Errorf("unknown method: %v", err)
	}
	if _, err := HalfRule(Reading{Gain: 1, Lags: []float64{1}}, 3); !errors.Is(err, ErrSetting) {
		t.Errorf("order 3: %v", err)
	}
	if _, err := HalfRule(Reading{Gain: 1, Leads: []float64{1}, Integrating: true}, 1); !errors.Is(err, ErrModel) {
		t.Errorf("lead without lag: %v", err)
	}
	// A reading built by hand with figures that break Reading's rules is
	// refused by field, not reduced to a model of NaN or negative times.
	for _, c := range []struct {
		r     Reading
		field string
	}{
		{Reading{Gain: math.NaN(), Lags: []float64{1}}, "Reading.Gain = NaN"},
		{Reading{Gain: 1, Lags: []float64{2, -5}}, "Reading.Lags[1] = -5"},
		{Reading{Gain: 1, Lags: []float64{math.NaN()}}, "Reading.Lags[0] = NaN"},
		{Reading{Gain: 1, Lags: []float64{3}, Leads: []float64{math.Inf(1)}}, "Reading.Leads[0] = +Inf"},
		{Reading{Gain: 1, Lags: []float64{3}, Inverse: []float64{0}}, "Reading.Inverse[0] = 0"},
		{Reading{Gain: 1, Lags: []float64{3}, DeadTime: -1}, "Reading.DeadTime = -1"},
		{Reading{Gain: 1, Lags: []float64{3}, Interval: math.NaN()}, "Reading.Interval = NaN"},
	} {
		_, err := HalfRule(c.r, 1)
		if !errors.Is(err, ErrSetting) || !strings.Contains(fmt.Sprint(err), c.field) || !strings.Contains(fmt.Sprint(err), "control.HalfRule") {
			t.Errorf("%+v: %v, want a *SettingError naming %s", c.r, err, c.field)
		}
	}
}
