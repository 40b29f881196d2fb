package identify_test

import (
	"context"
	"fmt"

	"github.com/backshift/backshift/tf/identify"
)

// ExampleCandidates identifies a model for BJsales (R's datasets package,
// Series M of Box, Jenkins & Reinsel: sales and a leading indicator)
// with both series differenced once, and prints the ranked candidates:
// the forms and noise orders proposed, then the lower-order neighbours
// of the best fit (white noise, no denominator), which fail their
// checks.
func ExampleCandidates() {
	data, err := loadBJsales() // columns "sales" and "lead"; see the Check example
	if err != nil {
		fmt.Println(err)
		return
	}
	cands, err := identify.Candidates(context.Background(), "sales", []string{"lead"}, data,
		&identify.Settings{OutputDiff: []float64{1, -1}})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range cands {
		fmt.Printf("#%d %s %6.2f  %-34s checks pass: %v\n", c.Rank, c.Criterion, c.Score, c.Label(), c.Diagnostics.Pass)
	}
	// Output:
	// #1 BIC  -5.99  lead (b=3, r=1, s=0), noise ARMA(0, 1) checks pass: true
	// #2 BIC  -1.21  lead (b=3, r=1, s=0), noise ARMA(1, 1) checks pass: true
	// #3 BIC  -1.09  lead (b=3, r=1, s=1), noise ARMA(0, 1) checks pass: true
	// #4 BIC   3.70  lead (b=3, r=1, s=1), noise ARMA(1, 1) checks pass: true
	// #5 BIC  32.17  lead (b=3, r=1, s=0), noise ARMA(0, 0) checks pass: false
	// #6 BIC 353.54  lead (b=3, r=0, s=0), noise ARMA(0, 1) checks pass: false
}
