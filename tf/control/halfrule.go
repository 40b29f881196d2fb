package control

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strconv"
)

// Reduced is a first- or second-order-plus-dead-time model (or its
// integrating counterpart) obtained from a Reading by Skogestad's half
// rule, the model the tuning rules are stated for:
//
//	G(s) = Gain e^{-DeadTime s} / ((Tau1 s + 1)(Tau2 s + 1)),
//	G(s) = Gain e^{-DeadTime s} / (s (Tau2 s + 1))          (Integrating),
//
// with Tau2 = 0 for first order. Times are in the unit of the interval.
type Reduced struct {
	Gain        float64
	Integrating bool
	Tau1, Tau2  float64
	// DeadTime is the effective dead time: the reading's dead time plus
	// the neglected dynamics and half the sample interval (see HalfRule).
	DeadTime float64
	// Order is 1 or 2: the number of lags kept (the integrator not
	// counted; Tau1 is unused when Integrating).
	Order int
	// Notes record the approximations made.
	Notes []string
}

// String prints the reduced model, such as "2.1 e^{-3.5 s}/(12 s + 1)".
func (m Reduced) String() string {
	s := fmtG(m.Gain) + " e^{-" + fmtG(m.DeadTime) + " s}/("
	switch {
	case m.Integrating && m.Tau2 > 0:
		s += "s (" + fmtG(m.Tau2) + " s + 1)"
	case m.Integrating:
		s += "s"
	case m.Tau2 > 0:
		s += "(" + fmtG(m.Tau1) + " s + 1)(" + fmtG(m.Tau2) + " s + 1)"
	default:
		s += fmtG(m.Tau1) + " s + 1"
	}
	return s + ")"
}

// HalfRule reduces the reading r to order 1 or 2 by Skogestad's half
// rule (Skogestad 2003, section 3.1): the largest neglected lag is split
// in two halves, one added to the smallest lag kept, the other to the
// effective dead time; every smaller lag, every inverse-response time
// constant and half the sample interval (h/2, for the sample-and-hold of
// a digital controller) are added to the dead time whole:
//
//	order 1:  Tau1 = tau1 + tau2/2,  DeadTime = theta + tau2/2 + sum_{i>=3} tau_i + sum T_inv + h/2,
//	order 2:  Tau1 = tau1,  Tau2 = tau2 + tau3/2,  DeadTime = theta + tau3/2 + sum_{i>=4} tau_i + sum T_inv + h/2.
//
// An integrating reading keeps its integrator as an infinite lag tau_0,
// so that order 1 gives an integrator with dead time (the largest lag
// halved into the dead time) and order 2 an integrator with one lag.
//
// Leads go first, each against the closest lag at least as long,
// (T0 s + 1)/(tau0 s + 1) ~ 1/((tau0 - T0) s + 1) (Skogestad's rule T3
// without its cap at five dead times), or, when every lag is shorter,
// against the longest lag, ~ T0/tau0 (rule T1, a gain factor); these
// rules are stated from memory of the paper and simplified. A lead with
// no lag to pair is refused.
//
// It returns a *SettingError for an order other than 1 or 2 or for a
// reading whose figures break Reading's rules (a Gain that is not
// finite, a lag, lead or inverse-response time constant that is not
// positive and finite, a DeadTime or Interval that is negative or not
// finite), naming the field, as in "Reading.Lags[0]"; and a
// *ModelError when the reading cannot be reduced: no lag for a
// non-integrating model (a pure dead time, for which a PI controller
// degenerates into integral action alone), or no lag left after a lead
// longer than every lag took the longest as a gain factor (the rule
// does not apply to such a lead-lag plant).
func HalfRule(r Reading, order int) (Reduced, error) {
	const op = "control.HalfRule"
	if order != 1 && order != 2 {
		return Reduced{}, &SettingError{Op: op, Setting: "order", Value: strconv.Itoa(order), Rule: "must be 1 or 2"}
	}
	if err := r.validate(op); err != nil {
		return Reduced{}, err
	}
	lags := append([]float64(nil), r.Lags...)
	sort.Sort(sort.Reverse(sort.Float64Slice(lags)))
	m := Reduced{Gain: r.Gain, Integrating: r.Integrating, Notes: append([]string(nil), r.Notes...)}
	var err error
	if lags, err = m.pairLeads(lags, r.Leads); err != nil {
		err.(*ModelError).Op = op
		return Reduced{}, err
	}
	theta := r.DeadTime + r.Interval/2
	for _, v := range r.Inverse {
		theta += v
	}
	keep := order
	if r.Integrating {
		keep = order - 1 // the integrator counts as the first lag
	}
	kept := lags[:min(keep, len(lags))]
	rest := lags[len(kept):]
	if len(rest) > 0 {
		half := rest[0] / 2
		theta += half
		if len(kept) > 0 {
			kept[len(kept)-1] += half
		}
		for _, v := range rest[1:] {
			theta += v
		}
	}
	if !r.Integrating && len(kept) == 0 && len(r.Lags) > 0 {
		return Reduced{}, &ModelError{Op: op, Part: "plant zeros", Problem: "a lead longer than every lag (" + m.Notes[len(m.Notes)-1] + ") used up the plant's lags: the half rule, and SIMC and IMC with it, do not apply to this lead-lag plant; tune it by Dahlin's rule, or choose a PI by your own judgement and check it with Analyze"}
	}
	if !r.Integrating && len(kept) == 0 {
		return Reduced{}, &ModelError{Op: op, Part: "plant", Problem: "has no lag: a pure dead time, for which the rules give integral action alone; use a rational controller (Dahlin)"}
	}
	m.DeadTime = theta
	m.Order = max(len(kept), 1)
	switch {
	case r.Integrating && len(kept) == 1:
		m.Tau2 = kept[0]
	case !r.Integrating:
		m.Tau1 = kept[0]
		if len(kept) == 2 {
			m.Tau2 = kept[1]
		}
	}
	return m, nil
}

// validate checks the figures of a reading built by hand (Read's own
// readings pass): what HalfRule would otherwise carry silently into a
// NaN or negative time constant of the reduced model.
func (r Reading) validate(op string) error {
	if !finite(r.Gain) {
		return fsetting(op, "Reading.Gain", r.Gain, "must be a finite number")
	}
	for _, f := range []struct {
		name string
		v    []float64
	}{{"Reading.Lags", r.Lags}, {"Reading.Leads", r.Leads}, {"Reading.Inverse", r.Inverse}} {
		for i, v := range f.v {
			if !(v > 0) || math.IsInf(v, 0) {
				return fsetting(op, f.name+"["+strconv.Itoa(i)+"]", v, "must be a positive finite time constant")
			}
		}
	}
	if !(r.DeadTime >= 0) || math.IsInf(r.DeadTime, 0) {
		return fsetting(op, "Reading.DeadTime", r.DeadTime, "must be a finite number, zero or positive")
	}
	if !(r.Interval >= 0) || math.IsInf(r.Interval, 0) {
		return fsetting(op, "Reading.Interval", r.Interval, "must be a finite number, zero or positive (the sample interval)")
	}
	return nil
}

// pairLeads cancels each lead against a lag (rules T3 and T1 of the half
// rule, simplified) and returns the lags left, longest first.
func (m *Reduced) pairLeads(lags, leads []float64) ([]float64, error) {
	for _, t0 := range leads {
		best := -1
		for i, v := range lags {
			if v >= t0 {
				best = i // lags are sorted longest first: the last is closest
			}
		}
		switch {
		case best >= 0:
			m.Notes = append(m.Notes, fmt.Sprintf("lead %s cancelled against lag %s, leaving a lag of %s", fmtG(t0), fmtG(lags[best]), fmtG(lags[best]-t0)))
			lags[best] -= t0
			if lags[best] <= 0 {
				lags = append(lags[:best], lags[best+1:]...)
			}
		case len(lags) > 0:
			m.Notes = append(m.Notes, fmt.Sprintf("lead %s longer than every lag: lead/lag %s taken as the gain factor %s", fmtG(t0), fmtG(lags[0]), fmtG(t0/lags[0])))
			m.Gain *= t0 / lags[0]
			lags = lags[1:]
		default:
			return nil, &ModelError{Part: "plant zeros", Problem: "a lead of " + fmtG(t0) + " with no lag to pair it with: the half rule cannot reduce this model"}
		}
		sort.Sort(sort.Reverse(sort.Float64Slice(lags)))
	}
	return lags, nil
}

// fmtG formats v with four significant digits for people.
func fmtG(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }

// fmtC formats a complex number for people.
func fmtC(z complex128) string {
	if imag(z) == 0 {
		return fmtG(real(z))
	}
	return fmtG(real(z)) + "+" + fmtG(imag(z)) + "i (|z| = " + fmtG(cmplx.Abs(z)) + ")"
}

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
