package parse

import (
	"errors"
	"testing"
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
		} else {
			p := m.String()
			m2, err := Model(p)
			if err != nil {
				t.Fatalf("%q prints as %q, which fails: %v", s, p, err)
			}
			if !m2.Equal(m) {
				t.Fatalf("%q prints as %q, which reads back as %q", s, p, m2.String())
			}
			if p2 := m2.String(); p2 != p {
				t.Fatalf("printing not stable: %q then %q", p, p2)
			}
		}
	})
}
