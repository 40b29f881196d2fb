package tf

import (
	"context"
	"runtime"
	"testing"

	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/lm"
)

// TestFitNormalBlocked checks normalEval, which forms the Jacobian a
// block of rows at a time and never stores it, against the stored
// columns of eval multiplied out the way lm sums them (blocks of
// lm.NormalBlock in row order; from lm.NormalSplit rows the two halves
// separately, then added): J'J and J'r must agree bit for bit, with one
// goroutine and with two. The cases cover no moving-average part (the
// halves on two goroutines) and one (the recursion carried from block to
// block), short and long series; the finite-difference test checks the
// stored columns themselves. Run it with -race to check the sharing.
func TestFitNormalBlocked(t *testing.T) {
	ma := benchModel()
	ma.Noise.MA = oneMinus("t1", 1)
	cases := []struct {
		name string
		m    Model
		data map[string][]float64
		x    []float64
	}{
		{"AR(2) long", benchModel(), benchData(lm.NormalSplit+1000, 3), []float64{1, 1.2, 0.6, -0.3, 0.7, 0.9, -0.2}},
		{"AR(2) short", benchModel(), benchData(3000, 4), []float64{1, 1.2, 0.6, -0.3, 0.7, 0.9, -0.2}},
		{"ARMA(2,1) long", ma, benchData(lm.NormalSplit+777, 5), nil},
		{"two inputs, MA factors", jacModel(), jacData(2000), nil},
	}
	for _, c := range cases {
		for _, procs := range []int{1, 2} {
			old := runtime.GOMAXPROCS(procs)
			w, err := prepareFit(c.m, c.data, FitSettings{})
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
	if _, err := Fit(context.Background(), benchModel(), benchData(lm.NormalSplit+1000, 3), nil); err != nil {
		t.Fatal(err)
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

// TestFitRun1 checks the fused first-order kernel against the general
// path (recursive filter, moving average, recursive filter) bit for bit.
func TestFitRun1(t *testing.T) {
	rng := newRand(71)
	n, b := 1000, 3
	zc := make([]float64, n)
	for i := range zc {
		zc[i] = rng.NormFloat64()
	}
	for _, c := range [][]float64{{0.7}, {0.7, -0.2}, {0.7, -0.2, 0.1}} {
		s1, u1, q1 := make([]float64, n), make([]float64, n), make([]float64, n)
		runFirstOrder(s1, u1, q1, zc, b, -0.8, c)
		s2, u2, q2 := make([]float64, n), make([]float64, n), make([]float64, n)
		filter.Run(s2[b:], unitPoly, []float64{1, -0.8}, zc[:n-b])
		fir(u2, c, s2, 0, false)
		filter.Run(q2, unitPoly, []float64{1, -0.8}, u2)
		for i := 0; i < n; i++ {
			if s1[i] != s2[i] || u1[i] != u2[i] || q1[i] != q2[i] {
				t.Fatalf("omega %v, t=%d: fused (%v %v %v), general (%v %v %v)", c, i, s1[i], u1[i], q1[i], s2[i], u2[i], q2[i])
			}
		}
	}
}
