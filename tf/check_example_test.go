package tf_test

import (
	"context"
	"encoding/csv"
	"fmt"
	"os"
	"strconv"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// loadBJsales reads testdata/bjsales/bjsales.csv (exported from R's
// datasets package, BJsales and BJsales.lead) into columns by header
// name: "sales" and "lead". The first column, the time index, is skipped.
func loadBJsales() (map[string][]float64, error) {
	f, err := os.Open("../testdata/bjsales/bjsales.csv")
	if err != nil {
		return nil, err
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		return nil, err
	}
	if len(rows) < 2 {
		return nil, fmt.Errorf("bjsales.csv: %d rows, want a header and data", len(rows))
	}
	data := map[string][]float64{}
	for i, row := range rows[1:] {
		for j, name := range rows[0][1:] {
			v, err := strconv.ParseFloat(row[j+1], 64)
			if err != nil {
				return nil, fmt.Errorf("bjsales.csv row %d, column %s: %w", i+2, name, err)
			}
			data[name] = append(data[name], v)
		}
	}
	return data, nil
}

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
	m, err := parse.Model("(1 - B) sales = c + w0 / (1 - d1 B) B^3 ((1 - B) lead) + (1 - t1 B) a")
	if err != nil {
		fmt.Println(err)
		return
	}
	est, err := tf.Fit(context.Background(), m, data, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	d, err := tf.Check(est, data, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(d)
	// Output:
	// Diagnostic checks at the 0.05 level: all pass and the estimate is sound
	//   residual autocorrelation, lags 1..24: Ljung-Box Q = 20.43, df 23, p = 0.616  pass
	//     outside -/+0.162: lag 5 (0.163)
	//   residuals vs prewhitened lead (AR(3) filter), lags 0..24: S = 17.50, df 23, p = 0.784  pass
}
