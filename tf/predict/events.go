package predict

import (
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/tf"
)

// An event input (tf.Input.Event: step(T), pulse(T)) is not fed: the
// predictor builds its indicator from the sample count, as the fit
// builds it from the record (tf.Model.EventData). An event given as a
// sample index T is at the predictor's sample T - Settings.Offset,
// counted from the first sample fed after New, Reset or Warm (so that
// Offset 0 and Warm with the fit's record keep the fit's indices); an
// event given as a time is placed by Settings.Start, the time of that
// first sample, and the model's sample interval (tf.Event.Sample). A
// step is 1 from its sample on, a pulse 1 at its sample only; an event
// before sample 0 gives a step that is 1 throughout (held at 1 before
// the first sample, whatever ZeroPreSample says: it is in its steady
// state) and a pulse that never shows.

// event is a compiled event input: its kind and sample.
type event struct {
	step bool
	at   int
}

// compileEvent places the event of input in and returns its column
// (encoded as -1 - k for the k-th distinct event, fixed up once the
// series are counted); inputs with the same event share a column.
func (pl *plan) compileEvent(m tf.Model, in tf.Input, set Settings, seen map[string]int) (int, error) {
	if k, ok := seen[in.Series]; ok {
		return -1 - k, nil
	}
	at, err := in.Event.Sample(set.Start, m.Interval)
	if in.Event.At.IsZero() {
		at -= set.Offset // Offset >= 0 and at <= tf.MaxEventIndex: no overflow
	}
	if err != nil {
		return 0, &errs.ModelError{Part: "input " + strconv.Quote(in.Series),
			Problem: "the event cannot be placed (" + err.Error() + "); give Settings.Start, the time of the first sample fed, and the model's sample interval, or the event as a sample index", Err: err}
	}
	k := len(pl.events)
	seen[in.Series] = k
	pl.events = append(pl.events, event{step: in.Event.Kind == tf.Step, at: at})
	pl.evNames = append(pl.evNames, in.Series)
	return -1 - k, nil
}

// past reports whether column k (of the series and events) is an event
// that falls before sample 0: a step held at 1 before the first sample,
// or a pulse that never shows.
func (pl *plan) past(k int) bool {
	n := len(pl.names)
	return k >= n && pl.events[k-n].at < 0
}

// fillEvents writes the events' indicators at sample t into dst.
func (pl *plan) fillEvents(dst []float64, t int) {
	for k, e := range pl.events {
		v := 0.0
		if t == e.at || e.step && t > e.at {
			v = 1
		}
		dst[k] = v
	}
}

// withEvents returns x extended by the events' indicators at sample t,
// in the scratch row, or x itself for a model without events.
func (p *Predictor) withEvents(x []float64, t int) []float64 {
	if len(p.p.events) == 0 {
		return x
	}
	n := len(p.p.names)
	copy(p.xfull, x)
	p.p.fillEvents(p.xfull[n:], t)
	return p.xfull
}
