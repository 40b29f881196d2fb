package arma_test

import (
	"context"
	"fmt"

	"github.com/backshift/backshift/arma"
)

// A noise model is simulated, its order chosen by BIC, fitted by
// conditional least squares, checked by Ljung-Box and used to forecast.
func Example() {
	truth := arma.Model{AR: []float64{0.7}, MA: []float64{-0.3}, Mean: 50, Sigma2: 0.25}
	y, err := arma.Simulate(truth, 3000, &arma.SimSettings{Seed1: 1, Seed2: 2})
	if err != nil {
		panic(err)
	}
	fits, err := arma.Select(context.Background(), y, arma.Grid{MaxP: 2, MaxQ: 2}, nil)
	if err != nil {
		panic(err)
	}
	fmt.Println("chosen:", fits[0])
	cands := fits
	res, err := arma.Fit(context.Background(), y, cands[0].Order, nil)
	if err != nil {
		panic(err)
	}
	for _, p := range res.Params {
		fmt.Printf("%-6s %7.3f  se %.3f\n", p.Name, p.Value, p.SE)
	}
	lb, _ := arma.LjungBox(res.Resid[res.Start:], 20, 2)
	fmt.Printf("Ljung-Box Q(20) = %.1f on %d df, p = %.2f\n", lb.Q, lb.DF, lb.P)
	fc, _ := res.Forecast(3, 0.95, nil)
	for h := range fc.Mean {
		fmt.Printf("h=%d %.2f [%.2f, %.2f]\n", h+1, fc.Mean[h], fc.Lower[h], fc.Upper[h])
	}
	// Output:
	// chosen: ARIMA(1,0,1) BIC 4328.79
	// phi1     0.712  se 0.016
	// theta1  -0.264  se 0.021
	// c       50.036  se 0.040
	// Ljung-Box Q(20) = 20.3 on 18 df, p = 0.32
	// h=1 49.88 [48.90, 50.85]
	// h=2 49.92 [48.56, 51.28]
	// h=3 49.96 [48.44, 51.47]
}
