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

// The autocorrelations of a series with Bartlett bands, and the
// Yule-Walker autoregression chosen by AIC.
func ExampleYuleWalker() {
	y, _ := arma.Simulate(arma.Model{AR: []float64{0.5, 0.3}, Sigma2: 1}, 2000, &arma.SimSettings{Seed1: 3, Seed2: 4})
	c, _ := arma.ACF(y, 3)
	for k := 1; k <= 3; k++ {
		fmt.Printf("lag %d: r = %.3f (Bartlett se %.3f)\n", k, c.R[k], c.Bartlett[k])
	}
	f, _ := arma.YuleWalker(y, 10)
	fmt.Printf("AR(%d): phi = %.3f, var = %.3f\n", f.Order, f.Phi, f.Var)
	// Output:
	// lag 1: r = 0.685 (Bartlett se 0.022)
	// lag 2: r = 0.613 (Bartlett se 0.031)
	// lag 3: r = 0.496 (Bartlett se 0.037)
	// AR(2): phi = [0.498 0.272], var = 0.983
}

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

// A noise model written as factors, built from arma's own exports (the
// polynomial vocabulary Poly, Factor, Term and Coef), with the moving
// average coefficient held and the autoregressive one free, then fitted.
func ExampleNoise() {
	// (1 - phi1 B) n_t = (1 - 0.4 B) a_t: phi1 free from 0.5, the MA
	// coefficient a number.
	noise := arma.Noise{
		AR: arma.Poly{Factors: []arma.Factor{{Exp: 1, Terms: []arma.Term{
			{Coef: arma.Coef{Value: 1}},
			{Neg: true, Power: 1, Coef: arma.Coef{Name: "phi1", Value: 0.5, Free: true}},
		}}}},
		MA: arma.Poly{Factors: []arma.Factor{{Exp: 1, Terms: []arma.Term{
			{Coef: arma.Coef{Value: 1}},
			{Neg: true, Power: 1, Coef: arma.Coef{Value: 0.4}},
		}}}},
	}
	fmt.Println("AR", noise.AR.Coeffs(), "MA", noise.MA.Coeffs())
	y, _ := arma.Simulate(arma.Model{AR: []float64{0.6}, MA: []float64{0.4}, Sigma2: 1}, 2000, &arma.SimSettings{Seed1: 7, Seed2: 8})
	res, err := arma.FitNoise(context.Background(), y, noise, nil, &arma.FitSettings{Constant: arma.ConstantZero})
	if err != nil {
		panic(err)
	}
	p := res.Params[0]
	fmt.Printf("%s = %.3f (se %.3f)\n", p.Name, p.Value, p.SE)
	// Output:
	// AR [1 -0.5] MA [1 -0.4]
	// phi1 = 0.594 (se 0.018)
}
