package fit

import (
	"math"
	"strconv"
	"time"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// withEvents returns data with the indicator series of m's event inputs
// added (tf.Model.EventData over the output's length, sample 0 at
// start), in a new map that shares the caller's slices; data itself
// when m has no events. A column of data named like one of the events
// is refused: the indicator is the model's own, not the caller's.
func withEvents(m tf.Model, data map[string][]float64, start time.Time) (map[string][]float64, error) {
	if !hasEvents(m) {
		return data, nil
	}
	ev, err := m.EventData(len(data[m.Output]), start, tf.Interval{})
	if err != nil {
		return nil, err
	}
	out := make(map[string][]float64, len(data)+len(ev))
	for k, v := range data {
		out[k] = v
	}
	for k, v := range ev {
		if _, ok := data[k]; ok {
			return nil, &errs.SeriesError{Series: k, Kind: errs.ErrName,
				Detail: "the data hold a column named like the event input " + strconv.Quote(k) + "; the model builds that indicator itself: rename or drop the column"}
		}
		out[k] = v
	}
	return out, nil
}

// hasEvents reports whether some input of m is an event (a step or a
// pulse at a known time) rather than a data column.
func hasEvents(m tf.Model) bool {
	for _, in := range m.Inputs {
		if in.Event != nil {
			return true
		}
	}
	return false
}

// eventFutures returns futures with the next h samples of every event
// input of e's model added (their future is known: a step stays 1, a
// pulse 0 after its sample; an event after the horizon is still 0),
// unless the caller gave them; futures itself when the model has none.
// n is the length of the record forecast from.
func eventFutures(e *Estimate, futures map[string][]float64, n, h int) (map[string][]float64, error) {
	if !hasEvents(e.Model) {
		return futures, nil
	}
	out := make(map[string][]float64, len(futures)+len(e.Model.Inputs))
	for k, v := range futures {
		out[k] = v
	}
	for _, in := range e.Model.Inputs {
		if _, ok := out[in.Series]; ok || in.Event == nil {
			continue
		}
		x, err := in.Event.Indicator(n+h, e.Conditioning.Start, e.Model.Interval)
		if err != nil {
			return nil, err
		}
		out[in.Series] = x[n:]
	}
	return out, nil
}

// eventsAhead prepares a forecast from data of n samples, shorter than
// the fit's record, for the event inputs whose effect (the event's
// sample plus the dead time) is not yet in data: such an event cannot
// be estimated from data, but its size is the estimate's and its
// indicator is known, so it is passed on as a known series (its
// indicator over data added to a copy of data, and the event taken off
// a shallow copy of e whose model is a clone, its coefficients held at
// their estimates). It returns e and data
// themselves when every event's effect lies in data.
func eventsAhead(e *Estimate, data map[string][]float64, n int) (*Estimate, map[string][]float64, error) {
	var ahead []int
	for i, in := range e.Model.Inputs {
		if in.Event == nil {
			continue
		}
		T, err := in.Event.Sample(e.Conditioning.Start, e.Model.Interval)
		if err != nil {
			return nil, nil, err
		}
		if T+in.Delay >= n {
			ahead = append(ahead, i)
		}
	}
	if len(ahead) == 0 {
		return e, data, nil
	}
	e2 := *e
	e2.Model = e.Model.Clone()
	d2 := make(map[string][]float64, len(data)+len(ahead))
	for k, v := range data {
		d2[k] = v
	}
	for _, i := range ahead {
		in := &e2.Model.Inputs[i]
		if _, ok := data[in.Series]; ok {
			return nil, nil, &errs.SeriesError{Series: in.Series, Kind: errs.ErrName,
				Detail: "the data hold a column named like the event input " + strconv.Quote(in.Series) + "; the model builds that indicator itself: rename or drop the column"}
		}
		x, err := in.Event.Indicator(n, e.Conditioning.Start, e.Model.Interval)
		if err != nil {
			return nil, nil, err
		}
		d2[in.Series] = x
		in.Event = nil
		holdNames(&e2.Model, append(polyNames(in.Num), polyNames(in.Den)...))
	}
	return &e2, d2, nil
}

// holdNames holds (Free false, value kept) every coefficient of m named
// in names, wherever it appears: a forecast needs the estimates only,
// and an event input that does not move over the data is refused as an
// input to estimate.
func holdNames(m *tf.Model, names []string) {
	hold := map[string]bool{}
	for _, n := range names {
		hold[n] = true
	}
	fix := func(c *tf.Coef) {
		if hold[c.Name] {
			c.Free = false
		}
	}
	m.Diff.Each(fix)
	for _, in := range m.Inputs {
		in.Diff.Each(fix)
	}
	m.EachParam(fix)
}

// dropEventPlanWarnings removes the PlanOutsideRecord warnings of event
// inputs from fc: an event's future is the model's, not a plan, and a
// step still ahead of the data's end leaves the values seen in data.
func dropEventPlanWarnings(m tf.Model, fc *Forecast) {
	events := map[string]bool{}
	for _, in := range m.Inputs {
		if in.Event != nil {
			events[in.Series] = true
		}
	}
	kept := fc.Warnings[:0]
	for _, w := range fc.Warnings {
		if w.Kind != PlanOutsideRecord || !events[w.Input] {
			kept = append(kept, w)
		}
	}
	fc.Warnings = kept
}

// eventsAfterFirst refuses an event input whose effect (its indicator
// delayed by the input's dead time) does not change over the residuals
// summed, from first on: a step that has already begun by then is a
// second constant, a pulse before then never enters the sum, and either
// way its size cannot be estimated (J'J would be singular).
func eventsAfterFirst(m tf.Model, data map[string][]float64, first int) error {
	for _, in := range m.Inputs {
		if in.Event == nil {
			continue
		}
		x := data[in.Series]
		at := -1
		for t, v := range x {
			if v != 0 {
				at = t
				break
			}
		}
		if at < 0 {
			continue
		}
		effect := at + in.Delay
		late := effect >= len(x)
		early := effect < first || in.Event.Kind == tf.Step && effect == first
		if !late && !early {
			continue
		}
		what := "its effect begins at sample " + strconv.Itoa(effect)
		if in.Delay > 0 {
			what += " (the event's sample " + strconv.Itoa(at) + " plus the dead time " + strconv.Itoa(in.Delay) + ")"
		}
		if late {
			return &errs.ModelError{Part: "input " + in.Series, Problem: what + ", after the record's last sample " + strconv.Itoa(len(x)-1) +
				", so the record cannot show it; move the event or drop the input"}
		}
		return &errs.ModelError{Part: "input " + in.Series, Problem: what + ", but the residuals are summed from sample " + strconv.Itoa(first) +
			" on (Conditioning.First: the start-up the model's orders and Settings.First need), over which the indicator does not change" +
			", so its size cannot be estimated; place the event after sample " + strconv.Itoa(first)}
	}
	return nil
}

// eventsInGaps refuses, for an ExactML fit, an event input with a
// coefficient whose effect on the output falls only on missing (NaN)
// output samples: the likelihood then does not depend on it, the
// observed information is singular and no standard error exists (the
// refusal of eventsAfterFirst, for a gap). The effect of an event at
// sample T with dead time b starts at T + b. On the output as observed
// it is finite when the input's denominator, the output differencing
// D(B) and, for a step, its sum 1/(1 - B) all cancel against factors of
// the numerator written alike with fixed numbers (WithOutliers' terms:
// w pulse(T) acts at T only, w (1 - B) pulse(T) on a (1 - B) model
// too); then each free coefficient of the numerator acts on the samples
// where its own pattern (its derivative of the numerator, divided by
// what cancelled) is not zero, and one of those must be observed.
// Otherwise (a step, or a term through a denominator or an uncancelled
// differencing) the effect lasts to the record's end, and only a gap
// reaching the end refuses it: a decay seen after a gap carries the
// size. The other placements (outside the record, before First) are
// left to newWork's checks; y is the output as given.
func eventsInGaps(m tf.Model, y []float64, start time.Time) error {
	if !hasEvents(m) || len(gapsOf(y)) == 0 {
		return nil
	}
	n := len(y)
	observed := func(from, to int) bool {
		for t := from; t <= min(to, n-1); t++ {
			if !math.IsNaN(y[t]) {
				return true
			}
		}
		return false
	}
	for _, in := range m.Inputs {
		if in.Event == nil {
			continue
		}
		T, err := in.Event.Sample(start, m.Interval)
		if err != nil || T < 0 || T+in.Delay >= n {
			continue
		}
		from := T + in.Delay
		names, pats, finite := eventPatterns(m, in)
		if !finite {
			if !observed(from, n-1) {
				return eventGapErr(in, "", y, from, n-1)
			}
			continue
		}
		for i, pat := range pats {
			seen, lo, hi := false, -1, -1
			for j, v := range pat {
				if v == 0 || from+j >= n {
					continue
				}
				if lo < 0 {
					lo = j
				}
				hi = j
				seen = seen || !math.IsNaN(y[from+j])
			}
			if lo >= 0 && !seen {
				return eventGapErr(in, names[i], y, from+lo, from+hi)
			}
		}
	}
	return nil
}

// eventGapErr is eventsInGaps' error: the event input in (and its
// coefficient name, when the effect is finite) acts on the output at
// samples from..to only, all missing.
func eventGapErr(in tf.Input, name string, y []float64, from, to int) error {
	g := gap{from, 1}
	for _, gp := range gapsOf(y) {
		if gp.start <= from && from < gp.start+gp.n {
			g = gp
		}
	}
	what := "its effect on the output"
	if name != "" {
		what = "the effect of its coefficient " + name + " on the output"
	}
	span := "sample " + strconv.Itoa(from)
	switch {
	case to == len(y)-1 && name == "":
		span = "samples " + strconv.Itoa(from) + ".." + strconv.Itoa(to) + " (to the record's end)"
	case to > from:
		span = "samples " + strconv.Itoa(from) + ".." + strconv.Itoa(to)
	}
	return &errs.ModelError{Part: "input " + in.Series, Problem: what + " falls on " + span +
		", all inside the missing output samples " + strconv.Itoa(g.start) + ".." + strconv.Itoa(g.start+g.n-1) +
		", so the record cannot show it and it cannot be estimated; move the event, drop the input, or fit a record that observes it"}
}

// eventPatterns returns, for an event input whose effect on the output
// is finite (finite true: every factor of its denominator, of the
// output differencing and, for a step, 1/(1 - B) matched by a factor of
// the numerator written alike with fixed numbers), the free
// coefficients of its numerator in written order and the pattern of
// each one's effect from the effect's first sample on (the derivative
// of the numerator's coefficients, divided by the matched factors).
func eventPatterns(m tf.Model, in tf.Input) (names []string, pats [][]float64, finite bool) {
	key := func(f tf.Factor) (string, []float64) {
		for _, t := range f.Terms {
			if t.Coef.Name != "" {
				return "", nil
			}
		}
		c := tf.Poly{Factors: []tf.Factor{{Terms: f.Terms, Exp: 1}}}.Coeffs()
		return fmtCoeffs(c), c
	}
	num := map[string]int{}
	for _, f := range in.Num.Factors {
		if k, c := key(f); len(c) > 1 {
			num[k] += f.Exp
		}
	}
	dens := append(append([]tf.Factor(nil), in.Den.Factors...), m.Diff.Factors...)
	if in.Event.Kind == tf.Step {
		dens = append(dens, tf.Factor{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Value: 1}}, {Neg: true, Power: 1, Coef: tf.Coef{Value: 1}}}})
	}
	den := []float64{1}
	for _, f := range dens {
		k, c := key(f)
		if c != nil && len(c) == 1 {
			continue
		}
		if c == nil || num[k] < f.Exp {
			return nil, nil, false
		}
		num[k] -= f.Exp
		den = poly.Mul(den, poly.Pow(c, f.Exp))
	}
	idx := map[string]int{}
	in.Num.Each(func(c *tf.Coef) {
		if _, ok := idx[c.Name]; c.Free && !ok {
			idx[c.Name] = len(names)
			names = append(names, c.Name)
		}
	})
	_, d := in.Num.Grad(func(name string) int {
		if i, ok := idx[name]; ok {
			return i
		}
		return -1
	}, len(names))
	for _, g := range d {
		p, err := poly.Divide(g, den, max(len(g)-len(den)+1, 1))
		if err != nil {
			return nil, nil, false
		}
		pats = append(pats, p)
	}
	return names, pats, true
}

// fmtCoeffs formats coefficients exactly, for comparing factors.
func fmtCoeffs(c []float64) string {
	s := ""
	for _, v := range c {
		s += strconv.FormatFloat(v, 'g', -1, 64) + " "
	}
	return s
}
