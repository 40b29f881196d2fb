package main

import (
	"bytes"
	"errors"
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

// TestValidityStart checks the record's start time: shown with the
// record, refused (pointing at it) when it is not a time.
func TestValidityStart(t *testing.T) {
	raw := validityFile(`{"samples": 2000, "interval": "1 min", "start": "2026-03-28T12:00", "ranges": {"temp": [15, 16]}, "verdict": "passed"}`)
	var out, errOut bytes.Buffer
	if err := show(&out, &errOut, "s.json", raw); err != nil {
		t.Fatal(err)
	}
	if want := "    fitted to 2000 samples every 1 min from 2026-03-28T12:00\n"; !strings.Contains(out.String(), want) {
		t.Errorf("output lacks %q:\n%s", want, out.String())
	}
	v := `{"samples": 2000, "start": "28.3.2026 12:00", "ranges": {"temp": [15, 16]}, "verdict": "passed"}`
	raw = validityFile(v)
	_, err := Load("s.json", raw)
	pointsAt(t, v, raw, err, `"28.3.2026`)
	var p *Problem
	if want := `"start" of the validity of model 1 ("m") is "28.3.2026 12:00"; write the time of the record's first sample as an event's time is written, such as "2026-03-28T12:00" or "2026-03-28T12:00+01:00"`; !errors.As(err, &p) || p.Msg != want {
		t.Errorf("bad start: %v\nwant %s", err, want)
	}
}
