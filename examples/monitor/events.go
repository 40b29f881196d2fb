package main

import (
	"fmt"
	"strconv"
	"strings"
	"time"

	"github.com/backshift/backshift/tf"
)

// Events of a model in service.
//
// An event of a saved model (step(T), pulse(T): a known intervention,
// such as a level shift the fit found) is placed in the record the model
// was fitted to: T is a sample of that record, or a time. The predictor
// (tf/predict) counts events from the first sample fed to it, so the
// service moves each event to its place in the live stream before it
// builds the predictor: to live sample T - P0 for an event at record
// sample T when the stream starts at record sample P0, or to the live
// sample of its time when the stream's first sample has a time. An event
// before the stream has happened: a step is on throughout (the predictor
// takes it as held on before the first sample, so its path starts at its
// steady state) and a pulse is over (its term is left out). An event in
// the stream's future comes on at its sample, as in the fit.
//
// Where the stream starts is given by -from 'loop=POS', POS a record
// sample (the record's length when the stream follows the record) or the
// time of the first live sample. Without it the stream is taken to start
// right after the fit's record: at record sample "samples" of the
// config's validity record, which examples/identify -save writes, so
// that every event the fit placed in its record has happened. When the
// validity record also holds the time of the record's first sample
// ("start"), record samples and times convert into each other, so every
// event is placed exactly and -from may be either. Without it a timed
// event is taken as past when the model carries its validity record (the
// fit placed it inside the record) and its time is before the service's
// clock at start; otherwise -from must say where it falls. A
// sample line's "stamp" is an integer in the caller's unit, so it does
// not place events: the live samples follow the first at the model's
// sample interval, one line each.

// streamStart is where a loop's live stream starts against the record
// its model was fitted to, as -from gives it: a record sample, or the
// time of the first live sample.
type streamStart struct {
	Index int       // record sample of the first live sample, when At is zero
	At    time.Time // time of the first live sample, or zero
}

// parseStreamStart reads the POS of -from 'loop=POS'.
func parseStreamStart(v string) (streamStart, error) {
	v = strings.TrimSpace(v)
	if i, err := strconv.Atoi(v); err == nil {
		if i < 0 || i > tf.MaxEventIndex {
			return streamStart{}, fmt.Errorf("the record sample %d is outside 0..%d; the record's first sample is 0", i, tf.MaxEventIndex)
		}
		return streamStart{Index: i}, nil
	}
	at, err := tf.ParseEventTime(v)
	if err != nil {
		return streamStart{}, fmt.Errorf("%q is neither a record sample (a whole number) nor a time such as 2026-03-30T08:00 or 2026-03-30T08:00+01:00", v)
	}
	return streamStart{At: at}, nil
}

// placement is what the service knows of where the stream starts: the
// record sample p0 (when known0) and the time at (when not zero), in
// words, and the time rec of the record's first sample (when not zero).
type placement struct {
	p0     int
	known0 bool
	at     time.Time
	words  string
	rec    time.Time
}

// where returns the placement of e's stream: from the -from of the loop
// (nil when not given), else right after the record of e's validity. The
// validity's start, when given, turns a -from time into a record sample.
func (e entry) where(from *streamStart) (placement, error) {
	var pl placement
	if v := e.Validity; v != nil && v.Start != "" {
		t, err := tf.ParseEventTime(v.Start)
		if err != nil {
			return pl, fmt.Errorf("the start %q of its validity record is not a time such as 2026-03-28T12:00", v.Start)
		}
		pl.rec = t
	}
	switch {
	case from != nil && from.At.IsZero():
		pl.p0, pl.known0, pl.words = from.Index, true, fmt.Sprintf("the stream starts at record sample %d, by -from", from.Index)
	case from != nil:
		pl.at, pl.words = from.At, "the stream starts at "+tf.FormatEventTime(from.At)+", by -from"
		if !pl.rec.IsZero() {
			p0, err := tf.Event{Kind: tf.Step, At: from.At}.Sample(pl.rec, e.Spec.Model.Interval)
			if err != nil {
				return pl, fmt.Errorf("-from: %w", err)
			}
			pl.p0, pl.known0 = p0, true
		}
	case e.Validity != nil && e.Validity.Samples > 0:
		n := e.Validity.Samples
		pl.p0, pl.known0, pl.words = n, true, fmt.Sprintf("the stream starts at record sample %d, right after the fit's record of %d samples", n, n)
	}
	return pl, nil
}

// placeEvents returns the model the loop's predictor runs, e's model
// with its events placed on the live stream (see the comment above), and
// a line per event saying where it falls. from is the loop's -from or
// nil; now is the service's clock at start. A model without events is
// returned as it is.
func (e entry) placeEvents(from *streamStart, now time.Time) (tf.Model, []string, error) {
	m := e.Spec.Model
	pl, err := e.where(from)
	if err != nil {
		return tf.Model{}, nil, err
	}
	live := m.Clone()
	live.Inputs = live.Inputs[:0]
	var lines []string
	for _, in := range m.Clone().Inputs {
		if in.Event == nil {
			live.Inputs = append(live.Inputs, in)
			continue
		}
		at, past, err := e.liveSample(*in.Event, pl, from, now)
		if err != nil {
			return tf.Model{}, nil, fmt.Errorf("event %s: %w", in.Series, err)
		}
		kind := in.Event.Kind
		switch {
		case past && kind == tf.Pulse:
			lines = append(lines, fmt.Sprintf("%s: %s: the pulse is over, its term is left out", in.Series, pl.before()))
			continue
		case past:
			at = 0 // on from the first sample, and held on before it
			lines = append(lines, fmt.Sprintf("%s: %s: the step is on throughout", in.Series, pl.before()))
		default:
			lines = append(lines, fmt.Sprintf("%s: at live sample %d (%s): the %s comes at that sample", in.Series, at, pl.words, kind))
		}
		in.Event = &tf.Event{Kind: kind, Index: at}
		in.Series = in.Event.String()
		live.Inputs = append(live.Inputs, in)
	}
	if len(lines) == 0 {
		return m, nil, nil
	}
	return live, lines, nil
}

// before says that an event falls before the stream.
func (pl placement) before() string {
	if pl.words == "" {
		return "inside the fit's record, before the stream (no -from given; the event's time is before the service's clock)"
	}
	return "before the live stream (" + pl.words + ")"
}

// liveSample returns the live sample of ev, or past when it falls
// before the stream's first sample.
func (e entry) liveSample(ev tf.Event, pl placement, from *streamStart, now time.Time) (int, bool, error) {
	if ev.At.IsZero() {
		if !pl.known0 {
			why := "the config does not say how long the fit's record was (no \"validity\" record)"
			if from != nil {
				why = "-from gives the stream's start as a time, and the config does not hold the time of the record's first sample (\"start\" of its validity record)"
			}
			return 0, false, fmt.Errorf("it is at sample %d of the fit's record, and %s: give -from '%s=SAMPLE', the record sample of the first live sample (the record's length when the stream follows the record)",
				ev.Index, why, e.Name)
		}
		at := ev.Index - pl.p0
		return at, at < 0, nil
	}
	if !pl.at.IsZero() || (pl.known0 && !pl.rec.IsZero()) {
		t0, p0 := pl.at, 0
		if t0.IsZero() {
			t0, p0 = pl.rec, pl.p0 // the event's record sample, less the stream's
		}
		at, err := ev.Sample(t0, e.Spec.Model.Interval)
		if err != nil {
			return 0, false, err
		}
		return at - p0, at-p0 < 0, nil
	}
	fix := fmt.Sprintf("give -from '%s=TIME', the time of the first live sample (the stream's sample interval is the model's)", e.Name)
	switch {
	case from != nil:
		return 0, false, fmt.Errorf("it is given as a time, and -from gives the stream's start as a record sample while the config does not hold the time of the record's first sample (\"start\" of its validity record): %s", fix)
	case e.Validity == nil:
		return 0, false, fmt.Errorf("it is given as a time, and the config holds no record of the fit (\"validity\") that would place it before the stream: %s", fix)
	case !ev.At.Before(now):
		return 0, false, fmt.Errorf("it is given as a time after the service's clock (%s), so it cannot lie in the fit's record: %s", tf.FormatEventTime(now.UTC().Truncate(time.Second)), fix)
	}
	return -1, true, nil
}
