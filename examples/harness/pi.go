package main

import (
	"fmt"
	"math"
)

// PI is a proportional-integral controller in position form with output
// limits and back-calculation as its anti-windup, with tracking time
// Tt = Ti:
//
//	e_t = setpoint_t - measurement_t
//	v_t = Kc e_t + I_{t-1} + Kc Ts/Ti e_t       (the unlimited output)
//	u_t = clamp(v_t, Min, Max)
//	I_t = I_{t-1} + Kc Ts/Ti e_t + f (u_t - v_t),  f = min(Ts/Tt, 1)
//
// Within the limits u_t = v_t and u_t - u_{t-1} = Kc (e_t - e_{t-1}) +
// Kc Ts/Ti e_t: the backward-difference PI Kc ((1 + Ts/Ti) - B)/(1 - B)
// that control.Tune returns and control.Analyze closes, so an
// unsaturated run is the loop those figures are for. At a limit the
// controller keeps its position Kc e_t + I_t: the part of a set-point
// kick that the limit clipped is not forgotten (a clamped velocity form,
// u_t = clamp(u_{t-1} + du_t), loses it and then sits low until the
// integral recovers it over Ti: the faster tuning then looks the
// slower). The back-calculation term pulls the integral towards the
// value that would put the output at the limit, with time constant Tt
// (rule: Åström & Hägglund, Advanced PID Control, 2006, the section on
// integrator windup; from memory).
// With Tt = Ti the integral of a long spell at a limit settles where,
// with the sample's increment, it equals the limit (I_t + Kc Ts/Ti e_t =
// Max: the fixed point of the update with e constant), so it does not
// wind up, and the output leaves the limit as soon as the error changes
// sign. A shorter Tt holds the integral back during the short kick of a
// set-point step and slows the loop: on the greenhouse valve path
// with the SIMC tuning, a 4 degC step settles to +-0.2 degC in 12 min
// with Tt = Ti, 30 min with Tt = Ti/4 and 46 min with Tt = Ts (the
// clamped velocity form's figure), against 9 min without limits
// (testdata/harness/pi.py, checked by pi_test.go).
// Kc is in output units per measurement unit (for the greenhouse: %
// valve per degC); Ti and Ts are in the same time unit (minutes).
//
// A PI holds state; it is not safe for concurrent use.
type PI struct {
	Kc, Ti, Ts float64
	Min, Max   float64

	u, integral float64
	started     bool
}

// NewPI returns a PI controller whose output starts at u0 (bumpless
// start from the current actuator position: the integral is set on the
// first call so that the output moves from u0 by the integral step
// only). It returns an error when a tuning value is not finite and
// positive or the limits are not ordered.
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
		// First call: the integral takes the current output less the
		// proportional part, so there is no kick from an arbitrary
		// earlier error.
		c.integral, c.started = c.u-c.Kc*e, true
	}
	i := c.integral + c.Kc*c.Ts/c.Ti*e
	v := c.Kc*e + i
	c.u = math.Min(math.Max(v, c.Min), c.Max)
	c.integral = i + min(c.Ts/c.Ti, 1)*(c.u-v) // tracking time Tt = Ti
	return c.u
}

// Output returns the last output.
func (c *PI) Output() float64 { return c.u }
