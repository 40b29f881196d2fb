package kalman

import (
	"context"
	"errors"
	"math"
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
