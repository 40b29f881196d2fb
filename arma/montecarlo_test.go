package arma

import (
	"context"
	"math"
	"testing"
)

// TestMonteCarloARMA11 simulates ARMA(1,1) series (phi1 = 0.5, theta1 =
// -0.4, i.e. R's ma1 = 0.4; mean 0, sigma^2 = 1), n = 500, 200
// replicates with fixed seeds, and fits each by CLS with the mean
// estimated. For phi1 and theta1:
//   - the mean estimate is within 2 Monte Carlo standard errors (sd/sqrt(200))
//     of the truth;
//   - the 95 % intervals est -+ 1.96 SE cover the truth in 91-99 % of
//     replicates (binomial sd of the coverage at 200 replicates: 1.5 %).
func TestMonteCarloARMA11(t *testing.T) {
	truth := Model{AR: []float64{0.5}, MA: []float64{-0.4}, Sigma2: 1}
	const reps, n = 200, 500
	want := []float64{0.5, -0.4}
	var sum, sum2, cover [2]float64
	for r := 0; r < reps; r++ {
		y, err := Simulate(truth, n, &SimSettings{Seed1: 2026, Seed2: uint64(r)})
		if err != nil {
			t.Fatal(err)
		}
		res, err := Fit(context.Background(), y, Order{P: 1, Q: 1}, nil)
		if err != nil {
			t.Fatalf("replicate %d: %v", r, err)
		}
		for k := 0; k < 2; k++ {
			e := ests(res)[k]
			sum[k] += e
			sum2[k] += e * e
			if math.Abs(e-want[k]) <= 1.96*ses(res)[k] {
				cover[k]++
			}
		}
	}
	for k, name := range []string{"phi1", "theta1"} {
		mean := sum[k] / reps
		sd := math.Sqrt((sum2[k] - reps*mean*mean) / (reps - 1))
		mcse := sd / math.Sqrt(reps)
		cov := cover[k] / reps
		t.Logf("%s: mean %.4f (truth %.2f, MC SE %.4f), sd %.4f, coverage %.3f", name, mean, want[k], mcse, sd, cov)
		if math.Abs(mean-want[k]) > 2*mcse {
			t.Errorf("%s: mean estimate %.4f more than 2 MC SE (%.4f) from %.2f", name, mean, mcse, want[k])
		}
		if cov < 0.91 || cov > 0.99 {
			t.Errorf("%s: coverage %.3f outside [0.91, 0.99]", name, cov)
		}
	}
}
