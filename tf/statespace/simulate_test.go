package statespace

import (
	"math"
	"testing"

	"github.com/backshift/backshift/tf"
)

// pathRational is tf's Rational of the transfer function a Part says it
// realises (TestPartsTransfer checks that this is the model's path,
// omega D_i / (delta D) B^b, by cross-multiplication). Its Impulse is a
// power-series division and its Step the difference equation, both of
// package tf and independent of this package. (The uncancelled form
// would do as well in exact arithmetic, but its repeated pole at z = 1
// makes tf's power series lose about k^2 * 1e-16 at lag k: 1.35e-12 at
// lag 60 in the "partial" fixture, against an exact value worked out in
// rational arithmetic with Python's fractions.)
func pathRational(t *testing.T, p Part) tf.Rational {
	t.Helper()
	g, err := tf.NewRational(p.Num, p.Den, p.Delay)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// The impulse and step responses of every input path equal those of
// its transfer function computed by package tf (tf.Rational.Impulse and
// Step) to 1e-12 of the largest response value: the two are the same
// recursion in exact arithmetic, and 1e-12 leaves room for the rounding
// of 200 steps of different summation orders (about 200 * 1e-16 * the
// largest partial sum).
func TestResponsesMatchTF(t *testing.T) {
	const n = 200
	for _, f := range fixtures {
		t.Run(f.name, func(t *testing.T) {
			m := mustModel(t, f.spec)
			r, err := Realise(m)
			if err != nil {
				t.Fatal(err)
			}
			for i := range m.Inputs {
				g := pathRational(t, r.Parts()[i])
				imp, err := r.Impulse(i, n)
				if err != nil {
					t.Fatal(err)
				}
				step, err := r.Step(i, n)
				if err != nil {
					t.Fatal(err)
				}
				closeSlices(t, "impulse", imp, g.Impulse(n), 1e-12)
				closeSlices(t, "step", step, g.Step(n), 1e-12)
			}
		})
	}
}

// Simulating the realisation from its default start gives the output of
// tf's Model.Simulate from rest (SimSettings.FromRest) with the same
// innovations, the constant and the differencing included, to 1e-12 of
// the largest output (the same arithmetic as TestResponsesMatchTF, 300
// steps; differenced outputs grow like random walks, hence relative).
func TestSimulateMatchesModel(t *testing.T) {
	const n = 300
	for k, f := range fixtures {
		t.Run(f.name, func(t *testing.T) {
			m := mustModel(t, f.spec)
			r, err := Realise(m)
			if err != nil {
				t.Fatal(err)
			}
			data := map[string][]float64{}
			var inputs [][]float64
			for i, in := range m.Inputs {
				x := series(n, 1, uint64(10*k+i))
				data[in.Series] = x
				inputs = append(inputs, x)
			}
			set := &tf.SimSettings{FromRest: true}
			var a []float64
			if m.Noise != nil {
				a = series(n, 0.3, uint64(100+k))
				set.Innovations = a
			}
			want, err := m.Simulate(data, set)
			if err != nil {
				t.Fatal(err)
			}
			got, err := r.Simulate(inputs, a, nil)
			if err != nil {
				t.Fatal(err)
			}
			closeSlices(t, "output", got, want, 1e-12)
		})
	}
}

// closeSlices fails when got and want differ in length or by more than
// tol times the largest magnitude of want (at least 1).
func closeSlices(t *testing.T, what string, got, want []float64, tol float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("%s: length %d, want %d", what, len(got), len(want))
	}
	s := maxAbs(want)
	for i := range got {
		if !(math.Abs(got[i]-want[i]) <= tol*s) {
			t.Fatalf("%s[%d] = %.17g, want %.17g (tolerance %g of %g)", what, i, got[i], want[i], tol, s)
		}
	}
}
