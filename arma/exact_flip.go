package arma

import (
	"context"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/kalman"
	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/sym"
)

// The exact-likelihood search of an invertible start may cross the MA
// invertibility boundary: the filter computes the same likelihood on
// either side (sigma^2 concentrated out), and the point is mapped back
// by inverting the roots outside after the search and after the final
// Newton steps (see internal/kalman's boundary.go). A search that
// refused to cross stalled at the boundary with the other coefficients
// left unoptimised.

// newMAFlip returns the root inversion of e's MA part, one map per
// factor with free coefficients, nil when a factor cannot be rewritten
// in its own coefficients (see poly.NewFactorMap: a held coefficient, a
// name used elsewhere in the model, a sparse factor with several free
// terms). A factor with one free term c B^s (a seasonal MA) keeps its
// form.
func newMAFlip(e *engine) []poly.FactorMap {
	uses := map[int]int{}
	for _, r := range e.refs {
		uses[r.k]++
	}
	var fs []poly.FactorMap
	for _, f := range e.ma.Factors {
		fm, free, ok := poly.NewFactorMap(termRefs(f.Terms, e.place), func(k int) int { return uses[k] })
		if !ok {
			return nil
		}
		if free {
			fs = append(fs, fm)
		}
	}
	return fs
}

// termRefs describes terms for poly.NewFactorMap, index giving a
// coefficient's place in the parameter vector (< 0: fixed).
func termRefs(terms []sym.Term, index func(c sym.Coef) int) []poly.TermRef {
	ts := make([]poly.TermRef, len(terms))
	for i, t := range terms {
		sign := 1.0
		if t.Neg {
			sign = -1
		}
		ts[i] = poly.TermRef{Power: t.Power, Index: index(t.Coef), Sign: sign, Value: t.Coef.Value}
	}
	return ts
}

// place is the index in x of a free named coefficient, -1 for others.
func (e *engine) place(c sym.Coef) int {
	if k, ok := e.index[c.Name]; ok && c.Free && c.Name != "" && k >= 0 && k < e.narma {
		return k
	}
	return -1
}

// invertMA inverts the non-invertible MA roots of x in place (nil when
// the fit may not cross) and reports whether x moved; e is left set at x.
func (p *mlProblem) invertMA() func(x []float64) bool {
	if p.flip == nil {
		return nil
	}
	return func(x []float64) bool {
		changed, err := poly.InvertFactors(p.flip, x)
		p.e.set(x)
		return err == nil && changed
	}
}

// search runs the least-squares search of prob from x0. A fit that may
// cross the MA boundary (p.flip) maps the search's end back into the
// invertible region (the point has the same likelihood there, and its
// Gauss-Newton information is recomputed), and its search stops after
// kalman.BoundaryIter iterations when an MA root is then within
// kalman.BoundaryTol of the unit circle (atBoundary: finished by Newton
// steps, see kalman.FinishCrossing); otherwise it continues with the
// rest of FitSettings.MaxIter.
func (p *mlProblem) search(ctx context.Context, prob lm.Problem, x0 []float64, set lm.Settings) (lm.Result, bool, error) {
	invert := p.invertMA()
	if invert == nil {
		lres, err := lm.Minimize(ctx, prob, x0, &set)
		return lres, false, err
	}
	return lm.MinimizeCrossing(ctx, prob, x0, &set, lm.Crossing{
		Invert:      invert,
		Information: func(x []float64) *mat.SymDense { return kalman.GaussNewtonInverse(prob.Eval, x, prob.M) },
		AtBoundary: func([]float64) bool {
			bad, err := outside(p.e.ma.Coeffs(), kalman.BoundaryTol) // e is at the point (invertMA sets it)
			return err == nil && len(bad) > 0
		},
		FirstIter: kalman.BoundaryIter,
	})
}

// finish is kalman.FinishCrossing from the search's end lres: the
// Hessian's stencil may cross the MA boundary, and a search stopped at
// the boundary that passes the Newton-decrement test is reported as
// converged (lm.SmallGradient: the gradient vanished in Newton's
// metric).
func (p *mlProblem) finish(ctx context.Context, lres *lm.Result, atBoundary bool) ([]float64, *mat.SymDense, error) {
	end := kalman.SearchEnd{X: lres.X, Converged: lres.Reason.Converged(), JTJInv: lres.JTJInv, SSQ: lres.SSQ, N: len(lres.Resid)}
	x, hess, converged, err := kalman.FinishCrossing(ctx, p.negLogLik, func(on bool) { p.anyMA = on }, end, p.invertMA(), atBoundary)
	if atBoundary && converged {
		lres.Reason = lm.SmallGradient
	}
	return x, hess, err
}

// flagNearMA adds the MA part to res.Boundary when a z-plane root of
// res.MA is within kalman.BoundaryTol of the unit circle and it is not
// flagged already.
func (res *Result) flagNearMA() {
	for _, b := range res.Boundary {
		if b.Part == "MA" {
			return
		}
	}
	if bad, err := outside(res.MA, kalman.BoundaryTol); err == nil && len(bad) > 0 {
		res.Boundary = append(res.Boundary, Boundary{Part: "MA", Roots: bad})
	}
}
