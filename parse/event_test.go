package parse

import (
	"errors"
	"testing"
	"time"

	"github.com/backshift/backshift/tf"
)

// TestEvents reads events in each form of the language (parse/doc.go,
// Events), checks the tf.Event built and the canonical text printed, and
// that the text reads back to an equal model. The expected times are the
// written ones converted by hand (08:00 at +01:00 is 07:00 UTC).
func TestEvents(t *testing.T) {
	utc := func(y int, mo time.Month, d, h, mi, s, ns int) time.Time {
		return time.Date(y, mo, d, h, mi, s, ns, time.UTC)
	}
	cases := []struct {
		text  string // the event as written
		want  tf.Event
		print string // as printed
	}{
		{"step(120)", tf.Event{Kind: tf.Step, Index: 120}, "step(120)"},
		{"pulse(0)", tf.Event{Kind: tf.Pulse}, "pulse(0)"},
		{"step(0120)", tf.Event{Kind: tf.Step, Index: 120}, "step(120)"},
		{"step(12.0)", tf.Event{Kind: tf.Step, Index: 12}, "step(12)"},
		{"pulse(2026-03-01)", tf.Event{Kind: tf.Pulse, At: utc(2026, 3, 1, 0, 0, 0, 0)}, "pulse(2026-03-01)"},
		{"pulse(2026-03-01T00:00Z)", tf.Event{Kind: tf.Pulse, At: utc(2026, 3, 1, 0, 0, 0, 0)}, "pulse(2026-03-01)"},
		{"step(2026-03-01T08:00)", tf.Event{Kind: tf.Step, At: utc(2026, 3, 1, 8, 0, 0, 0)}, "step(2026-03-01T08:00)"},
		{"step(2026-03-01T08:00:30)", tf.Event{Kind: tf.Step, At: utc(2026, 3, 1, 8, 0, 30, 0)}, "step(2026-03-01T08:00:30)"},
		{"step(2026-03-01T08:00:30.250)", tf.Event{Kind: tf.Step, At: utc(2026, 3, 1, 8, 0, 30, 250000000)}, "step(2026-03-01T08:00:30.25)"},
		{"step(2026-03-01T08:00+01:00)", tf.Event{Kind: tf.Step, At: utc(2026, 3, 1, 7, 0, 0, 0)}, "step(2026-03-01T08:00+01:00)"},
		{"step(2026-03-01T00:00-05:00)", tf.Event{Kind: tf.Step, At: utc(2026, 3, 1, 5, 0, 0, 0)}, "step(2026-03-01T00:00-05:00)"},
	}
	for _, c := range cases {
		spec := "y = w0 x + k / (1 - d1 B) " + c.text + " + a"
		m, err := Model(spec)
		if err != nil {
			t.Errorf("%s: %v", c.text, err)
			continue
		}
		in := m.Inputs[1]
		if in.Event == nil || in.Event.Kind != c.want.Kind || in.Event.Index != c.want.Index || !in.Event.At.Equal(c.want.At) {
			t.Errorf("%s: event %+v, want %+v", c.text, in.Event, c.want)
			continue
		}
		if in.Series != c.print || in.Event.String() != c.print {
			t.Errorf("%s: series %q, event text %q, want %q", c.text, in.Series, in.Event.String(), c.print)
		}
		text := m.String()
		if want := "y = w0 x + k / (1 - d1 B) " + c.print + " + a"; text != want {
			t.Errorf("%s prints %q, want %q", c.text, text, want)
		}
		if _, err := readBack(m); err != nil {
			t.Errorf("%s: %v", c.text, err)
		}
		if err := Check(m); err != nil {
			t.Errorf("%s: Check: %v", c.text, err)
		}
	}
}

// TestEventNames: step and pulse are events only before '(': a series
// may be called step, and a lone event is an input of unit gain.
func TestEventNames(t *testing.T) {
	m := MustModel("y = w step + v pulse + a")
	if m.Inputs[0].Series != "step" || m.Inputs[0].Event != nil || m.Inputs[1].Series != "pulse" {
		t.Errorf("series named step and pulse: %+v", m.Inputs)
	}
	m = MustModel("y = 2 + w x + step(5)")
	if len(m.Inputs) != 2 || m.Inputs[1].Event == nil || !m.Inputs[1].Num.IsOne() || m.String() != "y = 2 + w x + 1 step(5)" {
		t.Errorf("lone event: %v", m)
	}
	// The '(' may follow after spaces, a line break or a comment.
	m = MustModel("y = k pulse # the new burner\n  (7) + w step")
	if m.Inputs[0].Event == nil || m.Inputs[0].Event.Index != 7 || m.Inputs[1].Event != nil {
		t.Errorf("event over a line break: %v", m)
	}
	// A name step or pulse at the end of the text is a series.
	if m := MustModel("y = w pulse"); m.Inputs[0].Event != nil {
		t.Errorf("series pulse at the end: %v", m)
	}
}

// TestCheckEvents: models built in code with a bad event are refused
// with the field's path; a good one passes.
func TestCheckEvents(t *testing.T) {
	at := time.Date(2026, 3, 1, 8, 0, 0, 0, time.UTC)
	good := tf.Event{Kind: tf.Pulse, At: at}
	mk := func(in tf.Input) tf.Model {
		return tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x"}, in}}
	}
	cases := []struct {
		in   tf.Input
		path string
		kind error
	}{
		{tf.Input{Series: good.String(), Event: &good}, "", nil},
		{tf.Input{Series: "pulse", Event: &good}, "Inputs[1].Series", ErrModel},
		{tf.Input{Series: "step(-1)", Event: &tf.Event{Kind: tf.Step, Index: -1}}, "Inputs[1].Event.Index", ErrModel},
		{tf.Input{Series: "step(3)", Event: &tf.Event{Kind: tf.Step, Index: 3, At: at}}, "Inputs[1].Event.Index", ErrModel},
		{tf.Input{Series: "EventKind(7)(3)", Event: &tf.Event{Kind: 7, Index: 3}}, "Inputs[1].Event.Kind", ErrModel},
		{tf.Input{Series: "step(3)", Event: &tf.Event{Kind: tf.Step, Index: 3}, Diff: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Value: 1}}, {Neg: true, Power: 1, Coef: tf.Coef{Value: 1}}}}}}}, "Inputs[1].Diff", ErrModel},
	}
	for _, c := range cases {
		err := Check(mk(c.in))
		if c.kind == nil {
			if err != nil {
				t.Errorf("%v: %v", c.in.Event, err)
			}
			continue
		}
		var l ErrorList
		if !errors.As(err, &l) || l[0].Path != c.path || !errors.Is(err, c.kind) {
			t.Errorf("%+v: got %v, want path %s", c.in.Event, err, c.path)
		}
		if verr := mk(c.in).Validate(); verr == nil {
			t.Errorf("%+v: tf.Model.Validate accepts it", c.in.Event)
		}
	}
}
