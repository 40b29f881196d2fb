package filter_test

import (
	"fmt"

	"github.com/backshift/backshift/internal/filter"
)

// y_t = 0.5 y_{t-1} + x_t driven by a unit step, first from rest and then
// continuing from the history of the first three samples. By hand:
// y_t = 2 - 0.5^t, so 1, 1.5, 1.75, 1.875, 1.9375 (all exact in binary),
// and the continuation from y_2 = 1.75 gives 1 + 0.875 = 1.875, then
// 1.9375.
func ExampleRunInit() {
	b, a := []float64{1}, []float64{1, -0.5}
	x := []float64{1, 1, 1, 1, 1}
	y := make([]float64, len(x))
	filter.Run(y, b, a, x)
	fmt.Println(y)
	rest := make([]float64, 2)
	filter.RunInit(rest, b, a, x[3:], x[:3], y[:3])
	fmt.Println(rest)
	// Output:
	// [1 1.5 1.75 1.875 1.9375]
	// [1.875 1.9375]
}
