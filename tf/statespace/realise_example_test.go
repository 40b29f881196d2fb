package statespace_test

import (
	"fmt"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/statespace"
)

// A first-order lag with two samples of dead time, ARMA(1,1) noise and
// a level: three states for the path and noise (one delay state, the
// lag, the noise) and the constant state.
func ExampleRealise() {
	m := parse.MustModel("temp = 20 + 0.5 / (1 - 0.8 B) B^2 valve + (1 - 0.3 B) / (1 - 0.5 B) a")
	r, err := statespace.Realise(m)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range r.Parts() {
		fmt.Printf("%-8s states %d..%d, %d delay states\n", p.Name, p.First, p.First+p.States-1, p.DelayStates)
	}
	fmt.Printf("A = %v\n", mat.Formatted(r.A(), mat.Prefix("    "), mat.Squeeze()))
	fmt.Printf("B' = %v  C = %v  G' = %v\n", mat.Formatted(r.B().T(), mat.Squeeze()), mat.Formatted(r.C(), mat.Squeeze()), mat.Formatted(r.G().T(), mat.Squeeze()))
	step, _ := r.Step(0, 5)
	fmt.Printf("step response %.4g\n", step)
	// Output:
	// valve    states 0..1, 1 delay states
	// noise    states 2..2, 0 delay states
	// constant states 3..3, 0 delay states
	// A = ⎡  0    0    0  0⎤
	//     ⎢0.5  0.8    0  0⎥
	//     ⎢  0    0  0.5  0⎥
	//     ⎣  0    0    0  1⎦
	// B' = [1  0  0  0]  C = [0  1  1  20]  G' = [0  0  0.2  0]
	// step response [0 0 0.5 0.9 1.22]
}

// The one-step predictor of the innovations form: its errors are the
// model's innovations once its start is forgotten.
func ExampleNewPredictor() {
	m := parse.MustModel("y = 0.5 / (1 - 0.8 B) B x + (1 - 0.3 B) a")
	r, _ := statespace.Realise(m)
	x := []float64{0, 1, 1, 1, 1, 1}
	a := []float64{0.1, -0.2, 0.05, 0, 0.3, -0.1}
	y, _ := r.Simulate([][]float64{x}, a, nil)
	p, _ := statespace.NewPredictor(r, nil)
	for t := range y {
		yhat, e := p.Step([]float64{x[t]}, y[t])
		fmt.Printf("t=%d  y %6.3f  predicted %6.3f  error %5.2f\n", t, y[t], yhat, e)
	}
	// Output:
	// t=0  y  0.100  predicted  0.000  error  0.10
	// t=1  y -0.230  predicted -0.030  error -0.20
	// t=2  y  0.610  predicted  0.560  error  0.05
	// t=3  y  0.885  predicted  0.885  error  0.00
	// t=4  y  1.520  predicted  1.220  error  0.30
	// t=5  y  1.286  predicted  1.386  error -0.10
}
