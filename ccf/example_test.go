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
	best := id.Candidates[0]
	fmt.Printf("dead time %d, r = %d, s = %d\n", id.DeadTime, best.R, best.S)
	fmt.Println("temp =", best.Term, "+ a")
	fmt.Printf("start values: w0 ~ %.2f, d1 ~ %.2f\n", best.Starts["w0"], best.Starts["d1"])
	// Output:
	// dead time 2, r = 1, s = 0
	// temp = w0 / (1 - d1 B) B^2 valve + a
	// start values: w0 ~ 0.77, d1 ~ 0.45
}

// y is x delayed by two samples: the correlation peaks at lag +2, x
// leading y.
func ExampleCross() {
	x := []float64{1, -2, 3, 0, -1, 2, -3, 1, 0, 2, -1, 1}
	y := []float64{0, 0, 1, -2, 3, 0, -1, 2, -3, 1, 0, 2} // x delayed by two samples
	c, err := ccf.Cross(x, y, 3, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	for k := -3; k <= 3; k++ {
		fmt.Printf("r(%+d) = %6.3f\n", k, c.At(k))
	}
	fmt.Printf("95%% band: +-%.3f\n", c.Band(0.95))
	// Output:
	// r(-3) =  0.130
	// r(-2) = -0.199
	// r(-1) = -0.002
	// r(+0) =  0.248
	// r(+1) = -0.649
	// r(+2) =  0.967
	// r(+3) = -0.577
	// 95% band: +-0.566
}
