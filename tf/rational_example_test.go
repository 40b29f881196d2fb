package tf_test

import (
	"fmt"

	"github.com/backshift/backshift/tf"
)

// A heater: 0.5 B^2 / (1 - 0.8 B), two samples of dead time and a pole at
// z = 0.8.
func ExampleNewRational() {
	g, err := tf.NewRational([]float64{0.5}, []float64{1, -0.8}, 2)
	if err != nil {
		fmt.Println(err)
		return
	}
	gain, _ := g.Gain()
	fmt.Printf("poles %.2f, stable %v, gain %.2f\n", g.Poles(), g.Stable(), gain)
	fmt.Printf("step %.3f\n", g.Step(6))
	// Output:
	// poles [(0.80+0.00i)], stable true, gain 2.50
	// step [0.000 0.000 0.500 0.900 1.220 1.476]
}

// Bad coefficients give typed errors that name the polynomial and index.
func ExampleNewRational_error() {
	_, err := tf.NewRational([]float64{1}, []float64{0, 1}, 0)
	fmt.Println(err)
	// Output:
	// tf.NewRational: den coefficient 0 (B^0) = 0: constant term is zero
}

// A first-order-plus-dead-time process with gain 2, time constant 5 s and
// dead time 2.3 s, sampled every second under a zero-order hold. The
// fractional 0.3 s of dead time gives the second numerator term.
func ExampleFOPDT_Discretize() {
	g, err := tf.FOPDT{Gain: 2, TimeConstant: 5, DeadTime: 2.3}.Discretize(1)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("num %.5f den %.5f delay %d\n", g.Num(), g.Den(), g.Delay())
	back, _ := g.AsFOPDT(1)
	fmt.Printf("K %.3f tau %.3f dead time %.3f\n", back.Gain, back.TimeConstant, back.DeadTime)
	// Output:
	// num [0.26128 0.10125] den [1.00000 -0.81873] delay 3
	// K 2.000 tau 5.000 dead time 2.300
}

// Closing a loop: a proportional-integral controller on the heater, and
// the closed-loop set-point response's metrics.
func ExampleRational_CloseLoop() {
	plant := tf.MustRational([]float64{0.5}, []float64{1, -0.8}, 2)
	// PI controller Kc = 0.6, Ti = 4 samples: (Kc (1 + 1/Ti) - Kc B)/(1 - B).
	pi := tf.MustRational([]float64{0.6 * 1.25, -0.6}, []float64{1, -1}, 0)
	open, _ := pi.Times(plant)
	one, _ := tf.Constant(1)
	closed, err := open.CloseLoop(one)
	if err != nil {
		fmt.Println(err)
		return
	}
	info, _ := closed.StepFigures(tf.StepSettings{Interval: 10}) // 10 s samples
	fmt.Printf("stable %v, final %.3f, overshoot %.1f %%, settling %.0f s\n",
		closed.Stable(), info.Final, 100*info.Overshoot, info.Settle.Time)
	// Output:
	// stable true, final 1.000, overshoot 8.4 %, settling 82 s
}

// A streaming plant for a controller test, started at the steady state
// of input 1.
func ExamplePlant() {
	p := tf.NewPlant(tf.MustRational([]float64{0.5}, []float64{1, -0.8}, 2))
	if err := p.SetSteady(1); err != nil {
		fmt.Println(err)
		return
	}
	for _, u := range []float64{1, 2, 2, 2} {
		fmt.Printf("%.3f ", p.Step(u))
	}
	fmt.Println()
	// Output:
	// 2.500 2.500 2.500 3.000
}

// Printing a term.
func ExampleRational_String() {
	fmt.Println(tf.MustRational([]float64{0.5, -0.2}, []float64{1, -0.8}, 2))
	fmt.Println(tf.MustRational([]float64{1.5}, []float64{1}, 7))
	// Output:
	// (0.5 - 0.2 B) / (1 - 0.8 B) B^2
	// (1.5) B^7
}
