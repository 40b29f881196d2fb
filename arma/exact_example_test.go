package arma_test

import (
	"context"
	"fmt"
	"math"

	"github.com/backshift/backshift/arma"
)

// An AR(1) record with a sensor dropout of five samples, fitted by exact
// maximum likelihood: the gap is skipped by the Kalman filter, and the
// dropout's samples are estimated from both sides with their standard
// errors.
func ExampleFit_exactML() {
	y, err := arma.Simulate(arma.Model{AR: []float64{0.7}, Mean: 20, Sigma2: 1}, 300, &arma.SimSettings{Seed1: 4})
	if err != nil {
		fmt.Println(err)
		return
	}
	for t := 120; t < 125; t++ {
		y[t] = math.NaN()
	}
	res, err := arma.Fit(context.Background(), y, arma.Order{P: 1}, &arma.FitSettings{Method: arma.ExactML})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(res.Method)
	for _, p := range res.Params {
		fmt.Printf("%s = %.2f (sd %.2f)\n", p.Name, p.Value, p.SE)
	}
	fmt.Printf("%d observed, %d missing; first missing: sample %d\n", res.NUsed, len(res.Missing), res.Missing[0].Index)
	// Output:
	// exact maximum likelihood
	// phi1 = 0.65 (sd 0.04)
	// c = 19.60 (sd 0.15)
	// 295 observed, 5 missing; first missing: sample 120
}
