package main

import (
	"bytes"
	"errors"
	"io"
	"net/http"
	"os"
	"strings"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/tf/predict"
)

// Bad lines are refused with the loop, the line, the field and the
// status; the lines before them are taken.
func TestBadInputLines(t *testing.T) {
	good := `{"valve": 50, "outdoor": 3, "temp": 19}` + "\n"
	cases := []struct {
		line, field, msg string
	}{
		{`{"valve": 50, "outdor": 3, "temp": 19}`, "outdor", `not a series of the loop (its output "temp", its inputs "valve", "outdoor", and "stamp"); did you mean outdoor?`},
		{`{"valve": null, "outdoor": 3, "temp": 19}`, "valve", "an input is null; inputs must be given on every sample (only the output may be null, for a missing value)"},
		{`{"valve": 50, "temp": 19}`, "outdoor", "no value for this input; every line needs every input (only the output may be missing)"},
		{`{"valve": "50", "outdoor": 3, "temp": 19}`, "valve", `holds the string "50"; give a number (or null for a missing output)`},
		{`{"valve": 50, "valve": 51, "outdoor": 3}`, "valve", "given twice in the line; give each series once"},
		{`{"stamp": 1.5, "valve": 50, "outdoor": 3}`, "stamp", "the stamp is 1.5; give an integer (your time unit, such as Unix seconds)"},
		{`{"valve": 1e400, "outdoor": 3}`, "valve", "1e400 is out of the range of float64; rescale the series"},
		{`[50, 3, 19]`, "", `a sample line is one JSON object, such as {"stamp": 1700000000, "valve": 1.5, "outdoor": 1.5, "temp": 20.1}`},
		{`{"valve": 50, "outdoor": 3} {}`, "", "text after the sample's object; give one object per line"},
		{`{"valve": 1e200, "outdoor": 3, "temp": 19}`, "valve", ""}, // the predictor's *SampleError, by name
	}
	for _, c := range cases {
		_, ts, _ := testService(t, 0)
		var le LineError
		body := good + good + "\n" + c.line + "\n" + good
		if st := post(t, ts, loopPath+"/samples", []byte(body), &le); st != http.StatusBadRequest {
			t.Errorf("%s: status %d, want 400", c.line, st)
		}
		if le.Loop != "air temperature" || le.Line != 4 || le.Taken != 2 || le.Field != c.field || (c.msg != "" && le.Msg != c.msg) {
			t.Errorf("%s: got %+v\nwant line 4, 2 taken, field %q, %q", c.line, le, c.field, c.msg)
		}
		var s stateOf
		if get(t, ts, loopPath, &s); s.Samples != 2 {
			t.Errorf("%s: %d samples taken, want the 2 before it", c.line, s.Samples)
		}
	}
}

// Requests that cannot be answered get a JSON error with a status that
// says why.
func TestBadInputRequests(t *testing.T) {
	_, ts, _ := testService(t, 0)
	var e apiError
	if st := get(t, ts, "/loops/air%20temprature", &e); st != http.StatusNotFound || !strings.Contains(e.Msg, `loops: "air temperature"`) {
		t.Errorf("unknown loop: %d %+v", st, e)
	}
	if st := get(t, ts, loopPath+"/predict", &e); st != http.StatusConflict {
		t.Errorf("predict before any sample: %d %+v, want 409", st, e)
	}
	feedAll(t, ts, sampleLines(greenhouse.Default(), 0, 10, nil, nil), 10)
	for q, want := range map[string]string{"?steps=0": "steps", "?steps=x": "steps", "?steps=10001": "steps"} {
		if st := get(t, ts, loopPath+"/predict"+q, &e); st != http.StatusBadRequest || e.Field != want {
			t.Errorf("%s: %d %+v", q, st, e)
		}
	}
	for body, field := range map[string]string{
		`{"steps": 3, "plan": {"vlave": [50]}}`:    "plan.vlave",
		`{"steps": 3, "plan": {"temp": [50]}}`:     "plan.temp",
		`{"steps": 3, "plan": {"valve": [1e200]}}`: "plan[valve]",
		`{"steps": 3, "horizon": 3}`:               "",
	} {
		e = apiError{}
		if st := post(t, ts, loopPath+"/predict", []byte(body), &e); st != http.StatusBadRequest || e.Field != field {
			t.Errorf("%s: %d %+v, want field %q", body, st, e, field)
		}
	}
	if st := get(t, ts, "/nowhere", &e); st != http.StatusNotFound {
		t.Errorf("unknown route: %d", st)
	}
}

// A planned valve move changes the predictions from the valve path's dead
// time on, and not before; intervals widen with the horizon.
func TestPredictPlan(t *testing.T) {
	_, ts, _ := testService(t, 0)
	feedAll(t, ts, sampleLines(greenhouse.Default(), 0, 500, nil, nil), 500)
	type answer struct {
		Points []struct {
			Index                  int
			Mean, SE, Lower, Upper float64
		} `json:"points"`
	}
	var held, moved answer
	get(t, ts, loopPath+"/predict?steps=6", &held)
	post(t, ts, loopPath+"/predict", []byte(`{"steps": 6, "plan": {"valve": [100, 100, 100, 100, 100, 100]}}`), &moved)
	if len(held.Points) != 6 || len(moved.Points) != 6 || held.Points[0].Index != 500 {
		t.Fatalf("points %+v %+v", held, moved)
	}
	for i := range 6 {
		h, m := held.Points[i], moved.Points[i]
		// The valve acts after 3 samples (greenhouse.True): the move of
		// sample 500 shows first at 503, i = 3.
		if changed := h.Mean != m.Mean; changed != (i >= 3) {
			t.Errorf("step %d: held %v, moved %v", i+1, h.Mean, m.Mean)
		}
		if i > 0 && !(h.SE > held.Points[i-1].SE) {
			t.Errorf("step %d: SE %v does not grow", i+1, h.SE)
		}
		if !finite(h.Lower, h.Upper) || !(h.Lower < h.Mean && h.Mean < h.Upper) {
			t.Errorf("step %d: interval %v..%v around %v", i+1, h.Lower, h.Upper, h.Mean)
		}
	}
	if s := held.Points[0].SE; s != 0.03 {
		t.Errorf("one-step SE %v, want the noise SD 0.03 of the config (psi_0 = 1)", s)
	}
}

// A restart through the snapshots carries on exactly: the restored
// service answers the same predictions and state as the one that never
// stopped, then and after more samples.
func TestSnapshotRestart(t *testing.T) {
	rec := greenhouse.Default()
	dir := t.TempDir()
	a, tsA, _ := testService(t, 0)
	feedAll(t, tsA, sampleLines(rec, 0, 2000, nil, gap), 500)
	if err := a.save(dir); err != nil {
		t.Fatal(err)
	}
	b, tsB, _ := testService(t, 0)
	if n, err := b.restore(dir); err != nil || n != 1 {
		t.Fatalf("restore: %d loops, %v", n, err)
	}
	same := func(when string) {
		for _, path := range []string{loopPath + "/predict?steps=30", loopPath} {
			if ra, rb := raw(t, tsA.URL+path), raw(t, tsB.URL+path); !bytes.Equal(ra, rb) {
				t.Errorf("%s: %s differs:\n%s\n%s", when, path, ra, rb)
			}
		}
	}
	same("after the restart")
	more := sampleLines(rec, 2000, 2300, drift, nil)
	feedAll(t, tsA, more, 100)
	feedAll(t, tsB, more, 100)
	same("300 samples later")
}

// A snapshot of another model, or of a monitor with another run length,
// is refused with the file's name, and the loop is left as it was.
func TestSnapshotRefused(t *testing.T) {
	dir := t.TempDir()
	a, ts, _ := testService(t, 0)
	feedAll(t, ts, sampleLines(greenhouse.Default(), 0, 200, nil, nil), 200)
	if err := a.save(dir); err != nil {
		t.Fatal(err)
	}
	other := strings.Replace(string(builtin), "0.01 / (1 - 0.95 B)", "0.012 / (1 - 0.95 B)", 1)
	specs, err := decodeConfig([]byte(other), nil)
	if err != nil {
		t.Fatal(err)
	}
	b, err := newService("other", specs, 0, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	defer b.close()
	if _, err := b.restore(dir); !errors.Is(err, predict.ErrOtherModel) || !strings.Contains(err.Error(), snapshotFile(dir, "air temperature")) {
		t.Errorf("another model: %v", err)
	}
	specs, _ = decodeConfig(builtin, nil)
	d, err := newService("arl", specs, 5000, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	defer d.close()
	if _, err := d.restore(dir); err == nil || !strings.Contains(err.Error(), "monitor:") {
		t.Errorf("another -arl: %v", err)
	}
	if d.loops[0].samples != 0 || d.loops[0].pred.Count() != 0 {
		t.Errorf("a refused snapshot changed the loop")
	}
	if err := os.WriteFile(snapshotFile(dir, "air temperature"), []byte("{"), 0o600); err != nil {
		t.Fatal(err)
	}
	if _, err := d.restore(dir); err == nil || !strings.Contains(err.Error(), "not a snapshot") {
		t.Errorf("a damaged file: %v", err)
	}
}

// raw fetches url and returns the body.
func raw(t *testing.T, url string) []byte {
	t.Helper()
	resp, err := http.Get(url)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	b, err := io.ReadAll(resp.Body)
	if err != nil {
		t.Fatal(err)
	}
	return b
}
