package fit

import (
	"context"
	"errors"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/tf"
)

// Fixtures shared by the tests of package fit: models built in code (the
// parser imports tf, so these tests cannot use it) and the simulated
// records they are fitted to.

// mkTerm returns a term: a named free coefficient (name != "") with start
// value v, or the fixed number v; neg gives the minus sign as written.
func mkTerm(neg bool, name string, v float64, power int) tf.Term {
	c := tf.Coef{Name: name, Value: v, Free: name != ""}
	return tf.Term{Neg: neg, Coef: c, Power: power}
}

// mkFactor returns the factor (terms)^1.
func mkFactor(ts ...tf.Term) tf.Factor { return tf.Factor{Terms: ts, Exp: 1} }

// mkPoly returns the product of the factors.
func mkPoly(fs ...tf.Factor) tf.Poly { return tf.Poly{Factors: fs} }

// oneMinus returns (1 - name B^k).
func oneMinus(name string, k int) tf.Poly {
	return mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, name, 0, k)))
}

// diff1 is (1 - B).
var diff1 = mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, "", 1, 1)))

// simNoise returns n samples of the ARMA noise ma/ar driven by Gaussian
// innovations of standard deviation sd, after a burn-in of 500 samples
// from rest so that the samples returned are close to stationary.
func simNoise(rng *rand.Rand, n int, ar, ma []float64, sd float64) []float64 {
	burn := 500
	e := make([]float64, n+burn)
	for i := range e {
		e[i] = sd * rng.NormFloat64()
	}
	out := make([]float64, n+burn)
	filter.Run(out, ma, ar, e)
	return out[burn:]
}

// simAR1 returns n samples of the AR(1) process with coefficient phi and
// unit innovations.
func simAR1(rng *rand.Rand, n int, phi float64) []float64 {
	return simNoise(rng, n, []float64{1, -phi}, []float64{1}, 1)
}

// newRand returns a PCG source seeded with (seed, seed+1).
func newRand(seed uint64) *rand.Rand { return rand.New(rand.NewPCG(seed, seed+1)) }

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

// plantModel is the Monte Carlo model of our own: b = 3, s = 1, r = 1 and
// AR(1) noise with a constant,
//
//	y_t = c + (w0 - w1 B)/(1 - d1 B) B^3 x_t + 1/(1 - p1 B) a_t,
//
// truth c = 2, w0 = 1.5, w1 = -0.8, d1 = 0.6, p1 = 0.5, sigma = 1, with
// x an AR(1) input (phi 0.5, unit innovations). The numerator zero
// (z = -0.53) is far from the pole (0.6): a nearly cancelling pair would
// make the surface strongly non-quadratic and the SEs unreliable at n = 400.
func plantModel() tf.Model {
	c := tf.Coef{Name: "c", Free: true}
	num := mkPoly(mkFactor(mkTerm(false, "w0", 0, 0), mkTerm(true, "w1", 0, 1)))
	return tf.Model{Output: "y", Const: &c,
		Inputs: []tf.Input{{Series: "x", Num: num, Den: oneMinus("d1", 1), Delay: 3}},
		Noise:  &arma.Noise{AR: oneMinus("p1", 1)}}
}

var plantTruth = map[string]float64{"c": 2, "w0": 1.5, "w1": -0.8, "d1": 0.6, "p1": 0.5}

// simulatePlant simulates n samples of plantModel with long burn-ins, so that
// the series are draws from the stationary process.
func simulatePlant(rng *rand.Rand, n int) (y, x []float64) {
	burn := 200
	m := n + burn
	xa := simAR1(rng, m, 0.5)
	u := make([]float64, m)
	filter.Run(u[3:], []float64{1.5, 0.8}, []float64{1, -0.6}, xa[:m-3])
	e := simAR1(rng, m, 0.5)
	ya := make([]float64, m)
	for i := range ya {
		ya[i] = 2 + u[i] + e[i]
	}
	return ya[burn:], xa[burn:]
}

// replicatePlant simulates n + h samples of plantModel and fits the
// model to the first n, failing the test on error. It returns the whole
// simulated series (the last h samples are the future), the estimate and
// the fitted data.
func replicatePlant(t *testing.T, rng *rand.Rand, n, h int) (y, x []float64, est *Estimate, data map[string][]float64) {
	t.Helper()
	y, x = simulatePlant(rng, n+h)
	data = map[string][]float64{"y": y[:n], "x": x[:n]}
	est, err := Model(context.Background(), plantModel(), data, nil)
	if err != nil {
		t.Fatal(err)
	}
	return y, x, est, data
}
