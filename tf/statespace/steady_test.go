package statespace

import (
	"errors"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
)

// Started from Steady at the first input samples, the realisation gives
// tf's Model.Simulate with its default settled start (each input held at
// its first sample before the record) and the same innovations, for
// every fixture without output differencing, to 1e-12 of the largest
// output (as in TestSimulateMatchesModel).
func TestSteadyMatchesSettledSimulate(t *testing.T) {
	const n = 300
	for k, f := range fixtures {
		m := fixture.MustModel(t, f.spec)
		if !m.Diff.IsOne() {
			continue
		}
		t.Run(f.name, func(t *testing.T) {
			r, err := Realise(m)
			if err != nil {
				t.Fatal(err)
			}
			// Inputs about 5, far from zero, so that a wrong start shows.
			data, inputs, a := drive(m, n, k, 5)
			var first []float64
			for _, x := range inputs {
				first = append(first, x[0])
			}
			x0, err := r.Steady(first)
			if err != nil {
				t.Fatal(err)
			}
			matchesModel(t, m, r, data, inputs, a, &tf.SimSettings{}, x0)
		})
	}
}

// An integrating path has no settled state for a nonzero input; zero is
// its rest. A u of the wrong length is refused.
func TestSteadyBadInput(t *testing.T) {
	r, err := Realise(fixture.MustModel(t, "(1 - B) y = 0.3 / (1 - 0.5 B) B x + a"))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := r.Steady([]float64{2}); !errors.Is(err, ErrModel) {
		t.Errorf("integrating path: %v, want ErrModel", err)
	}
	if x, err := r.Steady([]float64{0}); err != nil || len(x) != r.States() {
		t.Errorf("integrating path at rest: %v, %v", x, err)
	}
	if _, err := r.Steady(nil); !errors.Is(err, ErrLength) {
		t.Errorf("no inputs: %v, want ErrLength", err)
	}
}
