package lm_test

import (
	"context"
	"fmt"
	"math"

	"github.com/backshift/backshift/internal/lm"
)

// Fit the first-order step response y = K (1 - exp(-t/tau)) to noiseless
// samples of K = 2, tau = 5 from a poor start.
func ExampleMinimize() {
	t := []float64{0, 1, 2, 4, 6, 8, 12, 16, 20}
	y := make([]float64, len(t))
	for i, ti := range t {
		y[i] = 2 * (1 - math.Exp(-ti/5))
	}
	prob := lm.Problem{M: len(t), N: 2, Eval: func(x, r []float64, jac [][]float64) error {
		for i, ti := range t {
			e := math.Exp(-ti / x[1])
			r[i] = x[0]*(1-e) - y[i]
			if jac != nil {
				jac[0][i] = 1 - e
				jac[1][i] = -x[0] * e * ti / (x[1] * x[1])
			}
		}
		return nil
	}}
	res, err := lm.Minimize(context.Background(), prob, []float64{1, 1}, nil)
	if err != nil {
		panic(err)
	}
	fmt.Printf("K = %.6f, tau = %.6f, converged %v\n", res.X[0], res.X[1], res.Reason.Converged())
	// Output:
	// K = 2.000000, tau = 5.000000, converged true
}
