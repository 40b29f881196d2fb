package fit_test

import (
	"context"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// Fixtures shared by the tests and examples of package fit_test: the
// records they fit are either simulated from a model written as a spec
// or read from the BJsales file in testdata.

// whiteInput returns n standard normal draws from the PCG source seeded
// with (seed1, seed2): the white input most simulated records use.
func whiteInput(seed1, seed2 uint64, n int) []float64 {
	rng := rand.New(rand.NewPCG(seed1, seed2))
	x := make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64()
	}
	return x
}

// simulateRecord parses the model written as spec, simulates its output
// driven by inputs with settings s, and returns the record: the inputs
// (the caller's slices, which Simulate leaves unchanged) and the output
// under the model's output name.
func simulateRecord(spec string, inputs map[string][]float64, s *tf.SimSettings) (map[string][]float64, error) {
	m, err := parse.Model(spec)
	if err != nil {
		return nil, err
	}
	y, err := m.Simulate(inputs, s)
	if err != nil {
		return nil, err
	}
	rec := map[string][]float64{m.Output: y}
	for name, x := range inputs {
		rec[name] = x
	}
	return rec, nil
}

// mustRecord is simulateRecord for tests: an error ends the test.
func mustRecord(t testing.TB, spec string, inputs map[string][]float64, s *tf.SimSettings) map[string][]float64 {
	t.Helper()
	rec, err := simulateRecord(spec, inputs, s)
	if err != nil {
		t.Fatal(err)
	}
	return rec
}

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
