package prewhiten_test

import (
	"errors"
	"fmt"
	"math/rand/v2"

	"github.com/backshift/backshift/prewhiten"
)

// An autocorrelated input (AR(1), phi 0.8) and an output that follows it
// with a dead time of one sample. The fitted filter whitens the input;
// the same filter is applied to the output.
func ExamplePair() {
	rng := rand.New(rand.NewPCG(5, 6))
	n := 400
	x := make([]float64, n)
	y := make([]float64, n)
	for t := 1; t < n; t++ {
		x[t] = 0.8*x[t-1] + rng.NormFloat64()
		y[t] = 2*x[t-1] + 0.5*rng.NormFloat64()
	}
	res, err := prewhiten.Pair(x, y, "flow", &prewhiten.Settings{Name: "rain", MaxOrder: 5})
	var nw *prewhiten.NotWhiteError
	if errors.As(err, &nw) {
		fmt.Println("warning:", err)
	} else if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("order:", res.Filter.Order())
	fmt.Printf("phi1 = %.2f\n", -res.Filter.AR[1])
	fmt.Println("first valid index:", res.Start)
	fmt.Println("white:", res.White)
	// Output:
	// order: 1
	// phi1 = 0.78
	// first valid index: 1
	// white: true
}
