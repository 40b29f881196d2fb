package arma

import (
	"context"
	"math"
	"testing"
)

// mcRun fits reps simulated series of mdl (seeds 42, r) by both
// methods (no constant) and returns the mean errors of the estimates
// (bias) per method and the share of 95 % Wald intervals of the
// exact-likelihood fit, value -+ 1.96 SE, that hold the true value.
func mcRun(t *testing.T, mdl Model, n, reps int) (biasCLS, biasML, cover []float64) {
	truth := append(append([]float64{}, mdl.AR...), mdl.MA...)
	k := len(truth)
	biasCLS, biasML, cover = make([]float64, k), make([]float64, k), make([]float64, k)
	ord := Order{P: len(mdl.AR), Q: len(mdl.MA)}
	for r := 0; r < reps; r++ {
		y, err := Simulate(mdl, n, &SimSettings{Seed1: 42, Seed2: uint64(r)})
		if err != nil {
			t.Fatal(err)
		}
		for _, meth := range []Method{LeastSquares, ExactML} {
			res, err := Fit(context.Background(), y, ord, &FitSettings{Method: meth, Constant: ConstantZero})
			if res == nil {
				t.Fatalf("rep %d %v: %v", r, meth, err)
			}
			for j := range truth {
				d := res.Params[j].Value - truth[j]
				if meth == LeastSquares {
					biasCLS[j] += d / float64(reps)
					continue
				}
				biasML[j] += d / float64(reps)
				if math.Abs(d) <= 1.959964*res.Params[j].SE {
					cover[j] += 1 / float64(reps)
				}
			}
		}
	}
	return biasCLS, biasML, cover
}

// TestExactMLBias: Monte Carlo (fixed seeds) on short records with an MA
// coefficient near the unit circle: the exact-likelihood estimates are
// less biased than the conditional least-squares ones, the known effect
// of the conditioning on short records (Box, Jenkins, Reinsel & Ljung
// 2016, sec. 7.1.6 and 7.2; Ansley & Newbold 1980, J. Econometrics 13,
// 159-183). Figures measured with these seeds (300 series each):
//
//	MA(1) theta = 0.9,        n = 50:  bias CLS -0.035, ML +0.018
//	MA(1) theta = 0.9,        n = 100: bias CLS -0.020, ML +0.014
//	ARMA(1,1) 0.5, 0.9,       n = 100: bias CLS -0.124/-0.094, ML -0.045/-0.015
//
// The check asks |bias ML| < |bias CLS| for every coefficient; the
// figures are logged.
func TestExactMLBias(t *testing.T) {
	reps := 300
	if testing.Short() {
		reps = 100
	}
	for _, c := range []struct {
		name string
		mdl  Model
		n    int
	}{
		{"ma1_n50", Model{MA: []float64{0.9}, Sigma2: 1}, 50},
		{"ma1_n100", Model{MA: []float64{0.9}, Sigma2: 1}, 100},
		{"arma11_n100", Model{AR: []float64{0.5}, MA: []float64{0.9}, Sigma2: 1}, 100},
	} {
		t.Run(c.name, func(t *testing.T) {
			bc, bm, cov := mcRun(t, c.mdl, c.n, reps)
			t.Logf("bias CLS %.4f, ML %.4f; ML 95%% interval coverage %.3f", bc, bm, cov)
			for j := range bc {
				if !(math.Abs(bm[j]) < math.Abs(bc[j])) {
					t.Errorf("coefficient %d: |bias ML| %.4f not below |bias CLS| %.4f", j, bm[j], bc[j])
				}
			}
		})
	}
}

// TestExactMLCoverage: Monte Carlo (fixed seeds, 400 series of n = 100)
// of the 95 % Wald intervals value -+ 1.96 SE of the exact-likelihood
// fit, SE from the observed information, for ARMA(1,1) with phi = 0.5,
// theta = -0.4: the share that holds the true value lies in 92-98 %
// (the binomial standard error at 400 series is 1.1 %). Near the unit
// circle (theta = 0.9, TestExactMLBias) the Wald intervals are not
// reliable at these lengths: estimates pile up on the invertibility
// boundary, where the likelihood is flat (Davis & Dunsmuir 1996,
// Econometric Theory 12, 1-29); measured coverage 0.85-1.00 there.
// Measured here: phi1 0.965, theta1 0.947.
func TestExactMLCoverage(t *testing.T) {
	reps := 400
	if testing.Short() {
		reps = 150
	}
	_, _, cov := mcRun(t, Model{AR: []float64{0.5}, MA: []float64{-0.4}, Sigma2: 1}, 100, reps)
	t.Logf("coverage phi1 %.3f, theta1 %.3f", cov[0], cov[1])
	lo, hi := 0.92, 0.98
	if testing.Short() {
		lo, hi = 0.90, 0.99 // 150 series: binomial SE 1.8 %
	}
	for j, c := range cov {
		if c < lo || c > hi {
			t.Errorf("coefficient %d: coverage %.3f outside [%.2f, %.2f]", j, c, lo, hi)
		}
	}
}
