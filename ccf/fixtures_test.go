package ccf

// Shared fixtures of the ccf tests: the reference CSV reader and the
// seeded series of the benchmarks and the concurrency check.

import (
	"math/rand/v2"
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

func benchSeries(n int) (x, y []float64) {
	rng := rand.New(rand.NewPCG(3, 4))
	x = make([]float64, n)
	y = make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64()
		y[i] = rng.NormFloat64()
		if i > 0 {
			x[i] += 0.5 * x[i-1]
		}
	}
	return x, y
}
