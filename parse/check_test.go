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
	for _, n := range []int{3, 1000} {
		spec := "y = " + strings.Repeat("w (1 - d B) x + ", n) + "(1 - "
		_, err := Model(spec)
		var e *Error
		if !errors.As(err, &e) || e.Msg != "missing ')' to close the '(' at 1:"+strconv.Itoa(len(spec)-4) || e.Pos.Column != len(spec)+1 {
			t.Errorf("n = %d: %v", n, err)
		}
	}
}
