package control

import (
	"fmt"
	"math"
	"math/cmplx"
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
	// Td = Tau2 for order 2. The default tc is theta ("tight control"),
	// theta here the effective dead time plus half a sample (see Tune).
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
	// theta)^2), Ti = 2 lambda + theta, a PI also when a PID is asked for
	// (tuned then on the order-1 model, with a note). The default lambda
	// is 1.7 theta for PI and 0.8 theta for PID, the lower bounds the
	// paper recommends (from memory), theta here the effective dead time
	// plus half a sample (see Tune).
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
	// sample when Read refuses the model), at least one sample. A plant
	// pole on or outside the unit circle (other than one integrator) is
	// refused: the controller would cancel it, and the loop would be
	// internally unstable.
	Dahlin Rule = "Dahlin"
)

// TuneSettings chooses the rule, the controller and the speed of the
// loop. The zero value tunes a SIMC PI controller with the default tc
// (see Tune), discretised by backward differences.
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
	// bisection on log tc over [1e-3, 1e3] times the rule's own
	// closed-loop time, at least the sample interval; Ms falls as the
	// loop slows). It must lie in (1, 10]; 1.4 to 2 is the usual range
	// (common practice). A target that no loop of the range reaches, on
	// the slow or the fast side, is an error that gives the Ms reached.
	// It overrides ClosedLoopTime.
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
	if err := s.Method.check(op, "TuneSettings.Method"); err != nil {
		return err
	}
	if err := errs.NonNegative(op, "TuneSettings.ClosedLoopTime", s.ClosedLoopTime, "0: the rule's default"); err != nil {
		return err
	}
	if ms := s.MaxSensitivity; ms != 0 && !(ms > 1 && ms <= 10) {
		return fsetting(op, "TuneSettings.MaxSensitivity", ms, "must lie in (1, 10], or be 0 to use ClosedLoopTime")
	}
	return checkFilter(op, "TuneSettings.Filter", s.Filter)
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
	// Notes record what the caller should know about the settings: a
	// default closed-loop time lengthened to keep Ms at most 2, a
	// derivative asked for but not used (IMC on an integrating plant,
	// SIMC on a model with one lag), "aggressive: Ms above 2" when the
	// loop on the model has Ms > 2 (the usual range is 1.4 to 2, common
	// practice), a ringing controller (a pole with negative real part
	// and magnitude above RingingPole), and a slow load recovery (see
	// SlowLoadRecovery). String prints them.
	Notes []string
}

// AggressiveMs is the peak sensitivity above which a Tuning carries the
// note "aggressive: Ms above 2": the upper end of the usual range 1.4
// to 2 (common practice; Skogestad 2003 tunes for about 1.6 to 1.7).
// The default closed-loop time of every rule is lengthened, when needed
// and possible, so that the loop on the model stays at or below it.
const AggressiveMs = 2

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
	for _, n := range t.Notes {
		b.WriteString("note: " + n + "\n")
	}
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
// (tf.Model.Path: the whole path to the output, differencing included)
// sampled at the interval iv (the model's Interval; the zero Interval
// reads times in samples), by the rule and targets of s. SIMC and IMC
// work on the continuous reading of p (Read) reduced by HalfRule to the
// order the controller needs; Dahlin's rule works on p itself.
//
// The default closed-loop time (ClosedLoopTime and MaxSensitivity both
// 0) is the rule's own (see the rules), computed with the effective dead
// time of the reduced model plus half a sample: HalfRule already counts
// the hold's half sample, and the sampling of the measurement adds about
// another (Skogestad 2003 counts h/2 for the hold, from memory; when
// theta is about one sample the discrete loop needs both: on 0.1 B/(1 -
// 0.9 B), SIMC at tc = theta = 0.5 gives Ms 2.28 on the model, at 1 Ms
// 1.56, measured by the tests).
// When the loop on the model then has Ms above AggressiveMs (or is
// unstable), the default is lengthened by the search of MaxSensitivity
// to Ms = AggressiveMs, with a note in Tuning.Notes. A closed-loop time
// the caller sets is kept as it is, with the note "aggressive: Ms above
// 2" when it gives such a loop.
//
// Errors (Op "control.Tune"):
//   - a *SettingError for bad settings, an interval whose Value is
//     negative or not finite, or whose Unit is not one of tf.ValidUnit's
//     (the zero Interval means samples);
//   - a *ModelError when p has no reading or the rule cannot be applied
//     (see Read and HalfRule; Dahlin's rule refuses a plant with a pole
//     on or outside the unit circle, which its controller would cancel),
//     and when a MaxSensitivity target cannot be met in the search range
//     on either side;
//   - a *ModelError when the loop on the model is unstable: the Tuning
//     is returned beside the error so that it can be inspected, and its
//     settings must not be used;
//   - a *ModelError when the loop on the model has a characteristic
//     polynomial of degree above 256 (a dead time of some 250 samples or
//     more, too long for the root finder that checks its stability):
//     resample the data slower and fit and tune again, as with Analyze.
func Tune(p tf.Rational, iv tf.Interval, s TuneSettings) (t Tuning, err error) {
	const op = "control.Tune"
	defer errs.Recover(op, &err)
	if err := s.validate(op); err != nil {
		return Tuning{}, err
	}
	if err := checkInterval(op, "Interval", iv); err != nil {
		return Tuning{}, err
	}
	T := iv.Value
	if T == 0 {
		T = 1
	}
	tn, err := newTuner(p, T, s)
	if err != nil {
		setOp(op, err)
		return Tuning{}, err
	}
	tc := s.ClosedLoopTime
	switch {
	case s.MaxSensitivity != 0:
		tc, err = tn.searchMs(s.MaxSensitivity)
	case tc == 0:
		tc, err = tn.defaultTime()
	}
	if err != nil {
		setOp(op, err)
		return Tuning{}, err
	}
	t, err = tn.tune(tc)
	if err != nil {
		setOp(op, err)
		return Tuning{}, err
	}
	t.Interval = iv
	tn.addNotes(&t)
	if !t.Stable {
		advice := "set a longer ClosedLoopTime or a MaxSensitivity, or choose another rule"
		if rt := tn.ruleTime(); s.MaxSensitivity == 0 && tc > rt {
			// A closed-loop time far beyond the rule's own leaves a
			// controller so weak that its integrator's pole stays on the
			// unit circle in floating point: a longer one cannot help.
			advice = "the closed-loop time " + fmtG(tc) + " is longer than the rule's own " + fmtG(rt) + " and leaves the controller too weak to move the loop's poles inside the unit circle; set a shorter ClosedLoopTime (0 for the rule's default) or a MaxSensitivity"
		}
		return t, &ModelError{Op: op, Part: "loop on the model", Problem: "is unstable (largest closed-loop pole |z| = " + fmtG(tn.maxPole) + "): do not use these settings; " + advice}
	}
	return t, nil
}

// addNotes writes the tuner's notes and those on the result into t.
func (tn *tuner) addNotes(t *Tuning) {
	t.Notes = append(t.Notes, tn.notes...)
	if t.Stable && t.Ms > AggressiveMs {
		t.Notes = append(t.Notes, "aggressive: Ms above 2 (Ms = "+fmtG(t.Ms)+" on the model; 1.4 to 2 is the usual range): set a longer ClosedLoopTime or a MaxSensitivity")
	}
	if tn.s.Rule != Dahlin {
		// Dahlin's controller poles (of E(B)) cancel in the loop on the
		// model, whose response is the first-order T: not flagged.
		if n := ringingNote(t.Controller); n != "" {
			t.Notes = append(t.Notes, n)
		}
	}
	if t.Stable {
		if n := tn.loadNote(t.Controller, t.Interval); n != "" {
			t.Notes = append(t.Notes, n)
		}
	}
}

// SlowLoadRecovery is the multiple of the set-point settling time
// beyond which the loop's load recovery time (Response.Recover, on the
// model with the default LoopSettings) draws a note in Tuning.Notes.
// Rules that cancel a slow plant lag with the integral time (IMC with
// Ti = Tau1) settle a set-point step in about the closed-loop time but
// take about Tau1 to remove a load: on 0.001 B^2/(1 - 0.999 B) every
// hour, IMC's PI settles the set point in tens of hours and recovers
// from a load step in thousands. A factor of 10 flags that case and
// not the ordinary ratio of two to four (common practice: load
// recovery is slower than set-point settling by about Ti/tc); SIMC's
// Ti = min(Tau1, 4 (tc + theta)) avoids it.
const SlowLoadRecovery = 10

// loadNote returns the note for a load recovery slower than
// SlowLoadRecovery times the set-point settling, or "".
func (tn *tuner) loadNote(c tf.Rational, iv tf.Interval) string {
	lp, err := tn.an.analyze(c, tn.p, LoopSettings{Interval: iv})
	if err != nil {
		return ""
	}
	st, rc := lp.Setpoint.Figures.Settle.Samples, lp.Load.Recover.Samples
	if !(st > 0) || !(rc > SlowLoadRecovery*st) {
		return ""
	}
	unit := " samples"
	if iv.Value != 0 {
		st, rc, unit = st*iv.Value, rc*iv.Value, " "+iv.Unit
	}
	return "slow load recovery: a load step at the plant input takes " + fmtG(rc) + unit + " to recover against " + fmtG(st) + unit + " for the set point to settle (more than 10 times); a shorter integral time (SIMC) or a shorter closed-loop time rejects loads faster"
}

// RingingPole is the magnitude above which a controller pole with a
// negative real part draws a note in Tuning.Notes. Such a pole is a mode
// of the controller output that changes sign every sample (at z = -r it
// is (-r)^t): above 0.5 it keeps half its size from one sample to the
// next, so the valve or drive visibly chatters for several samples after
// each step of the set point or load (at 0.9, some 20 samples to fall to
// a tenth), common practice. Tustin's rule with a derivative filter time
// below T/2 gives one (see Method). Only the PI and PID controllers of
// SIMC and IMC are checked: the poles of a Dahlin controller's E(B)
// cancel in the loop on the model, whose response is the first-order T.
const RingingPole = 0.5

// ringingNote returns the note for a controller pole with a negative
// real part and magnitude above RingingPole, or "".
func ringingNote(c tf.Rational) string {
	den := c.Den()
	if len(den) < 2 {
		return ""
	}
	rs, err := poly.Roots(poly.Reciprocal(den))
	if err != nil {
		return ""
	}
	var worst complex128
	for _, z := range rs {
		if real(z) < 0 && cmplx.Abs(z) > RingingPole && cmplx.Abs(z) > cmplx.Abs(worst) {
			worst = z
		}
	}
	if worst == 0 {
		return ""
	}
	const fix = "discretise by backward difference, or lengthen the derivative filter (a larger Filter)"
	return "ringing controller: a pole at z = " + fmtZ(worst) + " (negative real part, |z| = " + fmtG(cmplx.Abs(worst)) + " above 0.5) makes the controller output alternate in sign from sample to sample after a step; " + fix
}

// fmtZ prints a pole to 3 significant digits.
func fmtZ(z complex128) string {
	if math.Abs(imag(z)) < 1e-9*cmplx.Abs(z) {
		return strconv.FormatFloat(real(z), 'g', 3, 64)
	}
	sign := " + "
	if imag(z) < 0 {
		sign = " - "
	}
	return strconv.FormatFloat(real(z), 'g', 3, 64) + sign + strconv.FormatFloat(math.Abs(imag(z)), 'g', 3, 64) + "i"
}

// checkInterval refuses an interval with a negative or non-finite
// Value, or a Unit that is not a unit of tf.ValidUnit; the zero Interval
// (times in samples) passes.
func checkInterval(op, field string, iv tf.Interval) error {
	if iv == (tf.Interval{}) {
		return nil
	}
	if !(iv.Value > 0) || math.IsInf(iv.Value, 0) {
		return fsetting(op, field+".Value", iv.Value, "must be positive and finite (the zero Interval: times in samples)")
	}
	if !tf.ValidUnit(iv.Unit) {
		return &SettingError{Op: op, Setting: field + ".Unit", Value: strconv.Quote(iv.Unit), Rule: `must be one of "s", "min", "h", "d", "wk", "mo", "qtr", "yr" (as in a model's spec: "every 1 min")`}
	}
	return nil
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
	// notes go to the Tuning; maxPole is the largest closed-loop pole
	// magnitude of the last loop checked.
	notes   []string
	maxPole float64
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
		if err := dahlinPlant(p); err != nil {
			return nil, err
		}
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
		if tn.s.Rule == IMC && rd.Integrating {
			// IMC's integrating row is a PI: it is tuned on the
			// order-1 model with the PI lambda (a second-order model
			// would move a lag out of the dead time that the PI then
			// ignores).
			order = 1
			tn.notes = append(tn.notes, "IMC on an integrating plant gives a PI (lambda tuning): the derivative asked for is not used")
		}
	}
	if tn.model, err = HalfRule(rd, order); err != nil {
		return nil, err
	}
	if order == 2 && tn.s.Rule == SIMC && tn.model.Tau2 == 0 {
		tn.notes = append(tn.notes, "SIMC on a model with one lag gives a PI (Td = Tau2 = 0): the derivative asked for is not used")
	}
	return tn, nil
}

// pidRow reports whether the rule gives a PID: a derivative asked for,
// and not IMC on an integrating plant.
func (tn *tuner) pidRow() bool {
	return tn.s.Derivative && !(tn.s.Rule == IMC && tn.model.Integrating)
}

// ruleTime is the rule's own closed-loop time: for SIMC and IMC the
// factor of the rule (1 for SIMC, 1.7 for IMC PI, 0.8 for IMC PID) times
// the model's effective dead time plus half a sample (see Tune).
func (tn *tuner) ruleTime() float64 {
	th := tn.model.DeadTime + tn.T/2
	switch tn.s.Rule {
	case IMC:
		if tn.pidRow() {
			return 0.8 * th
		}
		return 1.7 * th
	case Dahlin:
		return max(tn.reading.DeadTime, tn.T)
	}
	return th
}

// defaultTime is the default closed-loop time: the rule's own, or the
// one that gives the loop on the model Ms = AggressiveMs when the rule's
// gives more (or an unstable loop) and a slower loop reaches it.
func (tn *tuner) defaultTime() (float64, error) {
	tc := tn.ruleTime()
	ms, err := tn.msAt(tc)
	if err != nil || ms <= AggressiveMs {
		return tc, err
	}
	hi := max(tc, tn.T) * 1e3
	mhi, err := tn.msAt(hi)
	if err != nil || mhi > AggressiveMs {
		return tc, err // no slower loop helps: Tune notes or refuses it
	}
	slow, err := tn.bisectMs(AggressiveMs, tc, hi)
	if err != nil {
		return 0, err
	}
	was := "Ms " + fmtG(ms)
	if math.IsInf(ms, 1) {
		was = "an unstable loop"
	}
	tn.notes = append(tn.notes, "the rule's closed-loop time "+fmtG(tc)+" gave "+was+" on the model; lengthened to "+fmtG(slow)+" for Ms = 2 (the default keeps Ms at most 2)")
	return slow, nil
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
// 1e3] times the reference time (the rule's own closed-loop time, or the
// sample interval when that is longer): Ms falls as tc grows. A target
// above the Ms of the fastest loop tried, or below that of the slowest,
// is an error naming the setting and the Ms reached.
func (tn *tuner) searchMs(target float64) (float64, error) {
	ref := max(tn.ruleTime(), tn.T)
	lo, hi := ref*1e-3, ref*1e3
	mhi, err := tn.msAt(hi)
	if err != nil {
		return 0, err
	}
	if mhi > target {
		return 0, &ModelError{Part: "TuneSettings.MaxSensitivity target", Problem: fmtG(target) + " not reached: the slowest loop tried (closed-loop time " + fmtG(hi) + ") has Ms = " + fmtG(mhi) + "; ask for a larger target"}
	}
	mlo, err := tn.msAt(lo)
	if err != nil {
		return 0, err
	}
	if mlo <= target {
		return 0, &ModelError{Part: "TuneSettings.MaxSensitivity target", Problem: fmtG(target) + " not reached: the fastest loop tried (closed-loop time " + fmtG(lo) + ", 1e-3 of the rule's own) has Ms = " + fmtG(mlo) + ", about the largest this rule reaches on this plant; ask for at most " + fmtG(mlo)}
	}
	return tn.bisectMs(target, lo, hi)
}

// msAt returns the Ms of the loop on the model tuned with closed-loop
// time tc (+Inf when unstable).
func (tn *tuner) msAt(tc float64) (float64, error) {
	t, err := tn.tune(tc)
	if err != nil {
		return 0, err
	}
	return t.Ms, nil
}

// bisectMs returns the closed-loop time in [lo, hi] with Ms = target, by
// bisection on log tc to 1e-9, given Ms(lo) > target >= Ms(hi).
func (tn *tuner) bisectMs(target, lo, hi float64) (float64, error) {
	a, b := math.Log(lo), math.Log(hi)
	for it := 0; it < 100 && b-a > 1e-9; it++ {
		mid := 0.5 * (a + b)
		m, err := tn.msAt(math.Exp(mid))
		if err != nil {
			return 0, err
		}
		if m > target {
			a = mid
		} else {
			b = mid
		}
	}
	return math.Exp(b), nil
}

// stable reports whether the loop of c on the plant model is stable and
// keeps its largest pole magnitude in tn.maxPole; an algebraic loop (no
// dead time in the loop) and a characteristic polynomial beyond the root
// finder's degree are errors.
func (tn *tuner) stable(c tf.Rational) (bool, error) {
	char, err := characteristic(c, tn.p)
	if err != nil {
		return false, err
	}
	if deg := len(char) - 1; deg > poly.MaxDegree {
		return false, &ModelError{Part: "closed loop", Problem: "characteristic polynomial of degree " + strconv.Itoa(deg) + " is beyond the root finder's " + strconv.Itoa(poly.MaxDegree) + ", so the loop's stability cannot be checked: the plant's dead time (" + strconv.Itoa(tn.p.Delay()) + " samples) is too long in samples; resample slower (keep every k-th sample, so that the dead time is well under " + strconv.Itoa(poly.MaxDegree) + " samples), fit and tune again"}
	}
	rs, err := poly.Roots(poly.Reciprocal(char))
	if err != nil {
		return false, &ModelError{Part: "closed loop", Problem: "poles not found: " + err.Error(), Err: err}
	}
	tn.maxPole = poly.MaxAbsRoot(rs)
	return tn.maxPole < 1, nil
}

// shortRational prints r as tf.Rational.String does, with coefficients
// rounded to 6 significant digits for people (Controller holds them in
// full).
func shortRational(r tf.Rational) string {
	poly := func(c []float64) string {
		var b strings.Builder
		for k, v := range c {
			switch {
			case k > 0 && v == 0:
				continue // a zero term is left out, as in a model's spec
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
