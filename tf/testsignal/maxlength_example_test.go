package testsignal_test

import (
	"fmt"

	"github.com/backshift/backshift/tf/testsignal"
)

// One period of the 4-stage sequence: 15 values, eight +1 and seven -1.
func ExampleMaxLength() {
	x, err := testsignal.MaxLength(4)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(len(x), x)
	// Output:
	// 15 [1 1 1 1 -1 -1 -1 1 -1 -1 1 1 -1 1 -1]
}
