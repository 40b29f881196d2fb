package ccf_test

import (
	"fmt"

	"github.com/backshift/backshift/ccf"
)

// The summary of an identification from the weights of
// (2 + 0.4 B) / (1 - 0.6 B) B^2, known exactly.
func ExampleIdentification_String() {
	w := &ccf.Weights{
		Input: "burner",
		V:     []float64{0, 0, 2, 1.6, 0.96, 0.576, 0.3456, 0.20736, 0.124416, 0.0746496, 0.04478976},
		SE:    []float64{0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01},
	}
	id, err := ccf.Identify(w, &ccf.IdentifySettings{MaxR: 1, MaxS: 1})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(id)
	// Output:
	// input burner: dead time 2 samples
	//   lag    weight   t-ratio
	//     0         0     0.00
	//     1         0     0.00
	//     2         2   200.00 *
	//     3       1.6   160.00 *
	//     4      0.96    96.00 *
	//     5     0.576    57.60 *
	//     6    0.3456    34.56 *
	//     7    0.2074    20.74 *
	//     8    0.1244    12.44 *
	//     9   0.07465     7.46 *
	//    10   0.04479     4.48 *
	//   corner method: r = 1, s = 1
	//   rank  structure        score    shape
	//      1  b=2 (r=1, s=1)      6.00  exponential decay  (corner)
	//      2  b=2 (r=1, s=0)    693.50  exponential decay
	//      3  b=2 (r=0, s=1)   14392.72  cut-off
	//      4  b=2 (r=0, s=0)   39990.72  cut-off
}
