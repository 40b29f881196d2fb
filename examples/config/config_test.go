package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/predict"
)

func TestDemoRuns(t *testing.T) {
	var out, errOut bytes.Buffer
	if err := demo(&out, &errOut); err != nil {
		t.Fatal(err)
	}
	s := out.String()
	for _, want := range []string{
		"greenhouse.json: Greenhouse 3, north block, 4 models, every spec valid",
		// Gains, dead times and time constants of the first model: the
		// closed forms w/(1-d) and -1/ln(d) min (common practice).
		"gain             0.2 temp per unit of valve\n", "dead time        3 min\n", "time constant    19.5 min",
		"gain             none (integrating: pole at z = 1)",
		"oscillatory mode",
		// A model written by hand carries no record of its data.
		"  range of validity:\n    no record of the data this model was fitted to: its range of validity is unknown\n",
		// The model saved by examples/identify carries its record.
		"fitted.json: built-in greenhouse record",
		"    fitted to 5760 samples every 1 min\n", "      valve seen from 28.11 to 100\n", "    verdict when saved: passed every check\n",
		"Caution: an identified model is an approximation",
		"tuned on\nit under the site's safety procedures, with independent safety interlocks;\ndefer to local codes and licensed practice.",
		`broken.json:6:34: spec of model 1 ("air temperature"): the constant term of the denominator must be 1, not 2`,
	} {
		if !strings.Contains(s, want) {
			t.Errorf("output lacks %q:\n%s", want, s)
		}
	}
	// The caution follows each config that is shown.
	if n := strings.Count(s, "Caution: "); n != 2 {
		t.Errorf("%d cautions, want one per config shown (2)", n)
	}
	if errOut.Len() != 0 {
		t.Errorf("stderr: %s", errOut.String())
	}
}

func TestBuiltinLoads(t *testing.T) {
	c, err := Load("greenhouse.json", builtin)
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Models) != 4 || c.Models[0].Spec.Model.Output != "temp" || len(c.Models[0].Spec.Model.Inputs) != 2 {
		t.Errorf("decoded %+v", c)
	}
	for _, e := range c.Models {
		if e.Validity != nil {
			t.Errorf("%s: a model written by hand has a validity record", e.Name)
		}
	}
}

// TestFittedRecord checks the validity record of the built-in fitted.json
// against the record it describes: the built-in greenhouse record
// (greenhouse.Default), whose length and series ranges it must state
// exactly. The model and its verdict "passed" are what
// `go run ./examples/identify -save fitted.json` wrote and reported
// ("verdict: the model is adequate by every check").
func TestFittedRecord(t *testing.T) {
	c, err := Load("fitted.json", fitted)
	if err != nil {
		t.Fatal(err)
	}
	v := c.Models[0].Validity
	d := greenhouse.Default()
	if v == nil || v.Samples != d.Len() || v.Interval != "1 min" || v.Verdict != modelinfo.VerdictPassed {
		t.Fatalf("validity %+v, record of %d samples", v, d.Len())
	}
	for name, s := range d.ByName() {
		if r := v.Ranges[name]; r != [2]float64{slices.Min(s), slices.Max(s)} {
			t.Errorf("%s: range %v, the record's is [%v, %v]", name, r, slices.Min(s), slices.Max(s))
		}
	}
}

// TestBrokenPositions checks every problem of broken.json and that each
// position points at the character the message is about.
func TestBrokenPositions(t *testing.T) {
	_, err := Load("broken.json", broken)
	var ps Problems
	if !errors.As(err, &ps) {
		t.Fatalf("error %v is not Problems", err)
	}
	want := []struct {
		line, col int
		at        string // the file text starting at the position
		msg       string
	}{
		{6, 34, "(2 - 0.95 B)", `spec of model 1 ("air temperature"): the constant term of the denominator must be 1, not 2`},
		{10, 93, "minute", `spec of model 2 ("substrate temperature"): unknown unit "minute"`},
		{13, 15, `"air temperature"`, `model name "air temperature" is used twice (models 1 and 3)`},
		{14, 40, `"`, `model 3 ("air temperature") has no sample interval`},
	}
	if len(ps) != len(want) {
		t.Fatalf("%d problems, want %d:\n%v", len(ps), len(want), err)
	}
	lines := strings.Split(string(broken), "\n")
	for i, w := range want {
		p := ps[i]
		if p.Line != w.line || p.Column != w.col || !strings.Contains(p.Msg, w.msg) {
			t.Errorf("problem %d: %d:%d %q, want %d:%d %q", i, p.Line, p.Column, p.Msg, w.line, w.col, w.msg)
			continue
		}
		if got := lines[p.Line-1][p.Column-1:]; !strings.HasPrefix(got, w.at) {
			t.Errorf("problem %d points at %q, want %q", i, got, w.at)
		}
	}
}

// pointsAt checks that the one problem of err is at the place in raw
// where the text at starts, and that the printed caret is under it.
func pointsAt(t *testing.T, name string, raw []byte, err error, at string) {
	t.Helper()
	var ps Problems
	if !errors.As(err, &ps) || len(ps) != 1 {
		t.Errorf("%s: got %v, want one problem", name, err)
		return
	}
	p := ps[0]
	lines := strings.Split(strings.TrimPrefix(string(raw), "\ufeff"), "\n")
	if got := lines[p.Line-1][p.Column-1:]; !strings.HasPrefix(got, at) {
		t.Errorf("%s: %d:%d points at %q, want %q", name, p.Line, p.Column, got, at)
	}
	// The caret line: as many characters before the caret as the
	// printed line has before the place.
	out := strings.Split(p.Error(), "\n")
	if len(out) != 3 {
		t.Errorf("%s: printed as %q", name, p.Error())
		return
	}
	caret := []rune(out[2])
	text := []rune(out[1])
	k := len(caret) - 1
	if k > len(text) || !strings.HasPrefix(string(text[k:]), printable(at)) {
		t.Errorf("%s: caret misplaced:\n%s", name, p.Error())
	}
}

func TestPositionsThroughEscapes(t *testing.T) {
	for _, c := range []struct{ name, raw string }{
		// The spec is on two lines inside the JSON string (a \n escape), with
		// a \" and a \u00e9 (two bytes decoded) before the error on its
		// second line: the column must still point at the bad factor.
		{"escapes", `{"site": "x", "models": [{"name": "a", "notes": "q\"\u00e9",
  "spec": "# caf\u00e9 \"draft\"\ntemp = 0.01 / (2 - 0.9 B) B valve + a; every 1 min"}]}`},
		// A surrogate pair decodes to one 4-byte character.
		{"surrogate pair", `{"models": [{"name": "a", "spec": "# \ud83d\ude00 hot\ntemp = 0.01 / (2 - 0.9 B) B valve + a; every 1 min"}]}`},
		// A lone surrogate decodes to U+FFFD (3 bytes), as encoding/json does.
		{"lone surrogate", `{"models": [{"name": "a", "spec": "# \ud83d hot\ntemp = 0.01 / (2 - 0.9 B) B valve + a; every 1 min"}]}`},
		// Raw UTF-8 (é, 2 bytes) and invalid bytes (each U+FFFD, 3 bytes).
		{"raw UTF-8", "{\"models\": [{\"name\": \"a\", \"spec\": \"# caf\u00e9 \xff\xfe\\ntemp = 0.01 / (2 - 0.9 B) B valve + a; every 1 min\"}]}"},
		{"byte order mark", "\ufeff{\"models\": [{\"name\": \"a\", \"spec\": \"temp = 0.01 / (2 - 0.9 B) B valve + a; every 1 min\"}]}"},
	} {
		_, err := Load("esc.json", []byte(c.raw))
		pointsAt(t, c.name, []byte(c.raw), err, "(2 - 0.9 B)")
	}
}

// loadRefused loads raw as the file named and checks that it is refused
// with one problem, at the text at, with the message msg.
func loadRefused(t *testing.T, file, raw, at, msg string) {
	t.Helper()
	_, err := Load(file, []byte(raw))
	pointsAt(t, raw, []byte(raw), err, at)
	var p *Problem
	if errors.As(err, &p) && p.Msg != msg {
		t.Errorf("%s:\n got %s\nwant %s", raw, p.Msg, msg)
	}
}

// TestKeys checks that keys are matched exactly: a key in another case,
// a misspelt key or a key given twice is a problem at that key.
func TestKeys(t *testing.T) {
	for _, c := range []struct{ raw, at, msg string }{
		{`{"Models": [{"name": "a", "spec": "y = w0 x + a; every 1 s"}]}`, `"Models"`,
			`key "Models" in the config is written in another case: write "models" (keys are matched exactly, so that a misspelt key is never silently ignored)`},
		{`{"models": [{"name": "a", "SPEC": "y = w0 x + a; every 1 s"}]}`, `"SPEC"`,
			`key "SPEC" in model 1 ("a") is written in another case: write "spec" (keys are matched exactly, so that a misspelt key is never silently ignored)`},
		{`{"models": [{"name": "a", "spec": "y = w0 x + a; every 1 s",
   "spec": "y = w0 B x + a; every 1 s"}]}`, `"spec": "y = w0 B`,
			`key "spec" appears twice in model 1 ("a"); the second would silently replace the first: keep one`},
		{`{"site": "x",
 "modles": []}`, `"modles"`, `unknown key "modles" in the config (known: site, models); did you mean "models"?`},
		{`{"models": [{"name": "a", "sepc": "y = w0 x + a; every 1 s"}]}`, `"sepc"`,
			`unknown key "sepc" in model 1 ("a") (known: name, notes, spec, validity); did you mean "spec"?`},
		{`{"models": [{"name": "a", "spec": "y = w0 x + a; every 1 s", "owner": "me"}]}`, `"owner"`,
			`unknown key "owner" in model 1 ("a") (known: name, notes, spec, validity)`},
	} {
		loadRefused(t, "k.json", c.raw, c.at, c.msg)
	}
}

// TestBrokenFiles tries the loader as a user would with broken files:
// each problem says what is wrong and where (the text at the position).
func TestBrokenFiles(t *testing.T) {
	ok := `"name": "a", "spec": "y = w0 x + a; every 1 s"`
	for _, c := range []struct{ raw, at, msg string }{
		{"{\n  \"site\": \"x\",\n  \"models\": [ {\"name\": \"a\" \"spec\": \"y = 1 x\"} ]\n}", `"spec"`,
			`JSON: invalid character '"' after object key:value pair (a missing ',' between two members?)`},
		{`{"models": [{` + ok + `},]}`, `]}`,
			"JSON: invalid character ']' looking for beginning of value (JSON allows no ',' after the last member or element)"},
		{`{"models": [{` + ok + `}], "notes": tru}`, `}`, "JSON: invalid character '}' in literal true (expecting 'e')"},
		{`{"models": [{'name': "a"}]}`, `'name'`, `JSON: invalid character '\'' (JSON strings are in double quotes)`},
		{"# models of the north block\n{}", "# models", `JSON: invalid character '#' looking for beginning of value (JSON has no comments; put notes in a "notes" field)`},
		{`{"models": [{` + ok + `}]`, ``, `JSON: the file ends before the config is complete (a missing '}', ']' or '"'?)`},
		{`{"models": [{` + ok + `}]} {}`, `{}`, "JSON: text after the end of the config object; a file holds one config object"},
		// Text after the closing brace on the same line: placed at its
		// first character, whatever it is (a word the decoder would read
		// as a misspelt literal, a short literal, a stray letter).
		{`{"models": [{` + ok + `}]} trailing`, `trailing`, "JSON: text after the end of the config object; a file holds one config object"},
		{`{"models": [{` + ok + `}]}   nul`, `nul`, "JSON: text after the end of the config object; a file holds one config object"},
		{`{"models": [{` + ok + `}]} x`, `x`, "JSON: text after the end of the config object; a file holds one config object"},
		{"{\"models\": [{" + ok + "}]}\n\n  more", `more`, "JSON: text after the end of the config object; a file holds one config object"},
		{`[{` + ok + `}]`, `[{`, `the file holds an array, not a config object; a config is a JSON object such as ` + example},
		{`{"site": "x"}`, `{"site"`, `the config has no "models" array; a config is a JSON object such as ` + example},
		{`{"models": []}`, `[]`, `the "models" array is empty; list at least one model, as in [{"name": "...", "spec": "y = w0 B x + a; every 1 min"}]`},
		{`{"models": {` + ok + `}}`, `{"name"`, `"models" of the config holds an object; it must be an array of models, as in "models": [{"name": "...", "spec": "..."}]`},
		{`{"site": 3, "models": [{` + ok + `}]}`, `3`, `"site" of the config holds a number; it must be a string naming the plant, as in "site": "Greenhouse 3"`},
		{`{"models": ["y = w0 x + a; every 1 s"]}`, `"y = w0`, `model 1 is a string, not an object such as {"name": "...", "spec": "y = w0 B x + a; every 1 min"}`},
		{`{"models": [{"name": "a", "spec": 3}]}`, `3}`, `"spec" of model 1 ("a") holds a number; it must be a string holding a model spec, as in "spec": "y = w0 B x + a; every 1 min"`},
		{`{"models": [{"name": "a", "spec": null}]}`, `null`, `"spec" of model 1 ("a") holds null; it must be a string holding a model spec, as in "spec": "y = w0 B x + a; every 1 min"`},
		{`{"models": [{"name": ["a"], "spec": "y = w0 x + a; every 1 s"}]}`, `["a"]`, `"name" of model 1 holds an array; it must be a string, as in "name": "air temperature"`},
		{`{"models": [{"name": "", "spec": "y = w0 x + a; every 1 s"}]}`, `""`, `model 1 has an empty "name"; give each model a unique name`},
		{`{"models": [{"spec": "y = w0 x + a; every 1 s"}]}`, `{"spec"`, `model 1 has no "name"; give each model a unique name, as in "name": "air temperature"`},
		{`{"models": [{"name": "m"}]}`, `{"name"`, `model 1 ("m") has no "spec"; add one, as in "spec": "y = w0 B x + a; every 1 min"`},
		{`{"models": [{"name": "m", "spec": "  "}]}`, `"  "`, `model 1 ("m") has an empty "spec"; write the model, as in "y = w0 B x + a; every 1 min"`},
		{`{"models": [{"name": "m", "spec": "# to do"}]}`, `"}]}`, `spec of model 1 ("m"): the spec is empty; write a model such as y = w0 B x + a`},
		{`{"models": [{"name": "m", "spec": "temp = w0 B^3 valve + a"}]}`, `"}`, `model 1 ("m") has no sample interval; end its spec with "every 1 min" (or s, h, d)`},
		{`{"models": [{"name": "m", "spec": "temp = w0 B3 valve + a; every 1 min"}]}`, `B3 valve`,
			`spec of model 1 ("m"): B3 reads as a coefficient name; for B to the power 3 write B^3 (B^3 x delays x by 3 samples)`},
		{`{"models": [{"name": "m", "spec": "temp = w0 B^3 valve + a; every 1 minute"}]}`, `minute`,
			`spec of model 1 ("m"): unknown unit "minute" for the sample interval; use s, min, h, d, wk, mo, qtr or yr (for minutes write min)`},
		{`{"models": [{"name": "m", "spec": "temp = w0 B^3 valve + a; every 5"}]}`, `"}`,
			`spec of model 1 ("m"): expected a unit after the sample interval 5, as in every 5 min (units: s, min, h, d, wk, mo, qtr, yr); found the end of the spec`},
		{`{"models": [[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]}`, `[[[]]]`,
			"JSON: nested more than 32 deep; a config nests six deep (the file, models, a model, its validity, its ranges, a range)"},
	} {
		loadRefused(t, "b.json", c.raw, c.at, c.msg)
	}
}

// TestEmptyFile checks that an empty file (or one of blanks, or a byte
// order mark alone) says so and what a config holds.
func TestEmptyFile(t *testing.T) {
	for _, raw := range []string{"", " \n\t\n", "\ufeff"} {
		_, err := Load("e.json", []byte(raw))
		want := "e.json:1:1: the file is empty; a config is a JSON object listing models, such as " + example
		if err == nil || err.Error() != want {
			t.Errorf("%q: got %v\nwant %s", raw, err, want)
		}
	}
}

// validityFile returns a config of one model with the given validity
// object (JSON text).
func validityFile(v string) []byte {
	return []byte(`{"models": [{"name": "m", "spec": "temp = w0 B^3 valve + a; every 1 min",
  "validity": ` + v + `}]}`)
}

func TestValidityProblems(t *testing.T) {
	for _, c := range []struct{ v, at, msg string }{
		{`{"samples": 100, "ranges": {"temp": [1, 2]}, "verdict": "fine"}`, `"fine"`,
			`"verdict" of the validity of model 1 ("m") is "fine"; it must be "passed" or "failed"`},
		{`{"samples": 100, "ranges": {"temp": [1, 2]}, "verdcit": "failed"}`, `"verdcit"`,
			`unknown key "verdcit" in the validity of model 1 ("m") (known: samples, interval, start, ranges, verdict, failures, forced, cautions, sigma); did you mean "verdict"?`},
		{`{"samples": 100, "ranges": {"temp": [1, 2]}, "verdict": "passed", "cautions": [3]}`, `3]`,
			`"cautions" of the validity of model 1 ("m") holds a number; each caution is a string`},
		{`{"samples": 100, "ranges": {"temp": [1, 2]}}`, `{"samples"`, `the validity of model 1 ("m") has no "verdict"; it is "passed" or "failed"`},
		{`{"samples": 0, "ranges": {"temp": [1, 2]}, "verdict": "passed"}`, `0,`,
			`"samples" of the validity of model 1 ("m") is 0; it must be a whole number of samples, at least 1, written without a decimal point or exponent`},
		{`{"samples": 5760.0, "ranges": {"temp": [1, 2]}, "verdict": "passed"}`, `5760.0`,
			`"samples" of the validity of model 1 ("m") is 5760.0; it must be a whole number of samples, at least 1, written without a decimal point or exponent`},
		{`{"samples": "100", "ranges": {"temp": [1, 2]}, "verdict": "passed"}`, `"100"`,
			`"samples" of the validity of model 1 ("m") holds a string; it must be a whole number of samples`},
		{`{"samples": 100, "interval": "10 s", "ranges": {"temp": [1, 2]}, "verdict": "passed"}`, `"10 s"`,
			`"interval" of the validity of model 1 ("m") is "10 s" but its spec says every 1 min; the model was fitted at another interval: identify it again at 1 min, or fix the spec`},
		{`{"samples": 100, "interval": "1 minute", "ranges": {"temp": [1, 2]}, "verdict": "passed"}`, `"1 minute"`,
			`"interval" of the validity of model 1 ("m") is "1 minute"; write a number and a unit s, min, h or d (or the spec's own interval, such as "1 mo"), as in "1 min"`},
		{`{"samples": 100, "ranges": {"temp": [2, 1]}, "verdict": "passed"}`, `[2, 1]`,
			`the range of "temp" in model 1 ("m") is [2, 1]: the smallest value comes first`},
		{`{"samples": 100, "ranges": {"temp": [1]}, "verdict": "passed"}`, `[1]`,
			`the range of "temp" in model 1 ("m") must be a pair of finite numbers [smallest, largest]`},
		{`{"samples": 100, "ranges": {"valv": [1, 2]}, "verdict": "passed"}`, `"valv"`,
			`the ranges of model 1 ("m") name "valv", which is not a series of its spec (temp, valve)`},
		{`{"samples": 100, "ranges": {"temp": [1, 2]}, "verdict": "passed", "failures": ["residuals correlated"]}`, `["residuals`,
			`the validity of model 1 ("m") says "passed" but lists failures; the record contradicts itself: identify the model again`},
		{`{"samples": 100, "ranges": {"temp": [1, 2]}, "verdict": "failed", "forced": "yes"}`, `"yes"`,
			`"forced" of the validity of model 1 ("m") holds a string; it must be true or false`},
		{`{"samples": 100, "ranges": {"temp": [1, 2]}, "verdict": "passed", "sigma": -0.03}`, `-0.03`,
			`"sigma" of the validity of model 1 ("m") is -0.03; it is the standard deviation of the model's one-step prediction errors on clean data, a positive finite number in the output's units (drop the key if it is not known: examples/monitor then wants -sigma)`},
		{`{"samples": 100, "ranges": {"temp": [1, 2]}, "verdict": "passed", "sigma": 0}`, `0}`,
			`"sigma" of the validity of model 1 ("m") is 0; it is the standard deviation of the model's one-step prediction errors on clean data, a positive finite number in the output's units (drop the key if it is not known: examples/monitor then wants -sigma)`},
		{`{"samples": 100, "ranges": {"temp": [1, 2]}, "verdict": "passed", "sigma": "0.03"}`, `"0.03"`,
			`"sigma" of the validity of model 1 ("m") holds a string; it must be the noise SD to expect on clean data, a positive number in the output's units`},
		{`"passed"`, `"passed"`,
			`"validity" of model 1 ("m") holds a string; it must be an object as examples/identify -save writes it: {"samples": ..., "ranges": {...}, "verdict": "passed"}`},
	} {
		raw := validityFile(c.v)
		_, err := Load("v.json", raw)
		pointsAt(t, c.v, raw, err, c.at)
		var p *Problem
		if errors.As(err, &p) && p.Msg != c.msg {
			t.Errorf("%s:\n got %s\nwant %s", c.v, p.Msg, c.msg)
		}
	}
}

// TestValidityRoundTrip checks that a validity record as
// modelinfo.Validity marshals it loads back equal, and that an old file
// without one loads with a nil record.
func TestValidityRoundTrip(t *testing.T) {
	v := modelinfo.Validity{Samples: 1440, Interval: "1 min", Ranges: map[string][2]float64{"temp": {14.5, 22}, "valve": {0, 100}},
		Verdict: modelinfo.VerdictFailed, Failures: []string{"the fit did not converge"}, Forced: true, Sigma: 0.03034}
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	c, err := Load("v.json", validityFile(string(b)))
	if err != nil {
		t.Fatal(err)
	}
	got := c.Models[0].Validity
	if got == nil || got.Samples != v.Samples || got.Verdict != v.Verdict || !got.Forced || len(got.Failures) != 1 || got.Ranges["valve"] != v.Ranges["valve"] || got.Sigma != v.Sigma {
		t.Errorf("loaded %+v, saved %+v", got, v)
	}
	for _, raw := range []string{
		`{"models": [{"name": "m", "spec": "temp = w0 B^3 valve + a; every 1 min"}]}`,
		`{"models": [{"name": "m", "spec": "temp = w0 B^3 valve + a; every 1 min", "validity": null, "notes": null}]}`,
	} {
		c, err = Load("old.json", []byte(raw))
		if err != nil || c.Models[0].Validity != nil {
			t.Errorf("%s: %v, %+v", raw, err, c)
		}
	}
}

// TestFailedVerdictIsLoud checks that a model saved with the verdict
// "failed" is flagged in the heading, beside the model and on stderr,
// with its failures listed.
func TestFailedVerdictIsLoud(t *testing.T) {
	raw := validityFile(`{"samples": 20, "interval": "1 min", "ranges": {"temp": [15, 16], "valve": [40, 60]},
    "verdict": "failed", "failures": ["the fit did not converge", "a noise root on the unit circle"], "forced": true}`)
	var out, errOut bytes.Buffer
	if err := show(&out, &errOut, "f.json", raw); err != nil {
		t.Fatal(err)
	}
	s := out.String()
	for _, want := range []string{
		`WARNING: "m" FAILED its checks when it was saved; do not use it for control work`,
		`!!! THIS MODEL FAILED ITS CHECKS WHEN IT WAS SAVED (verdict "failed")`,
		"    verdict when saved: failed\n      - the fit did not converge\n      - a noise root on the unit circle\n",
		"SAVED DESPITE THE FAILED CHECKS on request",
		"Caution: an identified model is an approximation",
	} {
		if !strings.Contains(s, want) {
			t.Errorf("output lacks %q:\n%s", want, s)
		}
	}
	if !strings.Contains(errOut.String(), `f.json: WARNING: "m" FAILED its checks`) {
		t.Errorf("stderr: %q", errOut.String())
	}
	// A passed record with a series missing from its ranges says so.
	out.Reset()
	raw = validityFile(`{"samples": 20, "ranges": {"temp": [15, 16]}, "verdict": "passed"}`)
	if err := show(&out, &errOut, "p.json", raw); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out.String(), "      valve: no range recorded; its range of validity is unknown\n") {
		t.Errorf("missing range not reported:\n%s", out.String())
	}
}

// TestCommandLine checks -h, positional arguments and -file.
func TestCommandLine(t *testing.T) {
	var out, errOut bytes.Buffer
	if code := run([]string{"-h"}, &out, &errOut); code != 0 {
		t.Errorf("-h: exit %d", code)
	}
	for _, want := range []string{"config loads a site's library of process models",
		"go run ./examples/config                      # the built-in configs", "go run ./examples/config -file fitted.json", "-file string"} {
		if !strings.Contains(errOut.String(), want) {
			t.Errorf("-h lacks %q:\n%s", want, errOut.String())
		}
	}
	errOut.Reset()
	if code := run([]string{"site.json"}, &out, &errOut); code != 2 ||
		errOut.String() != "config takes no arguments besides its flags, and got \"site.json\"; to load a file write -file site.json (see -h)\n" {
		t.Errorf("positional argument: exit %d, %q", code, errOut.String())
	}
	dir := t.TempDir()
	empty := filepath.Join(dir, "empty.json")
	if err := os.WriteFile(empty, nil, 0o644); err != nil {
		t.Fatal(err)
	}
	errOut.Reset()
	if code := run([]string{"-file", empty}, &out, &errOut); code != 1 || !strings.Contains(errOut.String(), "the file is empty") {
		t.Errorf("empty file: exit %d, %q", code, errOut.String())
	}
	good := filepath.Join(dir, "fitted.json")
	if err := os.WriteFile(good, fitted, 0o644); err != nil {
		t.Fatal(err)
	}
	out.Reset()
	errOut.Reset()
	if code := run([]string{"-file", good}, &out, &errOut); code != 0 || !strings.Contains(out.String(), "Caution:") {
		t.Errorf("good file: exit %d, %q %q", code, out.String(), errOut.String())
	}
	errOut.Reset()
	if code := run([]string{"-file", filepath.Join(dir, "none.json")}, &out, &errOut); code != 1 ||
		!strings.HasPrefix(errOut.String(), "-file: open ") || !strings.Contains(errOut.String(), "no such file") {
		t.Errorf("missing file: exit %d, %q", code, errOut.String())
	}
	errOut.Reset()
	if code := run([]string{"-file", dir}, &out, &errOut); code != 1 || errOut.String() != "-file "+dir+": a folder, not a config file\n" {
		t.Errorf("folder: exit %d, %q", code, errOut.String())
	}
}

// TestManyProblems checks that a long one-line file with a problem in
// every model lists the first 50 and then says that more follow, each
// with a short window of the line.
func TestManyProblems(t *testing.T) {
	var b strings.Builder
	b.WriteString(`{"models": [`)
	for i := range 2000 {
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(`{"name": "m` + strings.Repeat("x", i%7) + `", "spec": "y = w0 x + a; every 1 s", "sepc": 1}`)
	}
	b.WriteString(`]}`)
	_, err := Load("many.json", []byte(b.String()))
	var ps Problems
	if !errors.As(err, &ps) || len(ps) != 51 {
		t.Fatalf("got %d problems", len(ps))
	}
	if last := ps[50].Msg; last != "more problems from here on are not listed; fix the ones above first" {
		t.Errorf("last: %s", last)
	}
	for _, p := range ps {
		if len(p.Text) > 140 {
			t.Fatalf("window of %d bytes: %q", len(p.Text), p.Text)
		}
	}
	pointsAt(t, "first", []byte(b.String()), ps[:1], `"sepc"`)
}

// TestNoiseRefused checks that a spec whose noise tf/predict refuses is
// reported by the loader, naming the model and the root (before:
// "every spec valid" was printed for (1 + 1.5 B) a, which
// examples/monitor then refused). The root of 1 + 1.5 B is at
// z = -1.5 (z + 1.5 = 0, arithmetic), that of 1 - 1.0 B at z = 1; the
// invertible 1 + 0.3 B loads. The predictor's refusal is checked beside it.
func TestNoiseRefused(t *testing.T) {
	cases := []struct{ noise, want string }{
		{"(1 + 1.5 B) / (1 - 0.8 B) a", `model 1 ("kiln"): the noise MA has a root on or outside the unit circle, at z = -1.5 (|z| = 1.5)`},
		{"1 / (1 - 1.0 B) a", `model 1 ("kiln"): the noise AR has a root on or outside the unit circle, at z = 1 (|z| = 1)`},
		{"(1 + 0.3 B) / (1 - 0.8 B) a", ""},
	}
	for _, c := range cases {
		spec := "temp = 6 + 0.01 / (1 - 0.95 B) B^3 valve + " + c.noise + "; every 1 min"
		raw := []byte(`{"site": "s", "models": [{"name": "kiln", "spec": "` + spec + `"}]}`)
		_, err := Load("one.json", raw)
		_, perr := predict.New(parse.MustModel(spec), 1, nil)
		if c.want == "" {
			if err != nil || perr != nil {
				t.Errorf("%s: refused: %v / predictor: %v", c.noise, err, perr)
			}
			continue
		}
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), "examples/monitor and tf/predict refuse this model") {
			t.Errorf("%s: got %v, want %q", c.noise, err, c.want)
		}
		if perr == nil {
			t.Errorf("%s: tf/predict accepts what the loader refuses", c.noise)
		}
	}
}
