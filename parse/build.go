package parse

import (
	"errors"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/alecthomas/participle/v2/lexer"
	"github.com/backshift/backshift/tf"
)

// builder turns the syntax tree into a tf.Model, checking what the
// grammar cannot say (the meaning of the spec: names, limits, constant
// terms, free and held coefficients) and collecting errors with their
// positions.
type builder struct {
	src    string
	errs   ErrorList
	m      tf.Model
	coefs  map[string]tf.Pos // first use of each coefficient name
	series map[string]tf.Pos // output and inputs
	noise  bool
	deg    map[*tf.Poly]int // degree so far of each polynomial being built
}

func toPos(p lexer.Position) tf.Pos {
	return tf.Pos{Offset: p.Offset, Line: p.Line, Column: p.Column}
}

func (b *builder) fail(p lexer.Position, kind error, msg string) {
	b.failAt(toPos(p), kind, msg)
}

func (b *builder) failAt(p tf.Pos, kind error, msg string) {
	if len(b.errs) >= maxErrors {
		return
	}
	b.errs = append(b.errs, &Error{Pos: p, Msg: msg, Text: lineAt(b.src, p.Offset), Kind: kind})
}

// build converts the tree and runs the checks of the whole model.
func (b *builder) build(g *specText) {
	b.coefs = map[string]tf.Pos{}
	b.series = map[string]tf.Pos{}
	eq := &g.Eq
	b.m.Output = eq.Output.Value
	b.series[eq.Output.Value] = toPos(eq.Output.Pos)
	var diff tf.Poly
	for _, f := range eq.Diff {
		b.diffFactors(f, &diff, "output "+eq.Output.Value)
	}
	b.m.Diff = diff
	b.term(eq.First.Sign, eq.First.Pos, &eq.First.Term)
	for i := range eq.Rest {
		b.term(eq.Rest[i].Sign, eq.Rest[i].Pos, &eq.Rest[i].Term)
	}
	b.requireInput(eq.First.Pos)
	b.checkNames()
	b.clauses(g.Clauses)
}

// requireInput refuses a model without an input term; first is where
// the right-hand side starts.
func (b *builder) requireInput(first lexer.Position) {
	if len(b.m.Inputs) > 0 || len(b.errs) > 0 {
		return
	}
	if c := b.m.Const; c != nil && c.Name != "" {
		b.failAt(c.Pos, ErrModel, "the model has no input term: a lone name such as "+c.Name+
			" is the constant; write w0 "+c.Name+" (or 1 "+c.Name+" for unit gain) to make it an input")
		return
	}
	b.fail(first, ErrModel, "the model has no input term; write at least one, such as w0 B x")
}

// clauses applies the every clause (at most one) and the bindings of the
// where clauses.
func (b *builder) clauses(cs []clause) {
	var binds []binding
	everySeen := false
	for _, c := range cs {
		if c.Every != nil {
			if everySeen {
				b.fail(c.Pos, ErrModel, "the sample interval is given twice")
				continue
			}
			everySeen = true
			b.every(c.Every)
		}
		binds = append(binds, c.Where...)
	}
	b.bind(binds)
}

// every sets the sample interval.
func (b *builder) every(e *every) {
	v, ok := b.number(e.Val.Pos, e.Val.Num, e.Val.Neg)
	if !ok {
		return
	}
	if !(v > 0) {
		b.fail(e.Val.Pos, ErrModel, "the sample interval must be a positive number")
		return
	}
	if !validUnit(e.Unit.Value) {
		b.fail(e.Unit.Pos, ErrModel, "unknown unit "+strconv.Quote(clip(e.Unit.Value))+" for the sample interval; use "+unitList+unitHint(e.Unit.Value))
		return
	}
	b.m.Interval = tf.Interval{Value: v, Unit: e.Unit.Value}
}

// validUnit reports whether u is a unit of the sample interval: a clock
// unit (s, min, h, d, wk) or a calendar unit (mo, qtr, yr).
func validUnit(u string) bool { return tf.ValidUnit(u) }

// unitList lists the units for a message.
const unitList = "s, min, h, d, wk, mo, qtr or yr"

// unitAliases maps other spellings of the units, in lower case, to the
// unit to write.
var unitAliases = map[string]string{
	"sec": "s", "secs": "s", "second": "s", "seconds": "s",
	"m": "min", "mn": "min", "mins": "min", "minute": "min", "minutes": "min",
	"hr": "h", "hrs": "h", "hour": "h", "hours": "h",
	"day": "d", "days": "d",
	"w": "wk", "week": "wk", "weeks": "wk", "wks": "wk",
	"month": "mo", "months": "mo", "mon": "mo", "mth": "mo", "mths": "mo",
	"q": "qtr", "quarter": "qtr", "quarters": "qtr", "qtrs": "qtr",
	"y": "yr", "year": "yr", "years": "yr", "yrs": "yr",
}

// unitWords names each unit in words, for a hint.
var unitWords = map[string]string{"s": "seconds", "min": "minutes", "h": "hours", "d": "days",
	"wk": "weeks", "mo": "months", "qtr": "quarters", "yr": "years"}

// unitHint suggests the unit meant by an unknown unit u: " (for minutes
// write min)", or "" when none is near.
func unitHint(u string) string {
	l := strings.ToLower(u)
	if validUnit(l) {
		return " (units are written in lower case: " + l + ")"
	}
	if to, ok := unitAliases[l]; ok {
		return " (for " + unitWords[to] + " write " + to + ")"
	}
	switch l {
	case "ms", "msec", "millisecond", "milliseconds":
		return " (for milliseconds write the interval in seconds, as in every 0.1 s)"
	}
	return ""
}

// number reads a number literal, negated when neg is set.
func (b *builder) number(p lexer.Position, text string, neg bool) (float64, bool) {
	v, err := strconv.ParseFloat(text, 64)
	if err != nil {
		b.fail(p, ErrSyntax, "number "+clip(text)+" is out of range")
		return 0, false
	}
	if neg {
		v = -v
	}
	return v, true
}

// whole reads a whole number in lo..hi; what names it in messages and
// unit, when not empty, follows the limit.
func (b *builder) whole(x *value, lo, hi int, what, unit string, kindOver error) (int, bool) {
	v, err := strconv.ParseFloat(x.Num, 64)
	text := clip(x.Num)
	if x.Neg {
		v, text = -v, "-"+text
	}
	of := ""
	if unit != "" {
		of, unit = " of "+unit, " "+unit
	}
	switch {
	case err == nil && v != math.Trunc(v):
		b.fail(x.Pos, ErrModel, what+" must be a whole number"+of+", not "+text)
	case err == nil && v < 0 && lo == 0:
		b.fail(x.Pos, ErrModel, what+" cannot be negative (here "+text+")")
	case err == nil && v < float64(lo):
		b.fail(x.Pos, ErrModel, what+" must be at least "+strconv.Itoa(lo)+", not "+text)
	case err != nil || v > float64(hi):
		b.fail(x.Pos, kindOver, what+" is "+text+", over the limit of "+strconv.Itoa(hi)+unit)
	default:
		return int(v), true
	}
	return 0, false
}

// term sorts one summand of the right-hand side, with its sign written
// at p, into the constant, an input or the noise term by what ends it.
func (b *builder) term(sign string, p lexer.Position, t *term) {
	end := t.End
	switch {
	case t.Short != nil || end.Noise:
		b.noiseTerm(sign, p, t)
	case end.Series != nil:
		b.input(sign, p, t, end.Series.Series.Value, b.seriesDiff(end.Series), nil)
	case end.Event != nil:
		if ev, ok := b.event(end.Event); ok {
			b.input(sign, p, t, ev.String(), tf.Poly{}, &ev)
		}
	case len(t.Ops) == 0:
		b.constant(sign, p, end)
	case end.Name != "":
		b.input(sign, p, t, end.Name, tf.Poly{}, nil)
	default:
		b.fail(end.Pos, ErrModel, "this term has no input series: end it with the series name, as in (w0 + w1 B) B^2 x")
	}
}

// constant sets the constant term: a lone number or name.
func (b *builder) constant(sign string, p lexer.Position, end *operand) {
	if hint := noiseLike(end.Name); hint != "" {
		b.fail(end.Pos, ErrModel, hint)
		return
	}
	if b.m.Const != nil {
		msg := "a second constant term; a model has at most one"
		if end.Name != "" {
			msg += " (a lone name is a constant: to feed series " + end.Name + " with unit gain write 1 " + end.Name + ")"
		}
		b.fail(end.Pos, ErrModel, msg)
		return
	}
	if end.Name != "" {
		if sign == "-" {
			b.fail(p, ErrModel, "write a named constant with '+'; its value may be negative")
			return
		}
		b.useCoef(end.Name, end.Pos)
		b.m.Const = &tf.Coef{Name: end.Name, Free: true, Pos: toPos(end.Pos)}
		return
	}
	v, ok := b.number(end.Pos, end.Number, sign == "-")
	if !ok {
		return
	}
	b.m.Const = &tf.Coef{Value: v, Pos: toPos(end.Pos)}
}

// noiseLike returns a message when a lone name, which the spec reads as
// the constant, is most likely meant as the noise term: e, eps, noise,
// a_t and the like, or a shorthand without its parentheses (AR1). It
// returns "" for other names.
func noiseLike(name string) string {
	if name == "" {
		return ""
	}
	switch strings.ToLower(name) {
	case "e", "e_t", "et", "eps", "eps_t", "epsilon", "a_t", "at", "noise", "white", "whitenoise", "white_noise":
		return "a lone name such as " + name + " is read as the constant, not as noise; the white-noise symbol is a, as in + a, + ARMA(1, 1) or + (1 - t1 B) / (1 - p1 B) a"
	}
	u := strings.ToUpper(name)
	for _, s := range []string{"ARMA", "AR", "MA"} {
		if rest, ok := strings.CutPrefix(u, s); ok && rest != "" && strings.Trim(rest, "0123456789") == "" {
			form := s + "(" + rest + ")"
			if s == "ARMA" {
				if len(rest) != 2 {
					form = "ARMA(p, q)"
				} else {
					form = "ARMA(" + rest[:1] + ", " + rest[1:] + ")"
				}
			}
			return "a lone name such as " + name + " is read as the constant; for the noise shorthand write " + form
		}
	}
	return ""
}

// numAfterDen is the ordering rule shared by input and noise terms: when
// a denominator came earlier in the term (sawDen) and op is a numerator
// factor (a number, a coefficient name or a polynomial in parentheses),
// it records an error saying why and reports true.
func (b *builder) numAfterDen(sawDen bool, op *operator) bool {
	if sawDen && (op.Coef != nil || op.Factor != nil) {
		b.fail(op.Pos, ErrModel, "a numerator factor after a denominator is ambiguous: write the numerator first, then each denominator factor after its own '/', as in (w0) / (1 - d1 B) / (1 - d2 B) B x")
		return true
	}
	return false
}

// useCoef records a use of a coefficient name; a name that reads as a
// slip for a power of B (B3, w1B, d2B2) is an error.
func (b *builder) useCoef(name string, p lexer.Position) {
	if _, ok := b.coefs[name]; !ok {
		b.coefs[name] = toPos(p)
	}
	if hint := glued(name); hint != "" {
		b.fail(p, ErrSyntax, hint)
	}
}

// glued returns a message when name looks like B and a power, or a
// coefficient and B, written without the '^' or the space between them:
// B3 (B^3), w1B (w1 B), d2B3 (d2 B^3). Such names are refused as
// coefficient names, because a slip there would otherwise parse as a
// product of coefficients with no dead time. It returns "" for any
// other name.
func glued(name string) string {
	digits := func(s string) bool {
		for i := 0; i < len(s); i++ {
			if !isDigit(s[i]) {
				return false
			}
		}
		return true
	}
	if len(name) > 1 && name[0] == 'B' && digits(name[1:]) {
		k := strings.TrimLeft(name[1:], "0")
		if k == "" {
			k = "0"
		}
		samples := " samples)"
		if k == "1" {
			samples = " sample)"
		}
		return name + " reads as a coefficient name; for B to the power " + k + " write B^" + k +
			" (B^" + k + " x delays x by " + k + samples
	}
	i := strings.LastIndexByte(name, 'B')
	if i < 2 || !isDigit(name[i-1]) || !digits(name[i+1:]) {
		return ""
	}
	want := name[:i] + " B"
	if i+1 < len(name) {
		want += "^" + name[i+1:]
	}
	return name + " reads as one coefficient name; put a space between the coefficient and B, as in " + want
}

// noiseTerm builds the noise term: a shorthand, or theta(B) / phi(B) a.
func (b *builder) noiseTerm(sign string, p lexer.Position, t *term) {
	at := t.End
	if t.Short != nil {
		at = &operand{Pos: t.Short.Pos}
	}
	if b.noise {
		b.fail(at.Pos, ErrModel, "a second noise term; a model has at most one")
		return
	}
	b.noise = true
	if sign == "-" {
		b.fail(p, ErrModel, "the noise term is added, not subtracted")
		return
	}
	var n tf.Noise
	if t.Short != nil {
		n, _ = b.shorthand(t.Short)
		b.m.Noise = &n
		return
	}
	sawDen := false
	for i := range t.Ops {
		op := &t.Ops[i]
		if b.numAfterDen(sawDen, op) {
			return
		}
		switch {
		case op.Coef != nil && op.Coef.Number == "1":
			// 1 / phi(B) a: a unit numerator, nothing to store.
		case op.Coef != nil:
			b.fail(op.Pos, ErrModel, "the noise term takes no gain (its scale is the noise variance; a is the white-noise symbol, not a series); write theta(B) / phi(B) a")
			return
		case op.Delay != nil:
			b.fail(op.Pos, ErrModel, "the noise term takes no dead time")
			return
		case op.Factor != nil:
			b.polyFactors(op.Factor, &n.MA, "noise numerator", true)
		default:
			sawDen = true
			b.polyFactors(op.Den, &n.AR, "noise denominator", true)
		}
	}
	b.m.Noise = &n
}

// shorthand expands AR(p), MA(q), ARMA(p, q) to
//
//	(1 - theta1 B - ... - thetaq B^q) / (1 - phi1 B - ... - phip B^p) a
//
// with free coefficients starting at 0.
func (b *builder) shorthand(s *shorthand) (tf.Noise, bool) {
	want := 1
	if s.Kind == "ARMA" {
		want = 2
	}
	if len(s.Args) != want {
		form := map[string]string{"AR": "AR(p)", "MA": "MA(q)", "ARMA": "ARMA(p, q)"}[s.Kind]
		b.fail(s.Pos, ErrSyntax, s.Kind+" takes "+map[int]string{1: "one order", 2: "two orders"}[want]+", as in "+form)
		return tf.Noise{}, false
	}
	ords := make([]int, want)
	for i, a := range s.Args {
		v, ok := b.whole(a, 0, MaxDegree, "the order", "", ErrLimit)
		if !ok {
			return tf.Noise{}, false
		}
		ords[i] = v
	}
	p, q := 0, 0
	switch s.Kind {
	case "AR":
		p = ords[0]
	case "MA":
		q = ords[0]
	default:
		p, q = ords[0], ords[1]
	}
	var n tf.Noise
	if p > 0 {
		n.AR.Factors = []tf.Factor{b.shortFactor(s.Pos, "phi", p)}
	}
	if q > 0 {
		n.MA.Factors = []tf.Factor{b.shortFactor(s.Pos, "theta", q)}
	}
	return n, true
}

// shortFactor is the factor (1 - name1 B - ... - namek B^k) of a noise
// shorthand written at p, with free coefficients.
func (b *builder) shortFactor(p lexer.Position, name string, k int) tf.Factor {
	pos := toPos(p)
	f := tf.Factor{Terms: make([]tf.Term, 0, k+1), Exp: 1, Pos: pos}
	f.Terms = append(f.Terms, tf.Term{Coef: tf.Coef{Value: 1, Pos: pos}})
	for i := 1; i <= k; i++ {
		nm := name + strconv.Itoa(i)
		b.useCoef(nm, p)
		f.Terms = append(f.Terms, tf.Term{Neg: true, Coef: tf.Coef{Name: nm, Free: true, Pos: pos}, Power: i})
	}
	return f
}

// event reads an event: step(T) or pulse(T), T a whole sample index or
// a time.
func (b *builder) event(ev *event) (tf.Event, bool) {
	e := tf.Event{Kind: tf.Step}
	if ev.Kind == "pulse" {
		e.Kind = tf.Pulse
	}
	if ev.Index != nil {
		k, ok := b.whole(ev.Index, 0, tf.MaxEventIndex, "the sample of an event", "", ErrLimit)
		e.Index = k
		return e, ok
	}
	at, err := tf.ParseEventTime(ev.Time.Value)
	if err != nil {
		b.fail(ev.Time.Pos, ErrModel, "bad time "+clip(ev.Time.Value)+" for "+ev.Kind+"(...)"+timeReason(err)+
			"; write a date, or a date and time, as in 2026-03-01, 2026-03-01T08:00 or 2026-03-01T08:00:30, in UTC or with an offset such as +01:00")
		return e, false
	}
	e.At = at
	return e, true
}

// timeReason words why time.Parse refused an event's time: a field out
// of range (month 13, February 30, hour 25), or "" for a malformed text.
func timeReason(err error) string {
	var pe *time.ParseError
	if errors.As(err, &pe) && strings.HasSuffix(pe.Message, "out of range") {
		return " (" + strings.TrimPrefix(pe.Message, ": ") + ")"
	}
	return ""
}

// input builds an input term, with its sign written at p, from its
// operators, its series name and the differencing of the series, or
// from its event (Series the event's text).
func (b *builder) input(sign string, p lexer.Position, t *term, series string, diff tf.Poly, ev *tf.Event) {
	if sign == "-" {
		b.fail(p, ErrModel, "an input term cannot be subtracted; put the sign in its numerator, as in (-w0 - w1 B) x")
		return
	}
	in := tf.Input{Series: series, Diff: diff, Event: ev, Pos: toPos(t.Pos)}
	delay, delayOK, sawDen := 0, true, false
	for i := range t.Ops {
		op := &t.Ops[i]
		if b.numAfterDen(sawDen, op) {
			return
		}
		switch {
		case op.Coef != nil && op.Coef.Number == "1":
			// a unit gain: nothing to store
		case op.Coef != nil:
			c, ok := b.coefficient(op.Coef.Pos, op.Coef.Number, op.Coef.Name)
			if !ok {
				return
			}
			in.Num.Factors = append(in.Num.Factors, tf.Factor{Terms: []tf.Term{{Coef: c}}, Exp: 1, Pos: toPos(op.Pos)})
		case op.Delay != nil:
			k, ok := b.delay(t.Ops, i)
			switch {
			case !ok:
				return
			case k < 0:
				delayOK = false
			case delay+k > MaxDelay && delayOK:
				b.fail(op.Pos, ErrLimit, "the dead time adds up to "+strconv.Itoa(delay+k)+", over the limit of "+strconv.Itoa(MaxDelay)+" samples")
				delayOK = false
			case delayOK:
				delay += k
			}
		case op.Factor != nil:
			b.polyFactors(op.Factor, &in.Num, "numerator", false)
		default:
			sawDen = true
			b.polyFactors(op.Den, &in.Den, "denominator", true)
		}
	}
	in.Delay = delay
	if len(b.m.Inputs) == MaxInputs {
		b.fail(t.Pos, ErrLimit, "more than "+strconv.Itoa(MaxInputs)+" input terms")
		return
	}
	b.m.Inputs = append(b.m.Inputs, in)
}

// coefficient reads a coefficient written as a number or a name at p.
func (b *builder) coefficient(p lexer.Position, number, name string) (tf.Coef, bool) {
	if name != "" {
		b.useCoef(name, p)
		return tf.Coef{Name: name, Free: true, Pos: toPos(p)}, true
	}
	v, ok := b.number(p, number, false)
	return tf.Coef{Value: v, Pos: toPos(p)}, ok
}

// delay reads the dead time of the power of B ops[i]: k >= 0, or -1
// for a bad power (reported, the term goes on to be checked); ok is
// false when B is followed by a whole number, a slip for B^k that ends
// the term.
func (b *builder) delay(ops []operator, i int) (k int, ok bool) {
	d := ops[i].Delay
	if k := wholeAfter(ops, i); d.Exp == nil && k != "" {
		b.fail(ops[i+1].Pos, ErrSyntax, "B followed by "+clip(k)+" reads as a delay of one sample times the gain "+clip(k)+
			"; for a dead time of "+clip(k)+" samples write B^"+clip(k))
		return 0, false
	}
	if d.Exp == nil {
		return 1, true
	}
	if d.Exp.Neg {
		n := clip(d.Exp.Num)
		b.fail(d.Exp.Pos, ErrModel, "the dead time cannot be negative (here -"+n+
			"); B^k delays a series by k samples, so write B^"+n+" for a dead time of "+n+" samples")
		return -1, true
	}
	v, good := b.whole(d.Exp, 0, MaxDelay, "the dead time", "samples", ErrLimit)
	if !good {
		return -1, true
	}
	return v, true
}

// wholeAfter returns the text of the operator after ops[i] when it is a
// whole number, alone or in parentheses with no sign or power (3 or
// (3)), else "".
func wholeAfter(ops []operator, i int) string {
	if i+1 >= len(ops) {
		return ""
	}
	op := &ops[i+1]
	k := ""
	switch f := op.Factor; {
	case op.Coef != nil:
		k = op.Coef.Number
	case f != nil && f.Exp == nil && f.Poly != nil && f.Poly.Sign == "" && len(f.Poly.Rest) == 0:
		if m := f.Poly.First; m.Power == nil && m.Bare == nil {
			k = m.Number
		}
	}
	for j := 0; j < len(k); j++ {
		if !isDigit(k[j]) {
			return ""
		}
	}
	return k
}

// seriesDiff reads the differencing of a differenced input series.
func (b *builder) seriesDiff(s *diffSeries) tf.Poly {
	var diff tf.Poly
	for _, f := range s.Factors {
		b.diffFactors(f, &diff, "input "+s.Series.Value)
	}
	return diff
}

// diffFactors appends the factors of a differencing operator: fixed
// numbers only, constant term 1.
func (b *builder) diffFactors(f *factor, dst *tf.Poly, of string) {
	n0 := len(dst.Factors)
	b.polyFactors(f, dst, "differencing of the "+of, true)
	for _, f := range dst.Factors[n0:] {
		for _, t := range f.Terms {
			if t.Coef.Name != "" {
				b.failAt(t.Coef.Pos, ErrModel, "the differencing of the "+of+" takes numbers only, and "+t.Coef.Name+" is a coefficient name; differencing is not estimated")
				return
			}
		}
	}
}

// polyFactors appends the factors of f (a polynomial in parentheses or a
// product of them) to dst, checking the degree limit and, when unit is
// set, that each factor's constant term is 1.
func (b *builder) polyFactors(f *factor, dst *tf.Poly, what string, unit bool) {
	b.factors(f, 1, dst, what, unit)
}

// factors is polyFactors for a factor inside powers whose product is exp.
func (b *builder) factors(f *factor, exp int, dst *tf.Poly, what string, unit bool) {
	if f.Exp != nil {
		e, ok := b.whole(f.Exp, 1, MaxDegree, "the power of a factor", "", ErrLimit)
		if !ok {
			return
		}
		exp *= e
		if exp > MaxDegree {
			b.fail(f.Exp.Pos, ErrLimit, "the "+what+" has degree over the limit of "+strconv.Itoa(MaxDegree))
			return
		}
	}
	if pr := f.Product; pr != nil {
		b.factors(pr.First, exp, dst, what, unit)
		for _, g := range pr.Rest {
			b.factors(g, exp, dst, what, unit)
		}
		return
	}
	fac, ok := b.polynomial(f)
	if !ok {
		return
	}
	fac.Exp = exp
	if unit && !b.unitConstant(f, &fac, what) {
		return
	}
	b.addFactor(f, fac, dst, what)
}

// unitConstant checks that the constant term of fac, written as f, is
// the number 1.
func (b *builder) unitConstant(f *factor, fac *tf.Factor, what string) bool {
	c0 := 0.0
	for _, t := range fac.Terms {
		if t.Power == 0 {
			if t.Coef.Name != "" {
				b.failAt(t.Coef.Pos, ErrModel, "the constant term of the "+what+" must be the number 1, not the coefficient "+t.Coef.Name)
				return false
			}
			c0 += t.Value()
		}
	}
	if c0 == 1 {
		return true
	}
	c := strconv.FormatFloat(c0, 'g', -1, 64)
	msg := "the constant term of the " + what + " must be 1, not " + c
	switch {
	case what == "noise numerator":
		msg += "; the noise has no gain (its scale is its variance): write (1 - t1 B ...)"
	case strings.HasPrefix(what, "differencing"):
		msg += "; a differencing operator starts with 1, as in (1 - B) or (1 - B^12)"
	case c0 != 0 && !math.IsInf(c0, 0):
		msg += "; divide the numerator and the denominator by " + c
	default:
		msg += "; write it as (1 + ...)"
	}
	b.fail(f.Pos, ErrModel, msg)
	return false
}

// addFactor appends fac, written as f, to dst within the degree limit.
// The degree so far is kept per polynomial, so that a long product costs
// linear time.
func (b *builder) addFactor(f *factor, fac tf.Factor, dst *tf.Poly, what string) {
	if b.deg == nil {
		b.deg = make(map[*tf.Poly]int, 8)
	}
	deg, ok := b.deg[dst]
	if !ok {
		deg = dst.Degree()
	}
	top := 0
	for _, t := range fac.Terms {
		top = max(top, t.Power)
	}
	if deg+top*fac.Exp > MaxDegree {
		b.fail(f.Pos, ErrLimit, "the "+what+" has degree "+strconv.Itoa(deg+top*fac.Exp)+", over the limit of "+strconv.Itoa(MaxDegree))
		return
	}
	b.deg[dst] = deg + top*fac.Exp
	dst.Factors = append(dst.Factors, fac)
}

// polynomial reads the polynomial in parentheses f, one term per power
// of B.
func (b *builder) polynomial(f *factor) (tf.Factor, bool) {
	pl := f.Poly
	fac := tf.Factor{Pos: toPos(f.Pos), Terms: make([]tf.Term, 0, 1+len(pl.Rest))}
	var seen [MaxDegree + 1]bool
	add := func(neg bool, m *monomial) bool {
		t, ok := b.monomial(m)
		if !ok {
			return false
		}
		if seen[t.Power] {
			b.fail(m.Pos, ErrModel, "two terms in B^"+strconv.Itoa(t.Power)+" in one polynomial; combine them")
			return false
		}
		seen[t.Power] = true
		t.Neg = neg
		fac.Terms = append(fac.Terms, t)
		return true
	}
	if !add(pl.Sign == "-", &pl.First) {
		return fac, false
	}
	for i := range pl.Rest {
		if !add(pl.Rest[i].Sign == "-", &pl.Rest[i].Mono) {
			return fac, false
		}
	}
	return fac, true
}

// monomial reads one term of a polynomial: c, c B^k or B^k.
func (b *builder) monomial(m *monomial) (tf.Term, bool) {
	d := m.Power
	var t tf.Term
	if m.Bare != nil {
		d = m.Bare
		t.Coef = tf.Coef{Value: 1, Pos: toPos(m.Pos)}
	} else {
		c, ok := b.coefficient(m.Pos, m.Number, m.Name)
		if !ok {
			return t, false
		}
		t.Coef = c
	}
	if d == nil {
		return t, true
	}
	t.Power = 1
	if d.Exp != nil {
		k, ok := b.whole(d.Exp, 0, MaxDegree, "the power of B", "", ErrLimit)
		if !ok {
			return t, false
		}
		t.Power = k
	}
	return t, true
}

func quoteTok(s string) string { return "'" + clip(s) + "'" }

// clip shortens a very long token for a message.
func clip(s string) string {
	if len(s) <= 40 {
		return s
	}
	return s[:32] + "... (" + strconv.Itoa(len(s)) + " characters)"
}

// checkNames reports series/coefficient clashes, an input named twice and
// the output used as an input.
func (b *builder) checkNames() {
	for i, in := range b.m.Inputs {
		if in.Series == b.m.Output {
			b.failAt(in.Pos, ErrModel, in.Series+" is the output; it cannot also be an input (past outputs enter through the denominators and the noise model, as in w0 / (1 - d1 B) x + 1 / (1 - p1 B) a)")
			continue
		}
		dup := false
		for _, o := range b.m.Inputs[:i] {
			if o.Series == in.Series {
				dup = true
			}
		}
		if dup {
			b.failAt(in.Pos, ErrModel, "input "+in.Series+" appears twice; combine its terms into one transfer function")
			continue
		}
		b.series[in.Series] = in.Pos
	}
	names := make([]string, 0, len(b.series))
	for s := range b.series {
		if _, ok := b.coefs[s]; ok {
			names = append(names, s)
		}
	}
	slices.Sort(names)
	for _, s := range names {
		cp, sp := b.coefs[s], b.series[s]
		at := cp
		if sp.Offset > cp.Offset {
			at = sp
		}
		b.failAt(at, ErrModel, s+" names both a series and a coefficient; rename one of them")
	}
}

// bind applies the where clause: name ~ v gives a free coefficient its
// start value, name = v holds it at v.
func (b *builder) bind(binds []binding) {
	type val struct {
		v    float64
		free bool
	}
	if len(binds) == 0 {
		return
	}
	vals := make(map[string]val, len(binds))
	for i := range binds {
		bd := &binds[i]
		name := bd.Name.Value
		if _, ok := b.coefs[name]; !ok {
			if _, isSeries := b.series[name]; isSeries {
				b.fail(bd.Name.Pos, ErrModel, name+" is a series, not a coefficient")
			} else {
				b.fail(bd.Name.Pos, ErrModel, name+" is not a coefficient of this model")
			}
			continue
		}
		if _, dup := vals[name]; dup {
			b.fail(bd.Name.Pos, ErrModel, name+" is given a value twice")
			continue
		}
		v, ok := b.number(bd.Val.Pos, bd.Val.Num, bd.Val.Neg)
		if !ok {
			continue
		}
		vals[name] = val{v, bd.Op == "~"}
	}
	set := func(c *tf.Coef) {
		if x, ok := vals[c.Name]; ok && c.Name != "" {
			c.Value, c.Free = x.v, x.free
		}
	}
	if b.m.Const != nil {
		set(b.m.Const)
	}
	for i := range b.m.Inputs {
		b.m.Inputs[i].Num.Each(set)
		b.m.Inputs[i].Den.Each(set)
	}
	if b.m.Noise != nil {
		b.m.Noise.MA.Each(set)
		b.m.Noise.AR.Each(set)
	}
}
