package main

import (
	"bytes"
	"errors"
	"strings"
	"testing"
)

func TestDemoRuns(t *testing.T) {
	var b bytes.Buffer
	if err := demo(&b); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{
		"greenhouse.json: Greenhouse 3, north block, 4 models, all valid",
		// Gains, dead times and time constants of the first model: the
		// closed forms w/(1-d) and -1/ln(d) min (common practice).
		"gain             0.2 temp per unit of valve\n", "dead time        3 min\n", "time constant    19.5 min",
		"gain             none (integrating: pole at z = 1)",
		"oscillatory mode",
		"broken.json:6:34: the constant term of the denominator must be 1, not 2",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
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
		{6, 34, "(2 - 0.95 B)", "the constant term of the denominator must be 1, not 2"},
		{10, 93, "minute", `unknown unit "minute"`},
		{13, 15, `"air temperature"`, `model name "air temperature" is used twice`},
		{14, 40, `"`, `model "air temperature" has no sample interval`},
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

func TestPositionsThroughEscapes(t *testing.T) {
	// The spec is on two lines inside the JSON string (a \n escape), with
	// a \" and a \u00e9 (two bytes decoded) before the error on its
	// second line: the column must still point at the bad factor in the file.
	raw := []byte(`{"site": "x", "models": [{"name": "a", "notes": "q\"\u00e9",
  "spec": "# caf\u00e9 \"draft\"\ntemp = 0.01 / (2 - 0.9 B) B valve + a; every 1 min"}]}`)
	_, err := Load("esc.json", raw)
	var ps Problems
	if !errors.As(err, &ps) || len(ps) != 1 {
		t.Fatalf("got %v", err)
	}
	lines := strings.Split(string(raw), "\n")
	if got := lines[ps[0].Line-1][ps[0].Column-1:]; !strings.HasPrefix(got, "(2 - 0.9 B)") {
		t.Errorf("points at %q (%d:%d)", got, ps[0].Line, ps[0].Column)
	}
}

func TestJSONProblems(t *testing.T) {
	for _, c := range []struct {
		raw, msg string
		line     int
	}{
		{"{\n  \"site\": \"x\",\n  \"models\": [ {\"name\": \"a\" \"spec\": \"y = 1 x\"} ]\n}", "JSON: invalid character", 3},
		{"{\"site\": \"x\",\n \"modles\": []}", `unknown field "modles"`, 2},
		{`{"site": "x", "models": [{"name": "a", "spec": 3}]}`, `holds a number, want a string`, 1},
		{`{"site": "x"}`, "lists no models", 1},
		{`{"models": [{"name": "", "spec": "y = w0 x + a; every 1 s"}]}`, "model 1 has no name", 1},
		{`{"models": [{"name": "m"}]}`, `model "m" has no spec`, 1},
	} {
		_, err := Load("t.json", []byte(c.raw))
		var ps Problems
		if !errors.As(err, &ps) {
			t.Errorf("%s: error %v", c.raw, err)
			continue
		}
		if !strings.Contains(ps[0].Msg, c.msg) || ps[0].Line != c.line {
			t.Errorf("%s:\n got %d: %s\nwant %d: %s", c.raw, ps[0].Line, ps[0].Msg, c.line, c.msg)
		}
	}
}
