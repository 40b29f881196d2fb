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

// The summary of an identification from the weights of
// (2 + 0.4 B) / (1 - 0.6 B) B^2, known exactly.
func ExampleIdentification_String() {
	w := &ccf.Weights{
		Input: "burner",
		V:     []float64{0, 0, 2, 1.6, 0.96, 0.576, 0.3456, 0.20736, 0.124416, 0.0746496, 0.04478976},
		SE:    []float64{0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01},
	}
	id, err := ccf.Identify(w, &ccf.IdentifySettings{MaxR: 1, MaxS: 1})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(id)
	// Output:
	// input burner: dead time 2 samples
	//   lag    weight   t-ratio
	//     0         0     0.00
	//     1         0     0.00
	//     2         2   200.00 *
	//     3       1.6   160.00 *
	//     4      0.96    96.00 *
	//     5     0.576    57.60 *
	//     6    0.3456    34.56 *
	//     7    0.2074    20.74 *
	//     8    0.1244    12.44 *
	//     9   0.07465     7.46 *
	//    10   0.04479     4.48 *
	//   corner method: r = 1, s = 1
	//   rank  structure        score    shape
	//      1  b=2 (r=1, s=1)      6.00  exponential decay  (corner)
	//      2  b=2 (r=1, s=0)    693.50  exponential decay
	//      3  b=2 (r=0, s=1)   14392.72  cut-off
	//      4  b=2 (r=0, s=0)   39990.72  cut-off
}
