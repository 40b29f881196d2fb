package arma_test

import (
	"context"
	"fmt"

	"github.com/backshift/backshift/arma"
)

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
