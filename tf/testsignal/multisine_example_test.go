package testsignal_test

import (
	"fmt"

	"github.com/backshift/backshift/tf/testsignal"
)

// Two inputs moved at once, a period of 120 samples, 10 lines each with
// Schroeder's phases: the inputs share no frequency, so their effects
// can be told apart, and the crest factors stay far below the sqrt(20)
// of cosines all in phase.
func ExampleMultisine() {
	set, err := testsignal.Multisine(testsignal.MultisineSettings{Inputs: 2, Period: 120, Lines: 10, Amplitude: 3})
	if err != nil {
		fmt.Println(err)
		return
	}
	for i := range set.Signals {
		fmt.Printf("input %d: lines %v, crest factor %.2f\n", i, set.Lines[i], set.CrestFactor[i])
	}
	// Output:
	// input 0: lines [1 3 5 7 9 11 13 15 17 19], crest factor 1.68
	// input 1: lines [2 4 6 8 10 12 14 16 18 20], crest factor 1.89
}
