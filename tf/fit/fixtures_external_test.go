package fit_test

import (
	"context"
	"encoding/csv"
	"fmt"
	"math/rand/v2"
	"os"
	"strconv"
	"testing"

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
