package predict_test

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/predict"
)

// FuzzUpdate builds a predictor from random coefficients and feeds it
// random samples (a byte 0x80 makes the output missing): New, Update and
// Forecast must give a typed error (one of the library's kinds) or
// finite numbers, never a panic or a NaN outside the documented places,
// and a snapshot restored into a fresh predictor of the same model must
// continue exactly as the original.
func FuzzUpdate(f *testing.F) {
	f.Add(0.8, 0.3, 1.2, -0.4, 0.6, 0.4, 1.5, 1.0, uint8(2), false, []byte{10, 20, 30, 40, 50, 60, 70, 0x80, 90, 100, 3, 4})
	f.Add(1.0, 0.0, 0.5, 0.0, 0.0, 0.0, 0.0, 0.01, uint8(0), true, []byte{1, 2, 3, 0x80, 0x80, 5, 6, 7, 8, 9})
	f.Add(1e300, 1e300, 0.1, 0.0, 0.99, -0.99, 1e300, 1e-300, uint8(7), false, []byte{127, 127, 127, 127, 0x81, 0x81})
	f.Fuzz(func(t *testing.T, w0, w1, d1, d2, p1, t1, c, sigma2 float64, delay uint8, diff bool, data []byte) {
		k := tf.Coef{Value: c}
		m := tf.Model{Output: "y", Const: &k,
			Inputs: []tf.Input{{Series: "u", Num: polyOf(w0, w1), Den: polyOf(1, -d1, -d2), Delay: int(delay)}},
			Noise:  &tf.Noise{MA: polyOf(1, t1), AR: polyOf(1, -p1)}}
		if diff {
			m.Diff = polyOf(1, -1)
		}
		p, err := predict.New(m, sigma2, nil)
		if err != nil {
			if !errs.IsKind(errors.Unwrap(err)) && !errors.Is(err, predict.ErrModel) {
				t.Fatalf("New: untyped error %v", err)
			}
			return
		}
		n := len(data) / 2
		for i := 0; i < n; i++ {
			x, y := float64(int8(data[2*i])), float64(int8(data[2*i+1]))
			if data[2*i+1] == 0x80 {
				y = math.NaN()
			}
			if data[2*i] == 0x81 {
				x = math.Inf(1)
			}
			if i == n/2 {
				checkRestore(t, m, sigma2, p, data[2*i:])
			}
			s, err := p.Update([]float64{x}, y)
			if err != nil {
				if !errors.Is(err, predict.ErrSample) && !errors.Is(err, predict.ErrOverflow) {
					t.Fatalf("sample %d: untyped error %v", i, err)
				}
				continue
			}
			if s.Index >= p.First() && !finite(s.Mean, s.SE, s.Lower, s.Upper) {
				t.Fatalf("sample %d: %+v with a nil error", i, s)
			}
		}
		dst := make([]predict.Point, 8)
		if err := p.Forecast(dst, nil); err == nil {
			for j, q := range dst {
				if !finite(q.Mean, q.SE, q.Lower, q.Upper) {
					t.Fatalf("forecast step %d: %+v with a nil error", j+1, q)
				}
			}
		} else if !errors.Is(err, predict.ErrShort) && !errors.Is(err, predict.ErrOverflow) {
			t.Fatalf("Forecast: %v", err)
		}
	})
}

// checkRestore snapshots p, restores it into a fresh predictor of m and
// feeds both the samples in rest: their steps must agree exactly.
func checkRestore(t *testing.T, m tf.Model, sigma2 float64, p *predict.Predictor, rest []byte) {
	snap, err := p.MarshalBinary()
	if err != nil {
		t.Fatal(err)
	}
	q := mustPredictor(t, m, sigma2, nil)
	if err := q.UnmarshalBinary(snap); err != nil {
		t.Fatalf("restoring a snapshot of the same model: %v", err)
	}
	a, b := p.Clone(), q
	for i := 0; i+1 < len(rest); i += 2 {
		x, y := float64(int8(rest[i])), float64(int8(rest[i+1]))
		sa, ea := a.Update([]float64{x}, y)
		sb, eb := b.Update([]float64{x}, y)
		if (ea == nil) != (eb == nil) || !sameStep(sa, sb) {
			t.Fatalf("after restore: %+v (%v) against %+v (%v)", sb, eb, sa, ea)
		}
	}
}

func sameStep(a, b predict.Step) bool {
	eq := func(x, y float64) bool { return x == y || math.IsNaN(x) && math.IsNaN(y) }
	return a.Index == b.Index && eq(a.Mean, b.Mean) && eq(a.SE, b.SE) && eq(a.Innov, b.Innov) && eq(a.Error, b.Error)
}

func finite(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// FuzzRestore restores arbitrary bytes into a predictor: a typed error
// (ErrFormat or ErrOtherModel, the predictor unchanged) or a state from
// which Update and Forecast give finite numbers or a typed error.
func FuzzRestore(f *testing.F) {
	m := fixture.MustModel(f, benchSpec)
	p := mustPredictor(f, m, 1, nil)
	for i := 0; i < 12; i++ {
		p.Update([]float64{float64(i), 1}, float64(i%3))
	}
	snap, _ := p.MarshalBinary()
	f.Add(snap)
	f.Add(snap[:20])
	f.Add([]byte{1})
	f.Add(append(append([]byte{2}, snap[1:25]...), snap[33:]...)) // the same state as version 2

	f.Fuzz(func(t *testing.T, data []byte) {
		q, _ := predict.New(m, 1, nil)
		before, _ := q.MarshalBinary()
		if err := q.UnmarshalBinary(data); err != nil {
			if !errors.Is(err, predict.ErrFormat) && !errors.Is(err, predict.ErrOtherModel) {
				t.Fatalf("untyped error %v", err)
			}
			if after, _ := q.MarshalBinary(); string(after) != string(before) {
				t.Fatal("a refused snapshot changed the predictor")
			}
			return
		}
		s, err := q.Update([]float64{3, 4}, 5)
		if err == nil && s.Index >= q.First() && !finite(s.Mean, s.SE, s.Lower, s.Upper) {
			t.Fatalf("step %+v with a nil error", s)
		}
		if err != nil && !errors.Is(err, predict.ErrOverflow) {
			t.Fatalf("Update after restore: %v", err)
		}
		dst := make([]predict.Point, 5)
		if err := q.Forecast(dst, nil); err == nil {
			for _, d := range dst {
				if !finite(d.Mean, d.SE, d.Lower, d.Upper) {
					t.Fatalf("forecast %+v with a nil error", d)
				}
			}
		} else if !errors.Is(err, predict.ErrShort) && !errors.Is(err, predict.ErrOverflow) {
			t.Fatalf("Forecast after restore: %v", err)
		}
	})
}
