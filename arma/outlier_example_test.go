package arma_test

import (
	"fmt"
	"math"

	"github.com/backshift/backshift/arma"
)

// Outliers in AR(1) noise: a bad reading at sample 80 and a level shift
// from sample 200 on, found from the residuals of the noise model, then
// removed from the series with Effects.
func ExampleOutliers() {
	y, _ := arma.Simulate(arma.Model{AR: []float64{0.6}, Sigma2: 1}, 300, &arma.SimSettings{Seed1: 1, Seed2: 2})
	y[80] += 7
	for t := 200; t < len(y); t++ {
		y[t] -= 5
	}
	// The residuals of (1 - 0.6 B) y_t = a_t, the first one missing.
	resid := make([]float64, len(y))
	resid[0] = math.NaN()
	for t := 1; t < len(y); t++ {
		resid[t] = y[t] - 0.6*y[t-1]
	}
	noise := arma.Model{AR: []float64{0.6}}.Noise() // (1 - phi1 B), phi1 = 0.6
	r, err := arma.Outliers(resid, noise, arma.Poly{}, nil)
	if err != nil {
		panic(err)
	}
	fmt.Printf("critical |t| %.2f over %d tests\n", r.Critical, r.Tests)
	for _, o := range r.Outliers {
		fmt.Printf("%d %s: size %.1f, t %.1f\n", o.Index, o.Kind, o.Size, o.T)
	}
	clean := r.Effects()
	fmt.Printf("y[250] %.2f, less the outliers %.2f\n", y[250], y[250]-clean[250])
	// Output:
	// critical |t| 4.27 over 1196 tests
	// 80 additive: size 7.1, t 7.6
	// 200 level shift: size -4.9, t -18.3
	// y[250] -2.79, less the outliers 2.06
}
