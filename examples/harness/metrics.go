package main

import "math"

// StepMetrics describes how a closed-loop variable answered a step: the
// time it took to enter and stay within a band around its final value,
// how far it went past the final value, and the remaining error. Every
// field is defined for every record; a value that the record cannot
// give is +Inf or NaN as documented, and the summary prints it as "not
// reached".
type StepMetrics struct {
	// Settling is the time (in the unit of the sample interval ts given
	// to Measure) from the step until the variable enters and stays
	// within the band of the target: 0 when it never leaves the band
	// after the step, +Inf when it is outside the band at the end of the
	// record (not reached within the run), NaN when the record has no
	// sample at or after the step.
	Settling float64
	// Overshoot is the largest excursion past the target, as a fraction
	// of the step size (0 when there is none); NaN when the target does
	// not change (a disturbance step has no step size to compare with:
	// see PeakDeviation) or there is no sample after the step.
	Overshoot float64
	// SteadyError is the mean of target - variable over the last
	// quarter of the record after the step (at least its last sample);
	// NaN when there is no sample after the step, or when the variable
	// does not settle (see Swing): a mean over an oscillation is no
	// steady state.
	SteadyError float64
	// Swing is the peak-to-peak range of the variable over that last
	// quarter (NaN when there is no sample after the step). When it
	// exceeds the band's full width (2 band) the variable cannot lie
	// within any band of that width there: it has not settled, and
	// Unsettled is true.
	Swing float64
	// Unsettled reports a variable still swinging by more than the
	// band's full width over the last quarter of the record after the
	// step (an oscillating or limit-cycling loop).
	Unsettled bool
	// PeakDeviation is the largest |target - variable| after the step
	// (for a disturbance step: how far the disturbance pushed it); NaN
	// when there is no sample after the step.
	PeakDeviation float64
}

// Measure computes StepMetrics for y answering a change of its target
// from before to after at sample k0, with sample interval ts and band
// the half-width of the settling band in y's units. y is not modified.
func Measure(y []float64, k0 int, before, after, band, ts float64) StepMetrics {
	nan := math.NaN()
	if k0 < 0 || k0 >= len(y) {
		return StepMetrics{Settling: nan, Overshoot: nan, SteadyError: nan, Swing: nan, PeakDeviation: nan}
	}
	var m StepMetrics
	size := after - before
	dir := 1.0
	if size < 0 {
		dir = -1
	}
	last := k0 - 1 // last sample outside the band; k0 - 1: none after the step
	for k := k0; k < len(y); k++ {
		dev := y[k] - after
		if !(math.Abs(dev) <= band) {
			last = k
		}
		m.PeakDeviation = math.Max(m.PeakDeviation, math.Abs(dev))
		if size != 0 {
			m.Overshoot = math.Max(m.Overshoot, dir*dev/math.Abs(size))
		}
	}
	if size == 0 {
		m.Overshoot = nan
	}
	m.Settling = float64(last+1-k0) * ts
	if last == len(y)-1 {
		m.Settling = math.Inf(1)
	}
	tail := y[k0+3*(len(y)-k0)/4:]
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range tail {
		m.SteadyError += after - v
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	m.SteadyError /= float64(len(tail))
	m.Swing = hi - lo
	if !(m.Swing <= 2*band) {
		m.Unsettled, m.SteadyError = true, nan
	}
	return m
}
