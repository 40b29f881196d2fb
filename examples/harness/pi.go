package main

import (
	"fmt"
	"math"
)

// PI is a proportional-integral controller in velocity (incremental)
// form with output limits:
//
//	e_t  = setpoint_t - measurement_t
//	du_t = Kc * ((e_t - e_{t-1}) + Ts/Ti * e_t)
//	u_t  = clamp(u_{t-1} + du_t, Min, Max)
//
// The velocity form has anti-windup built in: the controller integrates
// from its own limited output, so after a period at a limit it leaves the
// limit as soon as the error changes sign, with no stored integral to
// unwind. Kc is in output units per measurement unit (for the greenhouse:
// % valve per degC); Ti and Ts are in the same time unit (minutes).
//
// A PI holds state; it is not safe for concurrent use.
type PI struct {
	Kc, Ti, Ts float64
	Min, Max   float64

	u, ePrev float64
	started  bool
}

// NewPI returns a PI controller whose output starts at u0 (bumpless
// start from the current actuator position). It returns an error when a
// tuning value is not finite and positive or the limits are not ordered.
func NewPI(kc, ti, ts, lo, hi, u0 float64) (*PI, error) {
	for _, v := range []struct {
		name string
		x    float64
	}{{"Kc", kc}, {"Ti", ti}, {"Ts", ts}} {
		if !(v.x > 0) || math.IsInf(v.x, 0) {
			return nil, fmt.Errorf("harness: PI %s = %v, want a finite positive number", v.name, v.x)
		}
	}
	if !(lo < hi) {
		return nil, fmt.Errorf("harness: PI limits %v..%v are not ordered", lo, hi)
	}
	return &PI{Kc: kc, Ti: ti, Ts: ts, Min: lo, Max: hi, u: math.Min(math.Max(u0, lo), hi)}, nil
}

// Update returns the new controller output for the setpoint and the
// latest measurement.
func (c *PI) Update(setpoint, measurement float64) float64 {
	e := setpoint - measurement
	if !c.started {
		// First call: no previous error, so no proportional kick from
		// an arbitrary e_{-1}.
		c.ePrev, c.started = e, true
	}
	du := c.Kc * ((e - c.ePrev) + c.Ts/c.Ti*e)
	c.ePrev = e
	c.u = math.Min(math.Max(c.u+du, c.Min), c.Max)
	return c.u
}

// Output returns the last output.
func (c *PI) Output() float64 { return c.u }
