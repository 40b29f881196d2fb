package main

import (
	"bytes"
	"errors"
	"testing"

	"github.com/backshift/backshift/tf/monitor"
)

// FuzzFeed sends arbitrary request bodies to a loop: every body is taken
// whole or refused at a line with a *LineError naming the loop and a line
// of the body, never a panic; the lines before it are taken, and the
// loop's counts agree with the predictor's.
func FuzzFeed(f *testing.F) {
	f.Add([]byte(`{"valve": 50, "outdoor": 3, "temp": 19}` + "\n" + `{"stamp": 7, "valve": 50, "outdoor": 3, "temp": null}`))
	f.Add([]byte(`{"valve": 50, "outdoor": 3}` + "\n\n" + `{"valve": 1e200, "outdoor": 3, "temp": 1}`))
	f.Add([]byte(`{"valve": [1], "outdoor": {"a": 1}, "temp": "x"}`))
	f.Add([]byte(`{"valve": 50, "valve": 50, "stamp": -1e3}{}`))
	specs, err := decodeConfig(builtin, nil)
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, body []byte) {
		l, err := newLoop(specs[0], 0, make(chan monitor.Alarm, 1))
		if err != nil {
			t.Fatal(err)
		}
		l.mu.Lock()
		defer l.mu.Unlock()
		taken, _, err := l.feed(bytes.NewReader(body))
		lines := bytes.Count(body, []byte("\n")) + 1
		var le *LineError
		switch {
		case err == nil:
		case !errors.As(err, &le):
			t.Fatalf("error %v (%T) is not a *LineError", err, err)
		case le.Loop != "air temperature" || le.Line < 1 || le.Line > lines+1 || le.Taken != taken || le.Msg == "":
			t.Fatalf("line error %+v for a body of %d lines, %d taken", le, lines, taken)
		}
		if int64(taken) != l.samples || l.pred.Count() != taken || l.mon.Samples() != int64(taken) {
			t.Fatalf("%d lines taken, %d samples counted, predictor %d, monitor %d", taken, l.samples, l.pred.Count(), l.mon.Samples())
		}
	})
}
