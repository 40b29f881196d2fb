package fit

import (
	"strconv"
	"time"

	"github.com/backshift/backshift/internal/errs"
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
// pulse 0 after its sample), unless the caller gave them; futures itself
// when the model has none. n is the length of the record forecast from.
func eventFutures(e *Estimate, futures map[string][]float64, n, h int) (map[string][]float64, error) {
	if !hasEvents(e.Model) {
		return futures, nil
	}
	ev, err := e.Model.EventData(n+h, e.Conditioning.Start, tf.Interval{})
	if err != nil {
		return nil, err
	}
	out := make(map[string][]float64, len(futures)+len(ev))
	for k, v := range futures {
		out[k] = v
	}
	for k, v := range ev {
		if _, ok := out[k]; !ok {
			out[k] = v[n:]
		}
	}
	return out, nil
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
