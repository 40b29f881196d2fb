package main

import (
	"bytes"
	"errors"
	"strings"
	"testing"
)

// TestEventLeftOut checks that a plant with an event term (a known
// intervention in the fit's record, such as a level shift found as an
// outlier) is run without it, saying so, from -spec and from -config:
// the runs are those of the plant without the term, and an event given
// to NewProcess directly is named as an event, not as an input to rename.
func TestEventLeftOut(t *testing.T) {
	const noise = " + (1 + 0.3 B) / (1 - 0.8 B) a; every 1 min"
	if !strings.HasSuffix(PlantSpec, noise) {
		t.Fatalf("PlantSpec %q no longer ends with %q; update the test", PlantSpec, noise)
	}
	withEvent := strings.TrimSuffix(PlantSpec, noise) + " + 0.5 step(100) + 0.2 pulse(2026-03-29T13:00)" + noise
	var plain, buf bytes.Buffer
	if err := runWith(&plain, options{spec: PlantSpec, noise: NoiseSD}); err != nil {
		t.Fatal(err)
	}
	if figures(plain.String()) == "" {
		t.Fatalf("the summary has no \"sampled every\" line:\n%s", plain.String())
	}
	path := writeConfig(t, `{"name": "with events", "spec": "`+withEvent+`"}`)
	for _, o := range []options{{spec: withEvent, noise: NoiseSD}, {config: path, noise: NoiseSD}} {
		buf.Reset()
		if err := runWith(&buf, o); err != nil {
			t.Fatalf("%+v: %v", o, err)
		}
		for _, want := range []string{
			"  left out: 0.5 step(100), an event (a known intervention in the record the model was fitted to), not an input the harness drives\n",
			"  left out: 0.2 pulse(2026-03-29T13:00), an event",
		} {
			if !strings.Contains(buf.String(), want) {
				t.Errorf("%+v: summary lacks %q:\n%s", o, want, buf.String())
			}
		}
		if got, want := figures(buf.String()), figures(plain.String()); got != want {
			t.Errorf("%+v: the runs differ from those of the plant without the events:\n%s\nwant\n%s", o, got, want)
		}
	}
	_, err := NewProcess(withEvent, 0, 0)
	var pe *PlantError
	if !errors.As(err, &pe) || pe.Part != "input step(100)" || !strings.Contains(pe.Problem, "is an event") || strings.Contains(pe.Problem, "rename") {
		t.Errorf("NewProcess with an event: %v", err)
	}
}

// figures returns a summary from its "sampled every" line on: the
// scenarios' figures, without the lines that name the plant.
func figures(s string) string {
	_, after, _ := strings.Cut(s, "  sampled every")
	return after
}
