package ccf

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// readCSV reads a CSV file with a header row into a map from column name
// to the column's text values.
func readCSV(t *testing.T, path string) (header []string, rows [][]string) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.FieldsPerRecord = -1
	all, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return all[0], all[1:]
}

// readColumns reads the named numeric columns of a CSV file with a
// header line (internal/testutil.ReadCSV; path relative to this package).
func readColumns(t *testing.T, path string, names ...string) [][]float64 {
	t.Helper()
	abs, err := filepath.Abs(path)
	if err != nil {
		t.Fatal(err)
	}
	tb := testutil.ReadCSV(t, abs)
	out := make([][]float64, len(names))
	for i, name := range names {
		out[i] = tb.Column(t, name)
	}
	return out
}
