package lm

import (
	"context"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// The residual r(x) = |log|x|| - log 2 takes the same values at x and
// 1/x, with minima at 0.5 and 2 (worked by hand). From 1.5 the search
// ends at 2, outside the region |x| <= 1, and MinimizeCrossing maps it to
// 0.5 with its information recomputed there; a search held at the
// boundary by FirstIter is handed back with atBoundary true.
func TestMinimizeCrossing(t *testing.T) {
	p := Problem{M: 1, N: 1, Eval: func(x, r []float64, jac [][]float64) error {
		l := math.Log(math.Abs(x[0]))
		r[0] = math.Abs(l) - math.Ln2
		if jac != nil {
			jac[0][0] = math.Copysign(1, l) / x[0]
		}
		return nil
	}}
	infoCalls := 0
	c := Crossing{
		Invert: func(x []float64) bool {
			if math.Abs(x[0]) > 1 {
				x[0] = 1 / x[0]
				return true
			}
			return false
		},
		Information: func(x []float64) *mat.SymDense {
			infoCalls++
			return mat.NewSymDense(1, []float64{x[0] * x[0]}) // (J'J)^-1 = x^2
		},
		AtBoundary: func([]float64) bool { return false },
		FirstIter:  100,
	}
	res, at, err := MinimizeCrossing(context.Background(), p, []float64{1.5}, nil, c)
	if err != nil || at {
		t.Fatalf("err %v, atBoundary %v", err, at)
	}
	if math.Abs(res.X[0]-0.5) > 1e-8 || infoCalls != 1 || math.Abs(res.JTJInv.At(0, 0)-0.25) > 1e-8 {
		t.Errorf("X %v, information calls %d, JTJInv %v; want 0.5, 1, 0.25", res.X, infoCalls, res.JTJInv.At(0, 0))
	}
	c.FirstIter, c.AtBoundary = 1, func([]float64) bool { return true }
	res, at, err = MinimizeCrossing(context.Background(), p, []float64{0.95}, &Settings{FTol: 1e-300, XTol: 1e-300, GTol: 1e-300}, c)
	if err != nil || !at || res.Iter != 1 {
		t.Errorf("held at the boundary: err %v, atBoundary %v after %d iterations; want true after 1", err, at, res.Iter)
	}
}
