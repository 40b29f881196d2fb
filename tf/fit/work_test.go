package fit

import (
	"context"
	"math"
	"math/rand/v2"
	"runtime"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/tf"
)

// TestWorkJacobianFiniteDifference checks the analytic Jacobian columns
// against central differences of the residuals (step 1e-6; the truncation
// error is O(h^2) ~ 1e-12 relative and rounding ~ 1e-10, so 1e-6 relative
// to the column's scale is a safe bound).
func TestWorkJacobianFiniteDifference(t *testing.T) {
	data := jacData(300)
	for _, zero := range []bool{false, true} {
		jacCheck(t, data, Settings{ZeroPreSample: zero})
	}
}

// TestWorkNormalBlocked checks normalEval, which forms the Jacobian a
// block of rows at a time and never stores it, against the stored
// columns of eval multiplied out the way lm sums them (blocks of
// lm.NormalBlock in row order; from lm.NormalSplit rows the two halves
// separately, then added): J'J and J'r must agree bit for bit, with one
// goroutine and with two. The cases cover no moving-average part (the
// halves on two goroutines) and one (the recursion carried from block to
// block), short and long series; the finite-difference test checks the
// stored columns themselves. Run it with -race to check the sharing.
func TestWorkNormalBlocked(t *testing.T) {
	ma := benchModel()
	ma.Noise.MA = fixture.OneMinus("t1", 1)
	cases := []struct {
		name string
		m    tf.Model
		data map[string][]float64
		x    []float64
	}{
		{"AR(2) long", benchModel(), fixture.BenchData(lm.NormalSplit+1000, 3), []float64{1, 1.2, 0.6, -0.3, 0.7, 0.9, -0.2}},
		{"AR(2) short", benchModel(), fixture.BenchData(3000, 4), []float64{1, 1.2, 0.6, -0.3, 0.7, 0.9, -0.2}},
		{"ARMA(2,1) long", ma, fixture.BenchData(lm.NormalSplit+777, 5), nil},
		{"two inputs, MA factors", jacModel(), jacData(2000), nil},
	}
	for _, c := range cases {
		for _, procs := range []int{1, 2} {
			old := runtime.GOMAXPROCS(procs)
			w, err := newWork(c.m, c.data, Settings{})
			if err != nil {
				t.Fatal(err)
			}
			x := c.x
			if x == nil {
				x = w.params()
				for k := range x {
					if x[k] == 0 {
						x[k] = 0.3 // the MA coefficient: away from 1
					}
				}
			}
			m, k := w.n-w.cond.First, len(x)
			r := make([]float64, m)
			jac := make([][]float64, k)
			for j := range jac {
				jac[j] = make([]float64, m)
			}
			if err := w.eval(x, r, jac); err != nil {
				t.Fatal(err)
			}
			want := storedProducts(jac, r)
			r2 := make([]float64, m)
			got := make([]float64, k*(k+1))
			if err := w.normalEval(x, r2, got); err != nil {
				t.Fatal(err)
			}
			for i := range r {
				if r[i] != r2[i] {
					t.Fatalf("%s: residual %d: %v by eval, %v by normalEval", c.name, i, r[i], r2[i])
				}
			}
			for j := 0; j < k; j++ {
				for l := j; l <= k; l++ {
					if g, e := got[j*(k+1)+l], want[j*(k+1)+l]; g != e {
						t.Fatalf("%s, GOMAXPROCS %d: product (%d, %d) = %v blocked, %v from stored columns", c.name, procs, j, l, g, e)
					}
				}
			}
			w.release()
			runtime.GOMAXPROCS(old)
		}
	}
	if _, err := Model(context.Background(), benchModel(), fixture.BenchData(lm.NormalSplit+1000, 3), nil); err != nil {
		t.Fatal(err)
	}
}

// jacModel is a model with two inputs, differencing, a constant, a
// product of MA factors and a parameter shared between two places.
func jacModel() tf.Model {
	num1 := fixture.Poly(fixture.Factor(fixture.Term(false, "w0", 0.8, 0), fixture.Term(true, "w1", 0.3, 1)))
	den1 := fixture.Poly(fixture.Factor(fixture.Term(false, "", 1, 0), fixture.Term(true, "d1", 0.5, 1)))
	num2 := fixture.Poly(fixture.Factor(fixture.Term(false, "v0", -1.2, 0)))
	den2 := fixture.Poly(fixture.Factor(fixture.Term(false, "", 1, 0), fixture.Term(true, "e1", 0.4, 1), fixture.Term(false, "e2", 0.2, 2)))
	ma := fixture.Poly(fixture.Factor(fixture.Term(false, "", 1, 0), fixture.Term(true, "t1", 0.3, 1)),
		tf.Factor{Terms: []tf.Term{fixture.Term(false, "", 1, 0), fixture.Term(true, "T1", 0.2, 4)}, Exp: 2})
	ar := fixture.Poly(fixture.Factor(fixture.Term(false, "", 1, 0), fixture.Term(true, "p1", 0.6, 1)), fixture.Factor(fixture.Term(false, "", 1, 0), fixture.Term(true, "d1", 0.5, 2)))
	c := tf.Coef{Name: "c", Value: 0.1, Free: true}
	return tf.Model{
		Output: "y", Diff: fixture.Diff1(), Const: &c,
		Inputs: []tf.Input{
			{Series: "x1", Diff: fixture.Diff1(), Num: num1, Den: den1, Delay: 2},
			{Series: "x2", Num: num2, Den: den2, Delay: 1},
		},
		Noise: &arma.Noise{MA: ma, AR: ar},
	}
}

// jacData is n samples of noise with a trend in y, x1 and x2.
func jacData(n int) map[string][]float64 {
	rng := rand.New(rand.NewPCG(1, 2))
	data := map[string][]float64{"y": make([]float64, n), "x1": make([]float64, n), "x2": make([]float64, n)}
	for _, k := range []string{"y", "x1", "x2"} {
		for i := range data[k] {
			data[k][i] = rng.NormFloat64() + 0.01*float64(i)
		}
	}
	return data
}

func jacCheck(t *testing.T, data map[string][]float64, set Settings) {
	w, err := newWork(jacModel(), data, set)
	if err != nil {
		t.Fatal(err)
	}
	x := w.params()
	m := w.n - w.cond.First
	r := make([]float64, m)
	jac := make([][]float64, len(x))
	for k := range jac {
		jac[k] = make([]float64, m)
	}
	if err := w.eval(x, r, jac); err != nil {
		t.Fatal(err)
	}
	rp, rm := make([]float64, m), make([]float64, m)
	for k, name := range w.names {
		h := 1e-6
		xp := append([]float64(nil), x...)
		xm := append([]float64(nil), x...)
		xp[k] += h
		xm[k] -= h
		if err := w.eval(xp, rp, nil); err != nil {
			t.Fatal(err)
		}
		if err := w.eval(xm, rm, nil); err != nil {
			t.Fatal(err)
		}
		scale := 0.0
		for i := range r {
			scale = math.Max(scale, math.Abs(jac[k][i]))
		}
		for i := range r {
			fd := (rp[i] - rm[i]) / (2 * h)
			if math.Abs(fd-jac[k][i]) > 1e-6*math.Max(scale, 1) {
				t.Fatalf("%s (zero pre-sample %v): residual %d: analytic %v, finite difference %v", name, set.ZeroPreSample, i, jac[k][i], fd)
			}
		}
	}
}

// storedProducts multiplies stored columns out as lm does.
func storedProducts(jac [][]float64, r []float64) []float64 {
	k, m := len(jac), len(r)
	rows := func(acc []float64, lo, hi int) {
		blk := make([][]float64, k)
		for b := lo; b < hi; b += lm.NormalBlock {
			e := min(b+lm.NormalBlock, hi)
			for j := range jac {
				blk[j] = jac[j][b:e]
			}
			lm.AddBlock(acc, blk, r[b:e])
		}
	}
	acc := make([]float64, k*(k+1))
	h := lm.SplitRow(m)
	if h == 0 {
		rows(acc, 0, m)
		return acc
	}
	acc1 := make([]float64, len(acc))
	rows(acc, 0, h)
	rows(acc1, h, m)
	for i := range acc {
		acc[i] += acc1[i]
	}
	return acc
}
