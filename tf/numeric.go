package tf

import "strconv"

// Numeric views of the symbolic model: the polynomials of a Model or an
// Input expanded to coefficients in ascending powers of B, every
// coefficient at its Value (a free coefficient at its start value or
// estimate).

// Rational returns the transfer function of the input term,
//
//	Num(B) / Den(B) * B^Delay,
//
// with every coefficient at its Value. The input's differencing is not
// part of it: the term acts on the differenced series Diff(B) x_t (see
// DiffCoeffs). It returns a *ModelError for a polynomial that
// Model.Validate refuses (a factor power below 1, a negative power of B,
// a degree above MaxDegree), and NewRational's errors (*CoefError for a
// NaN or infinite value or a denominator whose constant term is zero;
// *DelayError for a dead time outside 0..MaxDelay). The effect of the
// input on the output itself, the plant for control, is Model.Path,
// which also multiplies by the input's differencing and divides by the
// output's.
func (in Input) Rational() (Rational, error) {
	r, err := in.rational()
	return r, composeErr("tf.Input.Rational", err)
}

// rational is Rational with errors carrying no Op.
func (in Input) rational() (Rational, error) {
	part := "input " + strconv.Quote(in.Series)
	if err := modelCheckPoly(in.Num, part+" numerator"); err != nil {
		return Rational{}, err
	}
	if err := modelCheckPoly(in.Den, part+" denominator"); err != nil {
		return Rational{}, err
	}
	return newRational(in.Num.Coeffs(), in.Den.Coeffs(), in.Delay)
}

// DiffCoeffs returns the expanded differencing of the input series,
// {1} when it is not differenced; for example {1, -1} for (1 - B). The
// polynomial must be one that Model.Validate accepts: a factor power
// below 0 or a negative power of B is a programmer error and panics.
func (in Input) DiffCoeffs() []float64 { return in.Diff.Coeffs() }

// DiffCoeffs returns the expanded differencing D(B) of the output, {1}
// when it is not differenced; for example {1, -2, 1} for (1 - B)^2. As
// for Input.DiffCoeffs, the polynomial must be one that Model.Validate
// accepts.
func (m Model) DiffCoeffs() []float64 { return m.Diff.Coeffs() }

// ConstValue returns the value of the constant c, 0 when the model has
// none.
func (m Model) ConstValue() float64 {
	if m.Const == nil {
		return 0
	}
	return m.Const.Value
}

// NoiseCoeffs returns the expanded noise polynomials theta(B) (ma) and
// phi(B) (ar), each with constant term 1 as written, and ok = true; for
// a noise-free model (Noise nil) it returns nil, nil, false. White noise
// gives {1}, {1}. The polynomials must be ones that Model.Validate
// accepts (a negative power panics).
func (m Model) NoiseCoeffs() (ma, ar []float64, ok bool) {
	if m.Noise == nil {
		return nil, nil, false
	}
	return m.Noise.MA.Coeffs(), m.Noise.AR.Coeffs(), true
}

// NoiseRational returns the noise filter theta(B) / phi(B) (dead time
// 0) as a Rational, for its psi weights (Impulse), poles (the AR roots
// in the z-plane) and stationarity (Stable). A noise-free model (Noise
// nil) gives the zero Rational. Errors: a *ModelError for a polynomial
// that Model.Validate refuses, and NewRational's.
func (m Model) NoiseRational() (Rational, error) {
	r, err := m.noiseRational()
	return r, composeErr("tf.Model.NoiseRational", err)
}

// noiseRational is NoiseRational with errors carrying no Op.
func (m Model) noiseRational() (Rational, error) {
	if m.Noise == nil {
		return Rational{}, nil
	}
	if err := modelCheckPoly(m.Noise.MA, "noise MA"); err != nil {
		return Rational{}, err
	}
	if err := modelCheckPoly(m.Noise.AR, "noise AR"); err != nil {
		return Rational{}, err
	}
	return newRational(m.Noise.MA.Coeffs(), m.Noise.AR.Coeffs(), 0)
}

// Params returns the named coefficients of m, one per name in order of
// first use (constant, then each input's numerator and denominator, then
// the noise's MA and AR polynomials), as found at that first use.
// Differencing holds no names.
func (m Model) Params() []Coef {
	var out []Coef
	seen := map[string]bool{}
	add := func(c *Coef) {
		if c.Name != "" && !seen[c.Name] {
			seen[c.Name] = true
			out = append(out, *c)
		}
	}
	m.eachCoefCopy(add)
	return out
}

// EachParam calls fn with a pointer to every coefficient of m that
// can be a parameter (named ones, and the numbers written in the spec,
// whose Name is empty), in written order: the constant, then each input's
// numerator and denominator, then the noise's MA and AR polynomials.
// Differencing polynomials are not visited: they hold fixed numbers. The
// order is that of Params and of a printed spec's where-list. The
// pointers are into m's own polynomials, which m shares with every copy
// of it that is not a Clone: to change coefficients, call EachParam on
// a Clone.
func (m Model) EachParam(fn func(c *Coef)) {
	if m.Const != nil {
		fn(m.Const)
	}
	for _, in := range m.Inputs {
		in.Num.Each(fn)
		in.Den.Each(fn)
	}
	if m.Noise != nil {
		m.Noise.MA.Each(fn)
		m.Noise.AR.Each(fn)
	}
}

// eachCoefCopy calls fn with a copy of every coefficient EachParam
// visits, in the same order, so that fn cannot change m.
func (m Model) eachCoefCopy(fn func(c *Coef)) {
	m.EachParam(func(c *Coef) {
		cp := *c
		fn(&cp)
	})
}

// clockUnits and calendarUnits are the units of a sample interval: the
// clock units with their length in seconds, the calendar units with
// theirs in months. Seconds, Months, Calendar and ValidUnit read them.
var (
	clockUnits    = map[string]float64{"s": 1, "min": 60, "h": 3600, "d": 86400, "wk": 7 * 86400}
	calendarUnits = map[string]float64{"mo": 1, "qtr": 3, "yr": 12}
)

// Seconds returns the sample interval in seconds (units s = 1 s, min =
// 60 s, h = 3600 s, d = 86400 s, wk = 604800 s) and ok = true, or 0 and
// false for the zero Interval, an unknown unit and a calendar unit (mo,
// qtr, yr: a month is 28 to 31 days, not a fixed number of seconds; see
// Interval).
func (iv Interval) Seconds() (float64, bool) {
	f, ok := clockUnits[iv.Unit]
	if !ok {
		return 0, false
	}
	return iv.Value * f, true
}

// Months returns the sample interval in months for a calendar unit (mo =
// 1, qtr = 3, yr = 12) and ok = true, or 0 and false for a clock unit,
// an unknown unit or the zero Interval.
func (iv Interval) Months() (float64, bool) {
	f, ok := calendarUnits[iv.Unit]
	if !ok {
		return 0, false
	}
	return iv.Value * f, true
}

// Calendar reports whether the unit is a calendar unit (mo, qtr, yr),
// whose length in seconds varies.
func (iv Interval) Calendar() bool { _, ok := iv.Months(); return ok }

// ValidUnit reports whether u is a unit of a sample interval: one of the
// clock units "s", "min", "h", "d", "wk" or the calendar units "mo",
// "qtr", "yr".
func ValidUnit(u string) bool {
	_, clock := clockUnits[u]
	_, calendar := calendarUnits[u]
	return clock || calendar
}
