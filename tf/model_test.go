package tf_test

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// TestEventSample checks the sample of an event given as a time against
// counts worked by hand: 08:00 is 960 intervals of 30 s after midnight;
// 08:00:10 lies between samples 960 and 961 and belongs to 961, the
// first sample that can show it; 07:59:50 before a start of 08:00 lies
// between samples -1 and 0 and belongs to 0. Calendar intervals count
// whole months from the start (time.Time.AddDate).
func TestEventSample(t *testing.T) {
	day := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	eight := day.Add(8 * time.Hour)
	jan := time.Date(2020, 1, 1, 0, 0, 0, 0, time.UTC)
	cases := []struct {
		at    time.Time
		start time.Time
		iv    tf.Interval
		want  int
	}{
		{eight, day, tf.Interval{Value: 30, Unit: "s"}, 960},
		{eight.Add(10 * time.Second), day, tf.Interval{Value: 30, Unit: "s"}, 961},
		{eight.Add(-10 * time.Second), eight, tf.Interval{Value: 30, Unit: "s"}, 0},
		{eight.Add(-30 * time.Second), eight, tf.Interval{Value: 30, Unit: "s"}, -1},
		{eight, day, tf.Interval{Value: 0.5, Unit: "h"}, 16},
		{day.AddDate(0, 0, 14), day, tf.Interval{Value: 1, Unit: "wk"}, 2},
		{time.Date(2020, 7, 1, 0, 0, 0, 0, time.UTC), jan, tf.Interval{Value: 1, Unit: "mo"}, 6},
		{time.Date(2020, 6, 15, 0, 0, 0, 0, time.UTC), jan, tf.Interval{Value: 1, Unit: "mo"}, 6},
		{time.Date(2021, 1, 1, 0, 0, 0, 0, time.UTC), jan, tf.Interval{Value: 1, Unit: "qtr"}, 4},
		{time.Date(2019, 12, 1, 0, 0, 0, 0, time.UTC), jan, tf.Interval{Value: 1, Unit: "qtr"}, 0},
		{time.Date(2019, 10, 1, 0, 0, 0, 0, time.UTC), jan, tf.Interval{Value: 1, Unit: "qtr"}, -1},
		{time.Date(2030, 1, 1, 0, 0, 0, 0, time.UTC), jan, tf.Interval{Value: 1, Unit: "yr"}, 10},
		// A start a few microseconds off (float64 seconds since 1970)
		// keeps an event on its sample: within 30 us of 30 s.
		{eight, day.Add(5 * time.Microsecond), tf.Interval{Value: 30, Unit: "s"}, 960},
		{eight, day.Add(-5 * time.Microsecond), tf.Interval{Value: 30, Unit: "s"}, 960},
		{eight.Add(-10 * time.Second), eight.Add(5 * time.Microsecond), tf.Interval{Value: 30, Unit: "s"}, 0},
		{eight.Add(-30 * time.Second), eight.Add(5 * time.Microsecond), tf.Interval{Value: 30, Unit: "s"}, -1},
		{time.Date(2020, 7, 1, 0, 0, 0, 0, time.UTC), jan.Add(time.Microsecond), tf.Interval{Value: 1, Unit: "mo"}, 6},
		{time.Date(2020, 7, 1, 0, 0, 0, 0, time.UTC), jan.Add(-time.Microsecond), tf.Interval{Value: 1, Unit: "mo"}, 6},
	}
	for _, c := range cases {
		e := tf.Event{Kind: tf.Step, At: c.at}
		got, err := e.Sample(c.start, c.iv)
		if err != nil || got != c.want {
			t.Errorf("%v from %v every %v: sample %d (%v), want %d", c.at, c.start, c.iv, got, err, c.want)
		}
	}
	if k, err := (tf.Event{Kind: tf.Pulse, Index: 7}).Sample(time.Time{}, tf.Interval{}); k != 7 || err != nil {
		t.Errorf("index event: %d, %v", k, err)
	}
	bad := []struct {
		start time.Time
		iv    tf.Interval
		words string
	}{
		{time.Time{}, tf.Interval{Value: 1, Unit: "s"}, "start time and sample interval are needed"},
		{day, tf.Interval{}, "start time and sample interval are needed"},
		{day, tf.Interval{Value: 1.5, Unit: "mo"}, "not a whole number of months"},
		{day, tf.Interval{Value: 1e-12, Unit: "s"}, "not a whole number of nanoseconds"},
	}
	for _, c := range bad {
		_, err := tf.Event{Kind: tf.Step, At: eight}.Sample(c.start, c.iv)
		if !errors.Is(err, tf.ErrModel) || !strings.Contains(err.Error(), c.words) || !strings.Contains(err.Error(), "step(2026-03-01T08:00)") {
			t.Errorf("%v %v: %v", c.start, c.iv, err)
		}
	}
}

// TestEventIndicator checks the indicators of the definitions (Box &
// Tiao 1975: a step S_t = 1 for t >= T, a pulse P_t = 1 at t = T only),
// inside and outside the record.
func TestEventIndicator(t *testing.T) {
	cases := []struct {
		e    tf.Event
		want string
	}{
		{tf.Event{Kind: tf.Step, Index: 3}, "000111"},
		{tf.Event{Kind: tf.Pulse, Index: 3}, "000100"},
		{tf.Event{Kind: tf.Step, Index: 0}, "111111"},
		{tf.Event{Kind: tf.Pulse, Index: 6}, "000000"},
		{tf.Event{Kind: tf.Step, Index: 9}, "000000"},
		{tf.Event{Kind: tf.Step, At: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)}, "111111"}, // before the start
	}
	start := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	for _, c := range cases {
		x, err := c.e.Indicator(6, start, tf.Interval{Value: 1, Unit: "d"})
		if err != nil {
			t.Fatal(err)
		}
		var b strings.Builder
		for _, v := range x {
			b.WriteByte('0' + byte(v))
		}
		if b.String() != c.want {
			t.Errorf("%v: %s, want %s", c.e, b.String(), c.want)
		}
	}
	if _, err := (tf.Event{Kind: tf.Step}).Indicator(-1, start, tf.Interval{}); !errors.Is(err, tf.ErrSetting) {
		t.Errorf("n = -1: %v", err)
	}
}

// TestEventData: the indicators of a model's events keyed by the
// inputs' series names, with the model's interval; an event outside the
// record is refused, naming the input and where it falls.
func TestEventData(t *testing.T) {
	at := time.Date(2026, 3, 1, 8, 0, 0, 0, time.UTC)
	step := tf.Event{Kind: tf.Step, At: at}
	pulse := tf.Event{Kind: tf.Pulse, Index: 2}
	m := tf.Model{Output: "y", Interval: tf.Interval{Value: 1, Unit: "h"}, Inputs: []tf.Input{
		{Series: "x"}, {Series: step.String(), Event: &step}, {Series: pulse.String(), Event: &pulse}}}
	if err := m.Validate(); err != nil {
		t.Fatal(err)
	}
	data, err := m.EventData(12, at.Add(-5*time.Hour), tf.Interval{})
	if err != nil {
		t.Fatal(err)
	}
	if len(data) != 2 || data["step(2026-03-01T08:00)"][4] != 0 || data["step(2026-03-01T08:00)"][5] != 1 ||
		data["step(2026-03-01T08:00)"][11] != 1 || data["pulse(2)"][2] != 1 || data["pulse(2)"][3] != 0 {
		t.Errorf("event data %v", data)
	}
	_, err = m.EventData(5, at.Add(-5*time.Hour), tf.Interval{})
	if !errors.Is(err, tf.ErrModel) || !strings.Contains(err.Error(), "input step(2026-03-01T08:00): the event falls at sample 5, after the record's last sample, 4") {
		t.Errorf("event after the record: %v", err)
	}
	_, err = m.EventData(12, at.Add(time.Hour), tf.Interval{})
	if !errors.Is(err, tf.ErrModel) || !strings.Contains(err.Error(), "falls at sample -1, before the record's first sample") {
		t.Errorf("event before the record: %v", err)
	}
	if d, err := (tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x"}}}).EventData(10, time.Time{}, tf.Interval{}); err != nil || len(d) != 0 {
		t.Errorf("no events: %v, %v", d, err)
	}
}

// TestSimulateEvents: Model.Simulate builds an event input's indicator
// itself, as estimation does. y = 0.5 B x + 2 step(10) with x = 1 and no
// noise is 0.5 from sample 0 (settled at x's first value) and 2.5 from
// sample 10 on (worked by hand); a series named like the event is
// refused.
func TestSimulateEvents(t *testing.T) {
	m := parse.MustModel("y = 0.5 B x + 2 step(10)")
	x := make([]float64, 20)
	for i := range x {
		x[i] = 1
	}
	y, err := m.Simulate(map[string][]float64{"x": x}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, v := range y {
		want := 0.5
		if i >= 10 {
			want = 2.5
		}
		if math.Abs(v-want) > 1e-12 {
			t.Errorf("y[%d] = %v, want %v", i, v, want)
		}
	}
	if _, err := m.Simulate(map[string][]float64{"x": x, "step(10)": x}, nil); !errors.Is(err, tf.ErrName) || !strings.Contains(err.Error(), "event input") {
		t.Errorf("a series named like the event: %v", err)
	}
}
