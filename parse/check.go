package parse

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/tf"
)

// Check reports whether a model built in code (or changed after
// parsing, for example by an estimator writing its estimates in) is one
// that a spec can say, with the same rules and messages as Model. It
// returns nil for a valid model, else an ErrorList.
//
// It first checks what printing cannot show: an empty output name, a
// NaN or infinite value, a name used with two different values or
// freedoms. Those errors carry the coefficient's own Pos (the zero Pos
// for a model built in code) and no Text. Then it parses m.String(): its
// errors point into that canonical text, which each Error holds in Text.
func Check(m tf.Model) error {
	b := builder{}
	if m.Output == "" {
		b.failAt(tf.Pos{}, ErrModel, "the model has no output name")
		return b.errs
	}
	type use struct {
		c     tf.Coef
		where string
	}
	seen := map[string]use{}
	visit := func(where string) func(c *tf.Coef) {
		return func(c *tf.Coef) {
			what := "the coefficient " + c.Name
			if c.Name == "" {
				what = "a coefficient"
			}
			if math.IsNaN(c.Value) || math.IsInf(c.Value, 0) {
				b.failAt(c.Pos, ErrModel, what+" of the "+where+" is "+strconv.FormatFloat(c.Value, 'g', -1, 64))
				return
			}
			if c.Name == "" {
				return
			}
			if u, ok := seen[c.Name]; ok {
				if u.c.Value != c.Value || u.c.Free != c.Free {
					b.failAt(c.Pos, ErrModel, "the coefficient "+c.Name+" of the "+where+" differs from its use in the "+u.where+
						" ("+coefState(*c)+" against "+coefState(u.c)+"); one name is one parameter")
				}
				return
			}
			seen[c.Name] = use{*c, where}
		}
	}
	if m.Const != nil {
		c := *m.Const
		visit("constant")(&c)
	}
	m = m.Clone() // Each hands out pointers; keep the caller's model untouched
	m.Diff.Each(visit("differencing of the output"))
	for _, in := range m.Inputs {
		in.Num.Each(visit("numerator of input " + in.Series))
		in.Den.Each(visit("denominator of input " + in.Series))
		in.Diff.Each(visit("differencing of input " + in.Series))
	}
	if m.Noise != nil {
		m.Noise.MA.Each(visit("noise numerator"))
		m.Noise.AR.Each(visit("noise denominator"))
	}
	if v := m.Interval.Value; m.Interval != (tf.Interval{}) && (math.IsNaN(v) || math.IsInf(v, 0)) {
		b.failAt(tf.Pos{}, ErrModel, "the sample interval is "+strconv.FormatFloat(v, 'g', -1, 64))
	}
	if len(b.errs) > 0 {
		return b.errs
	}
	_, err := Model(m.String())
	return err
}

func coefState(c tf.Coef) string {
	v := strconv.FormatFloat(c.Value, 'g', -1, 64)
	if c.Free {
		return "free from " + v
	}
	return "held at " + v
}
