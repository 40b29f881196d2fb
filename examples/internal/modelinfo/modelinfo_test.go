package modelinfo

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/examples/internal/greenhouse"
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
		// k = b - 1 + tau ln 50 (closed form); StepMetrics interpolates
		// linearly between samples, which on this convex curve is off by
		// less than 0.1 sample.
		st := float64(want.Delay) - 1 + want.TimeConstant()*math.Log(50)
		if math.Abs(p.Step.Settling.Time-st) > 0.1 {
			t.Errorf("%s settling %v min, want %.1f", p.Input, p.Step.Settling.Time, st)
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
