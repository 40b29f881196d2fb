package tf

import (
	"math"
	"strconv"
	"strings"
)

// String returns m as canonical spec text, on one line, which package
// parse reads back to a model equal to m (Model.Equal):
//
//	(1 - B) temp = 21.5 + (w0 + w1 B) / (1 - d1 B) B^4 burner + (1 - theta1 B) a; where w0 ~ 0.5, d1 = 0.8; every 30 s
//
// The layout: the output's differencing factors and name, '=', the
// constant, the input terms in order (numerator factors, '/' and each
// denominator factor, B^k for the dead time, then the series, written
// ((1 - B) x) when the input is differenced, or the event, written as
// Event.String() prints it, step(120) or pulse(2026-03-01T08:00)), the noise term
// theta(B) / phi(B) a (a alone for white noise, nothing when Noise is
// nil; AR(p), MA(q) or ARMA(p, q) when the noise is written exactly as
// that shorthand expands), then a where clause with every named coefficient that is held
// (name = value) or free with a non-zero start value (name ~ value), in
// order of first use, and the sample interval.
//
// Numbers print in the shortest form that reads back to the same float64
// (strconv 'g', precision -1). The text is exact for models as package
// parse builds them; for a model built in code it assumes that each name
// has one value and one freedom wherever it is used (the first use is
// printed), that unnamed coefficients are fixed and that values are
// finite; a negative unnamed value prints with its sign folded into the
// term's sign. A model that is not valid (one that parse.Check rejects,
// such as the zero Model, which has no output name and no input) prints
// as text that does not parse back.
func (m Model) String() string {
	var b strings.Builder
	b.Grow(96 + 64*len(m.Inputs))
	m.writeSpec(&b)
	return b.String()
}

// writeSpec writes m as spec text (see String).
func (m Model) writeSpec(b *strings.Builder) {
	if !m.Diff.IsOne() {
		writePoly(b, m.Diff)
		b.WriteByte(' ')
	}
	b.WriteString(m.Output)
	b.WriteString(" =")
	first := true
	sep := func() {
		if first {
			b.WriteByte(' ')
			first = false
		} else {
			b.WriteString(" + ")
		}
	}
	if m.Const != nil {
		sep()
		if m.Const.Name != "" {
			b.WriteString(m.Const.Name)
		} else {
			writeNum(b, m.Const.Value)
		}
	}
	for _, in := range m.Inputs {
		sep()
		in.writeSpec(b)
	}
	if m.Noise != nil {
		sep()
		m.writeNoise(b)
	}
	m.writeWhere(b)
	m.writeInterval(b)
}

// writeNoise writes the noise term: white noise, the AR(p), MA(q) or
// ARMA(p, q) shorthand when the polynomials are as it expands, else the
// polynomials over a.
func (m Model) writeNoise(b *strings.Builder) {
	p, okAR := shorthandOrder(m.Noise.AR, "phi")
	q, okMA := shorthandOrder(m.Noise.MA, "theta")
	switch {
	case m.Noise.IsWhite():
	case okAR && okMA:
		switch {
		case q == 0:
			b.WriteString("AR(" + strconv.Itoa(p) + ")")
		case p == 0:
			b.WriteString("MA(" + strconv.Itoa(q) + ")")
		default:
			b.WriteString("ARMA(" + strconv.Itoa(p) + ", " + strconv.Itoa(q) + ")")
		}
		return
	case m.Noise.MA.IsOne():
		b.WriteString("1 ")
	default:
		writePoly(b, m.Noise.MA)
		b.WriteByte(' ')
	}
	for _, f := range m.Noise.AR.Factors {
		b.WriteString("/ ")
		writeFactor(b, f)
		b.WriteByte(' ')
	}
	b.WriteByte('a')
}

// writeInterval writes the sample interval clause, when m has one.
func (m Model) writeInterval(b *strings.Builder) {
	if m.Interval != (Interval{}) {
		b.WriteString("; every ")
		b.WriteString(m.Interval.String())
	}
}

// shorthandOrder reports whether p is written as the AR(p) or MA(q)
// shorthand expands: no factors (order 0), or the one factor
// (1 - name1 B - ... - namek B^k) with the names in order.
func shorthandOrder(p Poly, name string) (int, bool) {
	if p.IsOne() {
		return 0, true
	}
	if len(p.Factors) != 1 || p.Factors[0].Exp != 1 {
		return 0, false
	}
	ts := p.Factors[0].Terms
	if len(ts) < 2 || ts[0].Neg || ts[0].Power != 0 || ts[0].Coef.Name != "" || ts[0].Coef.Value != 1 {
		return 0, false
	}
	for k, t := range ts[1:] {
		if !t.Neg || t.Power != k+1 || t.Coef.Name != name+strconv.Itoa(k+1) {
			return 0, false
		}
	}
	return len(ts) - 1, true
}

// writeWhere writes the where clause: each name once, at its first use,
// when it is held or has a non-zero start value.
func (m Model) writeWhere(b *strings.Builder) {
	var seen nameSet
	n := 0
	fn := func(c *Coef) {
		if c.Name == "" || !seen.add(c.Name) {
			return
		}
		if c.Free && c.Value == 0 {
			return
		}
		if n == 0 {
			b.WriteString("; where ")
		} else {
			b.WriteString(", ")
		}
		n++
		b.WriteString(c.Name)
		if c.Free {
			b.WriteString(" ~ ")
		} else {
			b.WriteString(" = ")
		}
		writeNum(b, c.Value)
	}
	m.eachCoefCopy(fn)
}

// nameSet is the set of names writeWhere has seen: a small array for the
// usual model, a map beyond.
type nameSet struct {
	small [16]string
	n     int
	many  map[string]struct{}
}

// add adds name and reports whether it was new.
func (s *nameSet) add(name string) bool {
	if s.many != nil {
		if _, ok := s.many[name]; ok {
			return false
		}
		s.many[name] = struct{}{}
		return true
	}
	for _, v := range s.small[:s.n] {
		if v == name {
			return false
		}
	}
	if s.n < len(s.small) {
		s.small[s.n] = name
		s.n++
		return true
	}
	s.many = make(map[string]struct{}, 2*len(s.small))
	for _, v := range s.small[:s.n] {
		s.many[v] = struct{}{}
	}
	s.many[name] = struct{}{}
	return true
}

// String returns the input term as spec text, such as
// "(w0 + w1 B) / (1 - d1 B) B^4 burner", "1 ((1 - B) feed)" or, for an
// event, "k / (1 - d1 B) step(120)".
func (in Input) String() string {
	var b strings.Builder
	in.writeSpec(&b)
	return b.String()
}

// writeSpec writes the input term as spec text (see String).
func (in Input) writeSpec(b *strings.Builder) {
	n := 0
	for _, f := range in.Num.Factors {
		if n > 0 {
			b.WriteByte(' ')
		}
		writeNumFactor(b, f)
		n++
	}
	for _, f := range in.Den.Factors {
		if n > 0 {
			b.WriteByte(' ')
		} else {
			b.WriteString("1 ")
		}
		b.WriteString("/ ")
		writeFactor(b, f)
		n++
	}
	if in.Delay != 0 {
		// A negative dead time (refused by Model.Validate) prints as
		// written, B^-1, so that the text shows the fault instead of
		// dropping it; parse refuses it when read back.
		if n > 0 {
			b.WriteByte(' ')
		}
		b.WriteByte('B')
		if in.Delay != 1 {
			b.WriteByte('^')
			b.WriteString(strconv.Itoa(in.Delay))
		}
		n++
	}
	if n == 0 && in.Diff.IsOne() {
		// A lone name reads as the constant: give the unit gain.
		b.WriteString("1")
		n++
	}
	if n > 0 {
		b.WriteByte(' ')
	}
	if in.Event != nil {
		// An event prints as its text whatever Series holds (Validate
		// refuses a mismatch), and a differencing is refused, not
		// printed.
		b.WriteString(in.Event.String())
		return
	}
	if in.Diff.IsOne() {
		b.WriteString(in.Series)
		return
	}
	b.WriteByte('(')
	writePoly(b, in.Diff)
	b.WriteByte(' ')
	b.WriteString(in.Series)
	b.WriteByte(')')
}

// String returns the interval as spec text, such as "30 s", or "" for the
// zero Interval.
func (iv Interval) String() string {
	if iv == (Interval{}) {
		return ""
	}
	return strconv.FormatFloat(iv.Value, 'g', -1, 64) + " " + iv.Unit
}

// FormatPoly returns p as spec text: its factors side by side, each in
// parentheses with its power, such as "(1 - p1 B)(1 - P1 B^12)" or
// "(1 - B)^2"; the constant 1 (no factors) prints as "1".
func FormatPoly(p Poly) string {
	if p.IsOne() {
		return "1"
	}
	var b strings.Builder
	writePoly(&b, p)
	return b.String()
}

// writePoly writes the factors of p in parentheses, one after another.
func writePoly(b *strings.Builder, p Poly) {
	for _, f := range p.Factors {
		writeFactor(b, f)
	}
}

// writeNumFactor writes a numerator factor: a lone coefficient without
// parentheses when that reads back the same (a name, or a number other
// than 1, with no sign and power 1), else in parentheses.
func writeNumFactor(b *strings.Builder, f Factor) {
	if f.Exp == 1 && len(f.Terms) == 1 {
		t := f.Terms[0]
		c := t.Coef
		if t.Power == 0 && !t.Neg && (c.Name != "" || (c.Value != 1 && c.Value >= 0 && !math.Signbit(c.Value))) {
			if c.Name != "" {
				b.WriteString(c.Name)
			} else {
				writeNum(b, c.Value)
			}
			return
		}
	}
	writeFactor(b, f)
}

// writeFactor writes one factor in parentheses, with its power.
func writeFactor(b *strings.Builder, f Factor) {
	b.WriteByte('(')
	for i, t := range f.Terms {
		neg := t.Neg
		c := t.Coef
		v := c.Value
		if c.Name == "" && math.Signbit(v) {
			neg, v = !neg, -v
		}
		switch {
		case i == 0 && neg:
			b.WriteByte('-')
		case i > 0 && neg:
			b.WriteString(" - ")
		case i > 0:
			b.WriteString(" + ")
		}
		coef := true
		if c.Name != "" {
			b.WriteString(c.Name)
		} else if v == 1 && t.Power > 0 {
			coef = false
		} else {
			writeNum(b, v)
		}
		if t.Power > 0 {
			if coef {
				b.WriteByte(' ')
			}
			b.WriteByte('B')
			if t.Power > 1 {
				b.WriteByte('^')
				b.WriteString(strconv.Itoa(t.Power))
			}
		}
	}
	b.WriteByte(')')
	if f.Exp > 1 {
		b.WriteByte('^')
		b.WriteString(strconv.Itoa(f.Exp))
	}
}

// writeNum writes v in the shortest form that reads back exactly.
func writeNum(b *strings.Builder, v float64) {
	var buf [32]byte
	b.Write(strconv.AppendFloat(buf[:0], v, 'g', -1, 64))
}

// Held returns a copy of m (sharing nothing with it) in which every free
// coefficient is held at its Value: a fitted model, whose free
// coefficients carry the estimates, prints as "name = estimate" instead of
// "name ~ estimate", the form a configuration file or a simulation wants,
// where the model is to be used as it is rather than fitted again. Parsed
// back (package parse) it equals Held's result; fitting it again leaves
// every coefficient where it is.
func (m Model) Held() Model {
	h := m.Clone()
	if h.Const != nil {
		h.Const.Free = false
	}
	for i := range h.Inputs {
		holdPoly(h.Inputs[i].Num)
		holdPoly(h.Inputs[i].Den)
		holdPoly(h.Inputs[i].Diff)
	}
	holdPoly(h.Diff)
	if h.Noise != nil {
		holdPoly(h.Noise.MA)
		holdPoly(h.Noise.AR)
	}
	return h
}

// holdPoly marks every coefficient of p (a clone's own) as held.
func holdPoly(p Poly) {
	for _, f := range p.Factors {
		for k := range f.Terms {
			f.Terms[k].Coef.Free = false
		}
	}
}
