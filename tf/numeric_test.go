package tf_test

import (
	"errors"
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
