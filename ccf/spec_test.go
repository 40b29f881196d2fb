package ccf_test

import (
	"math"
	"testing"

	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// TestCandidateSpecsParse checks that every candidate's spec text parses
// with parse.Model (H2's spec language) into a model whose input term has
// the candidate's dead time, orders and start values.
func TestCandidateSpecsParse(t *testing.T) {
	for _, b := range []int{0, 1, 3} {
		// Weights of 0.8 (1 + 0.5 B) / (1 - 0.6 B) B^b with a small
		// alternating disturbance so that every form fits differently.
		v := make([]float64, 16)
		se := make([]float64, 16)
		prev := 0.0
		for k := range v {
			se[k] = 0.05
			j := k - b
			if j < 0 {
				continue
			}
			u := 0.6 * prev
			if j == 0 {
				u += 0.8
			}
			if j == 1 {
				u += 0.4
			}
			prev = u
			v[k] = u + 0.01*math.Pow(-1, float64(k))
		}
		for _, prefix := range []string{"", "lead_"} {
			id, err := ccf.Identify(&ccf.Weights{Input: "lead", V: v, SE: se, N: 400}, &ccf.IdentifySettings{Prefix: prefix})
			if err != nil {
				t.Fatal(err)
			}
			if id.DeadTime != b {
				t.Errorf("b = %d: dead time %d", b, id.DeadTime)
			}
			if len(id.Candidates) != 9 {
				t.Errorf("b = %d: %d candidates, want 9", b, len(id.Candidates))
			}
			for _, c := range id.Candidates {
				text := c.Spec("sales", "")
				m, err := parse.Model(text)
				if err != nil {
					t.Errorf("candidate spec %q does not parse: %v", text, err)
					continue
				}
				if len(m.Inputs) != 1 {
					t.Errorf("%q: %d inputs", text, len(m.Inputs))
					continue
				}
				in := m.Inputs[0]
				if in.Series != "lead" || in.Delay != b || in.Num.Degree() != c.S || in.Den.Degree() != c.R {
					t.Errorf("%q parsed as series %q delay %d deg num %d deg den %d", text, in.Series, in.Delay, in.Num.Degree(), in.Den.Degree())
				}
				free := map[string]bool{}
				collect := func(p interface{ Each(func(*tf.Coef)) }) {
					p.Each(func(k *tf.Coef) {
						if k.Free {
							free[k.Name] = true
						}
					})
				}
				collect(in.Num)
				collect(in.Den)
				for _, name := range c.Names {
					if !free[name] {
						t.Errorf("%q: coefficient %s is not free after parsing", text, name)
					}
				}
				// Start values are printed to 6 significant digits.
				num, den := in.Num.Coeffs(), in.Den.Coeffs()
				for k, want := range c.Num {
					if math.Abs(num[k]-want) > 1e-5*math.Max(1, math.Abs(want)) {
						t.Errorf("%q: omega_%d = %g, want %g", text, k, num[k], want)
					}
				}
				for k, want := range c.Den {
					if math.Abs(den[k]-want) > 1e-5*math.Max(1, math.Abs(want)) {
						t.Errorf("%q: delta_%d = %g, want %g", text, k, den[k], want)
					}
				}
			}
		}
	}
}

// TestStartClauseMissing checks that names without a usable start are
// left out of the where clause instead of being written as 0, and that
// the clause still parses (property of our own spec language).
func TestStartClauseMissing(t *testing.T) {
	starts := map[string]float64{"w0": 0.5, "d1": math.NaN(), "d2": math.Inf(1)}
	for _, c := range []struct {
		names []string
		want  string
	}{
		{nil, ""},
		{[]string{"zz"}, ""},
		{[]string{"d1", "d2"}, ""},
		{[]string{"zz", "w0"}, " where w0 ~ 0.5"},
		{[]string{"w0", "d1", "zz"}, " where w0 ~ 0.5"},
	} {
		got := ccf.StartClause(c.names, starts)
		if got != c.want {
			t.Errorf("StartClause(%q) = %q, want %q", c.names, got, c.want)
		}
		if _, err := parse.Model("y = w0 x + a" + got); err != nil {
			t.Errorf("%q does not parse: %v", got, err)
		}
	}
}
