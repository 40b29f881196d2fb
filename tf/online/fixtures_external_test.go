package online_test

import (
	"context"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
	"github.com/backshift/backshift/tf/online"
)

// eightSpec is the model of the convergence, tracking and speed checks:
// two inputs with dead times 2 and 1, first-order denominators, a
// two-term numerator, a constant and ARMA(1,1) noise: 8 free
// coefficients.
const eightSpec = "y = c + (w0 + w1 B) / (1 - d1 B) B^2 x1 + w2 / (1 - d2 B) B x2 + (1 + t1 B) / (1 - p1 B) a" +
	"; where c ~ 1, w0 ~ 0.5, w1 ~ 0.3, d1 ~ 0.7, w2 ~ -0.8, d2 ~ 0.5, t1 ~ 0.4, p1 ~ 0.6"

// telegraph returns n samples of a random two-level signal (levels lo
// and hi) that switches with probability 0.1 a sample: a persistently
// exciting plant-test input.
func telegraph(r *rand.Rand, n int, lo, hi float64) []float64 {
	x := make([]float64, n)
	v := lo
	for t := range x {
		if r.Float64() < 0.1 {
			if v == lo {
				v = hi
			} else {
				v = lo
			}
		}
		x[t] = v
	}
	return x
}

// record simulates m (held at its values) over n samples of two
// telegraph inputs x1, x2 with innovations of standard deviation sigma,
// seeded.
func record(t testing.TB, m tf.Model, n int, sigma float64, seed uint64) map[string][]float64 {
	t.Helper()
	r := rand.New(rand.NewPCG(seed, 7))
	data := map[string][]float64{"x1": telegraph(r, n, 0, 2), "x2": telegraph(r, n, -1, 1)}
	y, err := m.Simulate(data, &tf.SimSettings{Sigma: sigma, Seed1: seed, Seed2: 11})
	if err != nil {
		t.Fatal(err)
	}
	data[m.Output] = y
	return data
}

// batchFit is the one place where this package's tests call the batch
// estimation API (fit.Model): it returns the fitted model and its
// parameters.
func batchFit(t testing.TB, m tf.Model, data map[string][]float64) (tf.Model, []fit.Param) {
	t.Helper()
	fm, ps, err := fitParams(context.Background(), m, data)
	if err != nil {
		t.Fatal(err)
	}
	return fm, ps
}

// fitParams is the call of the batch fit itself (tf.Fit, to become
// fit.Model): the fitted model and its parameters.
func fitParams(ctx context.Context, m tf.Model, data map[string][]float64) (tf.Model, []fit.Param, error) {
	est, err := fit.Model(ctx, m, data, nil)
	if err != nil {
		return tf.Model{}, nil, err
	}
	return est.Model, est.Params, nil
}

// refitByFit is the batch fit in the shape of online.RefitFunc.
func refitByFit(ctx context.Context, m tf.Model, window map[string][]float64) (tf.Model, error) {
	fm, _, err := fitParams(ctx, m, window)
	return fm, err
}

// perturbed returns a copy of m with every named coefficient moved:
// numerators of the first input scaled by 0.7, the denominator of the
// second by 0.5, the noise AR coefficients set to 0.
func perturbed(m tf.Model) tf.Model {
	s := m.Clone()
	named := func(f func(c *tf.Coef)) func(c *tf.Coef) {
		return func(c *tf.Coef) {
			if c.Name != "" {
				f(c)
			}
		}
	}
	s.Inputs[0].Num.Each(named(func(c *tf.Coef) { c.Value *= 0.7 }))
	s.Inputs[1].Den.Each(named(func(c *tf.Coef) { c.Value *= 0.5 }))
	s.Noise.AR.Each(named(func(c *tf.Coef) { c.Value = 0 }))
	return s
}

// spliced returns the record of m up to sample at and of m2 from there
// on, both driven by the same inputs and innovations: a plant whose
// coefficients change at sample at.
func spliced(t testing.TB, m, m2 tf.Model, n, at int, sigma float64, seed uint64) map[string][]float64 {
	t.Helper()
	a := record(t, m, n, sigma, seed)
	b := record(t, m2, n, sigma, seed)
	copy(a[m.Output][at:], b[m.Output][at:])
	return a
}

// testutilWords checks that err's message holds every word.
func testutilWords(t *testing.T, err error, words ...string) {
	t.Helper()
	testutil.CheckWords(t, t.Name(), err.Error(), words, nil)
}

// mustEstimator returns online.New(m, s), failing the test on an error.
func mustEstimator(t testing.TB, m tf.Model, s *online.Settings) *online.Estimator {
	t.Helper()
	e, err := online.New(m, s)
	if err != nil {
		t.Fatal(err)
	}
	return e
}

// feedRecord passes samples lo to hi (exclusive) of the record to take,
// the inputs in the order names and the output series y, failing the
// test on an error: the loop of feed and addAll.
func feedRecord(t testing.TB, take func(x []float64, y float64) error, names []string, data map[string][]float64, y string, lo, hi int) {
	t.Helper()
	x := make([]float64, len(names))
	for i := lo; i < hi; i++ {
		for j, nm := range names {
			x[j] = data[nm][i]
		}
		if err := take(x, data[y][i]); err != nil {
			t.Fatalf("sample %d: %v", i, err)
		}
	}
}

// feed runs the record through e from sample lo to hi (exclusive),
// failing the test on an error.
func feed(t testing.TB, e *online.Estimator, data map[string][]float64, y string, lo, hi int) {
	t.Helper()
	feedRecord(t, e.Update, e.Inputs(), data, y, lo, hi)
}

// addAll feeds the record to r, failing the test on an error.
func addAll(t testing.TB, r *online.Refitter, data map[string][]float64, y string, lo, hi int) {
	t.Helper()
	feedRecord(t, r.Add, r.Inputs(), data, y, lo, hi)
}
