package main

import (
	"errors"
	"testing"

	"github.com/backshift/backshift/parse"
)

// FuzzNewProcess feeds arbitrary specs to the plant checks: each gives a
// parse error or a *PlantError, or a plant whose scenarios start or are
// refused with a *PlantError, never a panic.
func FuzzNewProcess(f *testing.F) {
	for _, s := range []string{
		PlantSpec,
		"temp = 6 + 0.01 / (1 - 0.95 B) B^3 valve; every 10 s",
		"temp = 6 + w0 / (1 - d1 B) B^3 valve + a; every 1 min",
		"(1 - B) temp = 0.01 B^3 valve + a; every 1 min",
		"temp = 16 + 0.01 B ((1 - B) valve) + 0.05 B outdoor + AR(2); every 0.5 s",
		"temp = 0.001 / (1 - 0.95 B) B^3 valve + a; every 2 min",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, spec string) {
		p, err := NewProcess(spec, 1, 0)
		if err != nil {
			var pe *PlantError
			var list parse.ErrorList
			if !errors.As(err, &pe) && !errors.As(err, &list) {
				t.Fatalf("spec %q: error %T %v is neither a *PlantError nor a parse.ErrorList", spec, err, err)
			}
			return
		}
		if _, err := p.startValve(SetpointStep()); err != nil {
			var pe *PlantError
			if !errors.As(err, &pe) {
				t.Fatalf("spec %q: start: %T %v", spec, err, err)
			}
			return
		}
		for range 50 {
			p.Step(50, 2)
		}
	})
}
