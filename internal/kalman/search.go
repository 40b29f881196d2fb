package kalman

import (
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
