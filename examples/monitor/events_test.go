package main

import (
	"bytes"
	"context"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/tf/monitor"
)

// eventConfig is the built-in greenhouse loop with one more term, an
// event, and the given validity record (JSON, "" for none).
func eventConfig(term, validity string) []byte {
	s := `{"models": [{"name": "air", "notes": "residual SD 0.03", "spec": "temp = 6 + 0.01 / (1 - 0.95 B) B^3 valve + 0.05 / (1 - 0.9 B) B outdoor + ` +
		term + ` + (1 + 0.3 B) / (1 - 0.8 B) a; every 1 min"`
	if validity != "" {
		s += `, "validity": ` + validity
	}
	return []byte(s + "}]}")
}

// recordOf is the validity record of a fit to n samples (the ranges are
// not used by the service).
func recordOf(n string) string {
	return `{"samples": ` + n + `, "interval": "1 min", "ranges": {}, "verdict": "passed"}`
}

// timedRecordOf is recordOf with the time of the record's first sample.
func timedRecordOf(n, start string) string {
	return `{"samples": ` + n + `, "interval": "1 min", "start": "` + start + `", "ranges": {}, "verdict": "passed"}`
}

// means feeds samples from..to-1 of rec, with effect added to the
// output, to a loop of spec and returns the one-step predictions.
func means(t *testing.T, spec loopSpec, rec greenhouse.Data, from, to int, effect []float64) []float64 {
	t.Helper()
	l, err := newLoop(spec, 0, make(chan monitor.Alarm, 1000))
	if err != nil {
		t.Fatal(err)
	}
	var out []float64
	for i := from; i < to; i++ {
		for j, s := range l.inputs {
			l.x[j] = map[string]float64{"valve": rec.Valve[i], "outdoor": rec.Outdoor[i]}[s]
		}
		y := rec.Temp[i]
		if effect != nil {
			y += effect[i]
		}
		if _, err := l.take(int64(i), y); err != nil {
			t.Fatal(err)
		}
		out = append(out, l.last.Mean)
	}
	return out
}

// TestEventsOnTheStream checks where a saved model's event falls on the
// live stream. The model is linear in its event term, so the one-step
// predictions of the loop with the term k/(1 - 0.7 B) step(T), fed the
// record with that term's effect e_t added, must be those of the loop
// without it plus e_t, sample for sample (the identity of the model's
// recursions, tf/predict package doc; tolerance 1e-9 for rounding on
// outputs near 20): an event placed at the wrong sample (the first live
// sample counted as record sample 0) breaks it by 0.33 to 0.5 degC. Cases: a step before the stream (default
// placement right after the fit's record, and -from as a record sample
// or as a time), a step inside the stream (-from), and a pulse before the
// stream (its term left out; its effect 0.7^100 there is below 1e-15).
func TestEventsOnTheStream(t *testing.T) {
	rec := greenhouse.Generate(greenhouse.Settings{Days: 1})
	base, err := decodeConfig(builtin, nil)
	if err != nil {
		t.Fatal(err)
	}
	const k, pole = 0.5, 0.7
	effect := func(T int, step bool) []float64 {
		e := make([]float64, len(rec.Temp))
		for i := T; i < len(e); i++ {
			u := 0.0
			if i == T || step {
				u = 1
			}
			e[i] = pole*e[i-1] + k*u
		}
		return e
	}
	start := time.Date(2026, 3, 28, 12, 0, 0, 0, time.UTC) // the record's sample 0
	now := time.Date(2026, 12, 5, 0, 0, 0, 0, time.UTC)
	for _, c := range []struct {
		name, term, validity string
		from                 map[string]streamStart
		T, P0                int
		step                 bool
		line                 string
	}{
		{"step before, default", "0.5 / (1 - 0.7 B) step(600)", recordOf("1000"), nil, 600, 1000, true,
			"step(600): before the live stream (the stream starts at record sample 1000, right after the fit's record of 1000 samples): the step is on throughout"},
		{"step before, -from sample", "0.5 / (1 - 0.7 B) step(600)", "", map[string]streamStart{"air": {Index: 1000}}, 600, 1000, true,
			"step(600): before the live stream (the stream starts at record sample 1000, by -from): the step is on throughout"},
		{"step inside, -from sample", "0.5 / (1 - 0.7 B) step(600)", recordOf("1000"), map[string]streamStart{"air": {Index: 500}}, 600, 500, true,
			"step(600): at live sample 100 (the stream starts at record sample 500, by -from): the step comes at that sample"},
		{"timed step inside, -from time", "0.5 / (1 - 0.7 B) step(2026-03-28T22:00)", "", map[string]streamStart{"air": {At: start.Add(500 * time.Minute)}}, 600, 500, true,
			"step(2026-03-28T22:00): at live sample 100 (the stream starts at 2026-03-28T20:20, by -from): the step comes at that sample"},
		{"timed step before, default", "0.5 / (1 - 0.7 B) step(2026-03-28T22:00)", recordOf("1000"), nil, 600, 1000, true,
			"step(2026-03-28T22:00): before the live stream (the stream starts at record sample 1000, right after the fit's record of 1000 samples): the step is on throughout"},
		{"step inside, -from time, record start", "0.5 / (1 - 0.7 B) step(600)", timedRecordOf("1000", "2026-03-28T12:00"), map[string]streamStart{"air": {At: start.Add(500 * time.Minute)}}, 600, 500, true,
			"step(600): at live sample 100 (the stream starts at 2026-03-28T20:20, by -from): the step comes at that sample"},
		{"timed step inside, -from sample, record start", "0.5 / (1 - 0.7 B) step(2026-03-28T22:00)", timedRecordOf("1000", "2026-03-28T13:00+01:00"), map[string]streamStart{"air": {Index: 500}}, 600, 500, true,
			"step(2026-03-28T22:00): at live sample 100 (the stream starts at record sample 500, by -from): the step comes at that sample"},
		{"timed step after the record, record start", "0.5 / (1 - 0.7 B) step(2026-03-29T06:20)", timedRecordOf("1000", "2026-03-28T12:00"), nil, 1100, 1000, true,
			"step(2026-03-29T06:20): at live sample 100 (the stream starts at record sample 1000, right after the fit's record of 1000 samples): the step comes at that sample"},
		{"pulse before, default", "0.5 / (1 - 0.7 B) pulse(900)", recordOf("1000"), nil, 900, 1000, false,
			"pulse(900): before the live stream (the stream starts at record sample 1000, right after the fit's record of 1000 samples): the pulse is over, its term is left out"},
	} {
		specs, err := decodeConfigAt(eventConfig(c.term, c.validity), nil, c.from, now)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if len(specs[0].Events) != 1 || specs[0].Events[0] != c.line {
			t.Errorf("%s: events %q, want %q", c.name, specs[0].Events, c.line)
		}
		e := effect(c.T, c.step)
		with := means(t, specs[0], rec, c.P0, c.P0+400, e)
		without := means(t, base[0], rec, c.P0, c.P0+400, nil)
		worst := 0.0
		for i := range with {
			if !math.IsNaN(without[i]) {
				worst = max(worst, math.Abs(with[i]-without[i]-e[c.P0+i]))
			}
		}
		if worst > 1e-9 {
			t.Errorf("%s: the predictions differ from the model's by up to %.3g", c.name, worst)
		}
	}
}

// TestEventsRefused checks the events the service cannot place, each
// with the flag that places it.
func TestEventsRefused(t *testing.T) {
	now := time.Date(2026, 12, 5, 0, 0, 0, 0, time.UTC)
	for _, c := range []struct {
		name, term, validity string
		from                 map[string]streamStart
		want                 string
	}{
		{"index, no record", "0.5 step(600)", "", nil,
			`model 1 ("air"): event step(600): it is at sample 600 of the fit's record, and the config does not say how long the fit's record was (no "validity" record): give -from 'air=SAMPLE'`},
		{"index, -from time", "0.5 step(600)", recordOf("1000"), map[string]streamStart{"air": {At: now}},
			`-from gives the stream's start as a time, and the config does not hold the time of the record's first sample ("start" of its validity record): give -from 'air=SAMPLE'`},
		{"time, no record", "0.5 step(2026-03-28T22:00)", "", nil,
			`event step(2026-03-28T22:00): it is given as a time, and the config holds no record of the fit ("validity") that would place it before the stream: give -from 'air=TIME'`},
		{"time, -from sample", "0.5 step(2026-03-28T22:00)", recordOf("1000"), map[string]streamStart{"air": {Index: 3}},
			`-from gives the stream's start as a record sample while the config does not hold the time of the record's first sample ("start" of its validity record): give -from 'air=TIME'`},
		{"bad record start", "0.5 step(600)", `{"samples": 1000, "start": "noon", "ranges": {}, "verdict": "passed"}`, nil,
			`model 1 ("air"): the start "noon" of its validity record is not a time`},
		{"time after the clock", "0.5 step(2027-01-01)", recordOf("1000"), nil,
			"it is given as a time after the service's clock (2026-12-05), so it cannot lie in the fit's record: give -from 'air=TIME'"},
	} {
		_, err := decodeConfigAt(eventConfig(c.term, c.validity), nil, c.from, now)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want %q", c.name, err, c.want)
		}
	}
	_, err := decodeConfigAt(builtin, nil, map[string]streamStart{"airr": {}}, now)
	if !errors.As(err, new(*UsageError)) || !strings.Contains(err.Error(), `-from names "airr", which is not a model of the config ("air temperature")`) {
		t.Errorf("-from of an unknown loop: %v", err)
	}
	for _, c := range []struct{ v, want string }{
		{"-3", "the record sample -3 is outside 0..1073741824"},
		{"9223372036854775807", "the record sample 9223372036854775807 is outside 0..1073741824"},
		{"yesterday", `"yesterday" is neither a record sample`},
	} {
		if _, err := parseStreamStart(c.v); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("-from %q: %v", c.v, err)
		}
	}
}

// TestEventsCommandLine runs the program as a user would on a config
// whose model has an event: it says where the event falls, takes -from,
// and refuses what it cannot place.
func TestEventsCommandLine(t *testing.T) {
	dir := t.TempDir()
	withRecord := filepath.Join(dir, "record.json")
	noRecord := filepath.Join(dir, "norecord.json")
	os.WriteFile(withRecord, eventConfig("0.5 / (1 - 0.7 B) step(600)", recordOf("1000")), 0o600)
	os.WriteFile(noRecord, eventConfig("0.5 / (1 - 0.7 B) step(600)", ""), 0o600)
	ctx, cancel := context.WithCancel(context.Background())
	cancel() // start, print, stop
	for _, c := range []struct {
		args   []string
		status int
		out    string
	}{
		{[]string{"-config", withRecord}, 0, "  event step(600): before the live stream (the stream starts at record sample 1000, right after the fit's record of 1000 samples): the step is on throughout\n"},
		{[]string{"-config", withRecord, "-from", "air=500"}, 0, "  event step(600): at live sample 100 (the stream starts at record sample 500, by -from): the step comes at that sample\n"},
		{[]string{"-config", noRecord, "-from", "air=1000"}, 0, "  event step(600): before the live stream (the stream starts at record sample 1000, by -from)"},
		{[]string{"-config", noRecord}, 1, "monitor: -config " + noRecord + `: model 1 ("air"): event step(600): it is at sample 600 of the fit's record, and the config does not say how long`},
		{[]string{"-config", withRecord, "-from", "air=soon"}, 2, `invalid value "air=soon" for flag -from: "soon" is neither a record sample`},
		{[]string{"-config", withRecord, "-from", "1000"}, 2, "write the loop's name, '=' and a record sample or a time"},
		{[]string{"-track", dir, "-from", "air=1000"}, 2, "monitor: -from places a served loop's events on its live stream; -track serves nothing: leave it out"},
	} {
		var out, errOut bytes.Buffer
		st := run(ctx, append([]string{"-addr", "127.0.0.1:0"}, c.args...), &out, &errOut)
		if st != c.status || !strings.Contains(out.String()+errOut.String(), c.out) {
			t.Errorf("%q: status %d, stdout %q, stderr %q; want %d, %q", c.args, st, out.String(), errOut.String(), c.status, c.out)
		}
	}
}

// TestEventsRestore checks that a loop with an event carries on after a
// restart with the same placement, and that a restart with another -from
// (which moves the event) is refused with that reason.
func TestEventsRestore(t *testing.T) {
	dir := t.TempDir()
	now := time.Date(2026, 12, 5, 0, 0, 0, 0, time.UTC)
	raw := eventConfig("0.5 / (1 - 0.7 B) step(600)", recordOf("1000"))
	start := func(from map[string]streamStart) *service {
		specs, err := decodeConfigAt(raw, nil, from, now)
		if err != nil {
			t.Fatal(err)
		}
		svc, err := newService("events", specs, 0, io.Discard)
		if err != nil {
			t.Fatal(err)
		}
		return svc
	}
	a := start(map[string]streamStart{"air": {Index: 500}})
	rec := greenhouse.Generate(greenhouse.Settings{Days: 1})
	body := sampleLines(rec, 500, 550, nil, nil)
	l := a.loops[0]
	l.mu.Lock()
	if _, _, err := l.feed(bytes.NewReader(body)); err != nil {
		t.Fatal(err)
	}
	l.mu.Unlock()
	a.close()
	if err := a.save(dir); err != nil {
		t.Fatal(err)
	}
	b := start(map[string]streamStart{"air": {Index: 500}})
	defer b.close()
	if n, err := b.restore(dir); n != 1 || err != nil || b.loops[0].pred.Count() != 50 {
		t.Errorf("same -from: restored %d, %v", n, err)
	}
	c := start(nil)
	defer c.close()
	if _, err := c.restore(dir); err == nil || !strings.Contains(err.Error(), "give the -from the state was saved with") {
		t.Errorf("other -from: %v", err)
	}
}

// FuzzPlaceEvents places an event of any kind, sample or time, against a
// stream start of any text and a record of any length and start time:
// each is placed or refused with an error, never a panic, and a placed
// model builds a loop (its events within the predictor's range).
func FuzzPlaceEvents(f *testing.F) {
	f.Add("step(600)", "1000", "2026-03-28T12:00", 1000)
	f.Add("pulse(2026-03-28T22:00)", "2026-03-28T20:20", "", 1000)
	f.Add("step(2026-03-28T22:00)", "1073741824", "2026-03-28T12:00+01:00", 5)
	f.Add("pulse(5)", "", "1999-01-01", 0)
	now := time.Date(2026, 12, 5, 0, 0, 0, 0, time.UTC)
	f.Fuzz(func(t *testing.T, event, from, start string, samples int) {
		if strings.ContainsAny(event+start, "\"\\") || samples < 0 {
			return
		}
		v := `{"samples": ` + strconv.Itoa(samples) + `, "start": "` + start + `", "ranges": {}, "verdict": "passed"}`
		var fr map[string]streamStart
		if from != "" {
			s, err := parseStreamStart(from)
			if err != nil {
				return
			}
			fr = map[string]streamStart{"air": s}
		}
		specs, err := decodeConfigAt(eventConfig("0.5 / (1 - 0.7 B) "+event, v), nil, fr, now)
		if err != nil {
			return
		}
		if _, err := newLoop(specs[0], 0, make(chan monitor.Alarm, 1)); err != nil {
			t.Errorf("%s against %q, record of %d from %q: placed (%q) but the loop is refused: %v", event, from, samples, start, specs[0].Events, err)
		}
	})
}
