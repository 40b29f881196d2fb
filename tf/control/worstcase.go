package control

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// WorstCaseSettings names the plant errors to check: the true gain
// between (1 - GainBelow) and (1 + GainAbove) times the model's, and
// the true dead time between DelayBelow samples shorter and DelayAbove
// samples longer ("gain up to 30 % higher, one more sample of dead
// time" is GainAbove 0.3, DelayAbove 1).
type WorstCaseSettings struct {
	// GainBelow and GainAbove are fractions of the model gain; GainBelow
	// must lie in [0, 1), GainAbove be finite and >= 0.
	GainBelow, GainAbove float64
	// DelayBelow and DelayAbove are whole samples, >= 0. DelayBelow is
	// at most the model's dead time, and less than it when the
	// controller acts in the same sample as it reads (a PI or PID does):
	// a plant without dead time would close an algebraic loop.
	DelayBelow, DelayAbove int
	// GainSteps is the number of gain factors on the grid, evenly spaced
	// and including both ends; 0 means 5. At most 1000.
	GainSteps int
	// Loop is passed to the analysis of each loop.
	Loop LoopSettings
}

// Validate checks the settings and returns a *SettingError naming the
// field, or nil.
func (s WorstCaseSettings) Validate() error { return s.validate("control.WorstCaseSettings.Validate") }

func (s WorstCaseSettings) validate(op string) error {
	if !(s.GainBelow >= 0 && s.GainBelow < 1) {
		return fsetting(op, "WorstCaseSettings.GainBelow", s.GainBelow, "must lie in [0, 1): the largest fraction by which the true gain may fall short of the model's")
	}
	if err := errs.NonNegative(op, "WorstCaseSettings.GainAbove", s.GainAbove, "0: no gain above the model's"); err != nil {
		return err
	}
	if s.DelayBelow < 0 {
		return &SettingError{Op: op, Setting: "WorstCaseSettings.DelayBelow", Value: strconv.Itoa(s.DelayBelow), Rule: "must be zero or positive (samples of dead time less than the model's)"}
	}
	if s.DelayAbove < 0 || s.DelayAbove > tf.MaxDelay {
		return &SettingError{Op: op, Setting: "WorstCaseSettings.DelayAbove", Value: strconv.Itoa(s.DelayAbove), Rule: "must lie in 0..tf.MaxDelay (samples of dead time more than the model's)"}
	}
	if s.GainSteps < 0 || s.GainSteps == 1 || s.GainSteps > 1000 {
		return &SettingError{Op: op, Setting: "WorstCaseSettings.GainSteps", Value: strconv.Itoa(s.GainSteps), Rule: "must lie in 2..1000 (0 means 5): the grid includes both ends"}
	}
	return s.Loop.validate(op)
}

// Case is one plant of the worst-case grid: the model with its gain
// multiplied by GainFactor and DelayChange samples added to its dead
// time, and the loop on it.
type Case struct {
	GainFactor  float64
	DelayChange int
	Loop        Loop
}

// Extreme is the worst value of one figure over the stable cases and the
// index of its case in WorstCase.Cases (-1 when no case is stable).
type Extreme struct {
	Value float64
	Case  int
}

// WorstCase is the result of CheckWorstCase.
type WorstCase struct {
	// Cases are the grid, gain factors varying fastest, corners included.
	Cases []Case
	// Unstable counts the cases whose loop is unstable; the extremes
	// below are over the stable ones.
	Unstable int
	// The worst value of each figure: the smallest margins, the largest
	// peaks, overshoot and integrated absolute errors.
	GainMargin        Extreme
	PhaseMargin       Extreme
	DelayMargin       Extreme
	SensitivityPeak   Extreme
	ComplementaryPeak Extreme
	Overshoot         Extreme
	SetpointIAE       Extreme
	LoadIAE           Extreme
}

// CheckWorstCase closes the controller c around every plant of the grid
// of gain and dead-time errors of s about the model p (gain factors from
// 1 - GainBelow to 1 + GainAbove, dead times from b - DelayBelow to b +
// DelayAbove, all corners included) and returns each case and the worst
// of each figure. A deterministic check: the true plant is assumed to
// differ from the model only in these two ways.
//
// Errors (Op "control.CheckWorstCase"): a *SettingError for bad
// settings (DelayBelow above the model's dead time, or leaving an
// algebraic loop, and a DelayAbove whose longest case has a
// characteristic polynomial beyond the root finder's degree 256,
// checked before any case is run, included), and the errors of Analyze wrapped in a
// *ModelError naming the case.
func CheckWorstCase(c, p tf.Rational, s WorstCaseSettings) (out WorstCase, err error) {
	const op = "control.CheckWorstCase"
	defer errs.Recover(op, &err)
	if err := s.validate(op); err != nil {
		return WorstCase{}, err
	}
	if s.DelayBelow > p.Delay() {
		return WorstCase{}, &SettingError{Op: op, Setting: "WorstCaseSettings.DelayBelow", Value: strconv.Itoa(s.DelayBelow), Rule: "must be at most the model's dead time, " + strconv.Itoa(p.Delay()) + " samples"}
	}
	if s.DelayBelow > 0 {
		q, err := tf.NewRational(p.Num(), p.Den(), p.Delay()-s.DelayBelow)
		if err == nil {
			_, err = characteristic(c, q)
		}
		if err != nil {
			return WorstCase{}, &SettingError{Op: op, Setting: "WorstCaseSettings.DelayBelow", Value: strconv.Itoa(s.DelayBelow), Rule: "leaves the plant " + strconv.Itoa(p.Delay()-s.DelayBelow) + " samples of dead time, an algebraic loop with this controller (both act in the same sample); at most " + strconv.Itoa(max(s.DelayBelow-1, 0)) + " here: a sampled plant keeps at least the one sample of its hold"}
		}
	}
	if err := checkLongestCase(op, c, p, s.DelayAbove); err != nil {
		return WorstCase{}, err
	}
	steps := s.GainSteps
	if steps == 0 {
		steps = 5
	}
	if s.GainBelow == 0 && s.GainAbove == 0 {
		steps = 1
	}
	a := newAnalyzer()
	for d := -s.DelayBelow; d <= s.DelayAbove; d++ {
		for i := range steps {
			g := 1.0
			if steps > 1 {
				g = 1 - s.GainBelow + (s.GainBelow+s.GainAbove)*float64(i)/float64(steps-1)
			}
			q, err := tf.NewRational(poly.Scale(g, p.Num()), p.Den(), p.Delay()+d)
			if err != nil {
				return WorstCase{}, &ModelError{Op: op, Part: "plant with gain factor " + fmtG(g) + " and dead time change " + strconv.Itoa(d), Problem: err.Error(), Err: err}
			}
			lp, err := a.analyze(c, q, s.Loop)
			if err != nil {
				return WorstCase{}, &ModelError{Op: op, Part: "plant with gain factor " + fmtG(g) + " and dead time change " + strconv.Itoa(d), Problem: err.Error(), Err: err}
			}
			out.Cases = append(out.Cases, Case{GainFactor: g, DelayChange: d, Loop: lp})
		}
	}
	out.extremes()
	return out, nil
}

// extremes fills the worst value of each figure over the stable cases.
func (w *WorstCase) extremes() {
	type fig struct {
		dst  *Extreme
		f    func(Loop) float64
		less bool // the worst is the smallest
	}
	figs := []fig{
		{&w.GainMargin, func(l Loop) float64 { return orInf(l.Margins.GainMargin, l.Margins.HasGainMargin) }, true},
		{&w.PhaseMargin, func(l Loop) float64 { return orInf(l.Margins.PhaseMargin, l.Margins.HasPhaseMargin) }, true},
		{&w.DelayMargin, func(l Loop) float64 { return l.DelayMargin.Samples }, true},
		{&w.SensitivityPeak, func(l Loop) float64 { return l.SensitivityPeak }, false},
		{&w.ComplementaryPeak, func(l Loop) float64 { return l.ComplementaryPeak }, false},
		{&w.Overshoot, func(l Loop) float64 { return l.Setpoint.Figures.Overshoot }, false},
		{&w.SetpointIAE, func(l Loop) float64 { return l.Setpoint.IAE }, false},
		{&w.LoadIAE, func(l Loop) float64 { return l.Load.IAE }, false},
	}
	for _, f := range figs {
		*f.dst = Extreme{Value: math.NaN(), Case: -1}
	}
	for i, c := range w.Cases {
		if !c.Loop.Stable {
			w.Unstable++
			continue
		}
		for _, f := range figs {
			v := f.f(c.Loop)
			if f.dst.Case < 0 || (f.less && v < f.dst.Value) || (!f.less && v > f.dst.Value) {
				*f.dst = Extreme{Value: v, Case: i}
			}
		}
	}
}

func orInf(v float64, ok bool) float64 {
	if !ok {
		return math.Inf(1)
	}
	return v
}

// checkLongestCase refuses, before any case is run, a DelayAbove whose
// longest plant gives a characteristic polynomial beyond the root
// finder's degree (every case up to it would be analysed first).
func checkLongestCase(op string, c, p tf.Rational, above int) error {
	if above == 0 {
		return nil
	}
	q, err := tf.NewRational(p.Num(), p.Den(), p.Delay()+above)
	if err != nil {
		return &SettingError{Op: op, Setting: "WorstCaseSettings.DelayAbove", Value: strconv.Itoa(above), Rule: "gives a plant the model cannot hold: " + err.Error()}
	}
	char, err := characteristic(c, q)
	if err != nil || len(char)-1 <= poly.MaxDegree {
		return nil // the cases report it
	}
	most := above - (len(char) - 1 - poly.MaxDegree)
	rule := "the longest case's closed loop has a characteristic polynomial of degree " + strconv.Itoa(len(char)-1) + ", beyond the root finder's " + strconv.Itoa(poly.MaxDegree) + ": "
	if base, err := characteristic(c, p); err == nil && len(base)-1 > poly.MaxDegree || most < 0 {
		rule += "the model's loop is already too long in samples; resample slower"
	} else {
		rule += "at most " + strconv.Itoa(most) + " here, or resample slower"
	}
	return &SettingError{Op: op, Setting: "WorstCaseSettings.DelayAbove", Value: strconv.Itoa(above), Rule: rule}
}
