package ccf_test

import (
	"fmt"

	"github.com/backshift/backshift/ccf"
)

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
