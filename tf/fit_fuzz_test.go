package tf_test

import (
	"context"
	"encoding/binary"
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/tf"
)

// fuzzSpecs are the structures FuzzFit draws from; the fuzzer also
// perturbs powers and dead times (including the invalid values 0 and -1)
// so that models no spec can express reach Fit.
func fuzzModel(sel, exp, delay, pow byte) tf.Model {
	free := func(name string, neg bool, p int) tf.Term {
		return tf.Term{Neg: neg, Coef: tf.Coef{Name: name, Free: true}, Power: p}
	}
	one := tf.Term{Coef: tf.Coef{Value: 1}}
	num := tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{free("w0", false, 0)}}}}
	den := tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, free("d1", true, 1)}}}}
	m := tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x", Num: num, Delay: int(int8(delay)) % 5}}}
	switch sel % 6 {
	case 1:
		m.Inputs[0].Den = den
	case 2:
		m.Const = &tf.Coef{Name: "c", Free: true}
		m.Inputs[0].Den = den
		m.Noise = &arma.Noise{AR: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, free("p1", true, 1)}}}}}
	case 3:
		m.Noise = &arma.Noise{MA: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, free("t1", true, 1)}}}}}
	case 4:
		m.Diff = tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{one, {Neg: true, Coef: tf.Coef{Value: 1}, Power: 1}}}}}
		m.Inputs[0].Diff = m.Diff.Clone()
		m.Noise = &arma.Noise{}
	case 5:
		m.Const = &tf.Coef{Name: "c", Free: true}
	}
	if sel&0x40 != 0 && len(m.Inputs[0].Den.Factors) > 0 {
		m.Inputs[0].Den.Factors[0].Exp = int(int8(exp)) % 4 // 0, negative: invalid
	}
	if sel&0x80 != 0 {
		m.Inputs[0].Num.Factors[0].Terms[0].Power = int(int8(pow)) % 4
	}
	return m
}

// fuzzSeries reads pairs of float64 (output, input) from b; mode adds
// constant or huge values.
func fuzzSeries(b []byte, mode byte) (y, x []float64) {
	for len(b) >= 16 {
		y = append(y, math.Float64frombits(binary.LittleEndian.Uint64(b)))
		x = append(x, math.Float64frombits(binary.LittleEndian.Uint64(b[8:])))
		b = b[16:]
	}
	for i := range y {
		switch mode % 5 {
		case 1: // small integers: exact, often constant stretches
			y[i], x[i] = float64(int8(math.Float64bits(y[i]))), float64(int8(math.Float64bits(x[i])))
		case 2: // values in a sane range
			y[i], x[i] = math.Mod(y[i], 1e3), math.Mod(x[i], 1e3)
		case 3:
			x[i] = 7 // a constant input
		case 4:
			y[i] *= 1e-170
		}
	}
	return y, x
}

// FuzzFit fits small models (some with invalid structure) to arbitrary
// data, including NaN, huge, tiny and constant values: Fit must return a
// typed error or an estimate whose sum of squares, log-likelihood and
// coefficients are finite, whose missing standard errors are warned of,
// and never panic.
func FuzzFit(f *testing.F) {
	seed := make([]byte, 16*60)
	for i := 0; i < 60; i++ {
		binary.LittleEndian.PutUint64(seed[16*i:], math.Float64bits(float64(i%7)+0.1*float64(i%3)))
		binary.LittleEndian.PutUint64(seed[16*i+8:], math.Float64bits(float64(i%5)))
	}
	f.Add(seed, byte(0), byte(1), byte(1), byte(0), byte(2))
	f.Add(seed, byte(2), byte(1), byte(0), byte(0), byte(0))
	f.Add(seed, byte(0x43), byte(0), byte(255), byte(255), byte(1))
	f.Add(seed[:16*8], byte(3), byte(1), byte(1), byte(0), byte(3))
	f.Add(seed, byte(4), byte(1), byte(2), byte(0), byte(4))
	f.Fuzz(func(t *testing.T, b []byte, sel, exp, delay, pow, mode byte) {
		if len(b) > 16*400 {
			b = b[:16*400]
		}
		m := fuzzModel(sel, exp, delay, pow)
		y, x := fuzzSeries(b, mode)
		e, err := tf.Fit(context.Background(), m, map[string][]float64{"y": y, "x": x}, &tf.FitSettings{MaxIter: 30})
		if err != nil {
			var me *tf.ModelError // Model.Validate's error
			if !errors.As(err, &me) && !errors.Is(err, tf.ErrSample) && !errors.Is(err, tf.ErrShort) && !errors.Is(err, tf.ErrConstant) &&
				!errors.Is(err, tf.ErrLength) && !errors.Is(err, tf.ErrName) && !errors.Is(err, tf.ErrSetting) && !errors.Is(err, tf.ErrModel) &&
				!errors.Is(err, tf.ErrConvergence) && !errors.Is(err, tf.ErrOverflow) {
				t.Fatalf("error of no kind %T: %v", err, err)
			}
			if errors.Is(err, tf.ErrInternal) {
				t.Fatalf("internal error: %v", err)
			}
			return
		}
		if !(e.SSQ > 0) || math.IsInf(e.SSQ, 0) || math.IsInf(e.LogLik, 0) || math.IsNaN(e.LogLik) || math.IsNaN(e.AIC) {
			t.Fatalf("estimate with SSQ %v, LogLik %v, AIC %v", e.SSQ, e.LogLik, e.AIC)
		}
		warned := rtHas(e, tf.BadStandardError)
		for _, p := range e.Params {
			if math.IsNaN(p.Value) || math.IsInf(p.Value, 0) {
				t.Fatalf("estimate %s = %v", p.Name, p.Value)
			}
			if (math.IsNaN(p.SE) || math.IsInf(p.SE, 0) || p.SE == 0) && !warned {
				t.Fatalf("SE of %s = %v without a BadStandardError warning: %v", p.Name, p.SE, e.Warnings)
			}
		}
	})
}
