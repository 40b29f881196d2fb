package kalman

import (
	"context"
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"
)

// ErrNotFinite is Curvature's error when f is not finite at a point of
// the stencil.
var ErrNotFinite = errors.New("kalman: the function is not finite at a point of the curvature's stencil")

// CurvatureStep is the relative step of Curvature's central differences
// (2^-13, about eps^(1/4)): h_k = CurvatureStep max(|x_k|, 1). For
// parameters of order one the truncation error is O(h^2), about 1.5e-8
// relative, and rounding adds about eps |f| / h^2, below 1e-7 of the
// curvature of a log-likelihood for records up to 10^7 samples.
const CurvatureStep = 0x1p-13

// Steps returns the relative steps h_k = rel max(|x_k|, 1) of central
// differences for parameters of order one (with rel = CurvatureStep).
func Steps(x []float64, rel float64) []float64 {
	h := make([]float64, len(x))
	for i, v := range x {
		h[i] = rel * math.Max(math.Abs(v), 1)
	}
	return h
}

// ConditionalSteps returns the steps of Curvature's central
// differences for minus an exact log-likelihood at x, from the
// Gauss-Newton information of a least-squares search on its N scaled
// innovations (jtjInv = (J'J)^-1 and ssq = S at the search's end):
// h_k = min(CurvatureStep max(|x_k|, 1), 0.1 s_k), s_k = sqrt(S / (N
// (J'J)_kk)) the conditional standard error of parameter k (the others
// held), since -logL = N/2 log S + const has the Hessian N J'J / S to
// first order. The log-likelihood departs from its quadratic form on
// the scale of the conditional standard error, which for strongly
// correlated parameters (a gain and a slow pole; AR coefficients with
// roots near the unit circle) is far below the marginal one: steps of
// 0.1 s_k keep the truncation error of the second differences near 1e-3
// relative or below, and their rounding error is about eps |logL| /
// 0.01 relative, 2e-14 |logL|. A parameter far below one (the gain of
// an input recorded in large units) gets a step small against its own
// size likewise. Where jtjInv is nil, not positive definite, or ssq or
// n not positive, the steps are those of Steps(x, CurvatureStep).
func ConditionalSteps(x []float64, jtjInv *mat.SymDense, ssq float64, n int) []float64 {
	h := Steps(x, CurvatureStep)
	if jtjInv == nil || n <= 0 || !(ssq > 0) {
		return h
	}
	var c mat.Cholesky
	if !c.Factorize(jtjInv) {
		return h
	}
	jtj := mat.NewSymDense(len(x), nil)
	if c.InverseTo(jtj) != nil {
		return h
	}
	for i := range h {
		if d := jtj.At(i, i); d > 0 && !math.IsInf(d, 0) {
			if s := math.Sqrt(ssq / (float64(n) * d)); s > 0 {
				h[i] = math.Min(h[i], 0.1*s)
			}
		}
	}
	return h
}

// Curvature returns f at x, its central-difference gradient and its
// central-difference Hessian (row-major, len(x)^2) with the steps h
// (one per parameter, positive; Steps gives the usual ones):
//
//	g_i  = (f(+i) - f(-i)) / (2 h_i)
//	H_ii = (f(+i) - 2 f0 + f(-i)) / h_i^2
//	H_ij = (f(+i+j) - f(+i) - f(+j) + 2 f0 - f(-i) - f(-j) + f(-i-j)) / (2 h_i h_j)
//
// (Abramowitz & Stegun 1964, 25.3.23 and 25.3.27; all O(h^2)), in
// 1 + 2k + k(k-1) evaluations for k parameters. It is the observed
// information of an exact-likelihood fit when f is minus the
// log-likelihood. ctx is checked before each evaluation after the first
// (one call of ctx.Err, cheap against an evaluation): when it is done,
// Curvature returns ctx.Err() at once, so that a cancelled fit does not
// wait for the whole stencil. The error is ErrNotFinite when f is not
// finite at a point of the stencil. x and h are not modified; f must
// not keep its argument.
func Curvature(ctx context.Context, f func(x []float64) float64, x, h []float64) (f0 float64, g, H []float64, err error) {
	k := len(x)
	f0 = f(x)
	xt := append([]float64(nil), x...)
	at := func(i int, si float64, j int, sj float64) float64 {
		if err == nil {
			err = ctx.Err()
		}
		if err != nil {
			return math.NaN()
		}
		copy(xt, x)
		xt[i] += si * h[i]
		if j >= 0 {
			xt[j] += sj * h[j]
		}
		return f(xt)
	}
	fp, fm := make([]float64, k), make([]float64, k)
	g = make([]float64, k)
	H = make([]float64, k*k)
	for i := 0; i < k && err == nil; i++ {
		fp[i], fm[i] = at(i, 1, -1, 0), at(i, -1, -1, 0)
		g[i] = (fp[i] - fm[i]) / (2 * h[i])
		H[i*k+i] = (fp[i] - 2*f0 + fm[i]) / (h[i] * h[i])
	}
	for i := 0; i < k && err == nil; i++ {
		for j := i + 1; j < k && err == nil; j++ {
			v := at(i, 1, j, 1) - fp[i] - fp[j] + 2*f0 - fm[i] - fm[j] + at(i, -1, j, -1)
			H[i*k+j] = v / (2 * h[i] * h[j])
			H[j*k+i] = H[i*k+j]
		}
	}
	if err != nil {
		return f0, nil, nil, err
	}
	for _, v := range H {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return f0, g, nil, ErrNotFinite
		}
	}
	if math.IsInf(f0, 0) || math.IsNaN(f0) {
		return f0, g, H, ErrNotFinite
	}
	return f0, g, H, nil
}

// Information returns minus a log-likelihood f0 = f(x) at x, its
// gradient and its Hessian (the observed information when x is the
// maximum), by Curvature's central differences taken along the axes
// that the Gauss-Newton information of a least-squares search on the N
// scaled innovations makes uncorrelated (jtjInv = (J'J)^-1 and ssq = S
// at the search's end; see ConditionalSteps): with C = S/N (J'J)^-1 =
// L L' its inverse to first order, f is differenced as a function of u,
// x + L u, with the steps of whitenedSteps in u (a tenth of a standard
// error along each axis, or less), and the results are carried back, g = L^-T g_u and H =
// L^-T H_u L^-1.
//
// In those coordinates the Hessian is near the identity, so its errors
// of differencing (about 1e-3 relative from truncation, eps |f| / 0.01
// from rounding) stay errors of that size in the covariance H^-1 = L
// H_u^-1 L'. Along the parameters' own axes they do not: for strongly
// correlated parameters (AR coefficients with roots near the unit
// circle, a gain and a slow pole) the inverse cancels the Hessian's
// entries against each other, and an error of 1e-4 in them became 10 %
// in a standard error (an AR(2) with roots 0.99 and 0.9, whose
// conditional standard errors are 1/29 of the marginal ones; see
// arma's TestExactMLSENearUnitCircle).
//
// Where the Gauss-Newton information is missing or not positive
// definite, where it is a poor guide to the curvature (a diagonal entry
// of H_u outside [0.1, 10]: at an estimate stopped on the MA
// invertibility boundary, for one), or where f is not finite at a point
// of the rotated stencil (an axis that reaches past a stationarity
// boundary), the differences are taken along the parameters' own axes with the steps of
// ConditionalSteps. The error is ctx's when ctx is done (see
// Curvature), ErrNotFinite when no stencil could be evaluated.
func Information(ctx context.Context, f func(x []float64) float64, x []float64, jtjInv *mat.SymDense, ssq float64, n int) (f0 float64, g []float64, H *mat.SymDense, err error) {
	k := len(x)
	if L := gnFactor(jtjInv, ssq, n); L != nil {
		xt := make([]float64, k)
		fu := func(u []float64) float64 {
			for i := range xt {
				s := x[i]
				for j := 0; j <= i; j++ {
					s += L.At(i, j) * u[j]
				}
				xt[i] = s
			}
			return f(xt)
		}
		f0, gu, hu, err := Curvature(ctx, fu, make([]float64, k), whitenedSteps(L, x))
		if err == nil && nearIdentity(hu, k) {
			if g, H := backGradient(L, gu), backHessian(L, hu); g != nil && H != nil {
				return f0, g, H, nil
			}
		} else if err != nil && !errors.Is(err, ErrNotFinite) {
			return f0, nil, nil, err
		}
	}
	f0, g, h, err := Curvature(ctx, f, x, ConditionalSteps(x, jtjInv, ssq, n))
	if err != nil {
		return f0, g, nil, err
	}
	return f0, g, mat.NewSymDense(k, h), nil
}

// nearIdentity reports whether the Hessian hu (row-major, k x k) in the
// coordinates whitened by the Gauss-Newton information has every
// diagonal entry in [0.1, 10], as it has (near 1) where that
// information approximates the curvature.
func nearIdentity(hu []float64, k int) bool {
	for i := 0; i < k; i++ {
		if d := hu[i*k+i]; !(d >= 0.1 && d <= 10) {
			return false
		}
	}
	return true
}

// whitenedSteps returns the steps in u of Information: 0.1 (a tenth of
// a standard error), less where that would move a parameter x_i by
// more than the fixed step CurvatureStep max(|x_i|, 1), and at least
// 1e-3 (where rounding, eps |f| / h^2 relative, stays below 2e-10
// |f|). The bound keeps the stencil as close to x as the axis steps
// where the Gauss-Newton covariance is too wide to trust (an estimate on
// the MA invertibility boundary, where the exact likelihood folds over
// onto the mirror image of the MA part).
func whitenedSteps(L *mat.TriDense, x []float64) []float64 {
	fixed := Steps(x, CurvatureStep)
	h := make([]float64, len(x))
	for j := range h {
		h[j] = 0.1
		for i := j; i < len(x); i++ {
			if a := math.Abs(L.At(i, j)); a*h[j] > fixed[i] {
				h[j] = fixed[i] / a
			}
		}
		h[j] = math.Max(h[j], 1e-3)
	}
	return h
}

// gnFactor returns the lower Cholesky factor L of C = ssq/n jtjInv, nil
// when it is not available or not positive definite.
func gnFactor(jtjInv *mat.SymDense, ssq float64, n int) *mat.TriDense {
	if jtjInv == nil || n <= 0 || !(ssq > 0) || math.IsInf(ssq, 0) {
		return nil
	}
	k := jtjInv.SymmetricDim()
	c := mat.NewSymDense(k, nil)
	c.ScaleSym(ssq/float64(n), jtjInv)
	var ch mat.Cholesky
	if !ch.Factorize(c) {
		return nil
	}
	L := mat.NewTriDense(k, mat.Lower, nil)
	ch.LTo(L)
	return L
}

// backGradient returns L^-T gu, the gradient in x of a function
// differenced in u (x = x0 + L u).
func backGradient(L *mat.TriDense, gu []float64) []float64 {
	g := mat.NewVecDense(len(gu), append([]float64(nil), gu...))
	if !conditioned(g.SolveVec(L.T(), g)) {
		return nil
	}
	return g.RawVector().Data
}

// backHessian returns L^-T Hu L^-1 (Hu row-major), symmetrised.
func backHessian(L *mat.TriDense, hu []float64) *mat.SymDense {
	k, _ := L.Dims()
	var a, b mat.Dense
	if !conditioned(a.Solve(L.T(), mat.NewDense(k, k, hu))) { // L^-T Hu
		return nil
	}
	if !conditioned(b.Solve(L.T(), a.T())) { // L^-T (L^-T Hu)' = L^-T Hu L^-1 (Hu symmetric)
		return nil
	}
	H := mat.NewSymDense(k, nil)
	for i := 0; i < k; i++ {
		for j := i; j < k; j++ {
			H.SetSym(i, j, (b.At(i, j)+b.At(j, i))/2)
		}
	}
	return H
}

// conditioned reports whether a triangular solve succeeded: no error,
// or only gonum's warning of a large condition number (mat.Condition),
// which the solve of a factor of a positive definite matrix can give
// without harm to the result's use here.
func conditioned(err error) bool {
	var c mat.Condition
	return err == nil || errors.As(err, &c)
}
