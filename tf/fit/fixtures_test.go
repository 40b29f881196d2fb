package fit

import (
	"context"
	"errors"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
)

// Fixtures of the tests of package fit: the check that an error has one
// of the library's kinds, and fits of the Monte Carlo plant. The models
// built in code (the parser imports tf, so these tests cannot use it)
// and the simulated plants are package internal/fixture's, shared with
// the tests of tf/identify.

// hasKind reports whether err matches one of the library's kinds of
// error with errors.Is (every error of the package must).
func hasKind(err error) bool {
	for _, k := range []error{tf.ErrSample, tf.ErrShort, tf.ErrConstant, tf.ErrLength, tf.ErrName, tf.ErrSetting, tf.ErrModel, tf.ErrConvergence, tf.ErrOverflow, tf.ErrInternal} {
		if errors.Is(err, k) {
			return true
		}
	}
	return false
}

// mustFit fits m to data with settings s (fit.Model with a background
// context), ending the test on an error.
func mustFit(t testing.TB, m tf.Model, data map[string][]float64, s *Settings) *Estimate {
	t.Helper()
	est, err := Model(context.Background(), m, data, s)
	if err != nil {
		t.Fatal(err)
	}
	return est
}

// replicatePlant simulates n + h samples of fixture.PlantModel and fits the
// model to the first n, failing the test on error. It returns the whole
// simulated series (the last h samples are the future), the estimate and
// the fitted data.
func replicatePlant(t *testing.T, rng *rand.Rand, n, h int) (y, x []float64, est *Estimate, data map[string][]float64) {
	t.Helper()
	y, x = fixture.SimulatePlant(rng, n+h)
	data = map[string][]float64{"y": y[:n], "x": x[:n]}
	return y, x, mustFit(t, fixture.PlantModel(), data, nil), data
}
