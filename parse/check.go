package parse

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/tf"
)

// Check reports whether a model built in code (or changed after
// parsing, for example by an estimator writing its estimates in) is one
// that a spec can say, with the same rules and messages as Model. It
// returns nil for a valid model, else an ErrorList.
//
// It first checks the values themselves, for what printing cannot show
// or would show wrongly: an empty or unwritable name (output, series or
// coefficient: ASCII letters, digits and '_', not starting with a digit,
// not a reserved word), a factor with no terms or a power (Factor.Exp)
// outside 1..MaxDegree, a term with a power of B outside 0..MaxDegree or
// two terms in the same power, a dead time (Input.Delay) outside
// 0..MaxDelay, a polynomial of degree over MaxDegree, no input or more
// than MaxInputs, an input series named twice or named as the output, a
// NaN or infinite value, a free coefficient without a name (it would
// print as a fixed number), a named coefficient in a differencing
// operator, a name used with two different values or freedoms, and a
// sample interval that is not a positive number with a unit s, min, h or
// d, and an event (Input.Event) of unknown kind, with a sample index
// outside 0..tf.MaxEventIndex, both an index and a time, a year outside
// 1..9999, a Series other
// than its text (Event.String()) or a differencing. Those errors have Path set to the Go path of the offending field
// (such as "Inputs[0].Num.Factors[1].Exp"), carry the element's own Pos
// (the zero Pos for a model built in code) and no Text.
//
// Then it parses m.String(): its errors (a denominator whose constant
// term is not 1, ...) point into that canonical text, which each Error
// holds in Text. Last, it checks that the text reads back as m (with
// negative unnamed values compared by their signed value, as printing
// folds the sign into the term); a model that does not is refused.
func Check(m tf.Model) error {
	c := checker{builder: builder{}, seen: map[string]coefUse{}}
	c.model(m)
	if len(c.errs) > 0 {
		return c.errs
	}
	text := m.String()
	back, err := Model(text)
	if err != nil {
		return err
	}
	if !sameModel(back, m) {
		c.failAt(tf.Pos{}, ErrModel, "the model does not read back as itself from its spec text "+strconv.Quote(clipText(text))+
			"; check its names, signs and values")
		c.errs[0].Path = "."
		return c.errs
	}
	return nil
}

// coefUse is the first use of a coefficient name, for the check that a
// name has one value and one freedom.
type coefUse struct {
	c     tf.Coef
	where string
}

// checker holds the state of Check.
type checker struct {
	builder
	seen map[string]coefUse
}

func (c *checker) fail(path string, p tf.Pos, kind error, msg string) {
	if len(c.errs) >= maxErrors {
		return
	}
	c.errs = append(c.errs, &Error{Pos: p, Msg: msg, Kind: kind, Path: path})
}

func (c *checker) model(m tf.Model) {
	if m.Output == "" {
		c.fail("Output", tf.Pos{}, ErrModel, "the model has no output name")
		return
	}
	c.name(m.Output, "the output name", "Output", tf.Pos{})
	c.poly(m.Diff, "differencing of the output", "Diff", true)
	if m.Const != nil {
		c.coef(*m.Const, "constant", "Const", false)
	}
	switch {
	case len(m.Inputs) == 0:
		c.fail("Inputs", tf.Pos{}, ErrModel, "the model has no input term; give it at least one Input")
	case len(m.Inputs) > MaxInputs:
		c.fail("Inputs", tf.Pos{}, ErrLimit, "the model has "+strconv.Itoa(len(m.Inputs))+" inputs, over the limit of "+strconv.Itoa(MaxInputs))
	}
	first := map[string]int{}
	for i, in := range m.Inputs {
		path := "Inputs[" + strconv.Itoa(i) + "]"
		label := "input " + strconv.Itoa(i+1)
		switch {
		case in.Event != nil:
			if c.event(in, path, label) {
				c.once(first, in, i, path+".Event", "event")
			}
			label = "input " + in.Series
		case in.Series == "":
			c.fail(path+".Series", in.Pos, ErrModel, label+" has no series name")
		case in.Series == m.Output:
			c.fail(path+".Series", in.Pos, ErrModel, label+" is "+in.Series+", the output; it cannot also be an input")
		default:
			c.name(in.Series, "the series name of "+label, path+".Series", in.Pos)
			c.once(first, in, i, path+".Series", "input")
			label = "input " + in.Series
		}
		switch {
		case in.Delay < 0:
			c.fail(path+".Delay", in.Pos, ErrModel, "the dead time of "+label+" is "+strconv.Itoa(in.Delay)+
				" samples; a dead time is a whole number of samples from 0 to "+strconv.Itoa(MaxDelay))
		case in.Delay > MaxDelay:
			c.fail(path+".Delay", in.Pos, ErrLimit, "the dead time of "+label+" is "+strconv.Itoa(in.Delay)+
				" samples, over the limit of "+strconv.Itoa(MaxDelay))
		}
		c.poly(in.Num, "numerator of "+label, path+".Num", false)
		c.poly(in.Den, "denominator of "+label, path+".Den", false)
		c.poly(in.Diff, "differencing of "+label, path+".Diff", true)
	}
	if m.Noise != nil {
		c.noise(*m.Noise)
	}
	c.interval(m.Interval)
}

// once records that input i (at path, called what in the message: "input"
// or "event") is the first term of its series, or fails when an earlier
// input, first[in.Series], already is.
func (c *checker) once(first map[string]int, in tf.Input, i int, path, what string) {
	if j, dup := first[in.Series]; dup {
		c.fail(path, in.Pos, ErrModel, what+" "+in.Series+" appears twice (inputs "+strconv.Itoa(j+1)+" and "+
			strconv.Itoa(i+1)+"); combine its terms into one transfer function")
		return
	}
	first[in.Series] = i
}

// event checks the event of an input: a known kind, a sample index in
// range or a time, Series its text and no differencing. It reports
// whether the event is sound.
func (c *checker) event(in tf.Input, path, label string) bool {
	e := in.Event
	switch {
	case e.Kind != tf.Step && e.Kind != tf.Pulse:
		c.fail(path+".Event.Kind", in.Pos, ErrModel, "the event of "+label+" has kind "+e.Kind.String()+"; use tf.Step or tf.Pulse")
	case e.At.IsZero() && e.Index < 0:
		c.fail(path+".Event.Index", in.Pos, ErrModel, "the event of "+label+" is at sample "+strconv.Itoa(e.Index)+
			"; a sample index is a whole number from 0 (the record's first sample)")
	case e.At.IsZero() && e.Index > tf.MaxEventIndex:
		c.fail(path+".Event.Index", in.Pos, ErrLimit, "the event of "+label+" is at sample "+strconv.Itoa(e.Index)+
			", over the limit of "+strconv.Itoa(tf.MaxEventIndex))
	case !e.At.IsZero() && e.Index != 0:
		c.fail(path+".Event.Index", in.Pos, ErrModel, "the event of "+label+" has both a sample index ("+strconv.Itoa(e.Index)+
			") and a time; give one (Index is 0 when At is set)")
	case !e.At.IsZero() && (e.At.Year() < 1 || e.At.Year() > 9999):
		c.fail(path+".Event.At", in.Pos, ErrModel, "the event of "+label+" is in the year "+strconv.Itoa(e.At.Year())+
			"; a spec writes years 0001 to 9999")
	case in.Series != e.String():
		c.fail(path+".Series", in.Pos, ErrModel, "the series name of "+label+" is "+strconv.Quote(clipText(in.Series))+
			", not its event's text "+strconv.Quote(e.String())+"; set Series to Event.String()")
	case !in.Diff.IsOne():
		c.fail(path+".Diff", in.Pos, ErrModel, "the event "+e.String()+" takes no differencing (a differenced step is a pulse)")
	default:
		return true
	}
	return false
}

func (c *checker) noise(n tf.Noise) {
	c.poly(n.MA, "noise numerator", "Noise.MA", false)
	c.poly(n.AR, "noise denominator", "Noise.AR", false)
}

func (c *checker) interval(iv tf.Interval) {
	if iv == (tf.Interval{}) {
		return
	}
	v := strconv.FormatFloat(iv.Value, 'g', -1, 64)
	switch {
	case math.IsNaN(iv.Value) || math.IsInf(iv.Value, 0):
		c.fail("Interval.Value", tf.Pos{}, ErrModel, "the sample interval is "+v)
	case !(iv.Value > 0):
		c.fail("Interval.Value", tf.Pos{}, ErrModel, "the sample interval must be a positive number, not "+v)
	case iv.Unit == "":
		c.fail("Interval.Unit", tf.Pos{}, ErrModel, "the sample interval "+v+" has no unit; use "+unitList)
	case !validUnit(iv.Unit):
		c.fail("Interval.Unit", tf.Pos{}, ErrModel, "unknown unit "+strconv.Quote(iv.Unit)+" for the sample interval; use "+unitList+unitHint(iv.Unit))
	}
}

// name checks that s is a name the spec language can write.
func (c *checker) name(s, what, path string, p tf.Pos) {
	if why := badName(s); why != "" {
		c.fail(path, p, ErrModel, what+" "+strconv.Quote(clipText(s))+" "+why)
	}
}

// badName says why s cannot be written as a name in a spec, or returns
// "" when it can.
func badName(s string) string {
	if keywords[s] {
		return "is a reserved word of the spec language (B, a, AR, MA, ARMA, where, every); rename it"
	}
	ok := s != "" && isLetter(s[0])
	for i := 0; ok && i < len(s); i++ {
		ok = isLetter(s[i]) || isDigit(s[i])
	}
	if !ok {
		return "cannot be written in a spec: a name is ASCII letters, digits and '_', not starting with a digit"
	}
	return ""
}

// poly checks the structure of one polynomial: factors with terms, whole
// powers in range, one term per power, the degree limit, and each
// coefficient. diff marks a differencing operator (numbers only).
func (c *checker) poly(p tf.Poly, where, path string, diff bool) {
	deg := 0
	for i, f := range p.Factors {
		fp := path + ".Factors[" + strconv.Itoa(i) + "]"
		fw := "factor " + strconv.Itoa(i+1) + " of the " + where
		if len(f.Terms) == 0 {
			c.fail(fp+".Terms", f.Pos, ErrModel, fw+" has no terms; leave the factor out for the constant 1")
			continue
		}
		switch {
		case f.Exp < 1:
			c.fail(fp+".Exp", f.Pos, ErrModel, "the power of "+fw+" is "+strconv.Itoa(f.Exp)+
				"; a factor's power is a whole number from 1 to "+strconv.Itoa(MaxDegree)+" (Exp 1 for a factor written once)")
		case f.Exp > MaxDegree:
			c.fail(fp+".Exp", f.Pos, ErrLimit, "the power of "+fw+" is "+strconv.Itoa(f.Exp)+", over the limit of "+strconv.Itoa(MaxDegree))
		}
		top, ok := 0, f.Exp >= 1 && f.Exp <= MaxDegree
		var used [MaxDegree + 1]bool
		for j, t := range f.Terms {
			tp := fp + ".Terms[" + strconv.Itoa(j) + "]"
			switch {
			case t.Power < 0:
				c.fail(tp+".Power", t.Coef.Pos, ErrModel, "a term of "+fw+" is in B^"+strconv.Itoa(t.Power)+
					"; powers of B are whole numbers from 0 to "+strconv.Itoa(MaxDegree)+" (a dead time goes in Input.Delay)")
				ok = false
			case t.Power > MaxDegree:
				c.fail(tp+".Power", t.Coef.Pos, ErrLimit, "a term of "+fw+" is in B^"+strconv.Itoa(t.Power)+
					", over the limit of "+strconv.Itoa(MaxDegree))
				ok = false
			case used[t.Power]:
				c.fail(tp+".Power", t.Coef.Pos, ErrModel, fw+" has two terms in B^"+strconv.Itoa(t.Power)+"; combine them")
			default:
				used[t.Power] = true
				top = max(top, t.Power)
			}
			c.coef(t.Coef, where, tp+".Coef", diff)
		}
		if ok {
			deg += top * f.Exp
		}
	}
	if deg > MaxDegree {
		c.fail(path, tf.Pos{}, ErrLimit, "the "+where+" has degree "+strconv.Itoa(deg)+", over the limit of "+strconv.Itoa(MaxDegree))
	}
}

// coef checks one coefficient: a finite value, a name when free, a
// writable name, no name in a differencing operator, and one value and
// freedom per name.
func (c *checker) coef(k tf.Coef, where, path string, diff bool) {
	what := "the coefficient " + k.Name
	if k.Name == "" {
		what = "a coefficient"
	}
	switch {
	case math.IsNaN(k.Value) || math.IsInf(k.Value, 0):
		c.fail(path+".Value", k.Pos, ErrModel, what+" of the "+where+" is "+strconv.FormatFloat(k.Value, 'g', -1, 64))
		return
	case k.Name == "" && k.Free:
		c.fail(path+".Name", k.Pos, ErrModel, "a free coefficient of the "+where+" has no name; a free coefficient is a parameter "+
			"and needs one (a coefficient without a name is a fixed number: set Free false)")
		return
	case k.Name == "":
		return
	}
	if why := badName(k.Name); why != "" {
		c.fail(path+".Name", k.Pos, ErrModel, "the coefficient name "+strconv.Quote(clipText(k.Name))+" of the "+where+" "+why)
		return
	}
	if diff {
		c.fail(path+".Name", k.Pos, ErrModel, "the "+where+" takes numbers only, and "+k.Name+
			" is a coefficient name; differencing is not estimated")
		return
	}
	if u, ok := c.seen[k.Name]; ok {
		if u.c.Value != k.Value || u.c.Free != k.Free {
			c.fail(path, k.Pos, ErrModel, "the coefficient "+k.Name+" of the "+where+" differs from its use in the "+u.where+
				" ("+coefState(k)+" against "+coefState(u.c)+"); one name is one parameter")
		}
		return
	}
	c.seen[k.Name] = coefUse{k, where}
}

func coefState(c tf.Coef) string {
	v := strconv.FormatFloat(c.Value, 'g', -1, 64)
	if c.Free {
		return "free from " + v
	}
	return "held at " + v
}

// clipText shortens a long text for a message.
func clipText(s string) string {
	if len(s) <= 200 {
		return s
	}
	return s[:160] + "... (" + strconv.Itoa(len(s)) + " bytes)"
}

// sameModel reports whether a model read back from the printed text of m
// is m: as tf.Model.Equal, except that terms compare by their signed
// value (printing folds the sign of a negative unnamed value into the
// term's sign) and positions are ignored.
func sameModel(back, m tf.Model) bool {
	if back.Output != m.Output || back.Interval != m.Interval || !samePoly(back.Diff, m.Diff) ||
		len(back.Inputs) != len(m.Inputs) || (back.Const == nil) != (m.Const == nil) ||
		(back.Noise == nil) != (m.Noise == nil) {
		return false
	}
	if m.Const != nil && (back.Const.Name != m.Const.Name || back.Const.Free != m.Const.Free || back.Const.Value != m.Const.Value) {
		return false
	}
	if m.Noise != nil && (!samePoly(back.Noise.MA, m.Noise.MA) || !samePoly(back.Noise.AR, m.Noise.AR)) {
		return false
	}
	for i, a := range m.Inputs {
		b := back.Inputs[i]
		if a.Series != b.Series || a.Delay != b.Delay || !samePoly(a.Diff, b.Diff) || !samePoly(a.Num, b.Num) || !samePoly(a.Den, b.Den) ||
			!sameEvent(a.Event, b.Event) {
			return false
		}
	}
	return true
}

// samePoly reports whether p and q agree term by term in power, name,
// freedom and signed value (printing folds the sign of a negative
// unnamed value into the term's sign), ignoring positions.
func samePoly(p, q tf.Poly) bool {
	return p.EqualFunc(q, func(t, u tf.Term) bool {
		return t.Power == u.Power && t.Coef.Name == u.Coef.Name && t.Coef.Free == u.Coef.Free && t.Value() == u.Value()
	})
}

// sameEvent reports whether two events (or none) are one: kind, index
// and time as an instant.
func sameEvent(a, b *tf.Event) bool {
	if a == nil || b == nil {
		return a == b
	}
	return a.Kind == b.Kind && a.Index == b.Index && a.At.Equal(b.At)
}
