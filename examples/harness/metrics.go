package main

import "math"

// StepMetrics describes how a closed-loop variable answered a step: the
// time it took to enter and stay within a band around its final value,
// how far it went past the final value, and the remaining error.
type StepMetrics struct {
	// Settling is the time (minutes) from the step until the variable
	// enters and stays within Band of the target; +Inf when it never
	// settles within the record.
	Settling float64
	// Overshoot is the largest excursion past the target, as a fraction
	// of the step size (0 when there is none).
	Overshoot float64
	// SteadyError is the mean of target - variable over the last
	// quarter of the record after the step.
	SteadyError float64
	// PeakDeviation is the largest |target - variable| after the step
	// (for a disturbance step: how far the disturbance pushed it).
	PeakDeviation float64
}

// Measure computes StepMetrics for y answering a change of its target
// from before to after at sample k0, with sample interval ts (minutes)
// and band the half-width of the settling band in y's units. y is not
// modified.
func Measure(y []float64, k0 int, before, after, band, ts float64) StepMetrics {
	m := StepMetrics{Settling: math.Inf(1)}
	if k0 < 0 || k0 >= len(y) {
		return m
	}
	size := after - before
	dir := 1.0
	if size < 0 {
		dir = -1
	}
	last := -1 // last sample outside the band
	for k := k0; k < len(y); k++ {
		dev := y[k] - after
		if math.Abs(dev) > band {
			last = k
		}
		m.PeakDeviation = math.Max(m.PeakDeviation, math.Abs(dev))
		if size != 0 {
			m.Overshoot = math.Max(m.Overshoot, dir*dev/math.Abs(size))
		}
	}
	if last < len(y)-1 {
		m.Settling = float64(last+1-k0) * ts
	}
	tail := y[k0+3*(len(y)-k0)/4:]
	for _, v := range tail {
		m.SteadyError += after - v
	}
	m.SteadyError /= float64(len(tail))
	return m
}
