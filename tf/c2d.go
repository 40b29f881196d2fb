package tf

import (
	"math"
	"strconv"
)

// FOPDT is the continuous-time first-order-plus-dead-time process model
//
//	G(s) = Gain e^{-DeadTime s} / (TimeConstant s + 1),
//
// with TimeConstant and DeadTime in the time unit of the sample interval
// used with it.
type FOPDT struct {
	Gain         float64
	TimeConstant float64
	DeadTime     float64
}

// StepAt returns the continuous unit step response at time t (step
// applied at t = 0): Gain (1 - e^{-(t-DeadTime)/TimeConstant}) for
// t > DeadTime, else 0. Like SOPDT.StepAt and SecondOrder.StepAt it
// returns NaN for invalid parameters (a non-finite Gain, a TimeConstant
// that is not positive and finite, a DeadTime that is negative or not
// finite) and for t = NaN.
func (p FOPDT) StepAt(t float64) float64 {
	if checkFinite("Gain", p.Gain) != nil || checkPositive("TimeConstant", p.TimeConstant) != nil ||
		!stepArgsOK(p.DeadTime, t) {
		return math.NaN()
	}
	if !(t > p.DeadTime) {
		return 0
	}
	return -p.Gain * math.Expm1(-(t-p.DeadTime)/p.TimeConstant)
}

// Discretize returns the exact zero-order-hold equivalent of p for the
// sample interval T: the input is held constant over each interval
// [kT, (k+1)T) and the output sampled at kT. With DeadTime = (d + f) T,
// d whole and 0 <= f < 1, and a = e^{-T/tau} (modified z-transform),
//
//	G(B) = Gain (b1 + b2 B) / (1 - a B) * B^(d+1),
//	b1 = 1 - e^{-(1-f) T/tau},  b2 = e^{-(1-f) T/tau} - a,
//
// so b1 + b2 = 1 - a and the gain is exact; for a whole number of samples
// (f = 0) b2 = 0. The extra sample of dead time (d+1) is the hold's: the
// input applied at sample k first shows in the output at sample k+1. A
// fractional part within 1e-12 of 0 or 1 is rounded to the whole sample.
//
// It returns an *SettingError for a non-finite gain, a time constant or
// interval that is not positive and finite, a time constant so long
// against T that e^{-T/tau} rounds to 1 (about 2^53 intervals), a
// negative dead time, or a dead time of more than MaxDelay-1 samples.
func (p FOPDT) Discretize(T float64) (Rational, error) {
	out, err := p.discretize(T)
	return out, composeErr("tf.FOPDT.Discretize", err)
}

func (p FOPDT) discretize(T float64) (Rational, error) {
	if err := checkFinite("Gain", p.Gain); err != nil {
		return Rational{}, err
	}
	if err := checkPositive("TimeConstant", p.TimeConstant); err != nil {
		return Rational{}, err
	}
	d, f, err := splitDelay(p.DeadTime, T)
	if err != nil {
		return Rational{}, err
	}
	tau := p.TimeConstant
	a := math.Exp(-T / tau)
	if err := checkPole("TimeConstant", tau, a); err != nil {
		return Rational{}, err
	}
	h := (1 - f) * T // time from the delayed input's switch to the next sample
	b1 := -math.Expm1(-h / tau)
	b2 := 0.0
	if f > 0 {
		b2 = -math.Exp(-h/tau) * math.Expm1(-f*T/tau)
	}
	return newRational([]float64{p.Gain * b1, p.Gain * b2}, []float64{1, -a}, d+1)
}

// AsFOPDT converts a discrete first-order term back to the continuous
// first-order-plus-dead-time model whose zero-order-hold equivalent for
// the interval T it is (the inverse of FOPDT.Discretize): the term must
// have denominator 1 - a B with 0 < a < 1, a numerator of one or two
// coefficients (b1 + b2 B, leading zero coefficients counting as dead
// time) and dead time b >= 1. Then
//
//	Gain = (b1 + b2)/(1 - a),  TimeConstant = -T/ln(a),
//	DeadTime = (b - 1) T + f T,  f = 1 + (TimeConstant/T) ln(1 - (1-a) b1/(b1+b2)),
//
// so that f = 0 for b2 = 0. A fitted term whose split b1/(b1+b2) lies
// outside [0, 1] by at most 1e-9 is clamped into it.
//
// It returns an *SettingError when the term is not of this form (other
// orders, a pole outside (0, 1), a zero gain, no dead time, or a
// numerator split that no fractional dead time produces), or when T is
// not positive and finite.
func (r Rational) AsFOPDT(T float64) (FOPDT, error) {
	out, err := r.asFOPDT(T)
	return out, composeErr("tf.Rational.AsFOPDT", err)
}

// delayedCoefs returns r's numerator and denominator coefficients and
// its dead time in samples, with leading zero numerator coefficients
// moved into the dead time (omega(B) = B^k omega'(B) adds k samples).
func (r Rational) delayedCoefs() (num, den []float64, b int) {
	num, den = r.coefs()
	b = r.delay
	for len(num) > 1 && num[0] == 0 {
		num = num[1:]
		b++
	}
	return num, den, b
}

func (r Rational) asFOPDT(T float64) (FOPDT, error) {
	if err := checkPositive("interval", T); err != nil {
		return FOPDT{}, err
	}
	num, den, b := r.delayedCoefs()
	if len(den) != 2 {
		return FOPDT{}, &ModelError{Part: "term denominator degree", Problem: "is " + formatNum(float64(len(den)-1)) + ": must be 1 for a first-order term"}
	}
	if len(num) > 2 {
		return FOPDT{}, &ModelError{Part: "term numerator degree", Problem: "is " + formatNum(float64(len(num)-1)) + ": must be 0 or 1 for a first-order term"}
	}
	a := -den[1]
	if !(a > 0 && a < 1) {
		return FOPDT{}, &ModelError{Part: "term pole", Problem: "is " + formatNum(a) + ": must lie in (0, 1) for a first-order lag"}
	}
	b1 := num[0]
	b2 := 0.0
	if len(num) == 2 {
		b2 = num[1]
	}
	if b1+b2 == 0 {
		return FOPDT{}, &ModelError{Part: "term gain", Problem: "is 0: must be non-zero"}
	}
	if b < 1 {
		return FOPDT{}, &ModelError{Part: "term dead time", Problem: "is " + formatNum(float64(b)) + ": must be >= 1 sample for a zero-order-hold image (the hold adds one)"}
	}
	tau := -T / math.Log(a)
	// Fraction of the first response step: b1/(b1+b2) = (1 - e^{-(1-f)T/tau})/(1 - a).
	frac := b1 / (b1 + b2)
	const slack = 1e-9
	if frac < -slack || frac > 1+slack {
		return FOPDT{}, &ModelError{Part: "term numerator split b1/(b1+b2)", Problem: "is " + formatNum(frac) + ": must lie in [0, 1] for a fractional dead time"}
	}
	frac = min(max(frac, 0), 1)
	f := 0.0
	if frac < 1 {
		// (1-f) T/tau = -ln(1 - frac (1-a)).
		f = 1 + tau/T*math.Log1p(-frac*(1-a))
		f = min(max(f, 0), 1)
	}
	return FOPDT{Gain: (b1 + b2) / (1 - a), TimeConstant: tau, DeadTime: float64(b-1)*T + f*T}, nil
}

// SOPDT is the continuous-time second-order-plus-dead-time model with two
// real time constants,
//
//	G(s) = Gain e^{-DeadTime s} / ((Tau1 s + 1)(Tau2 s + 1)),
//
// in the time unit of the sample interval used with it. Tau1 = Tau2 (to
// 1e-6 relative) is treated as a double pole.
type SOPDT struct {
	Gain     float64
	Tau1     float64
	Tau2     float64
	DeadTime float64
}

// SecondOrder is the continuous-time second-order-plus-dead-time model in
// natural frequency and damping,
//
//	G(s) = Gain wn^2 e^{-DeadTime s} / (s^2 + 2 zeta wn s + wn^2),
//
// with NaturalFrequency wn in radians per time unit and Damping zeta >= 0
// (below 1 oscillatory, 1 critically damped, above 1 two real time
// constants).
type SecondOrder struct {
	Gain             float64
	NaturalFrequency float64
	Damping          float64
	DeadTime         float64
}

// secondOrderLag is a second-order lag in one of three closed forms.
type secondOrderLag struct {
	kind     int // 0 distinct real, 1 double real, 2 oscillatory
	k, theta float64
	t1, t2   float64 // time constants (kind 0, 1)
	zw, wd   float64 // zeta wn and damped frequency (kind 2)
	zr       float64 // zeta / sqrt(1 - zeta^2)
}

func (p SOPDT) second() (secondOrderLag, error) {
	if err := checkFinite("Gain", p.Gain); err != nil {
		return secondOrderLag{}, err
	}
	if err := checkPositive("Tau1", p.Tau1); err != nil {
		return secondOrderLag{}, err
	}
	if err := checkPositive("Tau2", p.Tau2); err != nil {
		return secondOrderLag{}, err
	}
	s := secondOrderLag{k: p.Gain, theta: p.DeadTime, t1: p.Tau1, t2: p.Tau2}
	if math.Abs(p.Tau1-p.Tau2) <= 1e-6*max(p.Tau1, p.Tau2) {
		s.kind = 1
		s.t1 = math.Sqrt(p.Tau1 * p.Tau2)
		s.t2 = s.t1
	}
	return s, nil
}

func (p SecondOrder) second() (secondOrderLag, error) {
	if err := checkFinite("Gain", p.Gain); err != nil {
		return secondOrderLag{}, err
	}
	if err := checkPositive("NaturalFrequency", p.NaturalFrequency); err != nil {
		return secondOrderLag{}, err
	}
	z, wn := p.Damping, p.NaturalFrequency
	if !(z >= 0) || math.IsInf(z, 0) {
		return secondOrderLag{}, setting("", "Damping", z, "must be finite and >= 0")
	}
	if z >= 1 {
		// Real time constants 1/(wn (zeta -+ sqrt(zeta^2 - 1))), the second
		// formed without cancellation from t1 t2 = 1/wn^2.
		q := math.Sqrt(z*z - 1)
		t1 := 1 / (wn * (z - q))
		return SOPDT{Gain: p.Gain, Tau1: t1, Tau2: 1 / (wn * wn * t1), DeadTime: p.DeadTime}.second()
	}
	q := math.Sqrt(1 - z*z)
	return secondOrderLag{kind: 2, k: p.Gain, theta: p.DeadTime, zw: z * wn, wd: wn * q, zr: z / q}, nil
}

// step returns the unit step response at t (step at 0).
func (s secondOrderLag) step(t float64) float64 {
	u := t - s.theta
	if !(u > 0) {
		return 0
	}
	switch s.kind {
	case 0:
		return s.k * (1 - (s.t1*math.Exp(-u/s.t1)-s.t2*math.Exp(-u/s.t2))/(s.t1-s.t2))
	case 1:
		return s.k * (1 - (1+u/s.t1)*math.Exp(-u/s.t1))
	default:
		return s.k * (1 - math.Exp(-s.zw*u)*(math.Cos(s.wd*u)+s.zr*math.Sin(s.wd*u)))
	}
}

// discretize returns the exact ZOH equivalent: denominator from the
// sampled poles, numerator from the sampled step response Y_k = y(kT) by
// G(B) = (1 - B) Y(B), that is omega = delta (1 - B) Y truncated to the
// three terms a second-order lag with fractional dead time has.
func (s secondOrderLag) discretize(T float64) (Rational, error) {
	d, f, err := splitDelay(s.theta, T)
	if err != nil {
		return Rational{}, err
	}
	var den [3]float64
	den[0] = 1
	switch s.kind {
	case 0, 1:
		a1, a2 := math.Exp(-T/s.t1), math.Exp(-T/s.t2)
		if err := checkPole("time constant", s.t1, a1); err != nil {
			return Rational{}, err
		}
		if err := checkPole("time constant", s.t2, a2); err != nil {
			return Rational{}, err
		}
		den[1], den[2] = -(a1 + a2), a1*a2
	default:
		e := math.Exp(-s.zw * T)
		den[1], den[2] = -2*e*math.Cos(s.wd*T), e*e
	}
	// Sample times relative to the whole-sample part of the dead time, so
	// that the fractional part is handled exactly: Y at sample d+j is the
	// response j T - f T after the delayed step.
	shifted := s
	shifted.theta = f * T
	y := func(j int) float64 { return shifted.step(float64(j) * T) }
	dy := func(j int) float64 { return y(j) - y(j-1) }
	var num [3]float64
	for j := 0; j < 3; j++ {
		for i := 0; i <= j; i++ {
			num[j] += den[i] * dy(1+j-i)
		}
	}
	if f == 0 {
		num[2] = 0
	}
	return newRational(num[:], den[:], d+1)
}

// StepAt returns the continuous unit step response at time t (step at
// t = 0), in closed form (common practice):
// Gain (1 - (Tau1 e^{-u/Tau1} - Tau2 e^{-u/Tau2})/(Tau1 - Tau2)) with
// u = t - DeadTime > 0, Gain (1 - (1 + u/tau) e^{-u/tau}) for a double pole,
// and 0 for u <= 0. It returns NaN for invalid parameters (a non-finite
// Gain, a time constant that is not positive and finite, a DeadTime that
// is negative or not finite) and for t = NaN, as FOPDT.StepAt does.
func (p SOPDT) StepAt(t float64) float64 { return lagStepAt(p.second, t) }

// Discretize returns the exact zero-order-hold equivalent of p for the
// sample interval T, including a dead time that is not a whole number of
// samples: DeadTime = (d + f) T gives
//
//	G(B) = (w0 + w1 B + w2 B^2) / ((1 - a1 B)(1 - a2 B)) * B^(d+1),  a_i = e^{-T/Tau_i},
//
// with w2 = 0 when f = 0. The numerator is (1 - B) delta(B) Y(B) for the
// sampled step response Y, which a zero-order hold reproduces exactly at
// the sampling instants. Numerator coefficients carry an absolute
// rounding error of a few eps times |Gain|, which is relatively large
// only when T is much shorter than the time constants.
//
// It returns an *SettingError for a non-finite gain, a time constant or
// interval that is not positive and finite, a time constant so long
// against T that e^{-T/Tau_i} rounds to 1 (about 2^53 intervals), or a
// dead time that is negative or over MaxDelay-1 samples.
func (p SOPDT) Discretize(T float64) (Rational, error) {
	out, err := lagDiscretize(p.second, T)
	return out, composeErr("tf.SOPDT.Discretize", err)
}

// StepAt returns the continuous unit step response at time t (step at
// t = 0), in closed form (common practice); for Damping < 1, with
// u = t - DeadTime > 0 and wd = wn sqrt(1 - zeta^2),
// Gain (1 - e^{-zeta wn u} (cos(wd u) + zeta/sqrt(1-zeta^2) sin(wd u))).
// It returns NaN for invalid parameters (a non-finite Gain, a
// NaturalFrequency that is not positive and finite, a negative or
// non-finite Damping, a DeadTime that is negative or not finite) and for
// t = NaN, as FOPDT.StepAt does.
func (p SecondOrder) StepAt(t float64) float64 { return lagStepAt(p.second, t) }

// Discretize returns the exact zero-order-hold equivalent of p for the
// sample interval T, as SOPDT.Discretize does; for Damping < 1 the
// denominator is 1 - 2 e^{-zeta wn T} cos(wd T) B + e^{-2 zeta wn T} B^2.
// Its errors are those of SOPDT.Discretize, plus an *SettingError for a
// negative or non-finite Damping.
func (p SecondOrder) Discretize(T float64) (Rational, error) {
	out, err := lagDiscretize(p.second, T)
	return out, composeErr("tf.SecondOrder.Discretize", err)
}

// lagStepAt is StepAt of a second-order model whose closed form lag
// returns (SOPDT.second, SecondOrder.second): NaN for a model lag
// refuses, a dead time or t that stepArgsOK refuses.
func lagStepAt(lag func() (secondOrderLag, error), t float64) float64 {
	s, err := lag()
	if err != nil || !stepArgsOK(s.theta, t) {
		return math.NaN()
	}
	return s.step(t)
}

// lagDiscretize is Discretize of a second-order model whose closed form
// lag returns, without the Op.
func lagDiscretize(lag func() (secondOrderLag, error), T float64) (Rational, error) {
	s, err := lag()
	if err != nil {
		return Rational{}, err
	}
	return s.discretize(T)
}

// stepArgsOK reports whether a dead time theta (finite, >= 0, as
// Discretize requires) and a time t (not NaN) give a step response value.
func stepArgsOK(theta, t float64) bool {
	return theta >= 0 && !math.IsInf(theta, 0) && !math.IsNaN(t)
}

// splitDelay splits theta = (d + f) T, rounding f within 1e-12 of 0
// or 1 to the whole sample.
func splitDelay(theta, T float64) (d int, f float64, err error) {
	if err := checkPositive("interval", T); err != nil {
		return 0, 0, err
	}
	if !(theta >= 0) || math.IsInf(theta, 0) {
		return 0, 0, setting("", "DeadTime", theta, "must be finite and >= 0")
	}
	x := theta / T
	if x > MaxDelay-1 {
		return 0, 0, setting("", "DeadTime", theta, "must be at most MaxDelay-1 samples")
	}
	fl := math.Floor(x)
	f = x - fl
	d = int(fl)
	switch {
	case f < 1e-12:
		f = 0
	case f > 1-1e-12:
		f = 0
		d++
	}
	return d, f, nil
}

// checkPole rejects a time constant tau so long against the sample
// interval that its sampled pole a = e^{-T/tau} rounds to 1: the term
// would come out as an integrator with the gain lost.
func checkPole(name string, tau, a float64) error {
	if a == 1 {
		return setting("", name, tau, "must be under 2^53 sample intervals (the sampled pole e^{-T/tau} rounds to 1)")
	}
	return nil
}

func checkFinite(name string, v float64) error {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return setting("", name, v, "must be finite")
	}
	return nil
}

func checkPositive(name string, v float64) error {
	if !(v > 0) || math.IsInf(v, 0) {
		return setting("", name, v, "must be positive and finite")
	}
	return nil
}

// AsSecondOrder converts a discrete second-order term back to the
// continuous second-order-plus-dead-time model whose zero-order-hold
// equivalent for the interval T it is (the inverse of
// SecondOrder.Discretize and SOPDT.Discretize). The term must have a
// denominator of degree 2 with stable poles that are real in (0, 1) or a
// complex pair, a numerator of at most three coefficients (leading zero
// coefficients counting as dead time) and dead time b >= 1.
//
// The poles give the continuous poles s = ln(z)/T, hence NaturalFrequency
// and Damping (Damping >= 1 for two real poles; their time constants are
// 1/(wn (zeta -+ sqrt(zeta^2 - 1)))); the gain is Gain(). The fractional
// part f of the dead time DeadTime = (b - 1 + f) T is the one for which
// the first numerator coefficient equals the continuous unit step
// response at (1 - f) T, times the gain (found by bisection; the response
// rises monotonically there when T is below half the damped period).
// For an exact image the other numerator coefficients then agree too; for
// a fitted term they need not, and mismatch returns the relative
// difference |w - w(model)| / |w| of the numerator coefficients, so that
// callers can judge how well the continuous model describes the term.
//
// It returns an *SettingError when the term is not of this form, when the
// first coefficient lies outside what a fractional dead time produces (by
// more than 1e-9 relative; it is clamped otherwise), or when T is not
// positive and finite or not below half the damped period.
func (r Rational) AsSecondOrder(T float64) (p SecondOrder, mismatch float64, err error) {
	p, mismatch, err = r.asSecondOrder(T)
	return p, mismatch, composeErr("tf.Rational.AsSecondOrder", err)
}

func (r Rational) asSecondOrder(T float64) (p SecondOrder, mismatch float64, err error) {
	if err := checkPositive("interval", T); err != nil {
		return SecondOrder{}, 0, err
	}
	num, den, b := r.delayedCoefs()
	if len(den) != 3 {
		return SecondOrder{}, 0, &ModelError{Part: "term denominator degree", Problem: "is " + formatNum(float64(len(den)-1)) + ": must be 2 for a second-order term"}
	}
	if len(num) > 3 {
		return SecondOrder{}, 0, &ModelError{Part: "term numerator degree", Problem: "is " + formatNum(float64(len(num)-1)) + ": must be at most 2 for a second-order term"}
	}
	if b < 1 {
		return SecondOrder{}, 0, &ModelError{Part: "term dead time", Problem: "is " + formatNum(float64(b)) + ": must be >= 1 sample for a zero-order-hold image (the hold adds one)"}
	}
	poles := r.Poles()
	if len(poles) != 2 {
		return SecondOrder{}, 0, &ModelError{Part: "term poles", Problem: "has " + strconv.Itoa(len(poles)) + ": a second-order term needs two"}
	}
	wn, zeta, err := secondOrderFromPoles(poles[0], poles[1], T)
	if err != nil {
		return SecondOrder{}, 0, err
	}
	k, err := r.gain()
	if err != nil {
		return SecondOrder{}, 0, err
	}
	if k == 0 {
		return SecondOrder{}, 0, &ModelError{Part: "term gain", Problem: "is 0: must be non-zero"}
	}
	unit := SecondOrder{Gain: 1, NaturalFrequency: wn, Damping: zeta}
	s, err := unit.second()
	if err != nil {
		return SecondOrder{}, 0, err
	}
	if s.kind == 2 && !(s.wd*T < math.Pi) {
		return SecondOrder{}, 0, setting("", "interval", T, "must be below half the damped period")
	}
	w0 := num[0] / k
	top := s.step(T)
	const slack = 1e-9
	if w0 < -slack*top || w0 > top*(1+slack) {
		return SecondOrder{}, 0, &ModelError{Part: "term first numerator coefficient / gain", Problem: "is " + formatNum(w0) +
			": must lie in [0, " + formatNum(top) + "] (the unit step response after one interval) for a fractional dead time"}
	}
	f := fractionOfInterval(s, w0, T)
	p = SecondOrder{Gain: k, NaturalFrequency: wn, Damping: zeta, DeadTime: (float64(b-1) + f) * T}
	img, err := p.Discretize(T)
	if err != nil {
		return SecondOrder{}, 0, err
	}
	return p, numeratorMismatch(img, b, num), nil
}

// secondOrderFromPoles returns the natural frequency and damping of the
// continuous second-order system whose zero-order-hold image at interval
// T has the poles z1 and z2 (real in (0, 1), or a complex pair inside
// the unit circle below half the damped period).
func secondOrderFromPoles(z1, z2 complex128, T float64) (wn, zeta float64, err error) {
	if imag(z1) == 0 {
		a1, a2 := real(z1), real(z2)
		if !(a1 > 0 && a1 < 1 && a2 > 0 && a2 < 1) {
			return 0, 0, &ModelError{Part: "term pole", Problem: "is " + formatNum(math.Min(a1, a2)) + ": real poles must lie in (0, 1)"}
		}
		t1, t2 := -T/math.Log(a1), -T/math.Log(a2)
		wn = 1 / math.Sqrt(t1*t2)
		zeta = (t1 + t2) / (2 * math.Sqrt(t1*t2))
	} else {
		m := math.Hypot(real(z1), imag(z1))
		if !(m < 1) {
			return 0, 0, &ModelError{Part: "term pole magnitude", Problem: "is " + formatNum(m) + ": must be below 1"}
		}
		// s = ln(z)/T = (ln|z| + i arg z)/T.
		re, im := math.Log(m)/T, math.Abs(math.Atan2(imag(z1), real(z1)))/T
		wn = math.Hypot(re, im)
		zeta = -re / wn
		if !(im*T < math.Pi) {
			return 0, 0, setting("", "interval", T, "must be below half the damped period")
		}
	}
	return wn, zeta, nil
}

// fractionOfInterval returns the fraction f in [0, 1] of an interval T
// by which the unit step response s, delayed by f T, equals w0 after one
// interval (bisection: step((1-f)T) decreases from its value at T to 0),
// 0 below 1e-12.
func fractionOfInterval(s secondOrderLag, w0, T float64) float64 {
	// Bisection on f in [0, 1]: step((1-f)T) decreases from top to 0.
	lo, hi := 0.0, 1.0
	for it := 0; it < 200 && hi-lo > 1e-15; it++ {
		mid := 0.5 * (lo + hi)
		if s.step((1-mid)*T) > w0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	f := 0.5 * (lo + hi)
	if f < 1e-12 {
		return 0
	}
	return f
}

// numeratorMismatch returns the relative distance between the
// numerator of img and num (with dead time b), aligned on the same total
// delay.
func numeratorMismatch(img Rational, b int, num []float64) float64 {
	// Compare numerators aligned on the same total delay.
	got := make([]float64, 4)
	want := make([]float64, 4)
	gn, _ := img.coefs()
	for j, v := range gn {
		if i := img.delay - b + j; i >= 0 && i < 4 {
			got[i] = v
		}
	}
	copy(want, num)
	d, nw := 0.0, 0.0
	for i := range want {
		d += (got[i] - want[i]) * (got[i] - want[i])
		nw += want[i] * want[i]
	}
	return math.Sqrt(d / nw)
}
