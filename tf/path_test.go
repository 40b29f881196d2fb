package tf_test

import (
	"errors"
	"slices"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// pathRef is testdata/path/path.json, made by make_path.py: the step
// response of y to a unit step of u from rest for each model, by
// scipy.signal.lfilter as a cascade of the input's differencing, the
// term and the inverse of the output's differencing (nothing cancelled).
type pathRef struct {
	N     int `json:"n"`
	Cases []struct {
		Name string    `json:"name"`
		Spec string    `json:"spec"`
		Step []float64 `json:"step"`
	} `json:"cases"`
}

// TestModelPathStep checks Model.Path's step response against scipy
// (testdata/path) and against the model's own Simulate of y for a unit
// step of u, noise off, from rest, for output, input, seasonal and both
// differencings. Tolerance 1e-12 in the running relative error
// (testutil.RunningRelErr: the error over the largest value so far, the
// measure for recursive filters, whose rounding grows with the ramp of an
// integrating path): the three compute the same recursions in different
// orders, 200 steps of a few flops each, well under 1e-13 in float64.
func TestModelPathStep(t *testing.T) {
	var ref pathRef
	testutil.ReadJSON(t, "testdata/path/path.json", &ref)
	if len(ref.Cases) < 8 {
		t.Fatalf("reference has %d cases, want 8", len(ref.Cases))
	}
	ones := make([]float64, ref.N)
	for i := range ones {
		ones[i] = 1
	}
	for _, c := range ref.Cases {
		// A noise term, which the run keeps off (Sigma 0).
		m, err := parse.Model(c.Spec + " + (1 + 0.3 B) / (1 - 0.6 B) a")
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		p, err := m.Path("u")
		if err != nil {
			t.Fatalf("%s: Path: %v", c.Name, err)
		}
		got := p.Step(ref.N)
		if e := testutil.RunningRelErr(got, c.Step); e > 1e-12 {
			t.Errorf("%s: Path %v step differs from scipy's cascade by %.3g (running relative)", c.Name, p, e)
		}
		sim, err := m.Simulate(map[string][]float64{"u": ones}, &tf.SimSettings{FromRest: true})
		if err != nil {
			t.Fatalf("%s: Simulate: %v", c.Name, err)
		}
		if e := testutil.RunningRelErr(got, sim); e > 1e-12 {
			t.Errorf("%s: Path %v step differs from Simulate by %.3g (running relative)", c.Name, p, e)
		}
	}
}

// TestModelPathForms checks the path's polynomials for the integrating model
// and the cancellations, by hand algebra (common practice: D(B) y = G x
// is y = G/D x; (1 - B^4) = (1 - B)(1 + B + B^2 + B^3)).
func TestModelPathForms(t *testing.T) {
	for _, c := range []struct {
		spec     string
		num, den []float64
		delay    int
		stable   bool
	}{
		// The integrating model: 0.05 B^2 / ((1 - 0.5 B)(1 - B)), integrating.
		{"(1 - B) y = 0.05 / (1 - 0.5 B) B^2 u", []float64{0.05}, []float64{1, -1.5, 0.5}, 2, false},
		// Input differencing: the (1 - B) stays in the numerator, gain 0.
		{"y = 0.5 / (1 - 0.5 B) B ((1 - B) u)", []float64{0.5, -0.5}, []float64{1, -0.5}, 1, true},
		// (1 - B) on both sides: a plain static-gain path.
		{"(1 - B) y = 0.3 / (1 - 0.8 B) B^3 ((1 - B) u)", []float64{0.3}, []float64{1, -0.8}, 3, true},
		{"(1 - B^4) y = 0.4 B ((1 - B^4) u)", []float64{0.4}, []float64{1}, 1, true},
		// One (1 - B) of (1 - B^4) cancels: 1 + B + B^2 + B^3 is left.
		{"(1 - B^4) y = 0.25 ((1 - B) u)", []float64{0.25}, []float64{1, 1, 1, 1}, 0, false},
		// Twice over once: one integrator left.
		{"(1 - B)^2 y = 0.2 B ((1 - B) u)", []float64{0.2}, []float64{1, -1}, 1, false},
		// A named coefficient never cancels.
		{"(1 - B) y = (0.2 - w B) u where w = 0.2", []float64{0.2, -0.2}, []float64{1, -1}, 0, false},
		// No differencing: the same as Input.Rational.
		{"y = (0.2 - 0.1 B) / (1 - 0.6 B) B u", []float64{0.2, -0.1}, []float64{1, -0.6}, 1, true},
	} {
		m, err := parse.Model(c.spec)
		if err != nil {
			t.Fatalf("%s: %v", c.spec, err)
		}
		p, err := m.Path("u")
		if err != nil {
			t.Fatalf("%s: %v", c.spec, err)
		}
		if !slices.Equal(p.Num(), c.num) || !slices.Equal(p.Den(), c.den) || p.Delay() != c.delay || p.Stable() != c.stable {
			t.Errorf("%s: Path = %v (stable %v), want num %v den %v delay %d stable %v", c.spec, p, p.Stable(), c.num, c.den, c.delay, c.stable)
		}
	}
	m := parse.MustModel("y = (0.2 - 0.1 B) / (1 - 0.6 B) B u")
	r, _ := m.Inputs[0].Rational()
	p, _ := m.Path("u")
	if !slices.Equal(r.Num(), p.Num()) || !slices.Equal(r.Den(), p.Den()) || r.Delay() != p.Delay() {
		t.Errorf("without differencing Path %v != Input.Rational %v", p, r)
	}
}

// TestModelPathEvent checks that an event input is handled: an additive
// outlier added by WithOutliers to a model with D(B) = (1 - B) carries
// (1 - B) in its numerator, and its path is the outlier's own shape on y,
// a static gain (Chen & Liu 1993: an additive outlier moves one sample of
// y); its impulse response equals Simulate's response to the pulse.
func TestModelPathEvent(t *testing.T) {
	m := parse.MustModel("(1 - B) y = 0.05 / (1 - 0.5 B) B^2 u")
	mo, _, err := m.WithOutliers([]arma.Outlier{{Kind: arma.Additive, Index: 0, Size: 2}}, 0)
	if err != nil {
		t.Fatal(err)
	}
	p, err := mo.Path("pulse(0)")
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(p.Num(), []float64{2}) || !slices.Equal(p.Den(), []float64{1}) || p.Delay() != 0 {
		t.Fatalf("additive outlier path = %v, want the static gain 2", p)
	}
	sim, err := mo.Simulate(map[string][]float64{"u": make([]float64, 50)}, &tf.SimSettings{FromRest: true})
	if err != nil {
		t.Fatal(err)
	}
	if e := testutil.RunningRelErr(p.Impulse(50), sim); e > 1e-12 {
		t.Errorf("event path impulse differs from Simulate by %.3g", e)
	}
}

// TestModelPathErrors checks the refusals: no such input, an input named
// twice (a model built in code), a polynomial Validate refuses.
func TestModelPathErrors(t *testing.T) {
	m := parse.MustModel("(1 - B) y = 0.05 / (1 - 0.5 B) B^2 u")
	var se *tf.SeriesError
	if _, err := m.Path("v"); !errors.As(err, &se) || se.Series != "v" || !errors.Is(err, tf.ErrName) {
		t.Errorf("unknown input: err = %v, want a *SeriesError naming v", err)
	}
	two := m.Clone()
	two.Inputs = append(two.Inputs, two.Inputs[0])
	if _, err := two.Path("u"); !errors.As(err, &se) {
		t.Errorf("input twice: err = %v, want a *SeriesError", err)
	} else {
		testutil.CheckWords(t, "input twice", err.Error(), []string{"tf.Model.Path", "inputs 1 and 2", "combine"}, nil)
	}
	bad := m.Clone()
	bad.Diff.Factors[0].Exp = 0
	var me *tf.ModelError
	if _, err := bad.Path("u"); !errors.As(err, &me) {
		t.Errorf("output differencing power 0: err = %v, want a *ModelError", err)
	}
	m.Inputs[0].Delay = -1
	if _, err := m.Path("u"); !errors.As(err, new(*tf.DelayError)) && !errors.As(err, &me) {
		t.Errorf("negative dead time: err = %v, want a *DelayError or *ModelError", err)
	}
}
