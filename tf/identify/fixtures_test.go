package identify

import (
	"path/filepath"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// Fixtures of the tests of package identify: the records of the scipy
// reference cases in testdata/fit. The models built in code (the parser
// imports tf) and the simulated plants are package internal/fixture's,
// shared with the tests of tf/fit.

// scipyRecord returns the record of the case of testdata/fit/ref_fit.json
// with the given name (its CSV file without the time column), failing
// the test when there is none.
func scipyRecord(t testing.TB, name string) map[string][]float64 {
	t.Helper()
	var cs []struct {
		Name string `json:"name"`
		File string `json:"file"`
	}
	testutil.ReadJSON(t, "testdata/fit/ref_fit.json", &cs)
	for _, c := range cs {
		if c.Name == name {
			d := testutil.ReadCSV(t, filepath.Join("testdata", "fit", c.File)).Num
			delete(d, "t")
			return d
		}
	}
	t.Fatalf("testdata/fit/ref_fit.json has no case %q", name)
	return nil
}
