package control

import (
	"errors"
	"math"

	"github.com/backshift/backshift/tf"
)

// responses simulates and measures the set-point and load responses of
// the loop c p over n samples.
func (a *analyzer) responses(lp *Loop, c, p tf.Rational, n int, T float64, s LoopSettings) error {
	sim, err := newLoopSim(c, p)
	if err != nil {
		return err
	}
	span := func(v float64) tf.Span { return spanOf(v, s.Interval.Value) }
	sp, ld := &lp.Setpoint, &lp.Load
	sp.Output, sp.Control = sim.run(n, 1, 0)
	ld.Output, ld.Control = sim.run(n, 0, 1)
	fs, fl := finals(c, p)
	band := s.Step.Band
	if band == 0 {
		band = 0.02
	}
	for t := range n {
		sp.IAE += math.Abs(1-sp.Output[t]) * T
		ld.IAE += math.Abs(ld.Output[t]) * T
		if v := math.Abs(ld.Output[t]); v > ld.Peak || math.IsNaN(v) && !math.IsNaN(ld.Peak) {
			ld.Peak, ld.PeakAt = v, span(float64(t))
		}
	}
	if !lp.Stable || fs == 0 {
		sp.Figures = nanFigures(n)
		ld.Recover = span(math.NaN())
		return nil
	}
	sp.Figures = figures(sp.Output, fs, s.Step, s.Interval.Value)
	ld.Recover = span(math.NaN()) // an offset: the output never comes back
	if math.Abs(fl) <= band*ld.Peak {
		ld.Recover = span(recovery(ld.Output, 0, band*ld.Peak))
	}
	return nil
}

// loopSim simulates the loop with the output read before the input of
// the same sample is applied: one of the two terms is run one sample
// early (its dead time less one) on the other's previous value.
type loopSim struct {
	c, p         tf.Rational
	plantDelayed bool
}

func newLoopSim(c, p tf.Rational) (loopSim, error) {
	if q, ok := earlier(p); ok {
		return loopSim{c: c, p: q, plantDelayed: true}, nil
	}
	if q, ok := earlier(c); ok {
		return loopSim{c: q, p: p}, nil
	}
	return loopSim{}, &ModelError{Part: "closed loop", Problem: "has no dead time (an algebraic loop)"}
}

// earlier returns r B^-1 when r has at least one sample of delay.
func earlier(r tf.Rational) (tf.Rational, bool) {
	num := r.Num()
	switch {
	case r.Delay() >= 1:
		q, err := tf.NewRational(num, r.Den(), r.Delay()-1)
		return q, err == nil
	case len(num) > 1 && num[0] == 0:
		q, err := tf.NewRational(num[1:], r.Den(), 0)
		return q, err == nil
	}
	return tf.Rational{}, false
}

// run returns the plant output and controller output for a set point r
// and a load d at the plant input, both steps at t = 0, from rest.
func (l loopSim) run(n int, r, d float64) (y, u []float64) {
	y, u = make([]float64, n), make([]float64, n)
	pl, ct := tf.NewPlant(l.p), tf.NewPlant(l.c)
	prev := 0.0
	for t := range n {
		if l.plantDelayed {
			y[t] = pl.Step(prev)
			u[t] = ct.Step(r - y[t])
			prev = u[t] + d
		} else {
			u[t] = ct.Step(prev)
			y[t] = pl.Step(u[t] + d)
			prev = r - y[t]
		}
	}
	return y, u
}

// finals returns the steady states of the set-point and load responses:
// with integral action in either term the output reaches the set point
// (and, with it in the controller, rejects the load; with it only in the
// plant, the load leaves 1/C(1)).
func finals(c, p tf.Rational) (setpoint, load float64) {
	var ge *tf.GainError
	gc, errc := c.Gain()
	gp, errp := p.Gain()
	ic, ip := errors.As(errc, &ge), errors.As(errp, &ge)
	switch {
	case ic:
		return 1, 0
	case ip:
		return 1, 1 / gc
	}
	return gc * gp / (1 + gc*gp), gp / (1 + gc*gp)
}

// figures measures the step response y (final value g) with
// tf.StepSettings.Measure, as tf.Rational.StepFigures measures a term's
// step response; NaN figures when Measure refuses g (not finite).
func figures(y []float64, g float64, o tf.StepSettings, interval float64) tf.StepFigures {
	o.Interval = interval
	f, err := o.Measure(y, g)
	if err != nil {
		return nanFigures(len(y))
	}
	if interval == 0 {
		// tf.Span's convention: Time is 0 when no interval is given (Measure
		// multiplies, which leaves a NaN time beside a NaN sample count).
		f.Rise.Time, f.Settle.Time, f.PeakAt.Time = 0, 0, 0
	}
	return f
}

func nanFigures(n int) tf.StepFigures {
	nan := math.NaN()
	s := tf.Span{Samples: nan, Time: nan}
	return tf.StepFigures{Final: nan, Rise: s, Settle: s, Peak: nan, PeakAt: s, Overshoot: nan, Undershoot: nan, Horizon: n}
}

// recovery is the time after which |y - final| stays within tol,
// interpolated; NaN when the last sample is outside.
func recovery(y []float64, final, tol float64) float64 {
	last := -1
	for k := len(y) - 1; k >= 0; k-- {
		if math.Abs(y[k]-final) > tol {
			last = k
			break
		}
	}
	switch {
	case last < 0:
		return 0
	case last == len(y)-1:
		return math.NaN()
	}
	e0, e1 := math.Abs(y[last]-final), math.Abs(y[last+1]-final)
	return float64(last) + (e0-tol)/(e0-e1)
}
