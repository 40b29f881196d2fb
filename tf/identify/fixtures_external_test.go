package identify_test

import (
	"encoding/csv"
	"fmt"
	"os"
	"strconv"
)

// Fixtures of the examples of package identify: the BJsales record.

// loadBJsales reads testdata/bjsales/bjsales.csv (exported from R's
// datasets package, BJsales and BJsales.lead) into columns by header
// name: "sales" and "lead". The first column, the time index, is skipped.
func loadBJsales() (map[string][]float64, error) {
	f, err := os.Open("../../testdata/bjsales/bjsales.csv")
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
