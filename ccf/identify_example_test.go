package ccf_test

import (
	"fmt"
	"math/rand/v2"

	"github.com/backshift/backshift/ccf"
)

// A white input drives the output through 0.8 / (1 - 0.5 B) B^2 plus
// noise; the cross-correlation shows the dead time at lag 2 and the
// identification proposes one denominator term.
func ExampleIdentify() {
	rng := rand.New(rand.NewPCG(1, 2))
	n := 500
	x := make([]float64, n)
	y := make([]float64, n)
	var s float64 // the filtered input 0.8 / (1 - 0.5 B) x
	for t := range x {
		x[t] = rng.NormFloat64()
	}
	for t := range y {
		if t >= 2 {
			s = 0.5*s + 0.8*x[t-2]
		}
		y[t] = s + 0.3*rng.NormFloat64()
	}
	// x is white already, so it needs no prewhitening here.
	w, err := ccf.ImpulseWeights(x, y, 12, "valve", nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	id, err := ccf.Identify(w, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	best := id.Forms[0]
	fmt.Printf("dead time %d, r = %d, s = %d\n", id.DeadTime, best.R, best.S)
	fmt.Println("structure", best)
	// omega(B) = Num, delta(B) = Den, ascending powers of B.
	fmt.Printf("omega %.2f, delta %.2f\n", best.Num, best.Den)
	// Output:
	// dead time 2, r = 1, s = 0
	// structure b=2 (r=1, s=0)
	// omega [0.77], delta [1.00 -0.45]
}
