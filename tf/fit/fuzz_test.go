package fit_test

import (
	"context"
	"encoding/binary"
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// FuzzModelMethod is FuzzModel with the method and missing samples: the
// models and series of FuzzModel, fitted by least squares or exact
// maximum likelihood (method & 1), with output samples set to NaN at the
// positions the bytes of gaps pick, and input samples too when gaps'
// first byte is odd, filled by a rule chosen from method. Model must
// return a typed error or an estimate with a finite log-likelihood and
// coefficients, residuals NaN exactly where the output is missing
// (exact ML) and one smoothed value per missing output; Check and
// Forecast of that estimate return a typed error or finite numbers;
// nothing panics.
func FuzzModelMethod(f *testing.F) {
	seed := make([]byte, 16*60)
	for i := 0; i < 60; i++ {
		binary.LittleEndian.PutUint64(seed[16*i:], math.Float64bits(float64(i%7)+0.1*float64(i%3)))
		binary.LittleEndian.PutUint64(seed[16*i+8:], math.Float64bits(float64(i%5)))
	}
	f.Add(seed, byte(0), byte(1), byte(1), byte(0), byte(2), byte(1), []byte{4, 5, 30})
	f.Add(seed, byte(2), byte(1), byte(0), byte(0), byte(0), byte(3), []byte{1, 7, 8, 9})
	f.Add(seed, byte(4), byte(1), byte(2), byte(0), byte(4), byte(0), []byte{})
	f.Add(seed[:16*8], byte(3), byte(1), byte(1), byte(0), byte(3), byte(5), []byte{0, 1, 2, 3, 4, 5, 6, 7})
	f.Fuzz(func(t *testing.T, b []byte, sel, exp, delay, pow, mode, method byte, gaps []byte) {
		if len(b) > 16*400 {
			b = b[:16*400]
		}
		m := fuzzModel(sel, exp, delay, pow)
		y, x := fuzzSeries(b, mode)
		set := &fit.Settings{MaxIter: 30, Method: fit.Method(method & 1)}
		if len(y) > 0 {
			for _, g := range gaps {
				y[int(g)%len(y)] = math.NaN()
			}
			if len(gaps) > 0 && gaps[0]%2 == 1 && len(x) > 2 {
				x[1+int(gaps[0])%(len(x)-1)] = math.NaN()
				set.InputGaps = fit.GapFill{Rule: fit.FillRule(method>>1) % 3}
			}
		}
		data := map[string][]float64{"y": y, "x": x}
		e, err := fit.Model(context.Background(), m, data, set)
		if err != nil {
			typedOnly(t, err)
			return
		}
		if math.IsInf(e.LogLik, 0) || math.IsNaN(e.LogLik) || math.IsNaN(e.AIC) || !(e.SSQ > 0) {
			t.Fatalf("estimate with SSQ %v, LogLik %v, AIC %v", e.SSQ, e.LogLik, e.AIC)
		}
		for _, p := range e.Params {
			if math.IsNaN(p.Value) || math.IsInf(p.Value, 0) {
				t.Fatalf("estimate %s = %v", p.Name, p.Value)
			}
		}
		if e.Method == fit.ExactML {
			missing := 0
			for t2, v := range y {
				if math.IsNaN(v) {
					missing++
					if !math.IsNaN(e.Resid[t2]) {
						t.Fatalf("residual at missing sample %d is %v", t2, e.Resid[t2])
					}
				}
			}
			if len(e.Missing) != missing {
				t.Fatalf("%d smoothed values for %d missing samples", len(e.Missing), missing)
			}
		}
		if d, err := fit.Check(e, data, nil); err != nil {
			typedOnly(t, err)
		} else if math.IsNaN(d.Residual.Q) && d.Residual.Lags > 0 {
			t.Fatalf("Ljung-Box Q is NaN")
		}
		if fc, err := e.Forecast(data, 3, nil); err != nil {
			typedOnly(t, err)
		} else {
			for j := range fc.Mean {
				if math.IsNaN(fc.Mean[j]) || math.IsNaN(fc.SE[j]) {
					t.Fatalf("forecast step %d: %v (SE %v)", j+1, fc.Mean[j], fc.SE[j])
				}
			}
		}
	})
}

// typedOnly fails the test for an error that is of no kind of the
// library, or a recovered panic.
func typedOnly(t *testing.T, err error) {
	t.Helper()
	var me *tf.ModelError
	if errors.Is(err, tf.ErrInternal) {
		t.Fatalf("internal error: %v", err)
	}
	if !errors.As(err, &me) && !errors.Is(err, tf.ErrSample) && !errors.Is(err, tf.ErrShort) && !errors.Is(err, tf.ErrConstant) &&
		!errors.Is(err, tf.ErrLength) && !errors.Is(err, tf.ErrName) && !errors.Is(err, tf.ErrSetting) && !errors.Is(err, tf.ErrModel) &&
		!errors.Is(err, tf.ErrConvergence) && !errors.Is(err, tf.ErrOverflow) {
		t.Fatalf("error of no kind %T: %v", err, err)
	}
}
