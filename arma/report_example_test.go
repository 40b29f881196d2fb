package arma_test

import (
	"context"
	"fmt"

	"github.com/backshift/backshift/arma"
)

// A fit report for people and the residual check with the degrees of
// freedom of the fitted ARMA coefficients.
func ExampleResult_String() {
	y, _ := arma.Simulate(arma.Model{AR: []float64{0.8}, Mean: 20, Sigma2: 1}, 400, &arma.SimSettings{Seed1: 5, Seed2: 6})
	res, err := arma.Fit(context.Background(), y, arma.Order{P: 1}, nil)
	if err != nil {
		panic(err)
	}
	fmt.Print(res)
	lb, _ := res.LjungBox(10)
	fmt.Printf("Ljung-Box Q(10) = %.2f on %d df\n", lb.Q, lb.DF)
	// Output:
	// ARIMA(1,0,0) fitted by conditional least squares to 400 samples (residuals 1..399, 399 summed)
	//   name              value    sd(value)  value/sd
	//   phi1            0.83097       0.0279     29.78
	//   c                20.228        0.289     69.88
	//   innovation variance 0.95502, sum of squares 379.142
	//   log-likelihood -555.97; AIC 1117.94, AICc 1118.00, BIC 1129.91
	//   converged: relative reduction of the sum of squares below tolerance after 3 iterations
	// Ljung-Box Q(10) = 11.60 on 9 df
}
