package control

import (
	"fmt"
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// Form is the way the three actions of a PID controller are combined.
type Form string

// The forms of PID.
const (
	// Parallel is the ideal (non-interacting) form
	//
	//	C(s) = Kc (1 + 1/(Ti s) + Td s/(a Td s + 1)),
	//
	// the derivative filtered by a first-order lag of time constant a Td.
	Parallel Form = "parallel"
	// Series is the interacting (cascade) form
	//
	//	C(s) = Kc (Ti s + 1)/(Ti s) (Td s + 1)/(a Td s + 1),
	//
	// the form in which SIMC states its PID settings.
	Series Form = "series"
)

// Method is the rule that turns a continuous controller into a discrete
// one for the sample interval T, by substituting for s a function of the
// backshift operator B.
type Method string

// The discretisation methods.
const (
	// BackwardDifference substitutes s = (1 - B)/T. Every stable
	// continuous pole maps inside the unit circle on the positive real
	// axis, so a derivative filter never rings; the integral is a running
	// sum of the error (common practice for process controllers).
	BackwardDifference Method = "backward difference"
	// Tustin substitutes s = (2/T)(1 - B)/(1 + B), the bilinear
	// transform; it keeps the frequency response closest to the
	// continuous one below the Nyquist frequency, but a derivative filter
	// whose time constant is below T/2 gives a pole on the negative real
	// axis (a controller output that alternates in sign each sample);
	// Tune notes such a pole beyond RingingPole in Tuning.Notes.
	Tustin Method = "Tustin"
)

// DefaultFilter is the derivative filter fraction a used when PID.Filter
// is 0: the filter time constant is a Td = Td/10 (a derivative gain
// limited to 10, common practice).
const DefaultFilter = 0.1

// PID holds the continuous parameters of a PI or PID controller, in the
// time unit of the plant model's sample interval (minutes for an interval
// of "1 min"). The controller acts on the control error e = r - y (set
// point minus measurement), all three actions included: a set-point step
// passes through the proportional and derivative actions.
type PID struct {
	// Form is Parallel or Series; the empty Form means Parallel.
	Form Form
	// Gain is the controller gain Kc, in units of the plant input per
	// unit of the plant output. Its sign must make the loop negative
	// feedback (the sign of the plant gain).
	Gain float64
	// Integral is the integral (reset) time Ti; 0 means no integral
	// action (a P or PD controller).
	Integral float64
	// Derivative is the derivative time Td; 0 means no derivative action.
	Derivative float64
	// Filter is the derivative filter fraction a, the filter time
	// constant being a Td; 0 means DefaultFilter. It must lie in (0, 1].
	Filter float64
}

// Validate checks the parameters: a finite non-zero Gain, finite
// non-negative times, a Filter in [0, 1] (0 for the default) and a known
// Form. It returns a *SettingError naming the field ("PID.Integral"), or
// nil.
func (c PID) Validate() error { return c.validate("control.PID.Validate") }

func (c PID) validate(op string) error {
	if c.Form != "" && c.Form != Parallel && c.Form != Series {
		return &SettingError{Op: op, Setting: "PID.Form", Value: strconv.Quote(string(c.Form)), Rule: `must be "parallel" or "series" (empty: parallel)`}
	}
	if c.Gain == 0 || math.IsNaN(c.Gain) || math.IsInf(c.Gain, 0) {
		return fsetting(op, "PID.Gain", c.Gain, "must be a finite non-zero number (its sign that of the plant gain)")
	}
	if err := errs.NonNegative(op, "PID.Integral", c.Integral, "0: no integral action"); err != nil {
		return err
	}
	if err := errs.NonNegative(op, "PID.Derivative", c.Derivative, "0: no derivative action"); err != nil {
		return err
	}
	return checkFilter(op, "PID.Filter", c.Filter)
}

// checkFilter checks a derivative filter fraction (PID.Filter,
// TuneSettings.Filter): in (0, 1], or 0 for DefaultFilter.
func checkFilter(op, field string, a float64) error {
	if !(a >= 0 && a <= 1) {
		return fsetting(op, field, a, "must lie in (0, 1], or be 0 for the default 0.1")
	}
	return nil
}

// check checks a discretisation method (TuneSettings.Method, the
// argument of PID.Discrete): empty for BackwardDifference, or Tustin.
func (m Method) check(op, field string) error {
	if m != "" && m != BackwardDifference && m != Tustin {
		return &SettingError{Op: op, Setting: field, Value: strconv.Quote(string(m)), Rule: `must be "backward difference" (the default) or "Tustin"`}
	}
	return nil
}

// fsetting returns a *SettingError for a float field.
func fsetting(op, field string, v float64, rule string) *SettingError {
	return &SettingError{Op: op, Setting: field, Value: strconv.FormatFloat(v, 'g', -1, 64), Rule: rule}
}

// form returns the Form with its default.
func (c PID) form() Form {
	if c.Form == "" {
		return Parallel
	}
	return c.Form
}

// filter returns the derivative filter fraction with its default.
func (c PID) filter() float64 {
	if c.Filter == 0 {
		return DefaultFilter
	}
	return c.Filter
}

// sPoly returns the continuous controller as num(s)/den(s), ascending
// powers of s.
func (c PID) sPoly() (num, den []float64) {
	a := c.filter()
	k, ti, td := c.Gain, c.Integral, c.Derivative
	tfl := a * td
	d := []float64{1, tfl} // derivative filter (Tf s + 1); {1, 0} without D
	var n []float64
	if c.form() == Series {
		n = poly.Mul([]float64{1, td}, []float64{1, ti}) // (Td s + 1)(Ti s + 1)
	} else {
		// Ti s (Tf s + 1) + (Tf s + 1) + Ti Td s^2, or without I:
		// (Tf s + 1) + Td s, written over (Tf s + 1).
		n = []float64{1, ti + tfl, ti*tfl + ti*td}
		if ti == 0 {
			n = []float64{1, tfl + td}
		}
	}
	if ti > 0 {
		d = poly.Mul(d, []float64{0, ti})
	}
	return poly.Scale(k, n), d
}

// Discrete returns the controller as a discrete transfer function
// u_t = C(B) e_t for the sample interval T (in the time unit of the
// parameters), by the method m (the empty Method means
// BackwardDifference). The continuous controller num(s)/den(s) becomes
// num(f(B))/den(f(B)) with s = f(B) as the method states, multiplied out
// over the common denominator; the result has no dead time.
//
// It returns a *SettingError for bad parameters (see Validate), an
// interval that is not positive and finite, or an unknown method.
func (c PID) Discrete(T float64, m Method) (tf.Rational, error) {
	const op = "control.PID.Discrete"
	if err := c.validate(op); err != nil {
		return tf.Rational{}, err
	}
	if !(T > 0) || math.IsInf(T, 0) {
		return tf.Rational{}, fsetting(op, "T", T, "the sample interval must be positive and finite")
	}
	num, den := c.sPoly()
	return substitute(op, num, den, T, m)
}

// substitute returns num(f(B))/den(f(B)) for s = f(B) = p(B)/q(B) of the
// method: both multiplied by q^n, n the larger degree,
//
//	sum_k c_k p^k q^(n-k).
func substitute(op string, num, den []float64, T float64, m Method) (tf.Rational, error) {
	if err := m.check(op, "Method"); err != nil {
		return tf.Rational{}, err
	}
	p, q := []float64{1 / T, -1 / T}, []float64{1} // backward difference
	if m == Tustin {
		p, q = []float64{2 / T, -2 / T}, []float64{1, 1}
	}
	num, den = trim(num), trim(den)
	n := max(len(num), len(den)) - 1
	sub := func(c []float64) []float64 {
		out := []float64{0}
		for k, ck := range c {
			out = poly.Add(out, poly.Scale(ck, poly.Mul(poly.Pow(p, k), poly.Pow(q, n-k))))
		}
		return out
	}
	r, err := tf.NewRational(sub(num), sub(den), 0)
	if err != nil {
		return tf.Rational{}, &ModelError{Op: op, Part: "discrete controller", Problem: "cannot be formed: " + err.Error(), Err: err}
	}
	return r, nil
}

// trim drops exact zeros at the high-power end, keeping one coefficient.
func trim(c []float64) []float64 {
	n := len(c)
	for n > 1 && c[n-1] == 0 {
		n--
	}
	return c[:n]
}

// String prints the parameters with the form, such as
// "PI (parallel): Kc = 2.5, Ti = 8".
func (c PID) String() string {
	kind := "P"
	if c.Integral > 0 {
		kind += "I"
	}
	if c.Derivative > 0 {
		kind += "D"
	}
	s := fmt.Sprintf("%s (%s): Kc = %.4g", kind, c.form(), c.Gain)
	if c.Integral > 0 {
		s += fmt.Sprintf(", Ti = %.4g", c.Integral)
	}
	if c.Derivative > 0 {
		s += fmt.Sprintf(", Td = %.4g, filter %.4g Td", c.Derivative, c.filter())
	}
	return s
}
