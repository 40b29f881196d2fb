package tf

import (
	"math"
	"math/cmplx"

	"github.com/backshift/backshift/internal/errs"
)

// Span is a duration in samples and, when a sample interval was given, in
// the interval's time units (Time = Samples * interval; 0 when no interval
// was given).
type Span struct {
	Samples float64
	Time    float64
}

// StepSettings tunes StepFigures. The zero value gives the defaults;
// by the settings rule of the library zero means the default and a
// value outside a field's range is an error (Validate names the field).
type StepSettings struct {
	// RiseFrom and RiseTo are the levels, as fractions of the final
	// value, between which the rise time is measured; 0 means 0.1 and
	// 0.9 (10 % and 90 %, common practice for a lag with a smooth start).
	// Each must lie in (0, 1) and RiseFrom below RiseTo.
	RiseFrom, RiseTo float64
	// Band is the settling band as a fraction of the final value; 0 means
	// 0.02 (2 %, common practice). It must lie in (0, 1).
	Band float64
	// Interval is the sample interval in the caller's time unit; 0 means
	// not given (times reported in samples only). It must be >= 0.
	Interval float64
	// Horizon is the number of samples of the step response examined; 0
	// chooses it from the slowest pole (long enough for that mode to decay
	// to 1e-3 of the band, at least 4 time constants past the dead time
	// and numerator), capped at 10^6 samples. At most 10^7.
	Horizon int
}

// Validate checks the settings by the rule of every settings struct of
// the library (zero means the default) and the ranges documented on each
// field, and returns a *SettingError naming the field
// ("StepSettings.Band"), or nil.
func (o StepSettings) Validate() error { return o.validate("tf.StepSettings.Validate") }

func (o StepSettings) validate(op string) error {
	for _, c := range []struct {
		name string
		v    float64
		def  string
	}{{"RiseFrom", o.RiseFrom, "0.1"}, {"RiseTo", o.RiseTo, "0.9"}, {"Band", o.Band, "0.02"}} {
		if !(c.v >= 0 && c.v < 1) {
			return setting(op, "StepSettings."+c.name, c.v, "must lie in (0, 1), or be 0 for the default "+c.def)
		}
	}
	if from, to := o.rise(); from >= to {
		return setting(op, "StepSettings.RiseFrom", from, "must lie below StepSettings.RiseTo ("+formatNum(to)+")")
	}
	if err := errs.NonNegative(op, "StepSettings.Interval", o.Interval, "0: not given, times in samples only"); err != nil {
		return err
	}
	if o.Horizon < 0 || o.Horizon > 1e7 {
		return intSetting(op, "StepSettings.Horizon", o.Horizon, "must lie in 0..10^7 (0: chosen from the slowest pole)")
	}
	return nil
}

// rise returns the rise levels with their defaults.
func (o StepSettings) rise() (from, to float64) {
	from, to = o.RiseFrom, o.RiseTo
	if from == 0 {
		from = 0.1
	}
	if to == 0 {
		to = 0.9
	}
	return from, to
}

// StepFigures describes the unit step response of a stable term, for
// people tuning controllers. Times count samples from the step at t = 0
// (the input is 1 from sample 0 on); rise and settling times are
// interpolated linearly between samples. The levels used (RiseFrom,
// RiseTo, Band) are reported with the figures.
type StepFigures struct {
	// Final is the final value, the steady-state gain.
	Final float64
	// Rise is the time from the first crossing of RiseFrom*Final to
	// the first crossing of RiseTo*Final; NaN when RiseTo is not reached
	// within the horizon. A level already reached at sample 0 (direct
	// feedthrough) counts as crossed at 0.
	Rise Span
	// Settle is the time after which the response stays within
	// Band*|Final| of Final until the end of the horizon; NaN when the
	// last sample of the horizon is still outside the band.
	Settle Span
	// Peak is the extreme value in the direction of Final (the maximum for
	// a positive gain), PeakAt the sample where it is first reached.
	Peak   float64
	PeakAt Span
	// Overshoot is (Peak - Final)/Final as a fraction (0.25 = 25 %), 0
	// when the response never passes Final.
	Overshoot float64
	// Undershoot is the largest excursion opposite to Final as a fraction
	// of |Final| (inverse response of a non-minimum-phase term), 0 when
	// there is none.
	Undershoot float64
	// RiseFrom and RiseTo are the rise levels used, Band the settling
	// band; Horizon the samples examined.
	RiseFrom, RiseTo float64
	Band             float64
	Horizon          int
}

// StepFigures returns rise time, settling time, overshoot and peak of the
// unit step response (see StepFigures), computed on the exact sampled
// step response. Errors (Op "tf.Rational.StepFigures"): an
// *UnstableError for a term that is not stable, a *SettingError for a
// bad setting, a *ModelError for a zero gain (no step to measure), and a
// *GainError when the gain does not exist.
func (r Rational) StepFigures(o StepSettings) (StepFigures, error) {
	const op = "tf.Rational.StepFigures"
	if err := o.validate(op); err != nil {
		return StepFigures{}, err
	}
	band := o.Band
	if band == 0 {
		band = 0.02
	}
	rho := r.MaxPoleMagnitude()
	if !(rho < 1) {
		return StepFigures{}, &UnstableError{Op: op, What: "step figures", MaxPole: rho}
	}
	g, err := r.gain()
	if err != nil {
		return StepFigures{}, withOp(op, err)
	}
	if g == 0 {
		return StepFigures{}, &ModelError{Op: op, Part: "gain", Problem: "is 0: a term with no steady-state change has no step figures"}
	}
	n := o.Horizon
	if n == 0 {
		n = r.stepHorizon(rho, band)
	}
	return o.measure(r.Step(n), g), nil
}

// Measure returns the step figures of a step response y computed
// elsewhere (a closed loop's, a simulation's), measured as StepFigures
// measures a term's: y[0] is the first sample after a unit step (the
// response before it is 0), final its final value, and the Horizon of
// the figures is len(y) (o.Horizon is not used). Errors (Op
// "tf.StepSettings.Measure"): a *SettingError for a bad setting, a
// *ModelError for a final value that is zero or not finite. y is not
// modified.
func (o StepSettings) Measure(y []float64, final float64) (StepFigures, error) {
	const op = "tf.StepSettings.Measure"
	if err := o.validate(op); err != nil {
		return StepFigures{}, err
	}
	if final == 0 || math.IsNaN(final) || math.IsInf(final, 0) {
		return StepFigures{}, &ModelError{Op: op, Part: "final value", Problem: "is " + formatNum(final) + ": the figures are fractions of a finite, non-zero final value"}
	}
	return o.measure(y, final), nil
}

// measure computes the figures of the step response y with final value
// g, the settings valid and g finite and non-zero.
func (o StepSettings) measure(y []float64, g float64) StepFigures {
	band := o.Band
	if band == 0 {
		band = 0.02
	}
	from, to := o.rise()
	info := StepFigures{Final: g, RiseFrom: from, RiseTo: to, Band: band, Horizon: len(y)}
	span := func(s float64) Span { return Span{Samples: s, Time: s * o.Interval} }
	info.Rise = span(crossing(y, g, to) - crossing(y, g, from))
	peak, kPeak, under := 0.0, 0, 0.0
	for k, v := range y {
		u := v / g
		if u > peak {
			peak, kPeak = u, k
		}
		under = max(under, -u)
	}
	info.Peak = peak * g
	info.PeakAt = span(float64(kPeak))
	info.Overshoot = max(peak-1, 0)
	info.Undershoot = under
	info.Settle = span(settling(y, g, band))
	return info
}

// stepHorizon is the default horizon of StepFigures: the samples of the
// dead time and degrees plus those in which the slowest pole (magnitude
// rho) decays to band 1e-3, and at least four time constants; at most
// 10^6.
func (r Rational) stepHorizon(rho, band float64) int {
	base := r.delay + r.NumDegree() + r.DenDegree() + 2
	n := base
	if rho > 0 {
		tau := -1 / math.Log(rho)
		n += int(math.Ceil(math.Max(math.Log(band*1e-3)/math.Log(rho), 4*tau)))
	}
	return min(n, 1000000)
}

// crossing returns the time, interpolated between samples, at which the
// normalised step response y/g first reaches level (the response before
// the step is 0); NaN when it never does.
func crossing(y []float64, g, level float64) float64 {
	prev := 0.0
	for k, v := range y {
		u := v / g
		if u >= level {
			if k == 0 {
				return 0
			}
			return float64(k-1) + (level-prev)/(u-prev)
		}
		prev = u
	}
	return math.NaN()
}

// settling returns the settling time of the step response y (final
// value g) into the band: after the last sample outside it, with the
// entry interpolated; 0 when always inside, NaN when the last sample is
// outside.
func settling(y []float64, g, band float64) float64 {
	last := -1
	for k := len(y) - 1; k >= 0; k-- {
		if math.Abs(y[k]/g-1) > band {
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
	e0, e1 := math.Abs(y[last]/g-1), math.Abs(y[last+1]/g-1)
	return float64(last) + (e0-band)/(e0-e1)
}

// ModeKind classifies a pole for Mode.
type ModeKind string

// The kinds of Mode.
const (
	// ModeReal is a real pole in (0, 1): a first-order lag.
	ModeReal ModeKind = "real"
	// ModeComplex is a complex pair inside the unit circle: an
	// oscillatory second-order mode.
	ModeComplex ModeKind = "complex"
	// ModeIntegrator is a pole at z = 1.
	ModeIntegrator ModeKind = "integrator"
	// ModeAlternating is a real pole in (-1, 0): a sign-alternating mode
	// with no continuous-time equivalent (often a sign of over-fitting or
	// of sampling too slowly).
	ModeAlternating ModeKind = "alternating"
	// ModeZero is a pole at z = 0: a pure delay of one sample.
	ModeZero ModeKind = "zero"
	// ModeUnstable is a pole with |z| >= 1 other than z = 1.
	ModeUnstable ModeKind = "unstable"
)

// Mode describes one pole of a term as engineers read it, through the
// continuous-time equivalent s = ln(z)/T of the pole z for sample
// interval T (T = 1 when no interval is given, so times are in samples).
type Mode struct {
	// Pole is the z-plane pole. For a complex pair only the member with
	// positive imaginary part is listed.
	Pole complex128
	// Kind classifies the pole.
	Kind ModeKind
	// TimeConstant tau = -T/ln(z) of a real pole in (0, 1): in samples
	// and time units.
	TimeConstant Span
	// NaturalFrequency |s| (radians per sample, and per time unit in
	// NaturalFrequencyTime) and Damping -Re(s)/|s| of a complex pair.
	NaturalFrequency     float64
	NaturalFrequencyTime float64
	Damping              float64
}

// Modes returns one Mode per real pole and per complex-conjugate pair, in
// the order of Poles. interval is the sample interval in the caller's
// time unit, or 0 when not given. It returns a *SettingError for a
// negative or non-finite interval.
func (r Rational) Modes(interval float64) ([]Mode, error) {
	if err := errs.NonNegative("tf.Rational.Modes", "interval", interval, "0: not given, times in samples only"); err != nil {
		return nil, err
	}
	var out []Mode
	for _, z := range r.Poles() {
		if imag(z) < 0 {
			continue
		}
		m := Mode{Pole: z}
		a := cmplx.Abs(z)
		switch {
		case z == 0:
			m.Kind = ModeZero
		case z == 1:
			m.Kind = ModeIntegrator
		case a >= 1:
			m.Kind = ModeUnstable
		case imag(z) == 0 && real(z) < 0:
			m.Kind = ModeAlternating
		case imag(z) == 0:
			m.Kind = ModeReal
			tau := -1 / math.Log(real(z))
			m.TimeConstant = Span{Samples: tau, Time: tau * interval}
		default:
			m.Kind = ModeComplex
			s := cmplx.Log(z) // per sample
			m.NaturalFrequency = cmplx.Abs(s)
			m.Damping = -real(s) / cmplx.Abs(s)
			if interval > 0 {
				m.NaturalFrequencyTime = m.NaturalFrequency / interval
			}
		}
		out = append(out, m)
	}
	return out, nil
}
