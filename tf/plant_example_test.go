package tf_test

import (
	"fmt"

	"github.com/backshift/backshift/tf"
)

// A closed-loop controller test: a PI controller acts each minute on the
// measurement read before the new valve position is applied, so the
// plant's dead time of two samples (and Feedthrough() == false) means no
// algebraic loop. The set-point steps from 0 to 1 at t = 0.
func ExamplePlant_closedLoop() {
	p := tf.NewPlant(tf.MustRational([]float64{0.5}, []float64{1, -0.8}, 2))
	const kc, ti = 0.6, 4.0 // gain and integral time in samples
	integral, y := 0.0, 0.0
	for t := 0; t < 30; t++ {
		e := 1 - y // error from the last measurement
		integral += e / ti
		u := kc * (e + integral)
		y = p.Step(u)
		if t%5 == 4 {
			fmt.Printf("t=%2d u=%.3f y=%.3f\n", t, u, y)
		}
	}
	// Output:
	// t= 4 u=0.731 y=1.125
	// t= 9 u=0.176 y=1.102
	// t=14 u=0.512 y=0.886
	// t=19 u=0.359 y=1.072
	// t=24 u=0.408 y=0.966
	// t=29 u=0.403 y=1.011
}
