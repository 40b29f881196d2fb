package tf

import (
	"context"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
)

func TestFitQuickRecovery(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	n := 3000
	x := make([]float64, n)
	for i := 1; i < n; i++ {
		x[i] = x[i-1] + rng.NormFloat64()
	}
	z := fitDiff(x, []float64{1, -1})
	u := make([]float64, n)
	filter.Run(u[3:], []float64{4.8}, []float64{1, -0.72}, z[:n-3])
	e := fitSimNoise(rng, n, []float64{1}, []float64{1, -0.54}, 0.2)
	y := make([]float64, n)
	for i := 1; i < n; i++ {
		y[i] = y[i-1] + 0.035 + u[i] + e[i]
	}
	c := Coef{Name: "c", Free: true}
	m := Model{Output: "y", Diff: fitDiff1, Const: &c,
		Inputs: []Input{{Series: "x", Diff: fitDiff1, Num: fitP(fitFac(fitTerm(false, "w0", 0, 0))), Den: fitOneMinus("d1", 1), Delay: 3}},
		Noise:  &arma.Noise{MA: fitOneMinus("t1", 1)}}
	est, err := Fit(context.Background(), m, map[string][]float64{"y": y, "x": x}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range est.Params {
		t.Logf("%s = %.4f (%.4f) start %.4f", p.Name, p.Value, p.SE, p.Start)
	}
	t.Log(est.Reason, est.Iter, est.Evals, est.StartsTried, est.Warnings)
}
