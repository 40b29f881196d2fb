package fit

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
)

// crossMC is a Monte Carlo case of the cross-correlation check: records
// of n samples drawn from truth with the input from input(seed), fitted
// with structure and checked with CrossLags lags.
type crossMC struct {
	name, truth, structure string
	input                  func(rng *rand.Rand, n int) []float64
	n, lags, records       int
}

// crossMCResult sums up the records of a case: the mean of S and of the
// mean the reference of the verdict (Scale * EffDF) and of the textbook
// one (DF) give it, and the rejections at 5 % by either reference.
type crossMCResult struct {
	meanS, meanRef, meanDF, varRef float64
	rejNew, rejPlain               int
	records, unsound               int
}

func (c crossMC) run(t *testing.T) crossMCResult {
	t.Helper()
	m := fixture.MustModel(t, c.structure)
	var r crossMCResult
	for seed := range uint64(c.records) {
		rng := rand.New(rand.NewPCG(seed+1, 77))
		x := c.input(rng, c.n)
		data := fixture.MustRecord(t, c.truth, map[string][]float64{"x": x}, &tf.SimSettings{Seed1: seed + 1, Seed2: 78, Sigma: 1})
		est, err := Model(context.Background(), m, data, nil)
		if err != nil {
			t.Fatal(err)
		}
		d, err := Check(est, data, &CheckSettings{CrossLags: c.lags})
		if err != nil {
			t.Fatal(err)
		}
		if len(est.Soundness()) > 0 {
			// A fit that failed (a local optimum with an unstable pole,
			// say) is no adequate model: the check's level does not
			// speak of it.
			r.unsound++
			continue
		}
		cc := d.Cross[0]
		r.records++
		r.meanS += cc.S
		r.meanRef += cc.Scale * cc.EffDF
		r.varRef += 2 * cc.Scale * cc.Scale * cc.EffDF
		r.meanDF += float64(cc.DF)
		if cc.P < 0.05 {
			r.rejNew++
		}
		if cc.PPlain < 0.05 {
			r.rejPlain++
		}
	}
	k := float64(r.records)
	r.meanS /= k
	r.meanRef /= k
	r.meanDF /= k
	r.varRef /= k
	return r
}

// TestCrossCheckLevel checks, by Monte Carlo over fixed seeds, that the
// cross-correlation check of an adequate model rejects at its nominal
// level and that S has the mean its reference gives it, for a white
// input and for a smooth one (an AR(2) with both roots at 0.9, prewhitened
// by the AIC-chosen autoregression), through a slow first-order path
// (pole 0.95, time constant about 20 samples) and ARMA(1,1) noise, K = 12
// lags. Model and inputs are our own.
//
// The textbook reference, chi-squared(K + 1 - (r + s + 1)) (Box, Jenkins,
// Reinsel & Ljung 2015, diagnostic checking of transfer-function
// models), removes one degree of freedom per transfer-function
// coefficient; that holds when the weights by which a coefficient moves
// the residuals die out within lags 0..K. Here they reach far beyond K,
// so S keeps most of its K + 1 degrees of freedom. Measured (these
// seeds, 300 records of 500 samples each):
//
//	input   mean S   mean ref  DF   rejected at 5 %: ref  textbook
//	white   12.09    12.36     11        14 (4.7 %)       27 (9.0 %)
//	smooth  12.47    12.38     11        19 (6.3 %)       33 (11.0 %)
//
// Bounds: the mean of S within 3 standard errors of the reference mean
// (the SE from the reference variance 2 c^2 nu over the records: about
// 0.29), and the rejections within the 99.9 % binomial range of 5 % of
// 300 (n p +- 3.3 sqrt(n p (1 - p)), 15 +- 12.5: 3 to 27, from the
// normal approximation to the binomial, common practice). The textbook
// reference's mean DF = 11 lies more than 3 SE below the mean of S in
// both cases, so the test fails with it (the check before this change).
func TestCrossCheckLevel(t *testing.T) {
	const truth = "y = 0.5 / (1 - 0.95 B) B^2 x + (1 + 0.3 B) / (1 - 0.8 B) a"
	const structure = "y = w0 / (1 - d1 B) B^2 x + (1 + t1 B) / (1 - p1 B) a"
	white := func(rng *rand.Rand, n int) []float64 {
		x := make([]float64, n)
		for i := range x {
			x[i] = rng.NormFloat64()
		}
		return x
	}
	smooth := func(rng *rand.Rand, n int) []float64 {
		return fixture.Noise(rng, n, []float64{1, -1.8, 0.81}, []float64{1}, 1)
	}
	records := 1000
	if testing.Short() {
		records = 300
	}
	for _, c := range []crossMC{
		{name: "white", truth: truth, structure: structure, input: white, n: 500, lags: 12, records: records},
		{name: "smooth", truth: truth, structure: structure, input: smooth, n: 500, lags: 12, records: records},
	} {
		t.Run(c.name, func(t *testing.T) {
			r := c.run(t)
			se := math.Sqrt(r.varRef / float64(r.records))
			t.Logf("%s: mean S %.2f, reference mean %.2f (SE %.2f), textbook DF %.0f; rejected at 5 %%: %d by the reference, %d by the textbook DF, of %d (%d unsound)",
				c.name, r.meanS, r.meanRef, se, r.meanDF, r.rejNew, r.rejPlain, r.records, r.unsound)
			if math.Abs(r.meanS-r.meanRef) > 3*se {
				t.Errorf("mean S %.2f is more than 3 SE (%.2f) from the reference mean %.2f", r.meanS, se, r.meanRef)
			}
			p := 0.05 * float64(c.records)
			half := 3.3 * math.Sqrt(p*0.95)
			if math.Abs(float64(r.rejNew)-p) > half {
				t.Errorf("%d rejections of %d at 5 %%, outside %.1f +- %.1f", r.rejNew, c.records, p, half)
			}
		})
	}
}
