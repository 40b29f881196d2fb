package statespace

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/sym"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
)

// FuzzRealise: any fixed coefficients, dead time and differencing give
// a *ModelError or a realisation whose matrices are finite, whose state
// count is the package doc's formula, which simulates a few steps and
// whose settled state is a typed error or finite; never a panic.
func FuzzRealise(f *testing.F) {
	f.Add([]byte{30, 10, 30, 200}, []byte{30, 20, 30, 246}, uint8(3), []byte{30, 240}, []byte{30, 10}, true, uint8(1))
	f.Add([]byte{3, 1}, []byte{0, 0, 30, 1}, uint8(0), []byte{}, []byte{30, 250, 30, 1}, false, uint8(2))
	f.Add([]byte{30, 127, 9, 127}, []byte{30, 128, 9, 100}, uint8(200), []byte{1, 1}, []byte{2, 2}, true, uint8(0))
	h := testutil.Hostile{Max: 6, Div: 64, Up: 1e150, Down: 1e-150}
	f.Fuzz(func(t *testing.T, num, den []byte, delay uint8, ma, ar []byte, konst bool, diff uint8) {
		m := tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x", Num: fixedPoly(testutil.HostileSeries(num, h), 0),
			Den: fixedPoly(testutil.HostileSeries(den, h), 1), Delay: int(delay) * 4}}}
		if len(ma)+len(ar) > 0 {
			m.Noise = &tf.Noise{MA: fixedPoly(testutil.HostileSeries(ma, h), 1), AR: fixedPoly(testutil.HostileSeries(ar, h), 1)}
		}
		if konst {
			m.Const = &tf.Coef{Value: 0.5}
		}
		if diff%3 > 0 {
			m.Diff = sym.FromCoeffs([]float64{1, -1})
			if diff%3 == 2 {
				m.Inputs[0].Diff = sym.FromCoeffs([]float64{1, -1})
			}
		}
		r, err := Realise(m)
		if err != nil {
			var me *ModelError
			if !errors.As(err, &me) {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		if r.States() > MaxStates {
			t.Fatalf("%d states", r.States())
		}
		for _, v := range [][]float64{r.a, r.b, r.c, r.d, r.g} {
			for _, x := range v {
				if math.IsNaN(x) || math.IsInf(x, 0) {
					t.Fatalf("non-finite entry %v", x)
				}
			}
		}
		p := r.Parts()[0]
		if want := max(len(p.Num)-1+p.Delay, len(p.Den)-1); p.States != want && !(len(p.Num) == 1 && p.Num[0] == 0) {
			t.Fatalf("path %v/%v B^%d: %d states, want %d", p.Num, p.Den, p.Delay, p.States, want)
		}
		if _, err := r.Simulate([][]float64{{1, 0, -1}}, nil, nil); err != nil && !errors.Is(err, ErrModel) {
			// A typed ModelError is Simulate's answer to a state that
			// leaves float64 range (coefficients of any size are drawn).
			t.Fatalf("simulate: untyped error %v", err)
		}
		if x, err := r.Steady([]float64{1}); err != nil {
			if !errors.Is(err, ErrModel) {
				t.Fatalf("steady: untyped error %v", err)
			}
		} else {
			for _, v := range x {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("steady state %v", x)
				}
			}
		}
	})
}

// fixedPoly returns a polynomial of fixed numbers with the constant term
// lead (1 for a denominator or noise polynomial, as the model requires)
// followed by c, or c itself for lead 0 (a numerator).
func fixedPoly(c []float64, lead float64) tf.Poly {
	if lead != 0 {
		c = append([]float64{lead}, c...)
	}
	if len(c) == 0 {
		c = []float64{1}
	}
	return sym.FromCoeffs(c)
}
