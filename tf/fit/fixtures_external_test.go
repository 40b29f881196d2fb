package fit_test

import (
	"context"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/fit"
)

// Fixtures shared by the tests and examples of package fit_test: the
// records they fit are either simulated from a model written as a spec
// (internal/fixture's SimulateRecord) or read from the BJsales file in
// testdata.

// estimateSpec parses the model written as spec and fits it to data with the
// default settings: the set-up of the examples whose subject comes after
// the fit (Check, Forecast); ExampleModel writes the two calls out.
func estimateSpec(spec string, data map[string][]float64) (*fit.Estimate, error) {
	m, err := parse.Model(spec)
	if err != nil {
		return nil, err
	}
	return fit.Model(context.Background(), m, data, nil)
}

// loadBJsales reads testdata/bjsales/bjsales.csv (exported from R's
// datasets package, BJsales and BJsales.lead) into the columns "sales"
// and "lead".
func loadBJsales() (map[string][]float64, error) {
	return testutil.LoadRecord("testdata/bjsales/bjsales.csv", "sales", "lead")
}
