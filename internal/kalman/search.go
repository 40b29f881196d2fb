package kalman

import (
	"context"
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"
)

// ForwardJacobian fills jac[k] (one column per parameter, len(r) values
// each) with the forward-difference derivatives at x of the residual
// function residuals, whose residuals at x are r: steps h_k = 2^-26
// max(|x_k|, 1), about sqrt(eps) relative, so an O(h) error (a search
// ends with Newton steps on a central-difference Hessian that remove
// it). When the forward point is not admissible (residuals returns an
// error) the step is taken backwards; the error of the backward point
// is returned. x and r are not modified.
func ForwardJacobian(residuals func(x, r []float64) error, x, r []float64, jac [][]float64) error {
	xt := append([]float64(nil), x...)
	for k := range x {
		h := 0x1p-26 * math.Max(math.Abs(x[k]), 1)
		xt[k] = x[k] + h
		if err := residuals(xt, jac[k]); err != nil {
			h = -h // the forward point is not admissible: step back
			xt[k] = x[k] + h
			if err := residuals(xt, jac[k]); err != nil {
				return err
			}
		}
		xt[k] = x[k]
		for i := range r {
			jac[k][i] = (jac[k][i] - r[i]) / h
		}
	}
	return nil
}

// NewtonStep returns x - H^-1 g and the largest relative change of a
// component, |dx_k| / (|x_k| + 1e-10); ok is false when H is not
// positive definite (Cholesky fails) or the solve fails. x, H and g are
// not modified.
func NewtonStep(x []float64, H *mat.SymDense, g []float64) (trial []float64, step float64, ok bool) {
	var c mat.Cholesky
	if !c.Factorize(H) {
		return nil, 0, false
	}
	var dx mat.VecDense
	if c.SolveVecTo(&dx, mat.NewVecDense(len(g), append([]float64(nil), g...))) != nil {
		return nil, 0, false
	}
	trial = make([]float64, len(x))
	for k := range x {
		d := -dx.AtVec(k)
		trial[k] = x[k] + d
		step = math.Max(step, math.Abs(d)/(math.Abs(x[k])+1e-10))
	}
	return trial, step, true
}

// JacobianEval returns the Eval of a least-squares search (internal/lm)
// on the residuals of residuals: the residuals at x into r and, when
// jac is not nil, their Jacobian by ForwardJacobian (the Newton steps of
// Polish remove the O(step) error this leaves in the optimum).
func JacobianEval(residuals func(x, r []float64) error) func(x, r []float64, jac [][]float64) error {
	return func(x, r []float64, jac [][]float64) error {
		if err := residuals(x, r); err != nil {
			return err
		}
		if jac == nil {
			return nil
		}
		return ForwardJacobian(residuals, x, r, jac)
	}
}

// SearchEnd is what Polish needs of the least-squares search that
// precedes it: its point X, whether it converged, and its Gauss-Newton
// information (JTJInv = (J'J)^-1 and SSQ = S of its N scaled
// innovations; see Information).
type SearchEnd struct {
	X         []float64
	Converged bool
	JTJInv    *mat.SymDense
	SSQ       float64
	N         int
}

// Polish takes up to three Newton steps on minus a log-likelihood f
// from the search's point s.X with the Hessian of Information, each kept only
// when f does not rise, after a converged search only; it stops early
// once a step is below 1e-4 (the curvature at the new point differs
// from the last by about the step, so the standard errors do not
// change to that order). It returns the point and the Hessian at the
// last point where it was computed (nil when it could not be), the
// observed information; the error is ctx's when ctx is done during a
// Hessian (the point is then the last one kept, the Hessian nil).
// widen (may be nil) is called with true before each Hessian and false
// after it, so that f may accept points of the stencil that the steps
// may not reach (arma and tf/fit let the stencil cross the MA
// invertibility boundary).
func Polish(ctx context.Context, f func(x []float64) float64, widen func(bool), s SearchEnd) ([]float64, *mat.SymDense, error) {
	x := append([]float64(nil), s.X...)
	if len(x) == 0 {
		return x, nil, nil
	}
	var hess *mat.SymDense
	for it := 0; it < 3; it++ {
		if widen != nil {
			widen(true)
		}
		f0, g, H, err := Information(ctx, f, x, s.JTJInv, s.SSQ, s.N)
		if widen != nil {
			widen(false)
		}
		if err != nil {
			if !errors.Is(err, ErrNotFinite) {
				return x, nil, err // ctx is done
			}
			break
		}
		hess = H
		if !s.Converged {
			break
		}
		trial, step, ok := NewtonStep(x, H, g)
		if !ok || !(f(trial) <= f0) {
			break
		}
		x = trial
		if step < 1e-4 {
			break
		}
	}
	return x, hess, nil
}

// Decrement returns the Newton decrement g'H^-1 g at a point with
// gradient g and Hessian H of a function to minimise: twice the decrease
// that the local quadratic model still promises (Boyd & Vandenberghe
// 2004, section 9.5.1), a convergence test that does not depend on the
// parameters' units. ok is false when H is not positive definite. H and
// g are not modified.
func Decrement(H *mat.SymDense, g []float64) (dec float64, ok bool) {
	var c mat.Cholesky
	if !c.Factorize(H) {
		return 0, false
	}
	var dx mat.VecDense
	gv := mat.NewVecDense(len(g), append([]float64(nil), g...))
	if c.SolveVecTo(&dx, gv) != nil {
		return 0, false
	}
	return mat.Dot(gv, &dx), true
}
