package fit_test

import (
	"fmt"

	"github.com/backshift/backshift/tf/fit"
)

// ExampleCheck fits the classic model of BJsales (R's datasets package,
// Series M of Box, Jenkins & Reinsel) and prints the diagnostic checks:
// the residuals are white and uncorrelated with the prewhitened leading
// indicator.
func ExampleCheck() {
	data, err := loadBJsales()
	if err != nil {
		fmt.Println(err)
		return
	}
	est, err := estimateSpec("(1 - B) sales = c + w0 / (1 - d1 B) B^3 ((1 - B) lead) + (1 - t1 B) a", data) // parse.Model, then fit.Model (fixtures_external_test.go)
	if err != nil {
		fmt.Println(err)
		return
	}
	d, err := fit.Check(est, data, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(d)
	// Output:
	// Diagnostic checks at the 0.05 level: all pass and the estimate is sound
	//   residual autocorrelation, lags 1..24: Ljung-Box Q = 20.43, df 23, p = 0.616  pass
	//     outside -/+0.162: lag 5 (0.163)
	//   residuals vs prewhitened lead (AR(3) filter), lags 0..24: S = 17.50, 1.050 x chi2(21.5), p = 0.756  pass
}
