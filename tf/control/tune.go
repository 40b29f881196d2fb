package control

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// Caution is printed with every tuning result: settings from a model are
// a starting point, not a commissioned controller.
const Caution = "Caution: an identified model is an approximation. Commission this controller on the plant " +
	"under the site's safety procedures, with independent interlocks, deferring to local codes and licensed practice."

// Rule is a published tuning rule.
type Rule string

// The tuning rules.
const (
	// SIMC is Skogestad's rule (Skogestad 2003) on the half-rule model.
	// Order 1 (PI):
	//
	//	Kc = Tau1/(k (tc + theta)),  Ti = min(Tau1, 4 (tc + theta));
	//
	// order 2 (PID, series form): the same with Td = Tau2. Integrating
	// (k the slope): Kc = 1/(k (tc + theta)), Ti = 4 (tc + theta), and
	// Td = Tau2 for order 2. The default tc is theta ("tight control").
	SIMC Rule = "SIMC"
	// IMC is lambda / internal-model-control tuning (Rivera, Morari &
	// Skogestad 1986) on the half-rule model. Order 1 (PI, e^{-theta s}
	// taken as 1 - theta s): Kc = Tau1/(k (lambda + theta)), Ti = Tau1.
	// PID on a first-order model (first-order Pade for the dead time,
	// parallel form): Kc = (2 Tau1 + theta)/(k (2 lambda + theta)),
	// Ti = Tau1 + theta/2, Td = Tau1 theta/(2 Tau1 + theta). PID on a
	// second-order model: Kc = (Tau1 + Tau2)/(k (lambda + theta)),
	// Ti = Tau1 + Tau2, Td = Tau1 Tau2/(Tau1 + Tau2). Integrating (lambda
	// tuning, common practice): Kc = (2 lambda + theta)/(k (lambda +
	// theta)^2), Ti = 2 lambda + theta, a PI also when a PID is asked for.
	// The default lambda is 1.7 theta
	// for PI and 0.8 theta for PID, the lower bounds the paper recommends
	// (from memory).
	IMC Rule = "IMC"
	// Dahlin is the discrete direct-synthesis rule (Dahlin 1968): the
	// controller that makes the closed loop on the model a first-order
	// lag of time constant lambda after the plant's own dead time,
	//
	//	T(B) = (1 - q) B^b / (1 - q B),  q = e^{-T/lambda},
	//	C(B) = T/(G (1 - T)) = delta(B) (1 - q) / (omega~(B) (1 - B) E(B)),
	//	E(B) = 1 + (1 - q)(B + ... + B^(b-1)),
	//
	// with omega~ the numerator whose zeros on the negative real axis or
	// outside the unit circle are replaced by their value at B = 1 (they
	// would give a ringing or unstable controller; the loop is then no
	// longer exactly T, common practice). An integrating plant's (1 - B)
	// cancels. It works on the discrete model directly (no reading), and
	// its result is a rational controller. The default lambda is the
	// dead time of the reading (of the model's dead time less the hold's
	// sample when Read refuses the model), at least one sample.
	Dahlin Rule = "Dahlin"
)

// TuneSettings chooses the rule, the controller and the speed of the
// loop. The zero value tunes a SIMC PI controller with tc = theta,
// discretised by backward differences.
type TuneSettings struct {
	// Rule is the tuning rule; empty means SIMC.
	Rule Rule
	// Derivative asks for a PID controller (a second-order model); false
	// gives PI. Dahlin's rule ignores it.
	Derivative bool
	// Form is the PID form of the result; empty means the rule's own
	// (series for SIMC, parallel for IMC). A PID is converted between
	// forms exactly for the unfiltered controller: parallel Kc' = Kc (1 +
	// Td/Ti), Ti' = Ti + Td, Td' = Ti Td/(Ti + Td) (common practice); a
	// parallel PID with Ti < 4 Td has no series form and stays parallel
	// (the result's PID.Form says which).
	Form Form
	// ClosedLoopTime is SIMC's tc or IMC's and Dahlin's lambda, in the
	// time unit of the interval; 0 means the rule's default. It must be
	// finite and >= 0.
	ClosedLoopTime float64
	// MaxSensitivity, when not 0, asks instead for the closed-loop time
	// whose discrete loop on the model has this peak |S| (found by
	// bisection on log tc over [1e-3, 1e3] times the rule's default
	// closed-loop time, at least the sample interval; Ms falls as the
	// loop slows). It must lie in (1, 10]; 1.4 to 2 is the
	// usual range (common practice). It overrides ClosedLoopTime.
	MaxSensitivity float64
	// Method discretises the PID; empty means BackwardDifference.
	Method Method
	// Filter is the derivative filter fraction (see PID.Filter); 0 means
	// DefaultFilter.
	Filter float64
}

// Validate checks the settings and returns a *SettingError naming the
// field ("TuneSettings.MaxSensitivity"), or nil.
func (s TuneSettings) Validate() error { return s.validate("control.TuneSettings.Validate") }

func (s TuneSettings) validate(op string) error {
	switch s.Rule {
	case "", SIMC, IMC, Dahlin:
	default:
		return &SettingError{Op: op, Setting: "TuneSettings.Rule", Value: strconv.Quote(string(s.Rule)), Rule: `must be "SIMC" (the default), "IMC" or "Dahlin"`}
	}
	if s.Form != "" && s.Form != Parallel && s.Form != Series {
		return &SettingError{Op: op, Setting: "TuneSettings.Form", Value: strconv.Quote(string(s.Form)), Rule: `must be "parallel", "series" or empty (the rule's own)`}
	}
	if s.Method != "" && s.Method != BackwardDifference && s.Method != Tustin {
		return &SettingError{Op: op, Setting: "TuneSettings.Method", Value: strconv.Quote(string(s.Method)), Rule: `must be "backward difference" (the default) or "Tustin"`}
	}
	if err := errs.NonNegative(op, "TuneSettings.ClosedLoopTime", s.ClosedLoopTime, "0: the rule's default"); err != nil {
		return err
	}
	if ms := s.MaxSensitivity; ms != 0 && !(ms > 1 && ms <= 10) {
		return fsetting(op, "TuneSettings.MaxSensitivity", ms, "must lie in (1, 10], or be 0 to use ClosedLoopTime")
	}
	if !(s.Filter >= 0 && s.Filter <= 1) {
		return fsetting(op, "TuneSettings.Filter", s.Filter, "must lie in (0, 1], or be 0 for the default 0.1")
	}
	return nil
}

// Tuning is the result of Tune. Its settings drive equipment: see
// Caution, which String prints.
type Tuning struct {
	// Rule is the rule used; ClosedLoopTime the tc or lambda used, in the
	// time unit of Interval.
	Rule           Rule
	ClosedLoopTime float64
	// PID holds the continuous parameters in the form it states (the
	// zero PID for Dahlin's rule), in the time unit of Interval.
	PID PID
	// Controller is the discrete controller u = C(B) e, for the sample
	// interval of the plant model, by Method.
	Controller tf.Rational
	Method     Method
	// Interval is the sample interval of the plant model.
	Interval tf.Interval
	// Reading is the continuous reading of the plant; Model the reduced
	// model the rule used (the zero Reduced for Dahlin's rule).
	Reading Reading
	Model   Reduced
	// Stable reports whether the discrete loop on the plant model is
	// stable; Ms is the peak of |S| of that loop (+Inf when unstable).
	Stable bool
	Ms     float64
}

// String prints the rule, the model, the settings in their form and
// units, and the Caution.
func (t Tuning) String() string {
	var b strings.Builder
	unit := t.Interval.Unit
	switch {
	case t.Interval.Value == 0:
		unit = "samples"
	case unit == "":
		unit = "time units"
	}
	fmt.Fprintf(&b, "%s tuning, closed-loop time %s %s", t.Rule, fmtG(t.ClosedLoopTime), unit)
	if t.Model.Order > 0 {
		fmt.Fprintf(&b, ", on the model %s (times in %s)", t.Model, unit)
	}
	b.WriteString("\n")
	if t.PID.Gain != 0 {
		fmt.Fprintf(&b, "%s (times in %s)\n", t.PID, unit)
	}
	fmt.Fprintf(&b, "discrete controller (%s): u = %s e\n", methodName(t.Method, t.PID.Gain != 0), shortRational(t.Controller))
	if t.Stable {
		fmt.Fprintf(&b, "peak sensitivity Ms = %.3g on the model\n", t.Ms)
	} else {
		b.WriteString("the loop on the model is UNSTABLE: do not use these settings\n")
	}
	b.WriteString(Caution)
	return b.String()
}

func methodName(m Method, pid bool) string {
	if !pid {
		return "direct synthesis"
	}
	if m == "" {
		return string(BackwardDifference)
	}
	return string(m)
}

// Tune returns controller settings for the plant path p of a model
// sampled at the interval iv (the model's Interval; the zero Interval
// reads times in samples), by the rule and targets of s. SIMC and IMC
// work on the continuous reading of p (Read) reduced by HalfRule to the
// order the controller needs; Dahlin's rule works on p itself.
//
// Errors (Op "control.Tune"): a *SettingError for bad settings or a
// negative or non-finite interval, a *ModelError when p has no reading
// or the rule cannot be applied (see Read and HalfRule), and when a
// MaxSensitivity target cannot be met in the search range.
func Tune(p tf.Rational, iv tf.Interval, s TuneSettings) (t Tuning, err error) {
	const op = "control.Tune"
	defer errs.Recover(op, &err)
	if err := s.validate(op); err != nil {
		return Tuning{}, err
	}
	T := iv.Value
	if T == 0 {
		T = 1
	}
	if !(T > 0) || math.IsInf(T, 0) {
		return Tuning{}, fsetting(op, "Interval.Value", iv.Value, "must be positive and finite (0: times in samples)")
	}
	tn, err := newTuner(p, T, s)
	if err != nil {
		setOp(op, err)
		return Tuning{}, err
	}
	tc := s.ClosedLoopTime
	if tc == 0 {
		tc = tn.defaultTime()
	}
	if s.MaxSensitivity != 0 {
		tc, err = tn.searchMs(s.MaxSensitivity)
		if err != nil {
			setOp(op, err)
			return Tuning{}, err
		}
	}
	t, err = tn.tune(tc)
	if err != nil {
		setOp(op, err)
		return Tuning{}, err
	}
	t.Interval = iv
	return t, nil
}

// setOp names op in the shared shapes of err.
func setOp(op string, err error) {
	switch e := err.(type) {
	case *ModelError:
		e.Op = op
	case *SettingError:
		e.Op = op
	}
}

// tuner holds what Tune computes once for a plant.
type tuner struct {
	p       tf.Rational
	T       float64
	s       TuneSettings
	reading Reading
	model   Reduced
	an      *analyzer
}

func newTuner(p tf.Rational, T float64, s TuneSettings) (*tuner, error) {
	tn := &tuner{p: p, T: T, s: s, an: newAnalyzer()}
	if s.Rule == "" {
		tn.s.Rule = SIMC
	}
	rd, err := Read(p, T)
	if tn.s.Rule == Dahlin {
		// Dahlin's rule works on p itself; the reading, when there is
		// one, only sets the default lambda.
		if err != nil {
			rd = Reading{DeadTime: float64(max(p.Delay()-1, 0)) * T, Interval: T, How: "dead time only"}
		}
		tn.reading = rd
		return tn, nil
	}
	if err != nil {
		return nil, err
	}
	tn.reading = rd
	order := 1
	if s.Derivative {
		order = 2
	}
	if tn.model, err = HalfRule(rd, order); err != nil {
		return nil, err
	}
	return tn, nil
}

// defaultTime is the rule's default closed-loop time.
func (tn *tuner) defaultTime() float64 {
	switch tn.s.Rule {
	case IMC:
		if tn.s.Derivative {
			return 0.8 * tn.model.DeadTime
		}
		return 1.7 * tn.model.DeadTime
	case Dahlin:
		return max(tn.reading.DeadTime, tn.T)
	}
	return tn.model.DeadTime
}

// tune applies the rule with closed-loop time tc and measures Ms.
func (tn *tuner) tune(tc float64) (Tuning, error) {
	t := Tuning{Rule: tn.s.Rule, ClosedLoopTime: tc, Reading: tn.reading, Method: tn.s.Method}
	var err error
	if tn.s.Rule == Dahlin {
		t.Controller, err = dahlin(tn.p, tn.T, tc)
	} else {
		t.Model = tn.model
		t.PID = tn.pid(tc)
		t.Controller, err = t.PID.Discrete(tn.T, tn.s.Method)
	}
	if err != nil {
		return Tuning{}, err
	}
	if t.Method == "" && tn.s.Rule != Dahlin {
		t.Method = BackwardDifference
	}
	if t.Stable, err = tn.stable(t.Controller); err != nil {
		return Tuning{}, err
	}
	if !t.Stable {
		t.Ms = math.Inf(1)
		return t, nil
	}
	t.Ms, err = tn.an.peakS(t.Controller, tn.p)
	return t, err
}

// pid returns the rule's PID for closed-loop time tc, in the form asked.
//
// The IMC rows re-derived (Rivera et al. 1986): with the model split as
// G = G+ G- (G+ the dead time's approximation, G+(0) = 1) and the filter
// 1/(lambda s + 1), the controller is C = G-^{-1}/((lambda s + 1) - G+).
// For k e^{-theta s}/(tau s + 1) and e^{-theta s} ~ 1 - theta s:
// C = (tau s + 1)/(k (lambda + theta) s), the PI row. With the Pade
// approximation (1 - theta s/2)/(1 + theta s/2) and G- including
// 1/(1 + theta s/2): C = (tau s + 1)(theta s/2 + 1)/(k (lambda +
// theta/2) s), the parallel PID Kc = (2 tau + theta)/(k (2 lambda +
// theta)), Ti = tau + theta/2, Td = tau theta/(2 tau + theta). For two
// lags and 1 - theta s: C = (tau1 s + 1)(tau2 s + 1)/(k (lambda + theta)
// s), the second-order row.
func (tn *tuner) pid(tc float64) PID {
	m := tn.model
	k, th := m.Gain, m.DeadTime
	var c PID
	switch {
	case tn.s.Rule == SIMC && m.Integrating:
		c = PID{Form: Series, Gain: 1 / (k * (tc + th)), Integral: 4 * (tc + th)}
	case tn.s.Rule == SIMC:
		c = PID{Form: Series, Gain: m.Tau1 / (k * (tc + th)), Integral: math.Min(m.Tau1, 4*(tc+th))}
	case m.Integrating:
		c = PID{Form: Parallel, Gain: (2*tc + th) / (k * (tc + th) * (tc + th)), Integral: 2*tc + th}
	case !tn.s.Derivative:
		c = PID{Form: Parallel, Gain: m.Tau1 / (k * (tc + th)), Integral: m.Tau1}
	case m.Tau2 > 0:
		c = PID{Form: Parallel, Gain: (m.Tau1 + m.Tau2) / (k * (tc + th)), Integral: m.Tau1 + m.Tau2, Derivative: m.Tau1 * m.Tau2 / (m.Tau1 + m.Tau2)}
	default:
		c = PID{Form: Parallel, Gain: (2*m.Tau1 + th) / (k * (2*tc + th)), Integral: m.Tau1 + th/2, Derivative: m.Tau1 * th / (2*m.Tau1 + th)}
	}
	if tn.s.Rule == SIMC && tn.s.Derivative {
		c.Derivative = m.Tau2
	}
	c.Filter = tn.s.Filter
	if tn.s.Form != "" && tn.s.Form != c.Form {
		if c.Derivative > 0 {
			c = convertForm(c)
		} else {
			c.Form = tn.s.Form // a PI is the same in both forms
		}
	}
	return c
}

// convertForm converts a PID between the series and parallel forms
// (exact without the derivative filter).
func convertForm(c PID) PID {
	ti, td := c.Integral, c.Derivative
	if c.Form == Series {
		// Series to parallel: Kc (1 + Td/Ti), Ti + Td, Ti Td/(Ti + Td).
		return PID{Form: Parallel, Gain: c.Gain * (1 + td/ti), Integral: ti + td, Derivative: ti * td / (ti + td), Filter: c.Filter}
	}
	// Parallel to series, when Ti >= 4 Td (real factors): Ti' and Td'
	// are the roots of x^2 - Ti x + Ti Td = 0, Kc' = Kc Ti'/Ti.
	disc := ti * ti * (1 - 4*td/ti)
	if ti == 0 || disc < 0 {
		return c // no series equivalent: the parallel form is kept
	}
	tis := (ti + math.Sqrt(disc)) / 2
	return PID{Form: Series, Gain: c.Gain * tis / ti, Integral: tis, Derivative: ti - tis, Filter: c.Filter}
}

// searchMs returns the closed-loop time whose loop on the plant model
// has the peak sensitivity target, by bisection on log tc over [1e-3,
// 1e3] times the reference time (the dead time, or the sample interval
// when that is longer): Ms falls as tc grows.
func (tn *tuner) searchMs(target float64) (float64, error) {
	ref := max(tn.defaultTime(), tn.T)
	ms := func(tc float64) (float64, error) {
		t, err := tn.tune(tc)
		if err != nil {
			return 0, err
		}
		return t.Ms, nil
	}
	lo, hi := math.Log(ref*1e-3), math.Log(ref*1e3)
	mhi, err := ms(math.Exp(hi))
	if err != nil {
		return 0, err
	}
	if mhi > target {
		return 0, &ModelError{Part: "MaxSensitivity target", Problem: "not reached: the slowest loop tried (closed-loop time " + fmtG(math.Exp(hi)) + ") has Ms = " + fmtG(mhi) + "; ask for a larger target"}
	}
	mlo, err := ms(math.Exp(lo))
	if err != nil {
		return 0, err
	}
	if mlo <= target {
		return math.Exp(lo), nil
	}
	for it := 0; it < 100 && hi-lo > 1e-9; it++ {
		mid := 0.5 * (lo + hi)
		m, err := ms(math.Exp(mid))
		if err != nil {
			return 0, err
		}
		if m > target {
			lo = mid
		} else {
			hi = mid
		}
	}
	return math.Exp(hi), nil
}

// stable reports whether the loop of c on the plant model is stable; an
// algebraic loop (no dead time in the loop) is an error.
func (tn *tuner) stable(c tf.Rational) (bool, error) {
	char, err := characteristic(c, tn.p)
	if err != nil {
		return false, err
	}
	rs, err := poly.Roots(poly.Reciprocal(char))
	if err != nil {
		return false, &ModelError{Part: "closed loop", Problem: "poles not found: " + err.Error(), Err: err}
	}
	return poly.MaxAbsRoot(rs) < 1, nil
}

// shortRational prints r as tf.Rational.String does, with coefficients
// rounded to 6 significant digits for people (Controller holds them in
// full).
func shortRational(r tf.Rational) string {
	poly := func(c []float64) string {
		var b strings.Builder
		for k, v := range c {
			switch {
			case k == 0:
				b.WriteString(strconv.FormatFloat(v, 'g', 6, 64))
				continue
			case v < 0:
				b.WriteString(" - ")
			default:
				b.WriteString(" + ")
			}
			if math.Abs(v) != 1 {
				b.WriteString(strconv.FormatFloat(math.Abs(v), 'g', 6, 64) + " ")
			}
			b.WriteString("B")
			if k > 1 {
				b.WriteString("^" + strconv.Itoa(k))
			}
		}
		return "(" + b.String() + ")"
	}
	s := poly(r.Num())
	if d := r.Den(); len(d) > 1 {
		s += " / " + poly(d)
	}
	switch b := r.Delay(); {
	case b == 1:
		s += " B"
	case b > 1:
		s += " B^" + strconv.Itoa(b)
	}
	return s
}
