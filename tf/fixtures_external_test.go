package tf_test

import (
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
)

// Fixtures shared by the tests and examples of package tf_test: records
// simulated from a model written as a spec, by package internal/fixture
// (shared with the tests of tf/fit); the short names keep the calls in
// this package's tests as they read.

// whiteInput is fixture.WhiteInput: n standard normal draws from the PCG
// source seeded with (seed1, seed2).
func whiteInput(seed1, seed2 uint64, n int) []float64 { return fixture.WhiteInput(seed1, seed2, n) }

// mustRecord is fixture.MustRecord: the record simulated from the model
// written as spec, driven by inputs; an error ends the test.
func mustRecord(t testing.TB, spec string, inputs map[string][]float64, s *tf.SimSettings) map[string][]float64 {
	t.Helper()
	return fixture.MustRecord(t, spec, inputs, s)
}
