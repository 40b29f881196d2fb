package tf_test

import (
	"context"
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/backshift/backshift/internal/sym"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// TestPrintCodeBuilt prints models built in code (not by the parser) and
// checks the exact text and that it reads back to an equal model.
func TestPrintCodeBuilt(t *testing.T) {
	fixed := func(v float64) tf.Coef { return tf.Coef{Value: v} }
	m := tf.Model{
		Output: "temp",
		Const:  &tf.Coef{Value: -4.25},
		Inputs: []tf.Input{
			{Series: "burner", Num: sym.FromCoeffs([]float64{0.5, 0.25}), Den: sym.FromCoeffs([]float64{1, -0.8}), Delay: 4},
			{Series: "feed", Num: tf.Poly{Factors: []tf.Factor{{Terms: []tf.Term{{Coef: fixed(1)}}, Exp: 1}}}},
			{Series: "air"},
			{Series: "flow", Diff: sym.FromCoeffs([]float64{1, -1}), Delay: 1},
			{Series: "level", Num: tf.Poly{Factors: []tf.Factor{{Terms: []tf.Term{{Coef: tf.Coef{Name: "k", Value: 2, Free: false}}}, Exp: 1}}}},
		},
		Noise:    &tf.Noise{AR: sym.FromCoeffs([]float64{1, -0.5, 0.25})},
		Interval: tf.Interval{Value: 0.5, Unit: "min"},
	}
	// The expected text is the package's own notation (the Model.String
	// doc in print.go), not a numerical result: each number in it is a
	// value set above printed by strconv 'g' precision -1, so the
	// comparison is exact. By hand: AR {1, -0.5, 0.25} is
	// phi(B) = 1 - 0.5 B + 0.25 B^2, and 0.5 min is the Interval.
	want := "temp = -4.25 + (0.5 + 0.25 B) / (1 - 0.8 B) B^4 burner + (1) feed + 1 air + B ((1 - B) flow) + k level + 1 / (1 - 0.5 B + 0.25 B^2) a; where k = 2; every 0.5 min"
	if got := m.String(); got != want {
		t.Fatalf("got  %s\nwant %s", got, want)
	}
	back, err := parse.Model(want)
	if err != nil || !back.Equal(m) {
		t.Errorf("reads back as %v, %v", back, err)
	}
	// A negative unnamed value prints with its sign folded into the
	// term's sign: the same polynomial, written as by hand.
	neg := tf.Poly{Factors: []tf.Factor{{Terms: []tf.Term{{Coef: fixed(1)}, {Coef: fixed(-0.3), Power: 1}}, Exp: 2}}}
	if got := tf.FormatPoly(neg); got != "(1 - 0.3 B)^2" {
		t.Errorf("FormatPoly: %s", got)
	}
	if got := tf.FormatPoly(tf.Poly{}); got != "1" {
		t.Errorf("FormatPoly of 1: %s", got)
	}
	// Values print in the shortest form that reads back exactly: the
	// expected value is the input itself, compared exactly, because
	// strconv.FormatFloat(v, 'g', -1, 64) uses "the minimal number of
	// digits necessary to represent the value uniquely" (Go strconv
	// doc) and strconv.ParseFloat rounds correctly. The values are edge
	// cases of that format (common practice): a non-terminating binary
	// fraction, 1/3, the smallest subnormal, the largest float64, an
	// integer above 2^53, a power of ten and a small value, which 'g'
	// writes as 1.2345678901234568e+17, 1e+21 and 2.5e-08 (checked
	// with Go 1.26 strconv), so the parser must read signed exponents.
	for _, v := range []float64{0.1, 1.0 / 3, 5e-324, math.MaxFloat64, 123456789012345680, 1e21, 2.5e-8} {
		m := tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x", Num: sym.FromCoeffs([]float64{v})}}}
		back, err := parse.Model(m.String())
		if err != nil {
			t.Errorf("%v prints as %q, which does not read back: %v", v, m.String(), err)
			continue
		}
		if got := back.Inputs[0].Num.Coeffs(); len(got) != 1 || got[0] != v {
			t.Errorf("%v prints as %q, reads back %v", v, m.String(), got)
		}
	}
	if s := (tf.Interval{}).String(); s != "" {
		t.Errorf("zero interval prints %q", s)
	}
	if s := m.Inputs[3].String(); s != "B ((1 - B) flow)" {
		t.Errorf("Input.String: %q", s)
	}
}

// TestPrintManyNames covers the where clause of a model with more names
// than the printer's small table (16).
func TestPrintManyNames(t *testing.T) {
	spec := "y = w0 x0"
	where := " where w0 ~ 1"
	for i := 1; i < 40; i++ {
		s := strconv.Itoa(i)
		spec += " + (w" + s + " + w0 B) x" + s
		if i%3 == 0 {
			where += ", w" + s + " = " + s
		}
	}
	m := parse.MustModel(spec + where)
	// 40 names (w0..w39), so the printer's map path is the one used.
	if n := len(m.Params()); n != 40 {
		t.Fatalf("%d names, want 40 (more than the small table's 16)", n)
	}
	text := m.String()
	back, err := parse.Model(text)
	if err != nil || !back.Equal(m) || back.String() != text {
		t.Fatalf("%s\nreads back %v", m, err)
	}
	// A read-back cannot see a name printed twice (both texts would
	// carry it), so check the where clause itself: w0, used in every
	// term, appears once, and the held names past the 16th are there.
	if c := strings.Count(text, "w0 ~ 1"); c != 1 {
		t.Errorf("w0 ~ 1 printed %d times in %s", c, text)
	}
	if !strings.HasSuffix(text, " where w0 ~ 1, w3 = 3, w6 = 6, w9 = 9, w12 = 12, w15 = 15, w18 = 18, w21 = 21, w24 = 24, w27 = 27, w30 = 30, w33 = 33, w36 = 36, w39 = 39") {
		t.Errorf("where clause: %s", text)
	}
}

// TestHeldRoundTrip: a fitted model prints its estimates as free ("~");
// Held prints them held ("="), reads back through parse to the same
// model, leaves the estimate untouched, and a fit of the held model
// moves nothing (every coefficient is held, so there is nothing to fit).
func TestHeldRoundTrip(t *testing.T) {
	x := whiteInput(5, 6, 300)
	y := mustRecord(t, "y = 2 + 0.8 / (1 - 0.6 B) B x + 1 / (1 - 0.4 B) a", map[string][]float64{"x": x}, &tf.SimSettings{Seed1: 1, Seed2: 2, Sigma: 0.3})["y"]
	spec := parse.MustModel("y = c + w0 / (1 - d1 B) B x + 1 / (1 - p1 B) a where w0 ~ 0.5, d1 ~ 0.3")
	est, err := fit.Model(context.Background(), spec, map[string][]float64{"y": y, "x": x}, nil)
	if err != nil {
		t.Fatal(err)
	}
	before := est.Model.String()
	if !strings.Contains(before, "w0 ~ ") {
		t.Fatalf("fitted model prints %q, want w0 ~ estimate", before)
	}
	held := est.Model.Held()
	text := held.String()
	for _, p := range est.Params {
		want := p.Name + " = " + strconv.FormatFloat(p.Value, 'g', -1, 64)
		if !strings.Contains(text, want) {
			t.Errorf("held model %q lacks %q", text, want)
		}
	}
	if strings.Contains(text, "~") {
		t.Errorf("held model %q still has a free coefficient", text)
	}
	back, err := parse.Model(text)
	if err != nil || !back.Equal(held) {
		t.Fatalf("round trip of %q: %v, %v", text, back, err)
	}
	if est.Model.String() != before || len(est.Model.Params()) == 0 || !est.Model.Params()[0].Free {
		t.Errorf("Held changed the estimate's model: %q", est.Model.String())
	}
	for _, c := range back.Params() {
		if c.Free {
			t.Errorf("parsed held model has %s free", c.Name)
		}
	}
}

// TestPrintEvents prints a model with event inputs built in code and
// reads it back (package parse) to an equal model; the text is the
// notation of parse/doc.go (Events), each time written by hand from the
// value set (08:00 at -05:00 prints with its offset; a UTC midnight as
// the date alone).
func TestPrintEvents(t *testing.T) {
	st := tf.Event{Kind: tf.Step, Index: 120}
	pu := tf.Event{Kind: tf.Pulse, At: time.Date(2026, 3, 1, 8, 0, 0, 0, time.FixedZone("", -5*3600))}
	day := tf.Event{Kind: tf.Pulse, At: time.Date(2026, 3, 2, 0, 0, 0, 0, time.UTC)}
	k := tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Name: "k", Free: true}}}}}}
	m := tf.Model{
		Output: "temp",
		Inputs: []tf.Input{
			{Series: "burner", Num: sym.FromCoeffs([]float64{0.5}), Delay: 2},
			{Series: st.String(), Event: &st, Num: k, Den: sym.FromCoeffs([]float64{1, -0.8})},
			{Series: pu.String(), Event: &pu, Delay: 1},
			{Series: day.String(), Event: &day, Num: sym.FromCoeffs([]float64{2})},
		},
		Noise: &tf.Noise{},
	}
	if err := m.Validate(); err != nil {
		t.Fatal(err)
	}
	want := "temp = 0.5 B^2 burner + k / (1 - 0.8 B) step(120) + B pulse(2026-03-01T08:00-05:00) + 2 pulse(2026-03-02) + a"
	if got := m.String(); got != want {
		t.Fatalf("got  %s\nwant %s", got, want)
	}
	back, err := parse.Model(want)
	if err != nil || !back.Equal(m) || back.String() != want {
		t.Fatalf("reads back as %v, %v", back, err)
	}
	if err := parse.Check(m); err != nil {
		t.Errorf("Check: %v", err)
	}
	if s := m.Inputs[1].String(); s != "k / (1 - 0.8 B) step(120)" {
		t.Errorf("Input.String: %q", s)
	}
	// Equal compares event times as instants and tells events apart.
	c := m.Clone()
	c.Inputs[2].Event.At = pu.At.UTC()
	if !c.Equal(m) || c.Inputs[2].Event == m.Inputs[2].Event {
		t.Errorf("Clone or Equal of an event input")
	}
	c.Inputs[1].Event.Kind = tf.Pulse
	if c.Equal(m) {
		t.Errorf("a pulse equals a step")
	}
}
