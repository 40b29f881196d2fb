package testsignal_test

import (
	"fmt"

	"github.com/backshift/backshift/tf/testsignal"
)

// One period of the ternary maximum-length sequence of a 2-stage
// register: 3^2 - 1 = 8 values, the second half the negation of the
// first.
func ExampleMultiLevel() {
	x, err := testsignal.MultiLevel(3, 2)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(x)
	// Output:
	// [0 1 -1 -1 0 -1 1 1]
}
