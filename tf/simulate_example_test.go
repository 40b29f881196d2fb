package tf_test

import (
	"fmt"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

func ExampleModel_Simulate() {
	m := parse.MustModel("temp = 20 + 0.5 / (1 - 0.8 B) B^2 burner")
	burner := []float64{0, 10, 10, 10, 10, 10}
	y, err := m.Simulate(map[string][]float64{"burner": burner}, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.4g\n", y)
	// Output:
	// [20 20 20 25 29 32.2]
}

func ExampleSystem() {
	m := parse.MustModel("(1 - B) level = 0.2 B inflow + MA(1) where theta1 = 0.4")
	sys, err := tf.NewSystem(m, &tf.SimSettings{Seed1: 1, Seed2: 2, Sigma: 0.01})
	if err != nil {
		fmt.Println(err)
		return
	}
	for t := range 4 {
		fmt.Printf("t=%d level %.3f\n", t, sys.Step([]float64{1}))
	}
	// Output:
	// t=0 level -0.005
	// t=1 level 0.194
	// t=2 level 0.384
	// t=3 level 0.590
}
