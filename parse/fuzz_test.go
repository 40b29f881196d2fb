package parse

import (
	"errors"
	"math"
	"testing"
	"time"

	"github.com/backshift/backshift/tf"
)

// FuzzParse checks that Model never panics, that every error is a
// positioned *Error inside the text, that anything that parses prints
// to a spec that parses to an equal model and prints the same again,
// Seeds: the
// test specs here and the files in testdata/fuzz/FuzzParse.
func FuzzParse(f *testing.F) {
	for _, s := range goodSpecs {
		f.Add(s)
	}
	for _, c := range errorCases {
		f.Add(c.spec)
	}
	f.Fuzz(func(t *testing.T, s string) {
		m, err := Model(s)
		if err != nil {
			var l ErrorList
			if !errors.As(err, &l) || len(l) == 0 {
				t.Fatalf("%q: error %T %v is not a non-empty ErrorList", s, err, err)
			}
			for _, e := range l {
				if e.Pos.Line < 1 || e.Pos.Column < 1 || e.Pos.Offset < 0 || e.Pos.Offset > len(s) || e.Msg == "" || e.Kind == nil {
					t.Fatalf("%q: bad error %+v", s, *e)
				}
			}
			_ = err.Error()
		} else if _, err := readBack(m); err != nil {
			t.Fatalf("%q %v", s, err)
		}
	})
}

// FuzzCheck changes one field of a parsed model as code could (a factor
// power, a power of B, a dead time, a value, a freedom, a name, an
// interval) and checks that Check never panics, and that a model it
// accepts prints as text that reads back as the same model, with every
// polynomial expandable within the degree limit.
func FuzzCheck(f *testing.F) {
	for i, s := range goodSpecs {
		f.Add(s, uint8(i), uint8(0), int64(-1), 0.5, "w9")
	}
	f.Add(goodSpecs[1], uint8(2), uint8(1), int64(0), math.NaN(), "")
	f.Add(goodSpecs[4], uint8(5), uint8(3), int64(70), math.Inf(1), "B3")
	f.Add(goodSpecs[0], uint8(8), uint8(1), int64(120), 0.0, "")
	f.Add(goodSpecs[0], uint8(9), uint8(50), int64(1772352000), 0.0, "")
	f.Fuzz(func(t *testing.T, spec string, what, which uint8, n int64, v float64, name string) {
		m, err := Model(spec)
		if err != nil {
			return
		}
		m = m.Clone()
		// Every coefficient and factor of the model, in order.
		var facs []*tf.Factor
		var coefs []*tf.Coef
		add := func(p *tf.Poly) {
			for i := range p.Factors {
				facs = append(facs, &p.Factors[i])
				for j := range p.Factors[i].Terms {
					coefs = append(coefs, &p.Factors[i].Terms[j].Coef)
				}
			}
		}
		add(&m.Diff)
		for i := range m.Inputs {
			add(&m.Inputs[i].Num)
			add(&m.Inputs[i].Den)
			add(&m.Inputs[i].Diff)
		}
		if m.Noise != nil {
			add(&m.Noise.MA)
			add(&m.Noise.AR)
		}
		k := int(which)
		switch what % 10 {
		case 0:
			if len(facs) > 0 {
				facs[k%len(facs)].Exp = int(n)
			}
		case 1:
			if len(facs) > 0 {
				f := facs[k%len(facs)]
				if len(f.Terms) > 0 {
					f.Terms[k%len(f.Terms)].Power = int(n)
				}
			}
		case 2:
			m.Inputs[k%len(m.Inputs)].Delay = int(n)
		case 3:
			if len(coefs) > 0 {
				coefs[k%len(coefs)].Value = v
			}
		case 4:
			if len(coefs) > 0 {
				c := coefs[k%len(coefs)]
				c.Free = !c.Free
			}
		case 5:
			if len(coefs) > 0 {
				coefs[k%len(coefs)].Name = name
			}
		case 6:
			m.Inputs[k%len(m.Inputs)].Series = name
		case 7:
			m.Interval = tf.Interval{Value: v, Unit: name}
		case 8, 9:
			// An event at a sample index (8) or at a time in a zone
			// offset by a multiple of 15 minutes (9), with its text as
			// the series name unless a name is given.
			e := tf.Event{Kind: tf.EventKind(which % 3), Index: int(n)}
			if what%10 == 9 {
				e.Index, e.At = 0, time.Unix(n, int64(which)*1e7).In(time.FixedZone("", (int(which)%96-48)*900))
			}
			in := &m.Inputs[k%len(m.Inputs)]
			in.Event, in.Series = &e, name
			if name == "" {
				in.Series = e.String()
			}
		}
		if err := Check(m); err != nil {
			_ = err.Error()
			return
		}
		back, err := Model(m.String())
		if err != nil || !sameModel(back, m) {
			t.Fatalf("accepted, but %q reads back as %v (%v)", m.String(), back, err)
		}
		for _, f := range facs {
			if f.Exp < 1 || f.Exp > MaxDegree {
				t.Fatalf("accepted a factor power %d", f.Exp)
			}
		}
		for _, in := range m.Inputs {
			for _, p := range []tf.Poly{in.Num, in.Den, in.Diff} {
				if p.Degree() > MaxDegree || len(p.Coeffs()) > MaxDegree+1 {
					t.Fatalf("accepted degree %d", p.Degree())
				}
			}
			if in.Delay < 0 || in.Delay > MaxDelay {
				t.Fatalf("accepted dead time %d", in.Delay)
			}
		}
	})
}
