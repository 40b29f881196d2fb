package statespace

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
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
			m, r := mustRealise(t, f.spec)
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
			m, r := mustRealise(t, f.spec)
			data, inputs, a := drive(m, n, k, 0)
			matchesModel(t, m, r, data, inputs, a, &tf.SimSettings{FromRest: true}, nil)
		})
	}
}

// closeSlices fails when got and want differ in length or by more than
// tol times the largest magnitude of want (at least 1).
// matchesModel simulates the realisation r of m from the state x0 (nil:
// its default start) and m itself by tf's Model.Simulate with the
// settings set, on the same inputs (data, and inputs in the model's
// order) and innovations a, and checks that the outputs agree to 1e-12
// of the largest (the tolerance of TestSimulateMatchesModel).
func matchesModel(t *testing.T, m tf.Model, r *Realisation, data map[string][]float64, inputs [][]float64, a []float64, set *tf.SimSettings, x0 []float64) {
	t.Helper()
	s := *set
	s.Innovations = a
	want, err := m.Simulate(data, &s)
	if err != nil {
		t.Fatal(err)
	}
	got, err := r.Simulate(inputs, a, x0)
	if err != nil {
		t.Fatal(err)
	}
	closeSlices(t, "output", got, want, 1e-12)
}

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

// TestSimulateBadInput: each call the simulation methods must refuse,
// with the kind and the words of its message.
func TestSimulateBadInput(t *testing.T) {
	r, err := Realise(fixture.MustModel(t, "y = 2 + 0.5 / (1 - 0.8 B) B x + 0.2 v + (1 - 0.3 B) a"))
	if err != nil {
		t.Fatal(err)
	}
	quiet, _ := Realise(fixture.MustModel(t, "y = 0.5 B x"))
	nan := math.NaN()
	ok := []float64{1, 2, 3}
	big := []float64{1e308, 1e308, 1e308, 1e308, 1e308, 1e308, 1e308, 1e308}
	for _, c := range []struct {
		name string
		call func() error
		kind error
		want []string
	}{
		{"count", func() error { _, err := r.Simulate([][]float64{ok}, nil, nil); return err }, ErrLength, []string{`"inputs" has 1 samples against 2`, "one series per input"}},
		{"lengths", func() error { _, err := r.Simulate([][]float64{ok, {1}}, nil, nil); return err }, ErrLength, []string{`series "v" has 1 samples against 3`, `input "x"`}},
		{"nan input", func() error { _, err := r.Simulate([][]float64{ok, {1, nan, 3}}, nil, nil); return err }, ErrSample, []string{`series "v" sample 1 is NaN`}},
		{"innovations length", func() error { _, err := r.Simulate([][]float64{ok, ok}, []float64{1}, nil); return err }, ErrLength, []string{"innovations"}},
		{"start length", func() error { _, err := r.Simulate([][]float64{ok, ok}, nil, []float64{1}); return err }, ErrLength, []string{"start", "one value per state"}},
		{"start nan", func() error { _, err := r.Simulate([][]float64{ok, ok}, nil, []float64{0, 0, nan}); return err }, ErrSample, []string{"start", "sample 2"}},
		{"no noise", func() error { _, err := quiet.Simulate([][]float64{ok}, ok, nil); return err }, ErrModel, []string{"no noise term"}},
		{"input number", func() error { _, err := r.Impulse(2, 5); return err }, ErrSetting, []string{"input = 2", "0..1"}},
		{"length", func() error { _, err := r.Step(0, -1); return err }, ErrSetting, []string{"n = -1"}},
		{"output length", func() error { _, _, err := r.OneStep([][]float64{ok, ok}, []float64{1}, nil); return err }, ErrLength, []string{`series "y" has 1 samples against 3`}},
		{"output nan", func() error { _, _, err := r.OneStep([][]float64{ok, ok}, []float64{1, nan, 1}, nil); return err }, ErrSample, []string{`series "y" sample 1`}},
		// Finite inputs whose output leaves float64 range: an error naming
		// the step (the output is 2 + 0.2 v + 0.5 sum 0.8^k x, past 1.8e308
		// at step 5), not a series of +Inf and NaN.
		{"output overflow", func() error { _, err := r.Simulate([][]float64{big, big}, nil, nil); return err }, ErrModel, []string{"statespace.Realisation.Simulate", "output", "step 5 gave +Inf", "float64 range"}},
		{"prediction overflow", func() error {
			_, _, err := r.OneStep([][]float64{big, big}, make([]float64, len(big)), nil)
			return err
		}, ErrModel, []string{"statespace.Realisation.OneStep", "prediction", "gave +Inf", "float64 range"}},
	} {
		err := c.call()
		if !errors.Is(err, c.kind) {
			t.Errorf("%s: %v, want kind %v", c.name, err, c.kind)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: %q does not say %q", c.name, err, w)
			}
		}
	}
}
