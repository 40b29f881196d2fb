package tf_test

import (
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// Fixtures shared by the tests and examples of package tf_test: records
// simulated from a model written as a spec.

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
