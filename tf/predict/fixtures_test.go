package predict_test

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
	"github.com/backshift/backshift/tf/predict"
)

// Fixtures shared by the tests: models from spec text, simulated records
// and the fits the predictor is checked against.

// benchSpec is the model of the speed target: two inputs with (2, 2)
// terms (two numerator and two denominator coefficients) and ARMA(1, 1)
// noise, every coefficient fixed.
const benchSpec = "y = 1.5 + (0.8 + 0.3 B) / (1 - 1.2 B + 0.4 B^2) B^2 u1 + (-0.5 + 0.2 B) / (1 - 0.5 B - 0.2 B^2) B u2 + (1 + 0.4 B) / (1 - 0.6 B) a"

// fitCase is a model of the checks against the fit: the spec with free
// coefficients, the true values to simulate with, and the fit's
// settings.
type fitCase struct {
	name string
	spec string // free coefficients
	true string // the simulated model
	fit  fit.Settings
}

// cases are the models of the checks against the fit: the spec with
// free coefficients (start values near the truth), the true values to
// simulate with, and the fit's settings.
var cases = []fitCase{
	{"two inputs ARMA(1,1)",
		"y = c + (w0 + w1 B) / (1 - d1 B - d2 B^2) B^2 u1 + (v0 + v1 B) / (1 - e1 B - e2 B^2) B u2 + (1 + t1 B) / (1 - p1 B) a" +
			" where c ~ 1.4, w0 ~ 0.7, w1 ~ 0.2, d1 ~ 1.1, d2 ~ -0.3, v0 ~ -0.4, v1 ~ 0.1, e1 ~ 0.4, e2 ~ 0.1, t1 ~ 0.3, p1 ~ 0.5",
		benchSpec, fit.Settings{}},
	{"ARIMA(1,1,1) with a differenced input",
		"(1 - B) y = w0 / (1 - d1 B) B ((1 - B) u1) + (1 - t1 B) / (1 - p1 B) a where w0 ~ 1.5, d1 ~ 0.6, t1 ~ 0.2, p1 ~ 0.4",
		"(1 - B) y = 2 / (1 - 0.7 B) B ((1 - B) u1) + (1 - 0.3 B) / (1 - 0.5 B) a", fit.Settings{}},
	{"AR(2) noise, first index moved",
		"y = c + w0 / (1 - d1 B) B^3 u1 + 1 / (1 - p1 B - p2 B^2) a where c ~ 4, w0 ~ 0.4, d1 ~ 0.7, p1 ~ 0.5, p2 ~ 0.1",
		"y = 5 + 0.5 / (1 - 0.8 B) B^3 u1 + 1 / (1 - 0.6 B - 0.2 B^2) a", fit.Settings{First: 40}},
	{"MA(2) noise, inputs from zero",
		"y = w0 u1 + (w0b + w1b B) B u2 + (1 + t1 B + t2 B^2) a where w0 ~ 1, w0b ~ 0.5, w1b ~ 0.2, t1 ~ 0.3, t2 ~ 0.1",
		"y = 1.2 u1 + (0.6 + 0.3 B) B u2 + (1 + 0.5 B + 0.2 B^2) a", fit.Settings{ZeroPreSample: true}},
}

// record simulates n samples of the model spec with unit-variance
// Gaussian innovations (seeded) and inputs of our own: u1 steps between
// random levels around 50 held for 5 to 24 samples, u2 an AR(1) series
// about 10.
func record(t testing.TB, spec string, n int, seed uint64) map[string][]float64 {
	t.Helper()
	m := fixture.MustModel(t, spec)
	rng := rand.New(rand.NewPCG(seed, seed+1))
	u1 := make([]float64, n)
	u2 := make([]float64, n)
	level, left, ar := 50.0, 0, 0.0
	for i := range u1 {
		if left == 0 {
			level = 50 + 10*rng.NormFloat64()
			left = 5 + rng.IntN(20)
		}
		left--
		u1[i] = level
		ar = 0.8*ar + rng.NormFloat64()
		u2[i] = 10 + ar
	}
	data := map[string][]float64{}
	ins := map[string][]float64{}
	for _, in := range m.Inputs {
		switch in.Series {
		case "u1":
			ins["u1"], data["u1"] = u1, u1
		case "u2":
			ins["u2"], data["u2"] = u2, u2
		}
	}
	y, err := m.Simulate(ins, &tf.SimSettings{Sigma: 1, Seed1: seed, Seed2: seed + 7})
	if err != nil {
		t.Fatal(err)
	}
	data["y"] = y
	return data
}

// fitted simulates n samples of the case's true model (seeded, see
// record), fits its spec to them with the estimation API (the one place
// these tests call it) and builds the predictor of the estimate: its
// model with the estimates held, its Sigma2 and the fit's start-up
// (Conditioning).
func (c fitCase) fitted(t testing.TB, n int, seed uint64) (map[string][]float64, *fit.Estimate, *predict.Predictor) {
	t.Helper()
	data := record(t, c.true, n, seed)
	set := c.fit
	e, err := fit.Model(context.Background(), fixture.MustModel(t, c.spec), data, &set)
	if err != nil {
		t.Fatal(err)
	}
	if !e.Converged {
		t.Fatalf("fit of %q did not converge: %s", c.spec, e.Reason)
	}
	p := mustPredictor(t, e.Held(), e.Sigma2, &predict.Settings{First: e.Conditioning.First, ZeroPreSample: e.Conditioning.ZeroPreSample})
	return data, e, p
}

// mustPredictor returns predict.New(m, sigma2, s), failing the test on
// an error.
func mustPredictor(t testing.TB, m tf.Model, sigma2 float64, s *predict.Settings) *predict.Predictor {
	t.Helper()
	p, err := predict.New(m, sigma2, s)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// warm warms p on the first n samples of data, failing the test on an
// error.
func warm(t testing.TB, p *predict.Predictor, data map[string][]float64, n int) {
	t.Helper()
	if err := p.Warm(window(data, n)); err != nil {
		t.Fatal(err)
	}
}

// window returns the first n samples of every series of data.
func window(data map[string][]float64, n int) map[string][]float64 {
	out := map[string][]float64{}
	for k, v := range data {
		out[k] = v[:n]
	}
	return out
}

// row returns the inputs of p at sample t of data, in p's order.
func row(p *predict.Predictor, data map[string][]float64, t int) []float64 {
	names := p.Inputs()
	x := make([]float64, len(names))
	for i, name := range names {
		x[i] = data[name][t]
	}
	return x
}

// nan is a missing sample.
var nan = math.NaN()

// near reports whether got is within tol of want relative to scale.
func near(got, want, tol, scale float64) bool {
	return math.Abs(got-want) <= tol*scale
}

// rms returns the root mean square of the finite values of x.
func rms(x []float64) float64 {
	s, n := 0.0, 0
	for _, v := range x {
		if !math.IsNaN(v) {
			s += v * v
			n++
		}
	}
	return math.Sqrt(s / float64(n))
}

// polyOf returns the polynomial c_0 + c_1 B + ... as one factor of
// fixed numbers, for models the spec language does not write (no
// input).
func polyOf(c ...float64) tf.Poly {
	f := tf.Factor{Exp: 1}
	for k, v := range c {
		f.Terms = append(f.Terms, tf.Term{Neg: v < 0, Coef: tf.Coef{Value: math.Abs(v)}, Power: k})
	}
	return tf.Poly{Factors: []tf.Factor{f}}
}

// TestMaxMagnitudeIsFits: a predictor accepts exactly the samples the
// fit accepts (its own constant, so that predict need not import the
// estimator).
func TestMaxMagnitudeIsFits(t *testing.T) {
	if predict.MaxMagnitude != fit.MaxMagnitude {
		t.Errorf("predict.MaxMagnitude %g, fit.MaxMagnitude %g", predict.MaxMagnitude, fit.MaxMagnitude)
	}
}
