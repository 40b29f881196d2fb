package identify_test

import "github.com/backshift/backshift/internal/testutil"

// Fixtures of the examples of package identify: the BJsales record.

// loadBJsales reads testdata/bjsales/bjsales.csv (exported from R's
// datasets package, BJsales and BJsales.lead) into the columns "sales"
// and "lead".
func loadBJsales() (map[string][]float64, error) {
	return testutil.LoadRecord("testdata/bjsales/bjsales.csv", "sales", "lead")
}
