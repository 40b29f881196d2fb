package gaps_test

import (
	"fmt"
	"math"

	"github.com/backshift/backshift/internal/gaps"
)

// A logger's output with a dropout of three samples and one lost
// reading.
func Example() {
	nan := math.NaN()
	y := []float64{20.1, 20.3, nan, nan, nan, 20.9, 21.0, nan, 21.2}
	for _, r := range gaps.Runs(y) {
		fmt.Println(r, gaps.Span(r))
	}
	// Output:
	// [2 5] 2..4 (3 samples)
	// [7 8] 7
}
