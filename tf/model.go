package tf

import (
	"errors"
	"math"
	"strconv"
	"time"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/sym"
)

// Pos is a position in a spec text: 1-based Line and Column (bytes) and a
// 0-based byte Offset. The zero Pos means the value was built in code.
type Pos = sym.Pos

// Coef is one coefficient of a model polynomial: a fixed number (empty
// Name), a free named parameter to be estimated (Value is its start value
// or estimate), or a named parameter held at Value.
type Coef = sym.Coef

// Noise is the noise term theta(B)/phi(B) a_t of a model: MA is theta,
// AR is phi, each with constant term 1 (the zero Noise is white noise).
// It is arma's type under tf's name, so that a program builds a model
// from tf's exports alone.
type Noise = arma.Noise

// Term is one signed summand Coef B^Power of a factor.
type Term = sym.Term

// Factor is a sum of terms raised to a whole power.
type Factor = sym.Factor

// Poly is a polynomial in B written as a product of factors.
type Poly = sym.Poly

// Input is one input term of a model,
//
//	Num(B) / Den(B) * B^Delay * Diff(B) x_t
//
// with x the series named Series: Num is omega(B), Den is delta(B) with
// constant term 1, Delay the dead time b in samples, Diff the differencing
// applied to the input (empty for none). The term alone (Input.Rational)
// acts on the model's differenced output; the effect of x on y itself,
// the plant a controller sees, is Model.Path.
//
// An input with Event set is an intervention (Box & Tiao 1975): x is
// the event's indicator (see Event), built from the record's length
// rather than read from the data, and Series is the event's spec text,
// Event.String() (such as "step(120)"), the name under which estimation
// adds the indicator to its data (Model.EventData). An event input takes
// no differencing (Diff empty; a differenced step is a pulse).
type Input struct {
	Series string
	Diff   Poly
	Num    Poly
	Den    Poly
	Delay  int
	Event  *Event
	Pos    Pos
}

// Interval is the sample interval of a model: Value in Unit, one of the
// clock units "s", "min", "h", "d", "wk" (7 days) or the calendar units
// "mo" (a month), "qtr" (3 months), "yr" (12 months); see ValidUnit. The
// zero Interval means the interval is not given and times are reported
// in samples only.
//
// Time figures (dead times, time constants, rise and settling times) are
// reported in the interval's own unit: samples times Value, in Unit. For
// a clock unit they convert to seconds with Seconds. A calendar unit is
// not a fixed number of seconds (a month has 28 to 31 days), so for it
// Seconds returns ok = false and figures stay in the calendar unit
// (Months converts between mo, qtr and yr).
type Interval struct {
	Value float64
	Unit  string
}

// Model is a whole transfer-function-noise model,
//
//	Diff(B) y_t = c + sum_i Num_i(B)/Den_i(B) B^b_i Diff_i(B) x_i,t + theta(B)/phi(B) a_t
//
// Output names y; Const is the constant c (nil for none); Noise is the
// noise term (nil for a noise-free model, the zero Noise for white
// noise). Path returns the whole path from one input to y,
// Num_i/Den_i B^b_i D_i(B)/D(B).
type Model struct {
	Output   string
	Diff     Poly
	Const    *Coef
	Inputs   []Input
	Noise    *Noise
	Interval Interval
}

// Clone returns a deep copy of m that shares nothing with it.
func (m Model) Clone() Model {
	c := Model{Output: m.Output, Diff: m.Diff.Clone(), Interval: m.Interval}
	if m.Const != nil {
		k := *m.Const
		c.Const = &k
	}
	if m.Inputs != nil {
		c.Inputs = make([]Input, len(m.Inputs))
		for i, in := range m.Inputs {
			c.Inputs[i] = Input{Series: in.Series, Diff: in.Diff.Clone(), Num: in.Num.Clone(),
				Den: in.Den.Clone(), Delay: in.Delay, Pos: in.Pos}
			if in.Event != nil {
				e := *in.Event
				c.Inputs[i].Event = &e
			}
		}
	}
	if m.Noise != nil {
		n := m.Noise.Clone()
		c.Noise = &n
	}
	return c
}

// Equal reports whether m and o are the same model as written: names,
// structure, coefficients (values exactly), freedom, events (times
// compared as instants, with time.Time.Equal) and interval, ignoring
// positions in the spec text.
func (m Model) Equal(o Model) bool {
	if m.Output != o.Output || m.Interval != o.Interval || !m.Diff.Equal(o.Diff) ||
		len(m.Inputs) != len(o.Inputs) || (m.Const == nil) != (o.Const == nil) ||
		(m.Noise == nil) != (o.Noise == nil) {
		return false
	}
	if m.Const != nil && !m.Const.Equal(*o.Const) {
		return false
	}
	if m.Noise != nil && !m.Noise.Equal(*o.Noise) {
		return false
	}
	for i, a := range m.Inputs {
		b := o.Inputs[i]
		if a.Series != b.Series || a.Delay != b.Delay || !a.Diff.Equal(b.Diff) ||
			!a.Num.Equal(b.Num) || !a.Den.Equal(b.Den) || !a.Event.equal(b.Event) {
			return false
		}
	}
	return true
}

// Validate checks the structure of m as a spec would have it, so that a
// model built in code cannot reach the numerical code with a shape it
// does not handle: every input named (Series not empty), every factor's
// power Exp in 1..MaxDegree, every power
// of B in 0..MaxDegree, every polynomial (differencing, numerator,
// denominator, noise MA and AR) of degree at most MaxDegree, every dead
// time in 0..MaxDelay and every coefficient value finite. It returns a
// *ModelError naming the first part at fault, or nil. It does not check
// what depends on the values' meaning (a zero constant term of a
// denominator, stability); fit.Model, Model.Simulate and NewSystem report
// those themselves, and call Validate first (their errors carry their
// own Op; Validate's carry "tf.Model.Validate").
func (m Model) Validate() error {
	if err := m.validate(); err != nil {
		return withOp("tf.Model.Validate", err)
	}
	return nil
}

// validate is Validate with errors carrying no Op, for the exported
// functions that check a model and set their own.
func (m Model) validate() error {
	if err := modelCheckPoly(m.Diff, "output "+m.Output+" differencing"); err != nil {
		return err
	}
	if m.Const != nil {
		if v := m.Const.Value; math.IsNaN(v) || math.IsInf(v, 0) {
			return &ModelError{Part: "constant " + modelCoefName(*m.Const), Problem: "value " + strconv.FormatFloat(v, 'g', -1, 64) + " is not finite"}
		}
	}
	for i, in := range m.Inputs {
		part := "input " + strconv.Quote(in.Series)
		if in.Series == "" && in.Event == nil {
			return &ModelError{Part: "input " + strconv.Itoa(i+1), Problem: "has no series name (Input.Series names the data series the term acts on)"}
		}
		if in.Event != nil {
			if err := in.validateEvent(i); err != nil {
				return err
			}
		}
		if in.Delay < 0 || in.Delay > MaxDelay {
			return &ModelError{Part: part + " dead time", Problem: strconv.Itoa(in.Delay) + " samples is outside 0.." + strconv.Itoa(MaxDelay) + " (a dead time counts whole samples of delay, B^b with b >= 0)"}
		}
		for _, p := range []struct {
			p    Poly
			what string
		}{{in.Diff, "differencing"}, {in.Num, "numerator"}, {in.Den, "denominator"}} {
			if err := modelCheckPoly(p.p, part+" "+p.what); err != nil {
				return err
			}
		}
	}
	if m.Noise != nil {
		if err := modelCheckPoly(m.Noise.MA, "noise MA"); err != nil {
			return err
		}
		if err := modelCheckPoly(m.Noise.AR, "noise AR"); err != nil {
			return err
		}
	}
	return nil
}

// modelCheckPoly checks one polynomial for Validate.
func modelCheckPoly(p Poly, part string) error {
	deg := 0
	for i, f := range p.Factors {
		fp := part + ", factor " + strconv.Itoa(i+1)
		if f.Exp < 1 || f.Exp > MaxDegree {
			return &ModelError{Part: fp, Problem: "power " + strconv.Itoa(f.Exp) + " is outside 1.." + strconv.Itoa(MaxDegree) +
				" (a factor written once has Exp 1; leave a factor out rather than give it power 0)"}
		}
		top := 0
		for _, t := range f.Terms {
			if t.Power < 0 || t.Power > MaxDegree {
				return &ModelError{Part: fp, Problem: "power of B " + strconv.Itoa(t.Power) + " is outside 0.." + strconv.Itoa(MaxDegree)}
			}
			if v := t.Coef.Value; math.IsNaN(v) || math.IsInf(v, 0) {
				return &ModelError{Part: fp, Problem: "coefficient " + modelCoefName(t.Coef) + " of B^" + strconv.Itoa(t.Power) +
					" is " + strconv.FormatFloat(v, 'g', -1, 64) + ", not finite"}
			}
			top = max(top, t.Power)
		}
		deg += top * f.Exp
		if deg > MaxDegree {
			return &ModelError{Part: part, Problem: "degree " + strconv.Itoa(deg) + " (up to factor " + strconv.Itoa(i+1) + ") is over the limit of " + strconv.Itoa(MaxDegree)}
		}
	}
	return nil
}

// modelCoefName names a coefficient for a message: its name, or "(a
// number)" for a fixed one.
func modelCoefName(c Coef) string {
	if c.Name != "" {
		return c.Name
	}
	return "(a number)"
}

// EventKind is the indicator of a known event (Box & Tiao 1975).
type EventKind int

// The event kinds: Step is 0 before the event's sample and 1 from it
// on (a lasting change: a new burner, a rule that took effect); Pulse is
// 1 at the event's sample and 0 elsewhere (a one-off: a door left open,
// a bad batch). Through an input's own dynamics they give the classic
// responses: w step(T) an abrupt permanent shift, w / (1 - d B) step(T)
// a gradual one, w / (1 - d B) pulse(T) a decaying pulse.
const (
	Step EventKind = iota + 1
	Pulse
)

// String returns "step" or "pulse", the words of the spec language.
func (k EventKind) String() string {
	switch k {
	case Step:
		return "step"
	case Pulse:
		return "pulse"
	}
	return "EventKind(" + strconv.Itoa(int(k)) + ")"
}

// MaxEventIndex is the largest sample index of an event.
const MaxEventIndex = 1 << 30

// Event is a known event at a known time: Kind, and the time as a 0-based
// sample Index of the record, or, when At is not the zero time, as a
// timestamp (then Index is ignored and is 0 in parsed models). A
// timestamp needs the record's start time and sample interval to become
// a sample (see Sample).
type Event struct {
	Kind  EventKind
	Index int
	At    time.Time
}

// String returns the event as spec text: "step(120)", "pulse(2026-03-01)",
// "step(2026-03-01T08:00)", "pulse(2026-03-01T08:00:30.5+01:00)". A time
// prints in the shortest of the forms YYYY-MM-DD (midnight),
// YYYY-MM-DDThh:mm, YYYY-MM-DDThh:mm:ss and with the fraction of a
// second it has, with its offset from UTC (+hh:mm or -hh:mm) unless that
// is zero: a time without an offset is UTC, as package tf/record reads a
// time column without one.
func (e Event) String() string {
	if e.At.IsZero() {
		return e.Kind.String() + "(" + strconv.Itoa(e.Index) + ")"
	}
	return e.Kind.String() + "(" + FormatEventTime(e.At) + ")"
}

// FormatEventTime writes t as an event's time (see Event.String).
func FormatEventTime(t time.Time) string {
	_, off := t.Zone()
	layout := "2006-01-02"
	switch {
	case t.Nanosecond() != 0:
		layout += "T15:04:05.999999999"
	case t.Second() != 0:
		layout += "T15:04:05"
	case t.Hour() != 0 || t.Minute() != 0 || off != 0:
		layout += "T15:04"
	}
	if off != 0 {
		layout += "-07:00"
	}
	return t.Format(layout)
}

// ParseEventTime reads an event's time in one of the forms Event.String
// prints (a trailing Z for UTC is also accepted); it returns a
// time.Parse error for any other text.
// The error returned is that of a field out of range (a *time.ParseError
// whose Message says which: month, day, hour, ...) when one form matched
// the text's shape, else that of the last form tried.
func ParseEventTime(s string) (time.Time, error) {
	var first error
	for _, l := range []string{"2006-01-02", "2006-01-02T15:04", "2006-01-02T15:04Z07:00", "2006-01-02T15:04:05", "2006-01-02T15:04:05Z07:00"} {
		t, err := time.Parse(l, s)
		if err == nil {
			return t, nil
		}
		var pe *time.ParseError
		if first == nil || errors.As(err, &pe) && pe.Message != "" {
			first = err
		}
	}
	return time.Time{}, first
}

func (e *Event) equal(f *Event) bool {
	if e == nil || f == nil {
		return e == f
	}
	return e.Kind == f.Kind && e.Index == f.Index && e.At.Equal(f.At)
}

// validateEvent checks the event of input i for Validate.
func (in Input) validateEvent(i int) error {
	e := in.Event
	part := "input " + strconv.Itoa(i+1) + " event"
	switch {
	case e.Kind != Step && e.Kind != Pulse:
		return &ModelError{Part: part, Problem: "kind " + e.Kind.String() + " is neither Step nor Pulse"}
	case e.At.IsZero() && (e.Index < 0 || e.Index > MaxEventIndex):
		return &ModelError{Part: part, Problem: "sample index " + strconv.Itoa(e.Index) + " is outside 0.." + strconv.Itoa(MaxEventIndex)}
	case !e.At.IsZero() && e.Index != 0:
		return &ModelError{Part: part, Problem: "has both a sample index (" + strconv.Itoa(e.Index) + ") and a time; give one (Index is 0 when At is set)"}
	case in.Series != e.String():
		return &ModelError{Part: part, Problem: "Series is " + strconv.Quote(in.Series) + ", not the event's text " + strconv.Quote(e.String()) +
			" (set Series to Event.String(), the name under which the indicator joins the data)"}
	case !in.Diff.IsOne():
		return &ModelError{Part: part, Problem: "an event takes no differencing (a differenced step is a pulse: write pulse)"}
	}
	return nil
}

// Sample returns the 0-based sample of the event in a record whose
// sample 0 is at start with sample interval iv: Index for an event given
// as an index (start and iv are not used), else the first sample at or
// after At (a time between two samples belongs to the next one, the
// first that can show the event). For a clock unit the count is exact
// in nanoseconds; for a calendar unit (mo, qtr, yr, a whole number of
// months per sample) samples are start plus whole months
// (time.Time.AddDate). A time within a millionth of an interval of a
// sample (1 ms for a calendar unit) counts as that sample, so that a
// start time rounded in floating point (tf/record keeps times as
// float64 seconds) does not move an event by one sample. The result is
// negative for a time before start.
// A *ModelError reports a timestamp without a start time or interval, an
// interval that is not a whole number of nanoseconds or months, and a
// sample beyond MaxEventIndex.
func (e Event) Sample(start time.Time, iv Interval) (int, error) {
	if e.At.IsZero() {
		return e.Index, nil
	}
	part := "event " + e.String()
	if start.IsZero() || !(iv.Value > 0) {
		return 0, &ModelError{Part: part, Problem: "is given as a time, so the record's start time and sample interval are needed " +
			"(a record with a time column has both; or write the sample index, as in " + e.Kind.String() + "(120))"}
	}
	if secs, ok := iv.Seconds(); ok {
		step := math.Round(secs * 1e9)
		if step < 1 || step > math.MaxInt64/2 {
			return 0, &ModelError{Part: part, Problem: "the sample interval " + iv.String() + " is not a whole number of nanoseconds"}
		}
		d := e.At.Sub(start)
		if d == math.MaxInt64 || d == math.MinInt64 {
			return 0, &ModelError{Part: part, Problem: "lies over 292 years from the record's start " + FormatEventTime(start)}
		}
		return eventCount(int64(d), int64(step), part)
	}
	months, ok := iv.Months()
	if !ok || months != math.Trunc(months) || months > 1200 {
		return 0, &ModelError{Part: part, Problem: "the sample interval " + iv.String() + " is not a whole number of months up to 100 years"}
	}
	m := int(months)
	// A first guess from the calendar months between the two, then the
	// exact sample by AddDate.
	k := ((e.At.Year()-start.Year())*12 + int(e.At.Month()-start.Month())) / m
	if k > MaxEventIndex || k < -MaxEventIndex {
		return 0, &ModelError{Part: part, Problem: "lies more than " + strconv.Itoa(MaxEventIndex) + " samples from the record's start"}
	}
	before := func(k int) bool { return start.AddDate(0, k*m, 0).Add(time.Millisecond).Before(e.At) }
	for before(k) {
		k++
	}
	for !before(k - 1) {
		k--
	}
	return k, nil
}

// eventCount returns ceil(d / step), d within step/10^6 (at least 1 ns)
// of a multiple of step counting as that multiple, within MaxEventIndex.
func eventCount(d, step int64, part string) (int, error) {
	tol := max(step/1_000_000, 1)
	q, r := d/step, d%step
	switch {
	case r > tol:
		q++
	case r < 0 && -r > step-tol:
		q--
	}
	if q > MaxEventIndex || q < -MaxEventIndex {
		return 0, &ModelError{Part: part, Problem: "lies more than " + strconv.Itoa(MaxEventIndex) + " samples from the record's start"}
	}
	return int(q), nil
}

// Indicator returns the event's indicator over samples 0..n-1 of a
// record whose sample 0 is at start with sample interval iv (see Sample):
// for a step 0 before the event's sample and 1 from it on, for a pulse 1
// at it and 0 elsewhere. An event outside the record gives all zeros (a
// pulse, or a step after the end) or all ones (a step before the start).
// Errors as for Sample, and a *SettingError for n < 0.
func (e Event) Indicator(n int, start time.Time, iv Interval) ([]float64, error) {
	if n < 0 {
		return nil, &SettingError{Setting: "n", Value: strconv.Itoa(n), Rule: "the number of samples must not be negative"}
	}
	T, err := e.Sample(start, iv)
	if err != nil {
		return nil, err
	}
	x := make([]float64, n)
	switch {
	case e.Kind == Pulse && T >= 0 && T < n:
		x[T] = 1
	case e.Kind == Step:
		for t := max(T, 0); t < n; t++ {
			x[t] = 1
		}
	}
	return x, nil
}

// EventData returns the indicators of the model's event inputs over a
// record of n samples whose sample 0 is at start (the zero time when no
// event is given as a time), keyed by each input's Series (the event's
// text), for estimation to add to its data before it looks the inputs
// up. The sample interval is m.Interval, or iv when that is zero. Each
// event must fall within the record (sample 0..n-1), else its effect
// cannot be estimated: a *ModelError naming the input says where it
// falls. A model without events gives an empty map. For a forecast h
// samples ahead call it with n + h (a step stays 1, a pulse 0).
func (m Model) EventData(n int, start time.Time, iv Interval) (map[string][]float64, error) {
	if m.Interval != (Interval{}) {
		iv = m.Interval
	}
	out := map[string][]float64{}
	for _, in := range m.Inputs {
		if in.Event == nil {
			continue
		}
		T, err := in.Event.Sample(start, iv)
		if err != nil {
			return nil, err
		}
		if T < 0 || T >= n {
			where := "before the record's first sample"
			if T >= n {
				where = "after the record's last sample, " + strconv.Itoa(n-1)
			}
			return nil, &ModelError{Part: "input " + in.Series, Problem: "the event falls at sample " + strconv.Itoa(T) + ", " + where +
				", so the record cannot show its effect; move the event or drop the input"}
		}
		x, err := in.Event.Indicator(n, start, iv)
		if err != nil {
			return nil, err
		}
		out[in.Series] = x
	}
	return out, nil
}

// WithOutliers returns a copy of m (sharing nothing with it) with the
// outliers found in its residuals by arma.Outliers added as event
// inputs, so that a refit estimates their sizes jointly with the model
// (the second stage of Chen & Liu 1993), each gain free and starting at
// the size found, named by kind and sample.
//
// An outlier is a disturbance of the output y itself (arma.OutlierKind),
// while the model's inputs enter the differenced equation D(B) y_t =
// ...; so each event term carries the output differencing D(B) (Box &
// Tiao 1975: the intervention on the series as observed, differenced
// with it). For a model without differencing, and for one with D(B) =
// (1 - B):
//
//	kind              term                      no D(B)                        D(B) = (1 - B)
//	additive          w D(B) pulse(T)           ao120 pulse(120)               ao120 (1 - B) pulse(120)
//	level shift       w D(B) step(T)            ls120 step(120)                ls120 pulse(120)
//	temporary change  w D(B)/(1 - d B) pulse(T) tc120 / (1 - 0.7 B) pulse(120) tc120 (1 - B) / (1 - 0.7 B) pulse(120)
//
// the decay d of a temporary change held at decay. For a level shift
// one factor (1 - B) of D(B), when it has one, cancels the step's sum
// and leaves a pulse ((1 - B) step(T) = pulse(T)); other factors stay as
// written, so that with D(B) = (1 - B^12) a level shift is
// ls120 (1 - B^12) step(120).
//
// An innovational outlier is a shock of the noise model, w theta(B) /
// phi(B) at T in the differenced equation, the same as a large a_T: it
// is not an input term and is left out, returned in skipped (its effect
// is the residual at T of the refit).
//
// A *SettingError reports an outlier with a negative Index (or one above
// MaxEventIndex), a Kind that is not one of the four, or a Size that is
// not finite, naming it as outs[i]; a *ModelError a name or an event the
// model already has, and a decay of a temporary change outside (0, 1).
// An index after the record's end is refused when the model is fitted
// (EventData).
func (m Model) WithOutliers(outs []arma.Outlier, decay float64) (_ Model, skipped []arma.Outlier, err error) {
	out := m.Clone()
	used := map[string]bool{}
	for _, c := range m.Params() {
		used[c.Name] = true
	}
	for _, in := range m.Inputs {
		used[in.Series] = true
	}
	for i, o := range outs {
		if err := checkOutlier(i, o); err != nil {
			return Model{}, nil, withOp("tf.Model.WithOutliers", err)
		}
		if o.Kind == arma.Innovational {
			skipped = append(skipped, o)
			continue
		}
		name := map[arma.OutlierKind]string{arma.Additive: "ao", arma.LevelShift: "ls", arma.TemporaryChange: "tc"}[o.Kind] + strconv.Itoa(o.Index)
		in := outlierInput(o, name, m.Diff)
		if used[name] || used[in.Series] {
			return Model{}, nil, withOp("tf.Model.WithOutliers", &ModelError{Part: "outlier " + name + " " + in.Series,
				Problem: "the model already has this name or event; drop the outlier or rename the model's coefficient"})
		}
		used[name], used[in.Series] = true, true
		if o.Kind == arma.TemporaryChange {
			if !(decay > 0 && decay < 1) {
				return Model{}, nil, withOp("tf.Model.WithOutliers", &ModelError{Part: "outlier " + name,
					Problem: "decay " + strconv.FormatFloat(decay, 'g', -1, 64) + " of a temporary change must lie strictly between 0 and 1 (use the OutlierReport's Decay)"})
			}
			in.Den = Poly{Factors: []Factor{{Exp: 1, Terms: []Term{{Coef: Coef{Value: 1}}, {Neg: true, Power: 1, Coef: Coef{Value: decay}}}}}}
		}
		out.Inputs = append(out.Inputs, in)
	}
	return out, skipped, nil
}

// checkOutlier refuses an outlier WithOutliers cannot place: a sample
// index outside 0..MaxEventIndex, an unknown kind, a size that is not
// finite.
func checkOutlier(i int, o arma.Outlier) error {
	at := "outs[" + strconv.Itoa(i) + "]"
	switch {
	case o.Index < 0 || o.Index > MaxEventIndex:
		return &SettingError{Setting: at + ".Index", Value: strconv.Itoa(o.Index),
			Rule: "an outlier's sample index must lie in 0.." + strconv.Itoa(MaxEventIndex) + " (the index into the record, as arma.Outliers gives it)"}
	case o.Kind < arma.Additive || o.Kind > arma.Innovational:
		return &SettingError{Setting: at + ".Kind", Value: strconv.Itoa(int(o.Kind)),
			Rule: "must be arma.Additive, arma.LevelShift, arma.TemporaryChange or arma.Innovational"}
	case math.IsNaN(o.Size) || math.IsInf(o.Size, 0):
		return &SettingError{Setting: at + ".Size", Value: strconv.FormatFloat(o.Size, 'g', -1, 64), Rule: "an outlier's size must be finite"}
	}
	return nil
}

// outlierInput returns the event input of an additive, level-shift or
// temporary-change outlier o on the output of a model with output
// differencing diff: gain name (free, starting at o.Size) times diff, on
// pulse(T), or on step(T) for a level shift whose diff has no factor
// (1 - B) to cancel the step's sum (WithOutliers). The denominator of a
// temporary change is left to the caller.
func outlierInput(o arma.Outlier, name string, diff Poly) Input {
	d := diff.Clone()
	for i := range d.Factors {
		d.Factors[i].Pos = Pos{}
		d.Factors[i].Terms = append([]Term(nil), d.Factors[i].Terms...)
		for j := range d.Factors[i].Terms {
			d.Factors[i].Terms[j].Coef.Pos = Pos{}
		}
	}
	kind := Pulse
	if o.Kind == arma.LevelShift {
		kind = Step
		for i, f := range d.Factors {
			if isFirstDifference(f) {
				kind = Pulse
				if d.Factors[i].Exp--; d.Factors[i].Exp == 0 {
					d.Factors = append(d.Factors[:i], d.Factors[i+1:]...)
				}
				break
			}
		}
	}
	in := Input{Event: &Event{Kind: kind, Index: o.Index}}
	in.Series = in.Event.String()
	in.Num = Poly{Factors: append([]Factor{{Exp: 1, Terms: []Term{{Coef: Coef{Name: name, Free: true, Value: o.Size}}}}}, d.Factors...)}
	return in
}

// isFirstDifference reports whether the factor's base is (1 - B) written
// with fixed numbers.
func isFirstDifference(f Factor) bool {
	for _, t := range f.Terms {
		if t.Coef.Name != "" {
			return false
		}
	}
	c := Poly{Factors: []Factor{{Terms: f.Terms, Exp: 1}}}.Coeffs()
	return len(c) == 2 && c[0] == 1 && c[1] == -1
}
