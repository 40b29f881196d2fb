package tf

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/arma"
)

// jacModel is a model with two inputs, differencing, a constant, a
// product of MA factors and a parameter shared between two places.
func jacModel() Model {
	num1 := mkPoly(mkFactor(mkTerm(false, "w0", 0.8, 0), mkTerm(true, "w1", 0.3, 1)))
	den1 := mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, "d1", 0.5, 1)))
	num2 := mkPoly(mkFactor(mkTerm(false, "v0", -1.2, 0)))
	den2 := mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, "e1", 0.4, 1), mkTerm(false, "e2", 0.2, 2)))
	ma := mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, "t1", 0.3, 1)),
		Factor{Terms: []Term{mkTerm(false, "", 1, 0), mkTerm(true, "T1", 0.2, 4)}, Exp: 2})
	ar := mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, "p1", 0.6, 1)), mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, "d1", 0.5, 2)))
	c := Coef{Name: "c", Value: 0.1, Free: true}
	return Model{
		Output: "y", Diff: diff1, Const: &c,
		Inputs: []Input{
			{Series: "x1", Diff: diff1, Num: num1, Den: den1, Delay: 2},
			{Series: "x2", Num: num2, Den: den2, Delay: 1},
		},
		Noise: &arma.Noise{MA: ma, AR: ar},
	}
}

// TestFitJacobianFiniteDifference checks the analytic Jacobian columns
// against central differences of the residuals (step 1e-6; the truncation
// error is O(h^2) ~ 1e-12 relative and rounding ~ 1e-10, so 1e-6 relative
// to the column's scale is a safe bound).
func TestFitJacobianFiniteDifference(t *testing.T) {
	data := jacData(300)
	for _, zero := range []bool{false, true} {
		jacCheck(t, data, FitSettings{ZeroPreSample: zero})
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

func jacCheck(t *testing.T, data map[string][]float64, set FitSettings) {
	w, err := prepareFit(jacModel(), data, set)
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
