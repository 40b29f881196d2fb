package kalman

import (
	"context"
	"errors"

	"gonum.org/v1/gonum/mat"
)

// The exact Gaussian likelihood of an MA part is the same for theta(B)
// and for the polynomial with its non-invertible roots inverted, the
// innovation variance rescaled (Brockwell & Davis 1991, sections 4.4 and
// 8.7; poly.InvertInside), and sigma^2 is concentrated out. So an
// exact-likelihood search (arma, tf/fit) may cross the MA invertibility
// boundary freely and map its point back by inverting the roots outside
// (poly.InvertFactors), as R's arima does with its final maInvert. The
// helpers here serve the end of such a search.

// BoundaryIter bounds the first least-squares search of a fit that may
// cross the MA boundary. At an MA root on the unit circle each scaled
// innovation is an even function of the root's log-modulus, so its
// derivative in that direction vanishes: J'J turns singular, the
// Gauss-Newton model fails and Levenberg-Marquardt creeps with
// reductions at the rounding floor until its iteration limit. A search
// still running after BoundaryIter iterations with an MA root within
// BoundaryTol of the circle is finished by Newton steps on the
// likelihood instead (FinishCrossing); one that is not near the circle
// continues with the rest of its iterations. Ordinary fits take far
// fewer (arma's benchmark ARMA(2,1) 3, R's lh with gaps 58).
const BoundaryIter = 100

// BoundaryTol is how close to the unit circle (1 - |z| for a z-plane
// root) an MA root of an exact-likelihood estimate counts as on the
// invertibility boundary, in the search (BoundaryIter) and in the
// reports. The likelihood is symmetric about the circle under root
// inversion, so a maximum on the circle is approached only as closely
// as the search's tolerances allow: on the fits of R's checks (arma's
// lh with gaps, MA(1) series near theta = -1) the searches end 1e-8 to
// 1e-7 inside; 1e-3 leaves a margin for longer records and coarser
// tolerances, and a root that close gives pi weights that decay too
// slowly for the difference to matter.
const BoundaryTol = 1e-3

// DecrementTol is the convergence test of a search finished by Newton
// steps at the MA boundary: half the Newton decrement g'H^-1 g (the
// increase of the log-likelihood that the local quadratic model still
// promises; Boyd & Vandenberghe 2004, section 9.5.1) must be below it.
// 1e-9 is far below the 1e-6 to which log-likelihoods are checked
// against R and far above the rounding of a central-difference gradient
// (relative noise about 1e-13 of a log-likelihood of order n over steps
// of about 1e-5, squared and divided by curvatures of order n).
const DecrementTol = 1e-9

// GaussNewtonInverse returns (J'J)^-1 for the Jacobian J at x of the
// residuals of eval (an internal/lm Eval with m residuals), nil when
// eval fails or J'J is not positive definite: the Gauss-Newton
// information of a point that a search did not end at (its point mapped
// back across the MA boundary). x is not modified.
func GaussNewtonInverse(eval func(x, r []float64, jac [][]float64) error, x []float64, m int) *mat.SymDense {
	n := len(x)
	r := make([]float64, m)
	jac := make([][]float64, n)
	for k := range jac {
		jac[k] = make([]float64, m)
	}
	if eval(append([]float64(nil), x...), r, jac) != nil {
		return nil
	}
	jtj := mat.NewSymDense(n, nil)
	for i := range jac {
		for j := 0; j <= i; j++ {
			d := 0.0
			for t, v := range jac[i] {
				d += v * jac[j][t]
			}
			jtj.SetSym(i, j, d)
		}
	}
	var c mat.Cholesky
	if !c.Factorize(jtj) {
		return nil
	}
	inv := mat.NewSymDense(n, nil)
	if c.InverseTo(inv) != nil {
		return nil
	}
	return inv
}

// FinishCrossing is Polish for a search that may cross the MA boundary:
// invert (nil: none) inverts the non-invertible MA roots of a point in
// place and reports whether it moved it. When the Newton steps end
// outside the invertible region, the point is mapped back and the
// observed information recomputed there. A search stopped near the
// boundary (atBoundary; see BoundaryIter) gets the Newton steps of a
// converged one, and converged reports whether half the Newton
// decrement at its end is below DecrementTol (the observed information
// is then that of the end); for other searches converged is s.Converged.
// The error is ctx's, as Polish's.
func FinishCrossing(ctx context.Context, f func(x []float64) float64, widen func(bool), s SearchEnd, invert func(x []float64) bool, atBoundary bool) (x []float64, hess *mat.SymDense, converged bool, err error) {
	converged = s.Converged
	s.Converged = s.Converged || atBoundary
	x, hess, err = Polish(ctx, f, widen, s)
	if err != nil || invert == nil {
		return x, hess, converged, err
	}
	if !invert(x) && !atBoundary {
		return x, hess, converged, nil
	}
	if widen != nil {
		widen(true)
	}
	_, g, H, err := Information(ctx, f, x, nil, 0, 0)
	if widen != nil {
		widen(false)
	}
	if err != nil {
		if errors.Is(err, ErrNotFinite) {
			return x, nil, converged, nil
		}
		return x, nil, converged, err
	}
	if atBoundary {
		dec, ok := Decrement(H, g)
		converged = ok && dec/2 < DecrementTol
	}
	return x, H, converged, nil
}
