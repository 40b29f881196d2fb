package testutil_test

import (
	"fmt"

	"github.com/backshift/backshift/internal/testutil"
)

// The error of the second value counts relative to the largest reference
// value so far (4), not to its own small reference value.
func ExampleRunningRelErr() {
	got := []float64{4, 0.001}
	want := []float64{4, 0}
	fmt.Println(testutil.RunningRelErr(got, want))
	// Output:
	// 0.00025
}
