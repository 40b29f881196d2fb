package control

import (
	"errors"
	"math"
	"math/cmplx"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// LoopSettings chooses what Analyze measures. The zero value is the
// default.
type LoopSettings struct {
	// Interval is the sample interval; the zero Interval reports times
	// in samples only. Otherwise its Value must be positive and finite
	// and its Unit one of tf.ValidUnit's. Integrated absolute errors are in output units
	// times the interval's time unit (times samples when not given).
	Interval tf.Interval
	// Horizon is the number of samples of the step responses; 0 chooses
	// it from the slowest closed-loop pole (the samples in which it
	// decays to 1e-3 of the settling band, at least 50, at most 10^5;
	// 200 for an unstable loop). At most 10^7.
	Horizon int
	// Step holds the rise levels and settling band of the set-point
	// figures (tf.StepSettings; its Interval and Horizon are not used,
	// the loop's are); the zero value means 10 % to 90 % and 2 %.
	Step tf.StepSettings
}

// Validate checks the settings and returns a *SettingError naming the
// field, or nil.
func (s LoopSettings) Validate() error { return s.validate("control.LoopSettings.Validate") }

func (s LoopSettings) validate(op string) error {
	if err := checkInterval(op, "LoopSettings.Interval", s.Interval); err != nil {
		return err
	}
	if s.Horizon < 0 || s.Horizon > 1e7 {
		return &SettingError{Op: op, Setting: "LoopSettings.Horizon", Value: strconv.Itoa(s.Horizon), Rule: "must lie in 0..10^7 (0: chosen from the slowest closed-loop pole)"}
	}
	st := s.Step
	st.Interval, st.Horizon = 0, 0
	if err := st.Validate(); err != nil {
		var se *SettingError
		if errors.As(err, &se) {
			se.Op, se.Setting = op, "LoopSettings.Step."+se.Setting[len("StepSettings."):]
		}
		return err
	}
	return nil
}

// Response is a closed-loop step response from rest: Output the plant
// output y_t and Control the controller output u_t, t = 0..Horizon-1,
// the step applied at t = 0.
type Response struct {
	Output  []float64
	Control []float64
	// Figures are the set-point figures (tf.StepFigures, measured on
	// Output as tf.Rational.StepFigures measures a term's step response,
	// with Final the exact steady state of the loop); zero for a load
	// response.
	Figures tf.StepFigures
	// Peak is the largest |y_t| and PeakAt its first sample (load
	// responses; for set points see Figures).
	Peak   float64
	PeakAt tf.Span
	// Recover is the load-recovery time (load responses): the time after
	// which the output stays back at the set point, |y_t| within Band
	// (LoopSettings.Step.Band, 2 % by default) times Peak, until the
	// horizon ends, interpolated between samples. It is NaN when that is
	// not reached: the loop keeps an offset beyond the band (a controller
	// without integral action), or the last sample is outside the band.
	Recover tf.Span
	// IAE is the integrated absolute error sum |r_t - y_t| T over the
	// horizon (r = 1 for the set point, 0 for the load).
	IAE float64
}

// Loop is the analysis of a discrete controller C closed around a plant
// P by negative feedback, u = C (r - y), y = P (u + d): set point r, load
// disturbance d at the plant input.
type Loop struct {
	// Poles are the closed-loop poles in the z-plane, the roots of the
	// characteristic polynomial delta_c delta_p + omega_c omega_p B^(b_c +
	// b_p) read as z = 1/B, sorted by magnitude; MaxPole the largest
	// magnitude; Stable reports MaxPole < 1. When the loop is unstable
	// the frequency figures below would be meaningless and are marked:
	// SensitivityPeak and ComplementaryPeak +Inf (as Tuning.Ms), the
	// margins, DelayMargin and the peak frequencies NaN, with
	// HasGainMargin and HasPhaseMargin false.
	Poles   []complex128
	MaxPole float64
	Stable  bool
	// Margins are the gain and phase margins of L = C P (the type and
	// definitions of tf.Rational.LoopMargins: the smallest over all
	// crossovers; frequencies in radians per sample).
	Margins tf.LoopMargins
	// DelayMargin is the extra dead time the loop tolerates before it
	// becomes unstable, min over gain crossovers of PM_i/w_i, in samples
	// (a fraction is part of a sample) and time units; +Inf without a
	// gain crossover.
	DelayMargin tf.Span
	// SensitivityPeak is max |S| = max 1/|1 + L| over the frequencies,
	// at SensitivityPeakAt (radians per sample); ComplementaryPeak is
	// max |T| = max |L/(1 + L)|. Both are NaN in the rare case of a pole
	// of L on the unit circle that the sweep cannot step beside.
	SensitivityPeak     float64
	SensitivityPeakAt   float64
	ComplementaryPeak   float64
	ComplementaryPeakAt float64
	// Setpoint is the response to a unit set-point step, Load to a unit
	// load step at the plant input.
	Setpoint Response
	Load     Response
}

// Analyze closes the discrete controller c around the plant p (both
// tf.Rational, in the plant's samples) and returns the loop's poles,
// stability, margins, sensitivity peaks and step responses.
//
// The frequency figures come from one sweep of L on a grid (see the
// constants of the sweep: log-spaced and linear points) with each
// crossover refined by bisection to 1e-13 rad/sample and each peak by
// golden-section search; they are checked against tf.LoopMargins and a
// dense scipy.signal.freqz sweep in the tests. One sweep serves margins,
// delay margin and both peaks, so that robustness checks over many
// plants stay fast.
//
// The step responses are simulated by the difference equations of C and
// P (tf.Plant), with the output read before the new input is applied:
// the loop must have at least one sample of dead time (a sampled plant
// has the hold's). For an unstable loop the responses are simulated but
// not measured (figures NaN).
//
// Errors (Op "control.Analyze"): a *SettingError for bad settings, a
// *ModelError for a loop with no dead time at all (an algebraic loop) or
// a characteristic polynomial of degree above 256 (a dead time too long
// for the root finder: resample slower).
func Analyze(c, p tf.Rational, s LoopSettings) (lp Loop, err error) {
	const op = "control.Analyze"
	defer errs.Recover(op, &err)
	if err := s.validate(op); err != nil {
		return Loop{}, err
	}
	lp, err = newAnalyzer().analyze(c, p, s)
	if err != nil {
		setOp(op, err)
	}
	return lp, err
}

// analyze is Analyze on the analyzer's buffers.
func (a *analyzer) analyze(c, p tf.Rational, s LoopSettings) (Loop, error) {
	char, err := characteristic(c, p)
	if err != nil {
		return Loop{}, err
	}
	var lp Loop
	if deg := len(char) - 1; deg > 0 {
		if deg > poly.MaxDegree {
			return Loop{}, &ModelError{Part: "closed loop", Problem: "characteristic polynomial of degree " + strconv.Itoa(deg) + " is beyond the root finder's " + strconv.Itoa(poly.MaxDegree) + ": the loop's dead time is too long in samples; resample slower"}
		}
		lp.Poles, err = poly.Roots(poly.Reciprocal(char))
		if err != nil {
			return Loop{}, &ModelError{Part: "closed loop", Problem: "poles not found: " + err.Error(), Err: err}
		}
	}
	for _, z := range lp.Poles {
		lp.MaxPole = math.Max(lp.MaxPole, cmplx.Abs(z))
	}
	lp.Stable = lp.MaxPole < 1
	T := s.Interval.Value
	if T == 0 {
		T = 1
	}
	l := newLoopFreq(c, p)
	f := a.sweep(&l)
	lp.Margins = f.margins
	lp.DelayMargin = spanOf(f.delayMargin, s.Interval.Value)
	lp.SensitivityPeak, lp.SensitivityPeakAt = f.ms, f.msAt
	lp.ComplementaryPeak, lp.ComplementaryPeakAt = f.mt, f.mtAt
	if f.poleOnUnitCircle {
		lp.SensitivityPeak, lp.ComplementaryPeak = math.NaN(), math.NaN()
	}
	if !lp.Stable {
		unstableFigures(&lp, s.Interval.Value)
	}
	n := s.Horizon
	if n == 0 {
		n = defaultHorizon(lp, s.Step.Band)
	}
	if err := a.responses(&lp, c, p, n, T, s); err != nil {
		return Loop{}, err
	}
	return lp, nil
}

// unstableFigures marks the frequency figures of an unstable loop: the
// peaks +Inf (as Tuning.Ms), the margins and their frequencies NaN with
// HasGainMargin and HasPhaseMargin false. Read from the open loop alone,
// they would be finite numbers that describe no stable loop (a margin
// measures the distance to instability).
func unstableFigures(lp *Loop, interval float64) {
	nan := math.NaN()
	lp.Margins = tf.LoopMargins{GainMargin: nan, PhaseCrossover: nan, PhaseMargin: nan, GainCrossover: nan}
	lp.DelayMargin = spanOf(nan, interval)
	lp.SensitivityPeak, lp.ComplementaryPeak = math.Inf(1), math.Inf(1)
	lp.SensitivityPeakAt, lp.ComplementaryPeakAt = nan, nan
}

// spanOf returns v samples as a tf.Span: Time is v times the interval,
// 0 when no interval is given (tf.Span's convention).
func spanOf(v, interval float64) tf.Span {
	if interval == 0 {
		return tf.Span{Samples: v}
	}
	return tf.Span{Samples: v, Time: v * interval}
}

// characteristic returns delta_c delta_p + omega_c omega_p B^(b_c+b_p),
// refusing a loop without dead time.
func characteristic(c, p tf.Rational) ([]float64, error) {
	nc, np := c.Num(), p.Num()
	b := c.Delay() + p.Delay()
	if b == 0 && nc[0] != 0 && np[0] != 0 {
		return nil, &ModelError{Part: "closed loop", Problem: "has no dead time: the plant and the controller both respond in the same sample (an algebraic loop); a sampled plant has at least the one sample of its hold"}
	}
	return poly.Add(poly.Mul(c.Den(), p.Den()), poly.Shift(poly.Mul(nc, np), b)), nil
}

// defaultHorizon is LoopSettings.Horizon's default.
func defaultHorizon(lp Loop, band float64) int {
	if !lp.Stable {
		return 200
	}
	if band == 0 {
		band = 0.02
	}
	if lp.MaxPole == 0 {
		return 50
	}
	n := math.Log(band*1e-3) / math.Log(lp.MaxPole)
	return int(math.Min(math.Max(math.Ceil(n), 50), 1e5))
}
