package main

import (
	"bytes"
	"strings"
	"testing"
)

// TestEventHasNoRange checks that an event input of a saved model is
// shown as an event at its sample or time, not as a series whose range
// was not recorded: an indicator of a known intervention has no range.
func TestEventHasNoRange(t *testing.T) {
	for _, c := range []struct{ event, want string }{
		{"step(1500)", "      step(1500): an event (a known intervention: a step at sample 1500 of the record), a 0/1 indicator with no range to record\n"},
		{"pulse(2026-03-29T13:00)", "      pulse(2026-03-29T13:00): an event (a known intervention: a pulse at 2026-03-29T13:00), a 0/1 indicator with no range to record\n"},
	} {
		raw := []byte(`{"models": [{"name": "m", "spec": "temp = w0 B^3 valve + k ` + c.event + ` + a; every 1 min",
  "validity": {"samples": 2000, "interval": "1 min", "ranges": {"temp": [15, 16], "valve": [40, 60]}, "verdict": "passed"}}]}`)
		var out, errOut bytes.Buffer
		if err := show(&out, &errOut, "e.json", raw); err != nil {
			t.Fatal(err)
		}
		s := out.String()
		if !strings.Contains(s, c.want) {
			t.Errorf("%s: output lacks %q:\n%s", c.event, c.want, s)
		}
		if strings.Contains(s, "no range recorded") {
			t.Errorf("%s: an event is reported as a series without a range:\n%s", c.event, s)
		}
	}
}
