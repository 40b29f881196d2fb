package tf_test

import (
	"encoding/binary"
	"math"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/tf"
)

// FuzzSystemStep builds a System from fuzzed coefficients (any float64,
// including NaN and huge values, and invalid powers and dead times) and
// steps it with fuzzed inputs: NewSystem returns a typed error or a
// System; every Step either gives a finite output or leaves Err set
// (from that step on), and nothing panics.
func FuzzSystemStep(f *testing.F) {
	f.Add([]byte{}, 0.5, -0.8, 0.3, byte(1), byte(1))
	f.Add([]byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16}, 1.0, -2.0, 0.9, byte(0), byte(3))
	f.Add(make([]byte, 64), 1e308, 1.0, 0.0, byte(2), byte(0))
	f.Fuzz(func(t *testing.T, b []byte, w0, d1, p1 float64, exp, delay byte) {
		one := tf.Term{Coef: tf.Coef{Value: 1}}
		term := func(v float64, p int) tf.Term { return tf.Term{Coef: tf.Coef{Value: v}, Power: p} }
		m := tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x", Delay: int(int8(delay)) % 6,
			Num: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{term(w0, 0)}}}},
			Den: tf.Poly{Factors: []tf.Factor{{Exp: int(int8(exp)) % 3, Terms: []tf.Term{one, term(d1, 1)}}}}}},
			Noise: &arma.Noise{AR: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, term(p1, 1)}}}}}}
		sys, err := tf.NewSystem(m, &tf.SimSettings{Sigma: math.Abs(math.Mod(p1, 10)), Seed1: 1})
		if err != nil {
			return
		}
		failed := false
		for len(b) >= 8 {
			u := math.Float64frombits(binary.LittleEndian.Uint64(b))
			b = b[8:]
			y := sys.Step([]float64{u})
			if math.IsNaN(y) || math.IsInf(y, 0) {
				failed = true
			}
			if failed && sys.Err() == nil {
				t.Fatalf("non-finite output %v and no Err", y)
			}
			if !failed && sys.Err() != nil {
				t.Fatalf("Err %v with finite outputs", sys.Err())
			}
		}
	})
}
