package modelinfo

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/parse"
)

func TestPathsOfTheGreenhouse(t *testing.T) {
	paths, err := Paths(greenhouse.True.Model(), 1)
	if err != nil {
		t.Fatal(err)
	}
	// Closed forms for a first-order lag w B^b/(1 - d B): gain w/(1-d),
	// time constant -T/ln d (common practice), dead time b.
	for i, want := range []greenhouse.Path{greenhouse.True.Valve, greenhouse.True.Outdoor} {
		p := paths[i]
		if p.Input != want.Series || p.DeadTime != want.Delay || !p.Stable {
			t.Errorf("path %d: %+v", i, p)
		}
		if math.Abs(p.Gain-want.Gain()) > 1e-12 {
			t.Errorf("%s gain %v, want %v", p.Input, p.Gain, want.Gain())
		}
		if len(p.Modes) != 1 || math.Abs(p.Modes[0].TimeConstant.Time-want.TimeConstant()) > 1e-9 {
			t.Errorf("%s modes %+v, want time constant %v", p.Input, p.Modes, want.TimeConstant())
		}
		// The sampled step response of w B^b/(1 - d B) is
		// g (1 - d^(k-b+1)) for k >= b, so it enters the 2 % band at
		// k = b - 1 + tau ln 50 (closed form); StepFigures interpolates
		// linearly between samples, which on this convex curve is off by
		// less than 0.1 sample.
		st := float64(want.Delay) - 1 + want.TimeConstant()*math.Log(50)
		if math.Abs(p.Step.Settle.Time-st) > 0.1 {
			t.Errorf("%s settling %v min, want %.1f", p.Input, p.Step.Settle.Time, st)
		}
	}
}

func TestWrite(t *testing.T) {
	var b bytes.Buffer
	if err := Write(&b, greenhouse.True.Model()); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"valve -> temp", "gain             0.2 temp per unit of valve\n", "dead time        3 min\n", "time constant    19.5 min"} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("summary lacks %q:\n%s", want, b.String())
		}
	}
}

func TestValidityOutside(t *testing.T) {
	v := &Validity{Samples: 10, Ranges: map[string][2]float64{"valve": {40, 60}}}
	if s := v.Outside("valve", 45, 55); s != "" {
		t.Errorf("inside the range: got %q", s)
	}
	want := "valve runs over 30..85, outside the range 40..60 seen in the record the model was fitted to; the model is an extrapolation there"
	if s := v.Outside("valve", 30, 85); s != want {
		t.Errorf("outside:\n got %q\nwant %q", s, want)
	}
	if s := v.Outside("outdoor", -100, 100); s != "" {
		t.Errorf("a series with no range: got %q", s)
	}
	if s := (*Validity)(nil).Outside("valve", 0, 1); s != "" {
		t.Errorf("nil record: got %q", s)
	}
}

func TestValidityWrite(t *testing.T) {
	var b strings.Builder
	v := &Validity{Samples: 20, Interval: "1 min", Ranges: map[string][2]float64{"valve": {40, 60}, "temp": {15, 21.5}},
		Verdict: VerdictFailed, Failures: []string{"the fit did not converge"}, Forced: true}
	v.Write(&b, "  ")
	want := "  fitted to 20 samples every 1 min\n    temp seen from 15 to 21.5\n    valve seen from 40 to 60\n" +
		"  verdict when saved: failed\n    - the fit did not converge\n  SAVED DESPITE THE FAILED CHECKS on request: do not use it for control work\n"
	if b.String() != want {
		t.Errorf("got\n%s\nwant\n%s", b.String(), want)
	}
	b.Reset()
	v = &Validity{Samples: 20, Verdict: VerdictPassed, Cautions: []string{"1 outlier was found in its residuals"}}
	v.Write(&b, "  ")
	want = "  fitted to 20 samples\n  verdict when saved: passed every check\n    but: 1 outlier was found in its residuals\n"
	if b.String() != want {
		t.Errorf("a passed verdict with a caution: got\n%s\nwant\n%s", b.String(), want)
	}
}

// A path whose numerator sums to zero (1 - B: a pure rate effect) has a
// zero gain; its step summary says so in the path's words instead of
// passing on the step-metric error of package tf.
func TestZeroGainPath(t *testing.T) {
	m, err := parse.Model("y = (1 - B) / (1 - 0.5 B) x; every 1 min")
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := Write(&b, m); err != nil {
		t.Fatal(err)
	}
	want := "step response    none: the path's gain is 0, so a step leaves the output where it was"
	if !strings.Contains(b.String(), want) {
		t.Errorf("got\n%s\nwant a line %q", b.String(), want)
	}
}
