package parse

import (
	"errors"
	"flag"
	"io"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/tf"
)

func TestCheck(t *testing.T) {
	m := MustModel("temp = c + (w0 + w1 B) / (1 - d1 B) B^4 burner + w0 feed + ARMA(1, 1) where c ~ 20")
	if err := Check(m); err != nil {
		t.Fatalf("valid model: %v", err)
	}
	// An estimator writes estimates in: still valid.
	est := m.Clone()
	est.Inputs[0].Den.Factors[0].Terms[1].Coef.Value = 0.7
	if err := Check(est); err != nil {
		t.Errorf("with estimates: %v", err)
	}
	cases := []struct {
		edit func(m *tf.Model)
		msg  string
	}{
		{func(m *tf.Model) { m.Output = "" }, "the model has no output name"},
		{func(m *tf.Model) { m.Inputs[0].Num.Factors[0].Terms[1].Coef.Value = math.NaN() },
			"the coefficient w1 of the numerator of input burner is NaN"},
		{func(m *tf.Model) { m.Inputs[1].Num.Factors[0].Terms[0].Coef.Value = 2 },
			"the coefficient w0 of the numerator of input feed differs from its use in the numerator of input burner (free from 2 against free from 0); one name is one parameter"},
		{func(m *tf.Model) { m.Inputs[0].Den.Factors[0].Terms[0].Coef.Value = 2 },
			"the constant term of the denominator must be 1, not 2; divide the numerator and the denominator by 2"},
		{func(m *tf.Model) { m.Inputs[1].Series = "burner" },
			"input burner appears twice (inputs 1 and 2); combine its terms into one transfer function"},
		{func(m *tf.Model) { m.Interval = tf.Interval{Value: 3, Unit: "fortnight"} },
			`unknown unit "fortnight" for the sample interval; use s, min, h, d, wk, mo, qtr or yr`},
	}
	for _, c := range cases {
		bad := m.Clone()
		c.edit(&bad)
		err := Check(bad)
		var e *Error
		if !errors.As(err, &e) || e.Msg != c.msg {
			t.Errorf("got %v\nwant %s", err, c.msg)
		}
	}
	// Check does not modify the model.
	before := m.String()
	Check(m)
	if m.String() != before {
		t.Error("Check modified the model")
	}
}

func TestCheckErrorText(t *testing.T) {
	m := tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x", Num: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Value: math.Inf(1)}}}}}}}}}
	if err := Check(m); err == nil || err.Error() != "Inputs[0].Num.Factors[0].Terms[0].Coef.Value: a coefficient of the numerator of input x is +Inf" {
		t.Errorf("got %v", err)
	}
}

// TestSpecFlag uses Spec as a command-line flag through flag.TextVar.
func TestSpecFlag(t *testing.T) {
	fs := flag.NewFlagSet("sim", flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	var sp Spec
	fs.TextVar(&sp, "model", Spec{}, "model spec")
	if err := fs.Parse([]string{"-model", "flow = w0 B^2 rain + a every 1 h"}); err != nil {
		t.Fatal(err)
	}
	if sp.Model.Inputs[0].Delay != 2 || sp.Model.Interval.Unit != "h" {
		t.Errorf("flag gave %v", sp)
	}
	err := fs.Parse([]string{"-model", "flow = w0 B^-2 rain"})
	if err == nil || !strings.Contains(err.Error(), "1:13: the dead time cannot be negative (here -2)") {
		t.Errorf("bad flag: %v", err)
	}
}

// TestLongLineSnippet checks that an error in a very long line prints a
// window of the line around the caret.
func TestLongLineSnippet(t *testing.T) {
	var sb strings.Builder
	sb.WriteString("y = w0 x")
	for i := range 30 {
		sb.WriteString(" + w x" + strconv.Itoa(i))
	}
	sb.WriteString(" + (1 - ) z")
	for i := range 30 {
		sb.WriteString(" + w v" + strconv.Itoa(i))
	}
	spec := sb.String()
	_, err := Model(spec)
	var e *Error
	if !errors.As(err, &e) {
		t.Fatal(err)
	}
	lines := strings.Split(err.Error(), "\n")
	if len(lines) != 3 || len(lines[1]) > 4+3+110+3 || !strings.HasPrefix(lines[1], "    ...") || !strings.HasSuffix(lines[1], "...") {
		t.Fatalf("snippet:\n%s", err)
	}
	// The caret sits under the ')' that follows "(1 - ".
	c := strings.Index(lines[2], "^")
	if c < 0 || lines[1][c] != ')' || lines[1][c-4:c] != "1 - " {
		t.Errorf("caret misplaced:\n%s", err)
	}
	if e.Text != spec {
		t.Error("Text is not the whole line")
	}
}

// TestLongSyntaxError checks that a syntax error at the end of a long
// text gets the same message as in a short text.
func TestLongSyntaxError(t *testing.T) {
	for _, n := range []int{3, 450} { // 450 terms: 4055 tokens, near MaxTokens
		spec := "y = " + strings.Repeat("w (1 - d B) x + ", n) + "(1 - "
		_, err := Model(spec)
		var e *Error
		if !errors.As(err, &e) || e.Msg != "missing ')' to close the '(' at 1:"+strconv.Itoa(len(spec)-4) || e.Pos.Column != len(spec)+1 {
			t.Errorf("n = %d: %v", n, err)
		}
	}
}

// codeModel is a valid model built in code, as a caller of tf would
// build one: y = (w0 + w1 B) / (1 - d1 B) B^2 burner + 0.5 feed + (1 - t1 B) / (1 - p1 B) a.
func codeModel() tf.Model {
	num := func(v float64) tf.Coef { return tf.Coef{Value: v} }
	free := func(n string, v float64) tf.Coef { return tf.Coef{Name: n, Value: v, Free: true} }
	one := func(terms ...tf.Term) tf.Poly { return tf.Poly{Factors: []tf.Factor{{Terms: terms, Exp: 1}}} }
	return tf.Model{
		Output: "temp",
		Inputs: []tf.Input{
			{Series: "burner", Delay: 2,
				Num: one(tf.Term{Coef: free("w0", 0.5)}, tf.Term{Coef: free("w1", 0), Power: 1}),
				Den: one(tf.Term{Coef: num(1)}, tf.Term{Neg: true, Coef: free("d1", 0.7), Power: 1})},
			{Series: "feed", Num: one(tf.Term{Coef: num(0.5)})},
		},
		Noise: &tf.Noise{
			MA: one(tf.Term{Coef: num(1)}, tf.Term{Neg: true, Coef: free("t1", 0.2), Power: 1}),
			AR: one(tf.Term{Coef: num(1)}, tf.Term{Neg: true, Coef: free("p1", 0.6), Power: 1}),
		},
		Interval: tf.Interval{Value: 1, Unit: "min"},
	}
}

// TestCheckTraps is the table of models built in code that a spec could
// not say, and that tf would otherwise take to a panic or to a silently
// different model (issue 11, item 14): each is refused with a typed
// *Error that names the field (Path), the input or polynomial, and the
// fix.
func TestCheckTraps(t *testing.T) {
	if err := Check(codeModel()); err != nil {
		t.Fatalf("the valid model is refused: %v", err)
	}
	term := func(m *tf.Model) *tf.Term { return &m.Inputs[0].Den.Factors[0].Terms[1] }
	cases := []struct {
		name string
		edit func(m *tf.Model)
		kind error
		path string
		msg  string
	}{
		{"factor power 0", func(m *tf.Model) { m.Inputs[0].Num.Factors[0].Exp = 0 }, ErrModel, "Inputs[0].Num.Factors[0].Exp",
			"the power of factor 1 of the numerator of input burner is 0; a factor's power is a whole number from 1 to 64 (Exp 1 for a factor written once)"},
		{"factor power -1", func(m *tf.Model) { m.Noise.AR.Factors[0].Exp = -1 }, ErrModel, "Noise.AR.Factors[0].Exp",
			"the power of factor 1 of the noise denominator is -1; a factor's power is a whole number from 1 to 64 (Exp 1 for a factor written once)"},
		{"factor power over the limit", func(m *tf.Model) { m.Inputs[0].Den.Factors[0].Exp = 65 }, ErrLimit, "Inputs[0].Den.Factors[0].Exp",
			"the power of factor 1 of the denominator of input burner is 65, over the limit of 64"},
		{"negative dead time", func(m *tf.Model) { m.Inputs[1].Delay = -1 }, ErrModel, "Inputs[1].Delay",
			"the dead time of input feed is -1 samples; a dead time is a whole number of samples from 0 to 10000"},
		{"dead time over the limit", func(m *tf.Model) { m.Inputs[0].Delay = 10001 }, ErrLimit, "Inputs[0].Delay",
			"the dead time of input burner is 10001 samples, over the limit of 10000"},
		{"NaN coefficient", func(m *tf.Model) { term(m).Coef.Value = math.NaN() }, ErrModel, "Inputs[0].Den.Factors[0].Terms[1].Coef.Value",
			"the coefficient d1 of the denominator of input burner is NaN"},
		{"infinite fixed number", func(m *tf.Model) { m.Inputs[1].Num.Factors[0].Terms[0].Coef.Value = math.Inf(-1) }, ErrModel,
			"Inputs[1].Num.Factors[0].Terms[0].Coef.Value", "a coefficient of the numerator of input feed is -Inf"},
		{"free coefficient without a name", func(m *tf.Model) { m.Inputs[1].Num.Factors[0].Terms[0].Coef.Free = true }, ErrModel,
			"Inputs[1].Num.Factors[0].Terms[0].Coef.Name",
			"a free coefficient of the numerator of input feed has no name; a free coefficient is a parameter and needs one (a coefficient without a name is a fixed number: set Free false)"},
		{"free constant without a name", func(m *tf.Model) { m.Const = &tf.Coef{Value: 3, Free: true} }, ErrModel, "Const.Name",
			"a free coefficient of the constant has no name; a free coefficient is a parameter and needs one (a coefficient without a name is a fixed number: set Free false)"},
		{"duplicate input series", func(m *tf.Model) { m.Inputs[1].Series = "burner" }, ErrModel, "Inputs[1].Series",
			"input burner appears twice (inputs 1 and 2); combine its terms into one transfer function"},
		{"differencing with a free coefficient", func(m *tf.Model) {
			m.Inputs[1].Diff = tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Value: 1}}, {Neg: true, Coef: tf.Coef{Name: "g", Value: 1, Free: true}, Power: 1}}}}}
		}, ErrModel, "Inputs[1].Diff.Factors[0].Terms[1].Coef.Name",
			"the differencing of input feed takes numbers only, and g is a coefficient name; differencing is not estimated"},
		{"factor without terms", func(m *tf.Model) { m.Inputs[0].Num.Factors[0].Terms = nil }, ErrModel, "Inputs[0].Num.Factors[0].Terms",
			"factor 1 of the numerator of input burner has no terms; leave the factor out for the constant 1"},
		{"negative power of B", func(m *tf.Model) { term(m).Power = -1 }, ErrModel, "Inputs[0].Den.Factors[0].Terms[1].Power",
			"a term of factor 1 of the denominator of input burner is in B^-1; powers of B are whole numbers from 0 to 64 (a dead time goes in Input.Delay)"},
		{"power of B over the limit", func(m *tf.Model) { term(m).Power = 65 }, ErrLimit, "Inputs[0].Den.Factors[0].Terms[1].Power",
			"a term of factor 1 of the denominator of input burner is in B^65, over the limit of 64"},
		{"two terms in one power", func(m *tf.Model) { term(m).Power = 0 }, ErrModel, "Inputs[0].Den.Factors[0].Terms[1].Power",
			"factor 1 of the denominator of input burner has two terms in B^0; combine them"},
		{"degree over the limit", func(m *tf.Model) {
			f := tf.Factor{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Value: 1}}, {Neg: true, Coef: tf.Coef{Value: 1}, Power: 40}}}
			m.Diff = tf.Poly{Factors: []tf.Factor{f, f}}
		}, ErrLimit, "Diff", "the differencing of the output has degree 80, over the limit of 64"},
		{"input without a series name", func(m *tf.Model) { m.Inputs[1].Series = "" }, ErrModel, "Inputs[1].Series", "input 2 has no series name"},
		{"series name with a space", func(m *tf.Model) { m.Inputs[1].Series = "feed 2" }, ErrModel, "Inputs[1].Series",
			`the series name of input 2 "feed 2" cannot be written in a spec: a name is ASCII letters, digits and '_', not starting with a digit`},
		{"series named a", func(m *tf.Model) { m.Inputs[1].Series = "a" }, ErrModel, "Inputs[1].Series",
			`the series name of input 2 "a" is a reserved word of the spec language (B, a, AR, MA, ARMA, where, every); rename it`},
		{"output named B", func(m *tf.Model) { m.Output = "B" }, ErrModel, "Output",
			`the output name "B" is a reserved word of the spec language (B, a, AR, MA, ARMA, where, every); rename it`},
		{"coefficient name with a sign", func(m *tf.Model) { term(m).Coef.Name = "-d1" }, ErrModel, "Inputs[0].Den.Factors[0].Terms[1].Coef.Name",
			`the coefficient name "-d1" of the denominator of input burner cannot be written in a spec: a name is ASCII letters, digits and '_', not starting with a digit`},
		{"output as input", func(m *tf.Model) { m.Inputs[1].Series = "temp" }, ErrModel, "Inputs[1].Series",
			"input 2 is temp, the output; it cannot also be an input"},
		{"no input", func(m *tf.Model) { m.Inputs = nil }, ErrModel, "Inputs", "the model has no input term; give it at least one Input"},
		{"too many inputs", func(m *tf.Model) {
			for i := range 64 {
				m.Inputs = append(m.Inputs, tf.Input{Series: "x" + strconv.Itoa(i)})
			}
		}, ErrLimit, "Inputs", "the model has 66 inputs, over the limit of 64"},
		{"negative interval", func(m *tf.Model) { m.Interval.Value = -3 }, ErrModel, "Interval.Value",
			"the sample interval must be a positive number, not -3"},
		{"interval without a unit", func(m *tf.Model) { m.Interval.Unit = "" }, ErrModel, "Interval.Unit",
			"the sample interval 1 has no unit; use s, min, h, d, wk, mo, qtr or yr"},
		{"interval in minutes spelt out", func(m *tf.Model) { m.Interval.Unit = "minutes" }, ErrModel, "Interval.Unit",
			`unknown unit "minutes" for the sample interval; use s, min, h, d, wk, mo, qtr or yr (for minutes write min)`},
		{"interval NaN", func(m *tf.Model) { m.Interval.Value = math.NaN() }, ErrModel, "Interval.Value", "the sample interval is NaN"},
		{"one name, two values", func(m *tf.Model) { m.Noise.MA.Factors[0].Terms[1].Coef.Name = "p1" }, ErrModel, "Noise.AR.Factors[0].Terms[1].Coef",
			"the coefficient p1 of the noise denominator differs from its use in the noise numerator (free from 0.6 against free from 0.2); one name is one parameter"},
	}
	for _, c := range cases {
		m := codeModel()
		c.edit(&m)
		before := m.Clone()
		err := Check(m)
		var e *Error
		if !errors.As(err, &e) {
			t.Errorf("%s: got %v, want a *parse.Error", c.name, err)
			continue
		}
		if e.Msg != c.msg || e.Path != c.path || !errors.Is(err, c.kind) || !errors.Is(err, tf.ErrModel) {
			t.Errorf("%s:\n got %s %v %q\nwant %s %v %q", c.name, e.Path, e.Kind, e.Msg, c.path, c.kind, c.msg)
		}
		if want := c.path + ": " + c.msg; e.Error() != want {
			t.Errorf("%s: Error() = %q, want %q", c.name, e.Error(), want)
		}
		if !m.Equal(before) && !(math.IsNaN(m.Interval.Value) && math.IsNaN(before.Interval.Value)) {
			t.Errorf("%s: Check modified the model", c.name)
		}
	}
}

// TestCheckThroughText covers the rules Check leaves to the parser of
// the printed text: the errors point into the canonical text, held in
// Text, and have no Path.
func TestCheckThroughText(t *testing.T) {
	m := codeModel()
	m.Inputs[0].Den.Factors[0].Terms[1].Coef.Name = "B3"
	err := Check(m)
	var e *Error
	if !errors.As(err, &e) || e.Path != "" || !strings.HasPrefix(e.Msg, "B3 reads as a coefficient name; for B to the power 3 write B^3") ||
		!strings.Contains(e.Text, "(1 - B3 B)") {
		t.Fatalf("got %v", err)
	}
	// A negative unnamed value prints with the sign folded into the
	// term; the model still reads back as itself.
	m = codeModel()
	m.Inputs[1].Num.Factors[0].Terms[0].Coef.Value = -0.5
	m.Inputs[0].Den.Factors[0].Terms = append(m.Inputs[0].Den.Factors[0].Terms, tf.Term{Coef: tf.Coef{Value: -0.1}, Power: 2})
	if err := Check(m); err != nil {
		t.Errorf("negative unnamed values: %v", err)
	}
}

// TestCheckGoodSpecs checks that every model the parser builds passes
// Check.
func TestCheckGoodSpecs(t *testing.T) {
	for _, s := range goodSpecs {
		if err := Check(MustModel(s)); err != nil {
			t.Errorf("%q: %v", s, err)
		}
	}
}

// TestMarshalRefusesInvalid checks that a Spec holding a model a spec
// cannot say is not written: a negative dead time would print without
// its B^k and read back as another model.
func TestMarshalRefusesInvalid(t *testing.T) {
	m := codeModel()
	m.Inputs[0].Delay = -1
	_, err := Spec{Model: m}.MarshalText()
	var e *Error
	if !errors.As(err, &e) || e.Path != "Inputs[0].Delay" {
		t.Errorf("got %v", err)
	}
	b, err := Spec{Model: codeModel()}.AppendText([]byte("x: "))
	if err != nil || string(b) != "x: "+codeModel().String() {
		t.Errorf("valid model: %q, %v", b, err)
	}
}
