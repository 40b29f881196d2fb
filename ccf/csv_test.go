package ccf

import (
	"path/filepath"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

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
