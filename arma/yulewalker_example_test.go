package arma_test

import (
	"fmt"

	"github.com/backshift/backshift/arma"
)

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
