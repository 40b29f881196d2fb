package main

import (
	"fmt"
	"math"
	"sort"
	"time"

	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// start is the time of the record's sample 0, for fit.Settings.Start
// (it places the events a spec gives as times): the first time stamp of
// a time column of dates and times (after -gaps longest, the kept
// stretch's first row's), and the zero time for a record without one
// (no time column, a column of numbers, the built-in record).
func (ds *dataset) start() time.Time {
	c := ds.times
	if c == nil || !c.calendar {
		return time.Time{}
	}
	sec := math.Floor(c.t0)
	return time.Unix(int64(sec), int64(math.Round((c.t0-sec)*1e9))).UTC()
}

// fitSettings are the settings of every fit of the record ds: the
// extra columns ignored, residuals summed from first, by method, and
// the record's start time (start) for the events given as times.
func (ds *dataset) fitSettings(first int, method fit.Method) *fit.Settings {
	return &fit.Settings{IgnoreExtra: true, First: first, Method: method, Start: ds.start()}
}

// checkTimedEvents refuses a model with an event given as a time when
// the record has no clock of dates and times to place it on, saying
// why and what to write instead. (The library's own message speaks of
// Settings.Start, which this program sets from the time column.)
func checkTimedEvents(m tf.Model, ds *dataset) error {
	if !ds.start().IsZero() {
		return nil
	}
	for _, in := range m.Inputs {
		e := in.Event
		if e == nil || e.At.IsZero() {
			continue
		}
		var why string
		switch {
		case ds.builtin || ds.demoClock:
			why = "the built-in record has no dates (its samples are minutes from the start, day 1 00:00)"
		case ds.times != nil:
			why = fmt.Sprintf("the time column of %s holds numbers (in %s), not dates and times", ds.name, ds.times.unit)
		default:
			why = fmt.Sprintf("%s has no time column (its rows are read as samples 0, 1, 2, ...)", ds.name)
		}
		return fmt.Errorf("the spec's event %s is given as a time, but %s: write it as a sample index counted from 0 (as in %s(120)), or give a record whose time column holds dates and times",
			e, why, e.Kind)
	}
	return nil
}

// wallClock writes t, seconds since 1970, as the record's time column
// writes it: in the offset from UTC of the row at or before t (with the
// offset, "Z" for UTC, when the file writes offsets; without one when
// its times carry none, which are read as UTC and so shown as written).
func (c *sampleClock) wallClock(t float64) string {
	sec := math.Floor(t)
	at := time.Unix(int64(sec), int64(math.Round((t-sec)*1e9))).UTC()
	if !c.zoned {
		return at.Format("2006-01-02 15:04:05")
	}
	off := 0
	if k := sort.SearchFloat64s(c.rows, t+1e-6); k > 0 && k-1 < len(c.offsets) {
		off = c.offsets[k-1]
	} else if len(c.offsets) > 0 {
		off = c.offsets[0]
	}
	return at.In(time.FixedZone("", off)).Format("2006-01-02 15:04:05Z07:00")
}
