package fit_test

import (
	"context"
	"fmt"
	"math/rand/v2"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// ExampleModel fits a first-order-plus-dead-time transfer function with
// AR(1) noise to simulated data of our own (a heater's power driving a
// temperature) and prints the estimates and checks.
func ExampleModel() {
	n := 2000
	rng := rand.New(rand.NewPCG(1, 2))
	power := make([]float64, n)
	level := 5.0
	for i := range power {
		if rng.Float64() < 0.05 { // a new set point now and then
			level = 10 * rng.Float64()
		}
		power[i] = level
	}
	// fixture.SimulateRecord (internal/fixture) simulates the true model.
	data, err := fixture.SimulateRecord("temp = 20 + 0.8 / (1 - 0.9 B) B^2 power + 1 / (1 - 0.5 B) a",
		map[string][]float64{"power": power}, &tf.SimSettings{Seed1: 3, Seed2: 4, Sigma: 0.2, BurnIn: 100})
	if err != nil {
		fmt.Println(err)
		return
	}
	m, err := parse.Model("temp = c + w0 / (1 - d1 B) B^2 power + 1 / (1 - p1 B) a")
	if err != nil {
		fmt.Println(err)
		return
	}
	est, err := fit.Model(context.Background(), m, data, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range est.Params {
		fmt.Printf("%-2s %7.4f +- %.4f\n", p.Name, p.Value, p.SE)
	}
	d, err := fit.Check(est, data, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("checks pass:", d.Pass)
	fmt.Printf("%d residuals from index %d\n", est.N, est.Conditioning.First)
	// Output:
	// c  19.9958 +- 0.0272
	// w0  0.7990 +- 0.0009
	// d1  0.9001 +- 0.0001
	// p1  0.4928 +- 0.0195
	// checks pass: true
	// 1997 residuals from index 3
}
