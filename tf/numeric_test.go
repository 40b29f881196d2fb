package tf_test

import (
	"errors"
	"slices"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// A model built in code with a factor power Model.Validate refuses gives
// a *ModelError from the numeric views that return errors, not the
// polynomial package's panic; and a negative dead time prints as written
// (B^-1) instead of being dropped, so the text shows the fault.
func TestNumericViewsBadInput(t *testing.T) {
	for _, exp := range []int{0, -1} {
		m := parse.MustModel("y = 2 / (1 - 0.5 B) B x + 1 / (1 - 0.3 B) a")
		m.Inputs[0].Den.Factors[0].Exp = exp
		m.Noise.AR.Factors[0].Exp = exp
		var me *tf.ModelError
		if _, err := m.Inputs[0].Rational(); !errors.As(err, &me) || !strings.Contains(err.Error(), `input "x" denominator`) {
			t.Errorf("Exp %d: Input.Rational error = %v, want a *ModelError naming the denominator of input \"x\"", exp, err)
		}
		if _, err := m.NoiseRational(); !errors.As(err, &me) || !strings.Contains(err.Error(), "noise AR") {
			t.Errorf("Exp %d: NoiseRational error = %v, want a *ModelError naming the noise AR", exp, err)
		}
	}
	m := parse.MustModel("y = 2 / (1 - 0.5 B) B^2 x")
	m.Inputs[0].Delay = -1
	if s := m.String(); !strings.Contains(s, "B^-1 x") {
		t.Errorf("a dead time of -1 prints as %q, want it written as B^-1", s)
	}
	if _, err := parse.Model(m.String()); err == nil {
		t.Errorf("the text %q of a negative dead time parsed back without an error", m.String())
	}
}

func TestNumericViews(t *testing.T) {
	m := parse.MustModel("(1 - B)^2 y = c + (w0 + w1 B) / ((1 - 0.5 B)(1 + 0.2 B)) B^4 x + ((1 - B^12) z) + (1 - t1 B) / (1 - p1 B) / (1 - P1 B^12) a where c ~ 3, w0 = 2, t1 ~ 0.3, p1 ~ 0.5, P1 ~ 0.2")
	if d := m.DiffCoeffs(); !slices.Equal(d, []float64{1, -2, 1}) {
		t.Errorf("output differencing %v", d)
	}
	if d := m.Inputs[1].DiffCoeffs(); len(d) != 13 || d[0] != 1 || d[12] != -1 || d[6] != 0 {
		t.Errorf("input differencing %v", d)
	}
	if d := m.Inputs[0].DiffCoeffs(); !slices.Equal(d, []float64{1}) {
		t.Errorf("no differencing gives %v", d)
	}
	r, err := m.Inputs[0].Rational()
	if err != nil || !slices.Equal(r.Num(), []float64{2}) || !slices.Equal(r.Den(), []float64{1, -0.3, -0.1}) || r.Delay() != 4 {
		// w1 starts at 0, so the numerator trims to {2}.
		t.Errorf("Rational: %v/%v B^%d, %v", r.Num(), r.Den(), r.Delay(), err)
	}
	ma, ar, ok := m.NoiseCoeffs()
	if !ok || !slices.Equal(ma, []float64{1, -0.3}) || len(ar) != 14 || ar[1] != -0.5 || ar[12] != -0.2 || ar[13] != 0.1 {
		t.Errorf("noise %v / %v", ma, ar)
	}
	if _, _, ok := parse.MustModel("y = w0 x").NoiseCoeffs(); ok {
		t.Error("noise-free model reports noise")
	}
	if nr, _ := parse.MustModel("y = w0 x").NoiseRational(); nr.Impulse(3)[0] != 0 {
		t.Error("noise-free NoiseRational is not zero")
	}
	if m.ConstValue() != 3 {
		t.Errorf("ConstValue %v", m.ConstValue())
	}
	var names []string
	for _, p := range m.Params() {
		names = append(names, p.Name)
	}
	if got := strings.Join(names, " "); got != "c w0 w1 t1 p1 P1" {
		t.Errorf("Params: %s", got)
	}
}

// TestIntervalUnits checks every unit of a sample interval, and an
// unknown one and the empty one, through Seconds, Months, Calendar and
// ValidUnit (lengths: 60 s a minute, 3600 s an hour, 86400 s a day, 7
// days a week, 3 months a quarter, 12 a year; common practice).
func TestIntervalUnits(t *testing.T) {
	for _, c := range []struct {
		unit            string
		seconds, months float64 // 0: not that kind of unit
	}{
		{"s", 2, 0}, {"min", 120, 0}, {"h", 7200, 0}, {"d", 172800, 0}, {"wk", 1209600, 0},
		{"mo", 0, 2}, {"qtr", 0, 6}, {"yr", 0, 24}, {"sec", 0, 0}, {"", 0, 0},
	} {
		iv := tf.Interval{Value: 2, Unit: c.unit}
		s, sok := iv.Seconds()
		m, mok := iv.Months()
		if s != c.seconds || sok != (c.seconds > 0) || m != c.months || mok != (c.months > 0) ||
			iv.Calendar() != (c.months > 0) || tf.ValidUnit(c.unit) != (c.seconds > 0 || c.months > 0) {
			t.Errorf("unit %q: Seconds %g %v, Months %g %v, Calendar %v, ValidUnit %v", c.unit, s, sok, m, mok, iv.Calendar(), tf.ValidUnit(c.unit))
		}
	}
}

// EachParam visits the constant, each input's numerator and denominator
// and the noise's MA and AR coefficients in written order (the order of
// Params), skips differencing, and hands out pointers into the model:
// a change made through them on a Clone shows in the clone only.
func TestEachParam(t *testing.T) {
	m := parse.MustModel("(1 - B) y = c + (w0 + w1 B) / (1 - d1 B) B^2 x + (1 - t1 B) / (1 - p1 B) a; where c ~ 1, w0 ~ 2, w1 ~ 3, d1 ~ 0.5, t1 ~ 0.2, p1 ~ 0.4")
	var names []string
	m.EachParam(func(c *tf.Coef) {
		if c.Name != "" { // a number written in the spec, such as the 1 of (1 - t1 B)
			names = append(names, c.Name)
		}
	})
	want := []string{"c", "w0", "w1", "d1", "t1", "p1"}
	if !slices.Equal(names, want) {
		t.Fatalf("EachParam visited %v, want %v", names, want)
	}
	var params []string
	for _, p := range m.Params() {
		params = append(params, p.Name)
	}
	if !slices.Equal(params, want) {
		t.Errorf("Params gives %v, EachParam's order is %v", params, want)
	}
	cl := m.Clone()
	cl.EachParam(func(c *tf.Coef) { c.Value *= 10 })
	if got := cl.Params()[1].Value; got != 20 {
		t.Errorf("w0 of the changed clone = %v, want 20", got)
	}
	if got := m.Params()[1].Value; got != 2 {
		t.Errorf("w0 of the original = %v after changing a clone, want 2", got)
	}
}
