package main

import (
	"fmt"
	"math"

	"github.com/backshift/backshift/examples/chart"
	"github.com/backshift/backshift/tf"
	"gonum.org/v1/plot/vg/draw"
)

// marks are what the data and fit pictures mark on the output: the
// outliers found in the residuals (a ring on the sample, labelled in the
// legend with its kind and time), the event inputs of the model (a
// vertical line at the event's sample, labelled with the event) and the
// gaps of the output (a shaded band over the missing samples, labelled
// with their times).
type marks struct {
	outliers []FoundOutlier
	events   []markedEvent
	gaps     []OutputGap
}

// markedEvent is an event input of the model placed on the record.
type markedEvent struct {
	index int
	label string
}

// pictureMarks gathers the marks of a run: the outliers of res (nil
// with -outliers off) and the event inputs of m that fall in the record.
func pictureMarks(m tf.Model, res *Outliers, ds *dataset) *marks {
	mk := &marks{}
	if res != nil {
		mk.outliers = res.Found
	}
	if ds.gaps != nil {
		mk.gaps = ds.gaps.Output
	}
	for _, in := range m.Inputs {
		if in.Event == nil {
			continue
		}
		i, ok := ds.eventIndex(*in.Event)
		if ok && i >= 0 && i < ds.n {
			mk.events = append(mk.events, markedEvent{index: i, label: "event " + in.Event.String()})
		}
	}
	return mk
}

// eventIndex is the sample of event e: its Index, or for an event given
// as a time, its place on the record's clock (false without a calendar
// clock).
func (ds *dataset) eventIndex(e tf.Event) (int, bool) {
	if e.At.IsZero() {
		return e.Index, true
	}
	c := ds.times
	if c == nil || !c.calendar || !(c.step > 0) {
		return 0, false
	}
	secs := float64(e.At.UnixNano()) / 1e9
	return int(math.Ceil((secs-c.t0)/c.step - 1e-9)), true
}

// draw puts the marks on panel c, whose x axis is t (one entry per
// sample) and whose plotted series is y.
func (mk *marks) draw(c *chart.Chart, t, y []float64) {
	if mk == nil {
		return
	}
	lo, hi := finiteSpan(y)
	for i, g := range mk.gaps {
		// Half a sample either side, so that a single missing sample
		// shows as a band.
		dt := 1.0
		if len(t) > 1 {
			dt = t[1] - t[0]
		}
		x := []float64{t[g.First] - dt/2, t[g.Last] + dt/2}
		b := c.Band(x, []float64{lo, lo}, []float64{hi, hi}, palette.gap)
		switch {
		case i < maxGapLabels:
			c.Legend(fmt.Sprintf("output missing: %s to %s", g.From, g.To), b)
		case i == maxGapLabels:
			c.Legend(fmt.Sprintf("output missing: %d more gaps", len(mk.gaps)-maxGapLabels), b)
		}
	}
	for _, e := range mk.events {
		c.Legend(e.label, c.VLine(t[e.index], lo, hi, palette.truth).Dashed(4, 3))
	}
	for _, o := range mk.outliers {
		if o.Index < 0 || o.Index >= len(t) || !finite(y[o.Index]) {
			continue
		}
		label := fmt.Sprintf("outlier: %s, %s", o.Kind, o.When)
		c.Legend(label, c.Dots(t[o.Index:o.Index+1], y[o.Index:o.Index+1], palette.mark, draw.RingGlyph{}, 5))
	}
}

// maxGapLabels is the number of gaps labelled one by one in a legend.
const maxGapLabels = 3

// finiteSpan is the range of the finite values of y (0, 1 when none).
func finiteSpan(y []float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range y {
		if finite(v) {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	if lo > hi {
		return 0, 1
	}
	return lo, hi
}
