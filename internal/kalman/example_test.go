package kalman_test

import (
	"fmt"
	"math"

	"github.com/backshift/backshift/internal/kalman"
)

// The exact likelihood of an AR(1) series with one missing sample, and
// the smoothed estimate of that sample: for an AR(1) with phi = 0.5 the
// best estimate between neighbours 1 and 2 is phi (1 + 2) / (1 + phi^2)
// = 1.2, with variance 1 / (1 + phi^2) = 0.8 (sigma^2 = 1).
func Example() {
	z := []float64{0.5, 1, math.NaN(), 2, 0.7}
	f, err := kalman.New([]float64{1, -0.5}, []float64{1}, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	st, err := f.Run(z, 0, nil, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fill, vr, _, _ := f.Smooth(z, 0)
	fmt.Printf("observed %d, log-likelihood %.4f\n", st.NObs, st.LogLik())
	fmt.Printf("z[2] = %.3f, variance %.3f sigma^2\n", fill[2], vr[2])
	// Output:
	// observed 4, log-likelihood -5.5404
	// z[2] = 1.200, variance 0.800 sigma^2
}
