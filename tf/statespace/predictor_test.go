package statespace

import (
	"errors"
	"math"
	"slices"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/parse"

	"github.com/backshift/backshift/tf"
)

// The innovations form's one-step errors are the fitted model's
// residuals: fit a model with the library's conditional least squares
// (fit.Model), realise the estimate (Held), run the predictor from its
// default start over the same record and compare its errors e_t with the
// estimate's residuals a_t. The two start differently (the fit's
// residual recursion conditions on a_t = 0 before its First index and on
// inputs settled at their first sample, the predictor starts every path
// at rest), and both forget their start at the rate of the MA root
// (0.4) and the input poles (0.7, 0.6; in the "integrating" case the
// path's integrator keeps its start, and the noise part's own integrator
// takes the offset up at the MA root's rate): after 200 samples the start's
// share is below 0.7^200 = 1e-31 of the data's scale, so the remaining
// difference is rounding, and 1e-9 of the largest residual is a wide
// margin for it.
func TestPredictorMatchesFitResiduals(t *testing.T) {
	const n, skip = 1500, 200
	for _, c := range []struct{ name, truth, free string }{
		{"level", "y = 10 + 0.8 / (1 - 0.7 B) B^2 x + (1 - 0.4 B) / (1 - 0.5 B) a",
			"y = c + w0 / (1 - d1 B) B^2 x + (1 - t1 B) / (1 - p1 B) a"},
		{"differenced", "(1 - B) y = (0.5 + 0.3 B) / (1 - 0.6 B) B ((1 - B) x) + (1 - 0.4 B) a",
			"(1 - B) y = (w0 + w1 B) / (1 - d1 B) B ((1 - B) x) + (1 - t1 B) a"},
		{"integrating", "(1 - B) y = 0.4 / (1 - 0.6 B) B x + (1 - 0.4 B) a",
			"(1 - B) y = w0 / (1 - d1 B) B x + (1 - t1 B) a"},
	} {
		t.Run(c.name, func(t *testing.T) {
			x := series(n, 1, 3)
			y, err := fixture.MustModel(t, c.truth).Simulate(map[string][]float64{"x": x}, &tf.SimSettings{Sigma: 0.5, Seed1: 4})
			if err != nil {
				t.Fatal(err)
			}
			held, resid, first := fitModel(t, fixture.MustModel(t, c.free), map[string][]float64{"x": x, "y": y})
			r, err := Realise(held)
			if err != nil {
				t.Fatal(err)
			}
			pred, e, err := r.OneStep([][]float64{x}, y, nil)
			if err != nil {
				t.Fatal(err)
			}
			s := maxAbs(resid[first:])
			for i := max(skip, first); i < n; i++ {
				if math.Abs(e[i]-resid[i]) > 1e-9*s {
					t.Fatalf("t = %d: one-step error %.15g, residual %.15g", i, e[i], resid[i])
				}
				if pred[i]+e[i] != y[i] {
					t.Fatalf("t = %d: prediction %g + error %g is not the output %g", i, pred[i], e[i], y[i])
				}
			}
		})
	}
}

// Gain is G, zero outside the noise part, theta_j - Phi_j on it; a
// noise-free model has none. For (1 - 0.4 B)/((1 - 0.5 B)(1 - B)) a,
// Phi = 1 - 1.5 B + 0.5 B^2, so K = (-0.4 + 1.5, 0 - 0.5) = (1.1, -0.5)
// (by hand), after the path's two states.
func TestGain(t *testing.T) {
	r, err := Realise(fixture.MustModel(t, "(1 - B) y = 0.5 / (1 - 0.6 B) B^2 ((1 - B) x) + (1 - 0.4 B) / (1 - 0.5 B) a"))
	if err != nil {
		t.Fatal(err)
	}
	k, err := r.Gain()
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{0, 0, 1.1, -0.5}
	if rows, _ := k.Dims(); rows != len(want) {
		t.Fatalf("K has %d rows, want %d", rows, len(want))
	}
	for i, w := range want {
		if math.Abs(k.At(i, 0)-w) > 1e-15 {
			t.Errorf("K[%d] = %g, want %g", i, k.At(i, 0), w)
		}
	}
	r, _ = Realise(fixture.MustModel(t, "y = 0.5 B x"))
	if _, err := r.Gain(); !errors.Is(err, ErrModel) {
		t.Errorf("noise-free Gain: %v, want ErrModel", err)
	}
	if _, err := NewPredictor(r, nil); !errors.Is(err, ErrModel) {
		t.Errorf("noise-free NewPredictor: %v, want ErrModel", err)
	}
}

// Step records the first non-finite input or output in Err, and Reset
// clears it; the predictor's errors after Reset are those of a fresh one.
func TestPredictorErr(t *testing.T) {
	r, err := Realise(fixture.MustModel(t, "y = 0.5 B x + (1 - 0.3 B) a"))
	if err != nil {
		t.Fatal(err)
	}
	p, err := NewPredictor(r, nil)
	if err != nil {
		t.Fatal(err)
	}
	p.Step([]float64{1}, 2)
	p.Step([]float64{math.NaN()}, 2)
	var se *SampleError
	if !errors.As(p.Err(), &se) || se.Index != 1 || se.Series != "x" {
		t.Errorf("Err() = %v, want a *SampleError for input x at step 1", p.Err())
	}
	p.Reset()
	if p.Err() != nil {
		t.Errorf("after Reset: %v", p.Err())
	}
	_, e1 := p.Step([]float64{1}, 2)
	q, _ := NewPredictor(r, nil)
	if _, e2 := q.Step([]float64{1}, 2); e1 != e2 {
		t.Errorf("after Reset: error %g, fresh predictor %g", e1, e2)
	}
	if allocs := testing.AllocsPerRun(100, func() { p.Step([]float64{1}, 2) }); allocs != 0 {
		t.Errorf("Step allocates %v times", allocs)
	}
}

// K is the steady-state gain of the Kalman filter of the form
// x_{t+1} = A x + G a, y = C x + a (state noise G a correlated with the
// observation noise a: Q = G G', S = G, R = 1 for unit variance). The
// filter's recursion in predictor form (Anderson and Moore 1979, Optimal
// Filtering, the case of correlated noises; from memory),
//
//	F_t = C P_t C' + 1,  K_t = (A P_t C' + G) / F_t,
//	P_{t+1} = A P_t A' + G G' - K_t F_t K_t',
//
// started from P_0 = I (the state unknown), has P_t -> 0 and K_t -> G
// when theta is invertible, differencing included, and the input paths
// are stable (here each input is differenced as the output, so no path
// keeps a unit root; their share of P_t dies out). (With an integrating
// path, x undifferenced under a differenced y, the path's and the
// noise's unit roots cannot be told apart from y and P_t grows without
// bound: measured, trace P = 1.5e7 after 3200 steps of such a model.)
// After 400 steps the start has decayed like 0.5^400 (the slowest of
// the MA roots and path poles, a root 0.3^(1/4) = 0.74 of the seasonal
// factor aside: 0.74^400 = 1e-52); 1e-10 leaves room for rounding.
func TestGainIsKalmanSteadyState(t *testing.T) {
	for _, spec := range []string{
		"(1 - B) y = 0.5 B ((1 - B) x) + (1 - 0.4 B) / (1 - 0.6 B) a",
		"y = 0.5 B x + (1 + 0.3 B) / (1 - 1.2 B + 0.35 B^2) a",
		"(1 - B)(1 - B^4) y = 0.3 / (1 - 0.5 B) B^2 ((1 - B)(1 - B^4) x) + (1 - 0.4 B)(1 - 0.3 B^4) a",
	} {
		r, err := Realise(fixture.MustModel(t, spec))
		if err != nil {
			t.Fatal(err)
		}
		a, c, g := r.A(), r.C(), r.G()
		n := r.States()
		p := mat.NewDense(n, n, nil)
		for i := range n {
			p.Set(i, i, 1)
		}
		k := mat.NewDense(n, 1, nil)
		for range 400 {
			var pc, apc, apa, kk mat.Dense
			pc.Mul(p, c.T())
			f := mat.Dot(mat.NewVecDense(n, c.RawRowView(0)), pc.ColView(0)) + 1
			apc.Mul(a, &pc)
			k.Add(&apc, g)
			k.Scale(1/f, k)
			apa.Product(a, p, a.T())
			kk.Mul(k, k.T())
			kk.Scale(f, &kk)
			var gg mat.Dense
			gg.Mul(g, g.T())
			p.Add(&apa, &gg)
			p.Sub(p, &kk)
		}
		want, _ := r.Gain()
		for i := range n {
			if math.Abs(k.At(i, 0)-want.At(i, 0)) > 1e-10 {
				t.Errorf("%s: Kalman gain[%d] %.15g, Gain %.15g", spec, i, k.At(i, 0), want.At(i, 0))
			}
		}
	}
}

// A Realisation is shared by many goroutines, each with its own
// Predictor; run with -race.
func TestConcurrentUse(t *testing.T) {
	r, err := Realise(fixture.MustModel(t, "y = 0.5 / (1 - 0.8 B) B^2 x + (1 - 0.3 B) a"))
	if err != nil {
		t.Fatal(err)
	}
	x, y := series(200, 1, 1), series(200, 1, 2)
	_, want, _ := r.OneStep([][]float64{x}, y, nil)
	done := make(chan []float64)
	for range 4 {
		go func() {
			_, e, _ := r.OneStep([][]float64{x}, y, nil)
			_, _ = r.Simulate([][]float64{x}, y, nil)
			done <- e
		}()
	}
	for range 4 {
		if e := <-done; !slices.Equal(e, want) {
			t.Error("a concurrent run gave other errors")
		}
	}
}

func BenchmarkPredictorStep(b *testing.B) {
	for _, spec := range []string{
		"y = 0.5 / (1 - 0.8 B) B^2 x + (1 - 0.3 B) a",
		"y = 0.5 / (1 - 0.8 B) B^20 x + (0.3 - 0.1 B) / (1 - 1.2 B + 0.35 B^2) v + (1 - 0.3 B) / ((1 - 0.5 B)(1 - 0.4 B^12)) a",
	} {
		m, err := parse.Model(spec)
		if err != nil {
			b.Fatal(err)
		}
		r, _ := Realise(m)
		p, _ := NewPredictor(r, nil)
		u := make([]float64, len(m.Inputs))
		b.Run(strconv.Itoa(r.States())+"states", func(b *testing.B) {
			for i := range b.N {
				u[0] = float64(i % 7)
				p.Step(u, 1)
			}
		})
	}
}
