package tf

import (
	"context"
	"testing"

	"github.com/backshift/backshift/internal/filter"
)

// TestFitParallelColumns fits a series long enough for the Jacobian
// columns to be computed on two goroutines and checks that the result
// equals, bit for bit, an evaluation of the columns on one goroutine
// (run it with -race to check the sharing).
func TestFitParallelColumns(t *testing.T) {
	data := fitBenchData(fitParMin+1000, 3)
	w, err := fitPrepare(fitBenchModel(), data, FitSettings{})
	if err != nil {
		t.Fatal(err)
	}
	x := []float64{1, 1.2, 0.6, -0.3, 0.7, 0.9, -0.2}
	m := w.n - w.cond.First
	mk := func() [][]float64 {
		j := make([][]float64, len(x))
		for k := range j {
			j[k] = make([]float64, m)
		}
		return j
	}
	r := make([]float64, m)
	par, seq := mk(), mk()
	if err := w.eval(x, r, par); err != nil {
		t.Fatal(err)
	}
	phi1 := 0.0
	for _, v := range w.arC {
		phi1 += v
	}
	w.columns(seq, 0, len(seq), fitIsOne(w.maC), phi1, make([]float64, m))
	for k := range par {
		for i := range par[k] {
			if par[k][i] != seq[k][i] {
				t.Fatalf("column %d row %d: %v on two goroutines, %v on one", k, i, par[k][i], seq[k][i])
			}
		}
	}
	if _, err := Fit(context.Background(), fitBenchModel(), data, nil); err != nil {
		t.Fatal(err)
	}
}

// TestFitRun1 checks the fused first-order kernel against the general
// path (recursive filter, moving average, recursive filter) bit for bit.
func TestFitRun1(t *testing.T) {
	rng := fitRand(71)
	n, b := 1000, 3
	zc := make([]float64, n)
	for i := range zc {
		zc[i] = rng.NormFloat64()
	}
	for _, c := range [][]float64{{0.7}, {0.7, -0.2}, {0.7, -0.2, 0.1}} {
		s1, u1, q1 := make([]float64, n), make([]float64, n), make([]float64, n)
		fitRun1(s1, u1, q1, zc, b, -0.8, c)
		s2, u2, q2 := make([]float64, n), make([]float64, n), make([]float64, n)
		filter.Run(s2[b:], fitOne, []float64{1, -0.8}, zc[:n-b])
		fitFIR(u2, c, s2, 0, false)
		filter.Run(q2, fitOne, []float64{1, -0.8}, u2)
		for i := 0; i < n; i++ {
			if s1[i] != s2[i] || u1[i] != u2[i] || q1[i] != q2[i] {
				t.Fatalf("omega %v, t=%d: fused (%v %v %v), general (%v %v %v)", c, i, s1[i], u1[i], q1[i], s2[i], u2[i], q2[i])
			}
		}
	}
}
