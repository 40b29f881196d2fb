package tf

import (
	"errors"
	"math/rand/v2"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/filter"
)

// Test helpers that build models in code (no parser needed).

// fitTerm returns a term: a named free coefficient (name != "") with start
// value v, or the fixed number v; neg gives the minus sign as written.
func fitTerm(neg bool, name string, v float64, power int) Term {
	c := Coef{Name: name, Value: v, Free: name != ""}
	return Term{Neg: neg, Coef: c, Power: power}
}

// fitFac returns the factor (terms)^1.
func fitFac(ts ...Term) Factor { return Factor{Terms: ts, Exp: 1} }

// fitP returns the product of the factors.
func fitP(fs ...Factor) Poly { return Poly{Factors: fs} }

// fitOneMinus returns (1 - name B^k).
func fitOneMinus(name string, k int) Poly {
	return fitP(fitFac(fitTerm(false, "", 1, 0), fitTerm(true, name, 0, k)))
}

// fitDiff1 is (1 - B).
var fitDiff1 = fitP(fitFac(fitTerm(false, "", 1, 0), fitTerm(true, "", 1, 1)))

// fitSim simulates u = num/den B^b x plus theta/phi a with zero
// pre-sample values after a burn-in of the noise; returns output and
// input(s). x is white or AR(1) Gaussian.
func fitSimNoise(rng *rand.Rand, n int, ar, ma []float64, sd float64) []float64 {
	burn := 500
	e := make([]float64, n+burn)
	for i := range e {
		e[i] = sd * rng.NormFloat64()
	}
	out := make([]float64, n+burn)
	filter.Run(out, ma, ar, e)
	return out[burn:]
}

func fitSimAR1(rng *rand.Rand, n int, phi float64) []float64 {
	return fitSimNoise(rng, n, []float64{1, -phi}, []float64{1}, 1)
}

var _ = arma.Noise{}

func fitRand(seed uint64) *rand.Rand { return rand.New(rand.NewPCG(seed, seed+1)) }

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
