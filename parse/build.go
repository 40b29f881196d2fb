package parse

import (
	"errors"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/alecthomas/participle/v2/lexer"
	"github.com/backshift/backshift/tf"
)

// builder turns the syntax tree into a tf.Model, checking the meaning of
// the spec and collecting errors with their positions.
type builder struct {
	src    string
	errs   ErrorList
	m      tf.Model
	coefs  map[string]tf.Pos // first use of each coefficient name
	series map[string]tf.Pos // output and inputs
	noise  bool
	deg    map[*tf.Poly]int // degree so far of each polynomial being built
}

// errMaxed is returned internally once maxErrors errors are collected.
var errMaxed = errors.New("too many errors")

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
func (b *builder) build(g *gSpec) {
	b.coefs = map[string]tf.Pos{}
	b.series = map[string]tf.Pos{}
	eq := &g.Eq
	b.m.Output = eq.Output.Name
	b.series[eq.Output.Name] = toPos(eq.Output.Pos)
	var diff tf.Poly
	for _, grp := range eq.Diff {
		b.diffFactors(grp, &diff, "output "+eq.Output.Name)
	}
	b.m.Diff = diff
	for i := range eq.Terms {
		b.term(&eq.Terms[i], i == 0)
	}
	if len(b.m.Inputs) == 0 && len(eq.Terms) > 0 && len(b.errs) == 0 {
		if c := b.m.Const; c != nil && c.Name != "" {
			b.failAt(c.Pos, ErrModel, "the model has no input term: a lone name such as "+c.Name+
				" is the constant; write w0 "+c.Name+" (or 1 "+c.Name+" for unit gain) to make it an input")
		} else {
			b.fail(eq.Terms[0].Pos, ErrModel, "the model has no input term; write at least one, such as w0 B x")
		}
	}
	var binds []gBind
	everySeen := false
	for _, c := range g.Clauses {
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
	b.checkNames()
	b.bind(binds)
}

// every sets the sample interval.
func (b *builder) every(e *gEvery) {
	v, ok := b.number(&e.Val)
	if !ok {
		return
	}
	if !(v > 0) {
		b.fail(e.Val.Pos, ErrModel, "the sample interval must be a positive number")
		return
	}
	if !validUnit(e.Unit.Name) {
		b.fail(e.Unit.Pos, ErrModel, "unknown unit "+strconv.Quote(clip(e.Unit.Name))+" for the sample interval; use "+unitList+unitHint(e.Unit.Name))
		return
	}
	b.m.Interval = tf.Interval{Value: v, Unit: e.Unit.Name}
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

// number reads a signed number literal.
func (b *builder) number(x *gExp) (float64, bool) {
	v, err := strconv.ParseFloat(x.Num, 64)
	if err != nil {
		b.fail(x.Pos, ErrSyntax, "number "+clip(x.Num)+" is out of range")
		return 0, false
	}
	if x.Neg {
		v = -v
	}
	return v, true
}

// whole reads a whole number in lo..hi; what names it in messages and
// unit, when not empty, follows the limit.
func (b *builder) whole(x *gExp, lo, hi int, what, unit string, kindOver error) (int, bool) {
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

// term classifies one summand of the right-hand side.
func (b *builder) term(t *gTerm, first bool) {
	items, ok := b.items(t.Items)
	if !ok {
		return
	}
	last := items[len(items)-1]
	switch {
	case last.Short != nil:
		if len(items) > 1 {
			b.fail(items[0].Pos, ErrModel, "a noise shorthand such as "+last.Short.Kind+"(...) stands alone as the noise term")
			return
		}
		b.noiseTerm(t, nil, last)
	case last.Noise:
		b.noiseTerm(t, items[:len(items)-1], last)
	case len(items) == 1 && (last.Number != "" || last.Name != ""):
		b.constant(t, last)
	case last.Name != "":
		b.input(t, items[:len(items)-1], last.Name, tf.Poly{})
	case last.Group != nil && isDiffTarget(last.Group):
		b.diffInput(t, items[:len(items)-1], last.Group)
	case len(items) >= 2 && items[len(items)-2].Name != "" && last.Group != nil && startsWithT(last.Group):
		series := items[len(items)-2].Name
		b.fail(last.Pos, ErrModel, "a series is written by its name alone, not "+series+"(t ...); x three samples back is B^3 x, as in w0 B^3 "+series)
	default:
		p := t.Items[len(t.Items)-1].Pos
		b.fail(p, ErrModel, "this term has no input series: end it with the series name, as in (w0 + w1 B) B^2 x")
	}
}

// items drops the optional '*' between factors, checking that each one
// stands between two factors.
func (b *builder) items(in []gItem) ([]*gItem, bool) {
	out := make([]*gItem, 0, len(in))
	for i := range in {
		it := &in[i]
		if it.Star {
			if i > 0 && in[i-1].Star && in[i-1].Pos.Offset+1 == it.Pos.Offset {
				b.fail(in[i-1].Pos, ErrSyntax, "'**' is not a power here: write a power with '^', as in B^3")
				return nil, false
			}
			if i == 0 || i == len(in)-1 || in[i-1].Star {
				b.fail(it.Pos, ErrSyntax, "'*' must stand between two factors")
				return nil, false
			}
			continue
		}
		out = append(out, it)
	}
	return out, true
}

// startsWithT reports whether a group starts with the name t, as in
// x(t - 3).
func startsWithT(g *gGroup) bool {
	return len(g.Elems) > 0 && g.Elems[0].Item != nil && g.Elems[0].Item.Name == "t"
}

func isDiffTarget(g *gGroup) bool {
	n := len(g.Elems)
	return n >= 2 && g.Elems[n-1].Item != nil && g.Elems[n-1].Item.Name != "" && hasGroup(g)
}

func hasGroup(g *gGroup) bool {
	for _, e := range g.Elems {
		if e.Item != nil && e.Item.Group != nil {
			return true
		}
	}
	return false
}

func (b *builder) constant(t *gTerm, it *gItem) {
	if hint := noiseLike(it.Name); hint != "" {
		b.fail(it.Pos, ErrModel, hint)
		return
	}
	if b.m.Const != nil {
		msg := "a second constant term; a model has at most one"
		if it.Name != "" {
			msg += " (a lone name is a constant: to feed series " + it.Name + " with unit gain write 1 " + it.Name + ")"
		}
		b.fail(it.Pos, ErrModel, msg)
		return
	}
	if it.Name != "" {
		if t.Sign == "-" {
			b.fail(t.Pos, ErrModel, "write a named constant with '+'; its value may be negative")
			return
		}
		b.useCoef(it.Name, it.Pos)
		b.m.Const = &tf.Coef{Name: it.Name, Free: true, Pos: toPos(it.Pos)}
		return
	}
	v, ok := b.number(&gExp{Pos: it.Pos, Num: it.Number, Neg: t.Sign == "-"})
	if !ok {
		return
	}
	b.m.Const = &tf.Coef{Value: v, Pos: toPos(it.Pos)}
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
// a denominator came earlier in the term (sawDen) and it is a numerator
// factor (a number, a coefficient name or a polynomial in parentheses),
// it records an error saying why and reports true.
func (b *builder) numAfterDen(sawDen bool, it *gItem) bool {
	if sawDen && (it.Number != "" || it.Name != "" || it.Group != nil) {
		b.fail(it.Pos, ErrModel, "a numerator factor after a denominator is ambiguous: write the numerator first, then each denominator factor after its own '/', as in (w0) / (1 - d1 B) / (1 - d2 B) B x")
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

func (b *builder) noiseTerm(t *gTerm, ops []*gItem, last *gItem) {
	if b.noise {
		b.fail(last.Pos, ErrModel, "a second noise term; a model has at most one")
		return
	}
	b.noise = true
	if t.Sign == "-" {
		b.fail(t.Pos, ErrModel, "the noise term is added, not subtracted")
		return
	}
	var n tf.Noise
	if last.Short != nil {
		n, _ = b.shorthand(last.Short)
		b.m.Noise = &n
		return
	}
	sawDen := false
	for _, it := range ops {
		if b.numAfterDen(sawDen, it) {
			return
		}
		switch {
		case it.Number == "1":
			// 1 / phi(B) a: a unit numerator, nothing to store.
		case it.Number != "" || it.Name != "":
			b.fail(it.Pos, ErrModel, "the noise term takes no gain (its scale is the noise variance; a is the white-noise symbol, not a series); write theta(B) / phi(B) a")
			return
		case it.B != nil:
			b.fail(it.Pos, ErrModel, "the noise term takes no dead time")
			return
		case it.Group != nil:
			b.polyFactors(it.Group, &n.MA, "noise numerator", true)
		case it.Slash != nil:
			sawDen = true
			b.polyFactors(it.Slash, &n.AR, "noise denominator", true)
		case it.Noise:
			b.fail(it.Pos, ErrSyntax, "the white-noise symbol a must come last in the noise term")
			return
		default:
			b.fail(it.Pos, ErrModel, "the noise term is theta(B) / phi(B) a, with polynomials in parentheses")
			return
		}
	}
	b.m.Noise = &n
}

// shorthand expands AR(p), MA(q), ARMA(p, q) to
//
//	(1 - theta1 B - ... - thetaq B^q) / (1 - phi1 B - ... - phip B^p) a
//
// with free coefficients starting at 0.
func (b *builder) shorthand(s *gShort) (tf.Noise, bool) {
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
	var n tf.Noise
	p, q := 0, 0
	switch s.Kind {
	case "AR":
		p = ords[0]
	case "MA":
		q = ords[0]
	default:
		p, q = ords[0], ords[1]
	}
	pos := toPos(s.Pos)
	mk := func(name string, k int) tf.Factor {
		f := tf.Factor{Terms: make([]tf.Term, 0, k+1), Exp: 1, Pos: pos}
		f.Terms = append(f.Terms, tf.Term{Coef: tf.Coef{Value: 1, Pos: pos}})
		for i := 1; i <= k; i++ {
			nm := name + strconv.Itoa(i)
			b.useCoef(nm, s.Pos)
			f.Terms = append(f.Terms, tf.Term{Neg: true, Coef: tf.Coef{Name: nm, Free: true, Pos: pos}, Power: i})
		}
		return f
	}
	if p > 0 {
		n.AR.Factors = []tf.Factor{mk("phi", p)}
	}
	if q > 0 {
		n.MA.Factors = []tf.Factor{mk("theta", q)}
	}
	return n, true
}

// input builds an input term from its operator items, its series name and
// the differencing of the series.
func (b *builder) input(t *gTerm, ops []*gItem, series string, diff tf.Poly) {
	p := t.Items[0].Pos
	if t.Sign == "-" {
		b.fail(t.Pos, ErrModel, "an input term cannot be subtracted; put the sign in its numerator, as in (-w0 - w1 B) x")
		return
	}
	in := tf.Input{Series: series, Diff: diff, Pos: toPos(p)}
	delay := 0
	delayOK := true
	sawDen := false
	for i, it := range ops {
		if b.numAfterDen(sawDen, it) {
			return
		}
		switch {
		case it.Number == "1":
			// a unit gain: nothing to store
		case it.Number != "" || it.Name != "":
			var c tf.Coef
			if it.Name != "" {
				b.useCoef(it.Name, it.Pos)
				c = tf.Coef{Name: it.Name, Free: true, Pos: toPos(it.Pos)}
			} else {
				v, ok := b.number(&gExp{Pos: it.Pos, Num: it.Number})
				if !ok {
					return
				}
				c = tf.Coef{Value: v, Pos: toPos(it.Pos)}
			}
			in.Num.Factors = append(in.Num.Factors, tf.Factor{Terms: []tf.Term{{Coef: c}}, Exp: 1, Pos: toPos(it.Pos)})
		case it.B != nil:
			if k := wholeAfter(ops, i); it.B.Exp == nil && k != "" {
				next := ops[i+1]
				b.fail(next.Pos, ErrSyntax, "B followed by "+clip(k)+" reads as a delay of one sample times the gain "+clip(k)+
					"; for a dead time of "+clip(k)+" samples write B^"+clip(k))
				return
			}
			k := 1
			if it.B.Exp != nil {
				if it.B.Exp.Neg {
					b.fail(it.B.Exp.Pos, ErrModel, "the dead time cannot be negative (here -"+clip(it.B.Exp.Num)+
						"); B^k delays a series by k samples, so write B^"+clip(it.B.Exp.Num)+" for a dead time of "+clip(it.B.Exp.Num)+" samples")
					delayOK = false
					continue
				}
				v, ok := b.whole(it.B.Exp, 0, MaxDelay, "the dead time", "samples", ErrLimit)
				if !ok {
					delayOK = false
					continue
				}
				k = v
			}
			if delay+k > MaxDelay && delayOK {
				b.fail(it.Pos, ErrLimit, "the dead time adds up to "+strconv.Itoa(delay+k)+", over the limit of "+strconv.Itoa(MaxDelay)+" samples")
				delayOK = false
				continue
			}
			delay += k
		case it.Group != nil:
			if isDiffTarget(it.Group) {
				b.fail(it.Pos, ErrModel, "a differenced series such as ((1 - B) x) must come last in its term")
				return
			}
			b.polyFactors(it.Group, &in.Num, "numerator", false)
		case it.Slash != nil:
			sawDen = true
			b.polyFactors(it.Slash, &in.Den, "denominator", true)
		case it.Noise:
			b.fail(it.Pos, ErrSyntax, "the white-noise symbol a must come last in the noise term")
			return
		case it.Short != nil:
			b.fail(it.Pos, ErrModel, "a noise shorthand such as "+it.Short.Kind+"(...) stands alone as the noise term")
			return
		}
	}
	in.Delay = delay
	if len(b.m.Inputs) == MaxInputs {
		b.fail(p, ErrLimit, "more than "+strconv.Itoa(MaxInputs)+" input terms")
		return
	}
	b.m.Inputs = append(b.m.Inputs, in)
}

// wholeAfter returns the text of the item after ops[i] when it is a
// whole number, alone or in parentheses with no power (3 or (3)), else "".
func wholeAfter(ops []*gItem, i int) string {
	if i+1 >= len(ops) {
		return ""
	}
	it := ops[i+1]
	k := it.Number
	if g := it.Group; g != nil && g.Exp == nil && len(g.Elems) == 1 && g.Elems[0].Item != nil {
		k = g.Elems[0].Item.Number
	}
	for j := 0; j < len(k); j++ {
		if !isDigit(k[j]) {
			return ""
		}
	}
	return k
}

// diffInput builds an input term whose series is differenced:
// ops ((1 - B) x).
func (b *builder) diffInput(t *gTerm, ops []*gItem, g *gGroup) {
	if g.Exp != nil {
		b.fail(g.Exp.Pos, ErrModel, "a power cannot apply to a series; write the power on the differencing, as in ((1 - B)^2 x)")
		return
	}
	n := len(g.Elems)
	name := g.Elems[n-1].Item
	var diff tf.Poly
	for _, e := range g.Elems[:n-1] {
		switch {
		case e.Item != nil && e.Item.Star:
		case e.Item != nil && e.Item.Group != nil:
			b.diffFactors(e.Item.Group, &diff, "input "+name.Name)
		default:
			b.fail(e.Pos, ErrModel, "a differenced series is written ((1 - B) x): differencing in parentheses, then the series name")
			return
		}
	}
	b.input(t, ops, name.Name, diff)
}

// diffFactors appends the factors of a differencing operator: fixed
// numbers only, constant term 1.
func (b *builder) diffFactors(g *gGroup, dst *tf.Poly, of string) {
	n0 := len(dst.Factors)
	b.polyFactors(g, dst, "differencing of the "+of, true)
	for _, f := range dst.Factors[n0:] {
		for _, t := range f.Terms {
			if t.Coef.Name != "" {
				b.failAt(t.Coef.Pos, ErrModel, "the differencing of the "+of+" takes numbers only, and "+t.Coef.Name+" is a coefficient name; differencing is not estimated")
				return
			}
		}
	}
}

// polyFactors appends the factors of g (a polynomial in parentheses or a
// product of them) to dst, checking the degree limit and, when unit is
// set, that each factor's constant term is 1.
func (b *builder) polyFactors(g *gGroup, dst *tf.Poly, what string, unit bool) {
	b.groupFactors(g, 1, dst, what, unit)
}

func (b *builder) groupFactors(g *gGroup, exp int, dst *tf.Poly, what string, unit bool) {
	e := 1
	if g.Exp != nil {
		v, ok := b.whole(g.Exp, 1, MaxDegree, "the power of a factor", "", ErrLimit)
		if !ok {
			return
		}
		e = v
	}
	exp *= e
	if exp > MaxDegree {
		b.fail(g.Exp.Pos, ErrLimit, "the "+what+" has degree over the limit of "+strconv.Itoa(MaxDegree))
		return
	}
	if hasGroup(g) {
		for _, el := range g.Elems {
			switch {
			case el.Item != nil && el.Item.Star:
			case el.Item != nil && el.Item.Group != nil:
				b.groupFactors(el.Item.Group, exp, dst, what, unit)
			default:
				b.fail(el.Pos, ErrSyntax, "inside these parentheses write either one polynomial or a product of polynomials in parentheses, not both")
				return
			}
		}
		return
	}
	f, ok := b.sum(g, what)
	if !ok {
		return
	}
	f.Exp = exp
	if unit {
		c0 := 0.0
		for _, t := range f.Terms {
			if t.Power == 0 {
				if t.Coef.Name != "" {
					b.failAt(t.Coef.Pos, ErrModel, "the constant term of the "+what+" must be the number 1, not the coefficient "+t.Coef.Name)
					return
				}
				c0 += t.Value()
			}
		}
		if c0 != 1 {
			msg := "the constant term of the " + what + " must be 1, not " + strconv.FormatFloat(c0, 'g', -1, 64)
			switch {
			case what == "noise numerator":
				msg += "; the noise has no gain (its scale is its variance): write (1 - t1 B ...)"
			case strings.HasPrefix(what, "differencing"):
				msg += "; a differencing operator starts with 1, as in (1 - B) or (1 - B^12)"
			case c0 != 0 && !math.IsInf(c0, 0):
				msg += "; divide the numerator and the denominator by " + strconv.FormatFloat(c0, 'g', -1, 64)
			default:
				msg += "; write it as (1 + ...)"
			}
			b.fail(g.Pos, ErrModel, msg)
			return
		}
	}
	// The degree so far is kept per polynomial, so that a long product
	// costs linear time.
	if b.deg == nil {
		b.deg = make(map[*tf.Poly]int, 8)
	}
	deg, ok := b.deg[dst]
	if !ok {
		deg = dst.Degree()
	}
	top := 0
	for _, t := range f.Terms {
		top = max(top, t.Power)
	}
	if deg+top*f.Exp > MaxDegree {
		b.fail(g.Pos, ErrLimit, "the "+what+" has degree "+strconv.Itoa(deg+top*f.Exp)+", over the limit of "+strconv.Itoa(MaxDegree))
		return
	}
	b.deg[dst] = deg + top*f.Exp
	dst.Factors = append(dst.Factors, f)
}

// sum reads a polynomial written as signed terms c, c B^k or B^k.
func (b *builder) sum(g *gGroup, what string) (tf.Factor, bool) {
	f := tf.Factor{Pos: toPos(g.Pos), Terms: make([]tf.Term, 0, (len(g.Elems)+1)/2)}
	const (
		stStart = iota
		stSign
		stCoef
		stStar
		stB
	)
	st := stStart
	var cur tf.Term
	var prev string
	var seen uint64 // powers 0..63 used so far
	var seen64 bool
	finish := func(p lexer.Position) bool {
		k := cur.Power
		dup := false
		if k < 64 {
			dup = seen&(1<<k) != 0
			seen |= 1 << k
		} else {
			dup = seen64
			seen64 = true
		}
		if dup {
			b.fail(p, ErrModel, "two terms in B^"+strconv.Itoa(k)+" in one polynomial; combine them")
			return false
		}
		f.Terms = append(f.Terms, cur)
		cur = tf.Term{}
		return true
	}
	for i := range g.Elems {
		el := &g.Elems[i]
		it := el.Item
		switch {
		case el.Sign != "":
			switch st {
			case stStart, stCoef, stB:
				if st != stStart && !finish(el.Pos) {
					return f, false
				}
				cur.Neg = el.Sign == "-"
				st = stSign
			default:
				b.fail(el.Pos, ErrSyntax, "expected a coefficient or B after "+quoteTok(prev)+", found "+quoteTok(el.Sign))
				return f, false
			}
		case it.Number != "" || it.Name != "":
			if hint := glued(it.Name); it.Name != "" && hint != "" {
				b.fail(el.Pos, ErrSyntax, hint)
				return f, false
			}
			if it.Name == "s" && (st == stCoef || st == stStar) {
				b.fail(el.Pos, ErrSyntax, "s is not an operator of the spec language: a spec is in the backshift operator B of discrete time; convert a continuous-time model first, as with tf.FOPDT.Discretize")
				return f, false
			}
			if st == stB && prev == "B" && it.Number != "" && strings.Trim(it.Number, "0123456789") == "" {
				b.fail(el.Pos, ErrSyntax, "B followed by "+clip(it.Number)+" is not a power of B: for the term in B^"+clip(it.Number)+" write B^"+clip(it.Number))
				return f, false
			}
			if st != stStart && st != stSign {
				b.fail(el.Pos, ErrSyntax, "expected '+', '-' or ')' after "+quoteTok(prev)+": write a sign between the terms of a polynomial")
				return f, false
			}
			if it.Name != "" {
				b.useCoef(it.Name, it.Pos)
				cur.Coef = tf.Coef{Name: it.Name, Free: true, Pos: toPos(it.Pos)}
			} else {
				v, ok := b.number(&gExp{Pos: it.Pos, Num: it.Number})
				if !ok {
					return f, false
				}
				cur.Coef = tf.Coef{Value: v, Pos: toPos(it.Pos)}
			}
			st = stCoef
		case it.Star:
			if i+1 < len(g.Elems) && g.Elems[i+1].Item != nil && g.Elems[i+1].Item.Star && g.Elems[i+1].Pos.Offset == el.Pos.Offset+1 {
				b.fail(el.Pos, ErrSyntax, "'**' is not a power here: write a power with '^', as in B^3")
				return f, false
			}
			if st != stCoef {
				b.fail(el.Pos, ErrSyntax, "'*' must stand between a coefficient and B")
				return f, false
			}
			st = stStar
		case it.B != nil:
			switch st {
			case stStart, stSign:
				cur.Coef = tf.Coef{Value: 1, Pos: toPos(it.Pos)}
			case stCoef, stStar:
			default:
				b.fail(el.Pos, ErrSyntax, "expected '+', '-' or ')' after "+quoteTok(prev)+": write a sign between the terms of a polynomial")
				return f, false
			}
			cur.Power = 1
			if it.B.Exp != nil {
				k, ok := b.whole(it.B.Exp, 0, MaxDegree, "the power of B", "", ErrLimit)
				if !ok {
					return f, false
				}
				cur.Power = k
			}
			st = stB
		case it.Group != nil || it.Slash != nil:
			b.fail(el.Pos, ErrSyntax, "inside these parentheses write either one polynomial or a product of polynomials in parentheses, not both")
			return f, false
		case it.Noise:
			b.fail(el.Pos, ErrModel, "the white-noise symbol a cannot stand inside a polynomial")
			return f, false
		case it.Short != nil:
			b.fail(el.Pos, ErrModel, "a noise shorthand such as "+it.Short.Kind+"(...) cannot stand inside a polynomial")
			return f, false
		}
		prev = elemText(el)
	}
	switch st {
	case stSign, stStar:
		b.fail(g.Close.Pos, ErrSyntax, "expected a coefficient or B after "+quoteTok(prev)+", found ')'")
		return f, false
	case stCoef, stB:
		if !finish(g.Close.Pos) {
			return f, false
		}
	}
	return f, true
}

// elemText gives the text of an element for messages.
func elemText(el *gElem) string {
	it := el.Item
	switch {
	case el.Sign != "":
		return el.Sign
	case it.Number != "":
		return it.Number
	case it.Name != "":
		return it.Name
	case it.Star:
		return "*"
	case it.B != nil:
		if it.B.Exp != nil {
			s := "B^"
			if it.B.Exp.Neg {
				s += "-"
			}
			return s + it.B.Exp.Num
		}
		return "B"
	}
	return ""
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
func (b *builder) bind(binds []gBind) {
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
		name := bd.Name.Name
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
		v, ok := b.number(&bd.Val)
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
