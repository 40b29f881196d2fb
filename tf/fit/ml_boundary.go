package fit

import (
	"context"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/kalman"
	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/poly"
)

// The exact-likelihood search of a model whose noise MA part starts
// invertible may cross the invertibility boundary: the filter computes
// the same likelihood on either side (sigma^2 concentrated out), and the
// point is mapped back by inverting the roots outside after the search
// and after the final Newton steps (see internal/kalman's boundary.go).
// A search that refused to cross stalled at the boundary with the other
// coefficients left unoptimised.

// maFlip returns the root inversion of the noise MA part of w, one map
// per factor with free coefficients, nil when a factor cannot be
// rewritten in its own coefficients (poly.NewFactorMap: a held
// coefficient beside free ones, a name used elsewhere in the model, a
// sparse factor with several free terms).
func (w *work) maFlip() []poly.FactorMap {
	var fs []poly.FactorMap
	for _, f := range w.ma.Factors {
		ts := make([]poly.TermRef, len(f.Terms))
		for i, t := range f.Terms {
			k := -1
			if t.Coef.Name != "" {
				k = w.idx(t.Coef.Name)
			}
			sign := 1.0
			if t.Neg {
				sign = -1
			}
			ts[i] = poly.TermRef{Power: t.Power, Index: k, Sign: sign, Value: t.Coef.Value}
		}
		fm, free, ok := poly.NewFactorMap(ts, func(k int) int { return len(w.coefs[k]) })
		if !ok {
			return nil
		}
		if free {
			fs = append(fs, fm)
		}
	}
	return fs
}

// invertMA inverts the non-invertible MA roots of x in place (nil when
// the fit may not cross) and reports whether x moved.
func (p *mlProblem) invertMA() func(x []float64) bool {
	if p.flip == nil {
		return nil
	}
	return func(x []float64) bool {
		changed, err := poly.InvertFactors(p.flip, x)
		p.w.set(x)
		return err == nil && changed
	}
}

// search runs the least-squares search of prob from x0. A fit that may
// cross the MA boundary (p.flip) maps the search's end back into the
// invertible region (the point has the same likelihood there, and its
// Gauss-Newton information is recomputed), and its search stops after
// kalman.BoundaryIter iterations when an MA zero is then within
// kalman.BoundaryTol of the unit circle (atBoundary: finished by Newton
// steps, see kalman.FinishCrossing); otherwise it continues with the
// rest of the iterations.
func (p *mlProblem) search(ctx context.Context, prob lm.Problem, x0 []float64, set lm.Settings) (lm.Result, bool, error) {
	invert := p.invertMA()
	if invert == nil {
		lres, err := lm.Minimize(ctx, prob, x0, &set)
		return lres, false, err
	}
	return lm.MinimizeCrossing(ctx, prob, x0, &set, lm.Crossing{
		Invert:      invert,
		Information: func(x []float64) *mat.SymDense { return kalman.GaussNewtonInverse(prob.Eval, x, prob.M) },
		AtBoundary: func(x []float64) bool {
			p.w.set(x)
			return maxZ(p.w.ma.Coeffs()) >= 1-kalman.BoundaryTol
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
