package tf

import (
	"errors"
	"math/rand/v2"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
)

// Test helpers that build models in code (no parser needed).

// mkTerm returns a term: a named free coefficient (name != "") with start
// value v, or the fixed number v; neg gives the minus sign as written.
func mkTerm(neg bool, name string, v float64, power int) Term {
	c := Coef{Name: name, Value: v, Free: name != ""}
	return Term{Neg: neg, Coef: c, Power: power}
}

// mkFactor returns the factor (terms)^1.
func mkFactor(ts ...Term) Factor { return Factor{Terms: ts, Exp: 1} }

// mkPoly returns the product of the factors.
func mkPoly(fs ...Factor) Poly { return Poly{Factors: fs} }

// oneMinus returns (1 - name B^k).
func oneMinus(name string, k int) Poly {
	return mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, name, 0, k)))
}

// diff1 is (1 - B).
var diff1 = mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, "", 1, 1)))

// fitSim simulates u = num/den B^b x plus theta/phi a with zero
// pre-sample values after a burn-in of the noise; returns output and
// input(s). x is white or AR(1) Gaussian.
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

func simAR1(rng *rand.Rand, n int, phi float64) []float64 {
	return simNoise(rng, n, []float64{1, -phi}, []float64{1}, 1)
}

var _ = arma.Noise{}

func newRand(seed uint64) *rand.Rand { return rand.New(rand.NewPCG(seed, seed+1)) }

// tfHasKind reports whether err matches one of the library's kinds of
// error with errors.Is (every error of the package must).
func tfHasKind(err error) bool {
	for _, k := range []error{ErrSample, ErrShort, ErrConstant, ErrLength, ErrName, ErrSetting, ErrModel, ErrConvergence, ErrOverflow, ErrInternal} {
		if errors.Is(err, k) {
			return true
		}
	}
	return false
}
