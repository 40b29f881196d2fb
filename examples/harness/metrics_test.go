package main

import (
	"math"
	"testing"
)

// TestMeasure checks the response metrics on trajectories with known
// answers: a sampled first-order rise y = 4(1 - exp(-t/10)) from 16 to
// 20 enters the 2 % band (0.08) when exp(-t/10) = 0.02, at t = 10 ln 50
// = 39.1 (closed form), so at the first sample after it, t = 40; a
// trajectory that peaks at 20.5 overshoots by 0.5/4 = 12.5 %.
func TestMeasure(t *testing.T) {
	y := make([]float64, 300)
	for k := range y {
		y[k] = 16
		if k >= 10 {
			y[k] = 20 - 4*math.Exp(-float64(k-10)/10)
		}
	}
	m := Measure(y, 10, 16, 20, 0.08, 1)
	if m.Settling != 40 || m.Overshoot != 0 || abs(m.SteadyError) > 1e-9 || abs(m.PeakDeviation-4) > 1e-12 {
		t.Errorf("first-order rise: %+v", m)
	}
	y[100] = 20.5
	if m := Measure(y, 10, 16, 20, 0.08, 2); abs(m.Overshoot-0.125) > 1e-12 || m.Settling != 2*91 {
		t.Errorf("with a peak at minute 100: %+v", m)
	}
	if m := Measure(y[:50], 10, 16, 20, 0.001, 1); !math.IsInf(m.Settling, 1) {
		t.Errorf("never settles within 0.001 in 40 samples, got %v", m.Settling)
	}
}

// TestMeasureEdges checks that every metric is defined: an output that
// never leaves the band after the step settles in 0 (it reported
// (-1 - k0) samples, a negative time), a record without a sample after
// the step gives NaN everywhere (printed "not reached"), and a step of
// size zero has no overshoot (NaN) but a peak deviation. The values are
// by hand from the definitions in StepMetrics' doc.
func TestMeasureEdges(t *testing.T) {
	flat := []float64{18, 18.1, 17.95, 18.05, 18, 17.9}
	m := Measure(flat, 2, 18, 18, 0.2, 0.5)
	if m.Settling != 0 {
		t.Errorf("never outside the band: settling %v, want 0", m.Settling)
	}
	if !math.IsNaN(m.Overshoot) {
		t.Errorf("zero step size: overshoot %v, want NaN", m.Overshoot)
	}
	// After the step (samples 2..5) the largest |18 - y| is 0.1 (y =
	// 17.9); the last quarter of 4 samples is sample 5 alone: 18 - 17.9.
	if abs(m.PeakDeviation-0.1) > 1e-12 || abs(m.SteadyError-0.1) > 1e-12 {
		t.Errorf("peak %v, steady error %v, want 0.1 and 0.1", m.PeakDeviation, m.SteadyError)
	}
	for _, k0 := range []int{-1, len(flat)} {
		m := Measure(flat, k0, 16, 18, 0.2, 1)
		if !math.IsNaN(m.Settling) || !math.IsNaN(m.Overshoot) || !math.IsNaN(m.SteadyError) || !math.IsNaN(m.PeakDeviation) {
			t.Errorf("step at %d, outside the record: %+v, want NaN everywhere", k0, m)
		}
	}
	if got := timeText(math.NaN(), 1); got != "  not reached: no sample after the step" {
		t.Errorf("NaN settling prints %q", got)
	}
	if got := timeText(math.Inf(1), 1); got != "  not reached within the run" {
		t.Errorf("+Inf settling prints %q", got)
	}
	// Only the last sample outside the band: not settled within the run.
	if m := Measure([]float64{20, 20, 21}, 0, 16, 20, 0.2, 1); !math.IsInf(m.Settling, 1) {
		t.Errorf("outside the band at the end: settling %v, want +Inf", m.Settling)
	}
}

// TestMeasureUnsettled checks the rule for a loop that does not settle:
// a sustained oscillation y = 20 + 2 sin(2 pi k/40) after the step
// swings 4 degC peak to peak over the last quarter (by hand from the
// sine: a quarter of 300 samples holds whole periods), wider than the
// 0.4 degC full width of a +-0.2 band, so it has no steady-state error
// (NaN, where the mean would read about 0); a decaying response whose
// last quarter stays within 0.4 degC keeps its error.
func TestMeasureUnsettled(t *testing.T) {
	y := make([]float64, 310)
	for k := range y {
		y[k] = 16
		if k >= 10 {
			y[k] = 20 + 2*math.Sin(2*math.Pi*float64(k-10)/40)
		}
	}
	m := Measure(y, 10, 16, 20, 0.2, 1)
	if !m.Unsettled || !math.IsNaN(m.SteadyError) || abs(m.Swing-4) > 1e-9 || !math.IsInf(m.Settling, 1) {
		t.Errorf("oscillation: %+v, want unsettled, swing 4, no steady-state error", m)
	}
	for k := 10; k < len(y); k++ {
		y[k] = 19.5 + 0.1*math.Exp(-float64(k-10)/50)
	}
	if m := Measure(y, 10, 16, 20, 0.2, 1); m.Unsettled || math.IsNaN(m.SteadyError) || m.SteadyError < 0.4 || m.SteadyError > 0.5 {
		t.Errorf("settled with an offset of about 0.5: %+v", m)
	}
}
