package identify

import (
	"math/rand/v2"
	"path/filepath"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
)

// Fixtures shared by the tests of package identify: models built in code
// (the parser imports tf), the simulated records they are fitted to (the
// same as package fit's tests), and the records of the scipy reference
// cases in testdata/fit.

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

// benchData simulates benchModel with c = 1, omega = (1.2, 0.6,
// -0.3), d1 = 0.7, phi = (0.9, -0.2), sigma = 0.5 and an AR(1) input.
func benchData(n int, seed uint64) map[string][]float64 {
	rng := rand.New(rand.NewPCG(seed, 7))
	x := simAR1(rng, n, 0.6)
	u := make([]float64, n)
	filter.Run(u[3:], []float64{1.2, 0.6, -0.3}, []float64{1, -0.7}, x[:n-3])
	e := simNoise(rng, n, []float64{1, -0.9, 0.2}, []float64{1}, 0.5)
	y := make([]float64, n)
	for i := range y {
		y[i] = 1 + u[i] + e[i]
	}
	return map[string][]float64{"y": y, "x": x}
}

// scipyRecord returns the record of the case of testdata/fit/ref_fit.json
// with the given name (its CSV file without the time column), failing
// the test when there is none.
func scipyRecord(t testing.TB, name string) map[string][]float64 {
	t.Helper()
	var cs []struct {
		Name string `json:"name"`
		File string `json:"file"`
	}
	testutil.ReadJSON(t, "testdata/fit/ref_fit.json", &cs)
	for _, c := range cs {
		if c.Name == name {
			d := testutil.ReadCSV(t, filepath.Join("testdata", "fit", c.File)).Num
			delete(d, "t")
			return d
		}
	}
	t.Fatalf("testdata/fit/ref_fit.json has no case %q", name)
	return nil
}
