package tf_test

import (
	"context"
	"fmt"

	"github.com/backshift/backshift/tf"
)

// ExampleIdentify identifies a model for BJsales (R's datasets package,
// Series M of Box, Jenkins & Reinsel: sales and a leading indicator)
// with both series differenced once, and prints the ranked candidates:
// the forms and noise orders proposed, then the lower-order neighbours
// of the best fit (white noise, no denominator), which fail their
// checks.
func ExampleIdentify() {
	data, err := fitLoadBJsales() // columns "sales" and "lead"; see the Check example
	if err != nil {
		fmt.Println(err)
		return
	}
	cands, err := tf.Identify(context.Background(), "sales", []string{"lead"}, data,
		&tf.IdentifySettings{OutputDiff: []float64{1, -1}})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range cands {
		in := c.Model.Inputs[0]
		ma, ar, _ := c.Model.NoiseCoeffs()
		fmt.Printf("#%d BIC %6.2f  b=%d r=%d s=%d  noise AR(%d) MA(%d)  checks pass: %v\n", c.Rank, c.Score,
			in.Delay, in.Den.Degree(), in.Num.Degree(), len(ar)-1, len(ma)-1, c.Diagnostics.Pass)
	}
	// Output:
	// #1 BIC  -5.99  b=3 r=1 s=0  noise AR(0) MA(1)  checks pass: true
	// #2 BIC  -1.21  b=3 r=1 s=0  noise AR(1) MA(1)  checks pass: true
	// #3 BIC  -1.09  b=3 r=1 s=1  noise AR(0) MA(1)  checks pass: true
	// #4 BIC   3.70  b=3 r=1 s=1  noise AR(1) MA(1)  checks pass: true
	// #5 BIC  32.17  b=3 r=1 s=0  noise AR(0) MA(0)  checks pass: false
	// #6 BIC 353.54  b=3 r=0 s=0  noise AR(0) MA(1)  checks pass: false
}
