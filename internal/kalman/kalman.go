package kalman

import (
	"math"

	"github.com/backshift/backshift/internal/errs"
)

// Filter holds the state-space form of one ARIMA noise model and the
// scratch space of its passes. Build it with New, change the AR and MA
// coefficients with Set (no allocation when the degrees do not grow).
// A Filter is used by one goroutine at a time; build one per goroutine.
type Filter struct {
	r, dd, m int
	tc       []float64 // first column of the ARMA block of T: -phi_k/phi_0
	rr       []float64 // R, the ARMA block's innovation loading
	z        []float64 // Z, length m
	diff     []float64
	p0       []float64 // stationary covariance of the ARMA block, r x r

	// scratch, m or m x m (row-major)
	a, pz, tmp, tmp2 []float64
	P, X, Y          []float64
	// doubling scratch, r x r
	dA, dS, dT []float64
	std        []float64 // Scaled's innovations, grown on demand
}

// New returns the filter of phi(B) (diff(B) z_t - mu) = theta(B) a_t for
// the polynomials ar = phi, ma = theta and diff in ascending powers of B
// (nil diff is no differencing). The constant terms must be non-zero; they
// need not be 1 (the model is divided by phi_0). New returns a
// *errs.ModelError naming the polynomial for a zero constant term, a
// NaN or infinite coefficient, and an AR polynomial that is not
// stationary.
func New(ar, ma, diff []float64) (*Filter, error) {
	if len(diff) == 0 {
		diff = []float64{1}
	}
	if err := checkPoly("differencing polynomial", diff); err != nil {
		return nil, err
	}
	dd := len(diff) - 1
	for dd > 0 && diff[dd] == 0 {
		dd--
	}
	f := &Filter{dd: dd, diff: append([]float64(nil), diff[:dd+1]...)}
	if err := f.Set(ar, ma); err != nil {
		return nil, err
	}
	return f, nil
}

// Set changes the AR and MA polynomials of f (the differencing stays).
// It allocates only when the state grows. Errors as for New; after an
// error f must be Set again before use.
func (f *Filter) Set(ar, ma []float64) error {
	if err := checkPoly("AR polynomial", ar); err != nil {
		return err
	}
	if err := checkPoly("MA polynomial", ma); err != nil {
		return err
	}
	p, q := trimDeg(ar), trimDeg(ma)
	r := max(p, q+1)
	if r != f.r || f.tc == nil {
		f.alloc(r)
	}
	clear(f.tc)
	clear(f.rr)
	for i := 1; i <= p; i++ {
		f.tc[i-1] = -ar[i] / ar[0]
	}
	for i := 0; i <= q; i++ {
		f.rr[i] = ma[i] / ar[0]
	}
	clear(f.z)
	d0 := f.diff[0]
	f.z[0] = 1 / d0
	for k := 1; k <= f.dd; k++ {
		f.z[r+k-1] = -f.diff[k] / d0
	}
	var buf [128]float64
	if !clearOfUnitCircle(ar[:p+1], buf[:0]) || !f.stationaryCov() {
		return &errs.ModelError{Part: "AR polynomial", Problem: "not stationary (a root in B on, inside or within 1e-8 of the unit circle): the exact likelihood needs a stationary AR part; difference the series instead"}
	}
	return nil
}

// unitMargin is how far inside 1 every reflection coefficient of a
// stationary AR polynomial must stay: closer, the stationary covariance
// grows like 1/(1 - |k|) and the filter's variances lose every digit
// (a pair of roots on the unit circle gave a negative forecast
// variance instead of an error).
const unitMargin = 1e-8

// clearOfUnitCircle reports whether every root in B of the polynomial a
// (a[0] != 0) lies outside the unit circle with every reflection
// coefficient of the Schur-Cohn step-down recursion below 1 - unitMargin
// in magnitude (Levinson-Durbin run backwards; Box, Jenkins, Reinsel &
// Ljung 2015, the stationarity of an AR operator). buf is scratch
// (grown when too short).
func clearOfUnitCircle(a, buf []float64) bool {
	p := len(a) - 1
	if p < 1 {
		return true
	}
	c := append(buf[:0], a...)
	for i := range c {
		c[i] /= a[0]
	}
	for m := p; m >= 1; m-- {
		k := c[m]
		if !(math.Abs(k) < 1-unitMargin) {
			return false
		}
		den := 1 - k*k
		for i, j := 1, m-1; i <= j; i, j = i+1, j-1 {
			ci, cj := c[i], c[j]
			c[i], c[j] = (ci-k*cj)/den, (cj-k*ci)/den
		}
	}
	return true
}

// alloc sizes the state for an ARMA block of dimension r.
func (f *Filter) alloc(r int) {
	f.r = r
	f.m = r + f.dd
	m := f.m
	f.tc, f.rr, f.z = make([]float64, r), make([]float64, r), make([]float64, m)
	f.a, f.pz, f.tmp, f.tmp2 = make([]float64, m), make([]float64, m), make([]float64, m), make([]float64, m)
	f.P, f.X, f.Y = make([]float64, m*m), make([]float64, m*m), make([]float64, m*m)
	f.p0, f.dA, f.dS, f.dT = make([]float64, r*r), make([]float64, r*r), make([]float64, r*r), make([]float64, r*r)
}

// Dim returns the dimension of the state, max(p, q+1) + deg(diff).
func (f *Filter) Dim() int { return f.m }

// Diff returns the degree of the differencing polynomial.
func (f *Filter) Diff() int { return f.dd }

func checkPoly(part string, c []float64) error {
	if len(c) == 0 || c[0] == 0 {
		return &errs.ModelError{Part: part, Problem: "needs a non-zero constant term"}
	}
	for _, v := range c {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return &errs.ModelError{Part: part, Problem: "coefficients must be finite"}
		}
	}
	return nil
}

func trimDeg(c []float64) int {
	d := len(c) - 1
	for d > 0 && c[d] == 0 {
		d--
	}
	return d
}

// stationaryCov sets p0 = sum_k T^k R R' T'^k for the ARMA block by
// doubling (S <- S + A S A', A <- A A) until the largest entry of A is
// below 1e-30; false when the powers of T do not die out within 100
// doublings (2^100 steps) or overflow: an AR part that is not stationary.
func (f *Filter) stationaryCov() bool {
	r := f.r
	S, A, W := f.p0, f.dA, f.dS
	for i := 0; i < r; i++ {
		for j := 0; j < r; j++ {
			S[i*r+j] = f.rr[i] * f.rr[j]
		}
	}
	clear(A)
	for i := 0; i < r; i++ {
		A[i*r] = f.tc[i]
		if i+1 < r {
			A[i*r+i+1] = 1
		}
	}
	for it := 0; it < 100; it++ {
		matMul(W, A, S, r)      // A S
		matMulBt(f.dT, W, A, r) // A S A'
		for i := range S {
			S[i] += f.dT[i]
		}
		matMul(W, A, A, r)
		copy(A, W)
		big := 0.0
		for _, v := range A {
			big = math.Max(big, math.Abs(v))
		}
		if math.IsNaN(big) || math.IsInf(big, 0) {
			return false
		}
		if big < 1e-30 {
			return finite(S)
		}
	}
	return false
}

func finite(s []float64) bool {
	for _, v := range s {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

// matMul sets dst = a b for r x r row-major matrices.
func matMul(dst, a, b []float64, r int) {
	for i := 0; i < r; i++ {
		for j := 0; j < r; j++ {
			s := 0.0
			for k := 0; k < r; k++ {
				s += a[i*r+k] * b[k*r+j]
			}
			dst[i*r+j] = s
		}
	}
}

// matMulBt sets dst = a b'.
func matMulBt(dst, a, b []float64, r int) {
	for i := 0; i < r; i++ {
		for j := 0; j < r; j++ {
			s := 0.0
			for k := 0; k < r; k++ {
				s += a[i*r+k] * b[j*r+k]
			}
			dst[i*r+j] = s
		}
	}
}

// applyT sets dst = T src (no intercept).
func (f *Filter) applyT(dst, src []float64) {
	r := f.r
	s0 := src[0]
	for i := 0; i < r-1; i++ {
		dst[i] = f.tc[i]*s0 + src[i+1]
	}
	dst[r-1] = f.tc[r-1] * s0
	if f.dd == 0 {
		return
	}
	m := f.m
	zs := f.z[0] * s0
	for j := r; j < m; j++ {
		zs += f.z[j] * src[j]
	}
	for j := m - 1; j > r; j-- {
		dst[j] = src[j-1]
	}
	dst[r] = zs
}

// applyTt sets dst = T' src.
func (f *Filter) applyTt(dst, src []float64) {
	r, m := f.r, f.m
	s := 0.0
	for i := 0; i < r; i++ {
		s += f.tc[i] * src[i]
	}
	if f.dd > 0 {
		s += f.z[0] * src[r]
	}
	dst[0] = s
	for j := 1; j < r; j++ {
		dst[j] = src[j-1]
	}
	for j := r; j < m; j++ {
		v := f.z[j] * src[r]
		if j+1 < m {
			v += src[j+1]
		}
		dst[j] = v
	}
}

// sandwich sets dst = T src T' (op = applyT) or T' src T (op = applyTt)
// for a symmetric m x m src, through the rows: X = rows op(src rows) is
// src T' (or src T), and op on the rows of X' gives the product.
func (f *Filter) sandwich(dst, src []float64, op func(dst, src []float64)) {
	m := f.m
	X := f.X
	for i := 0; i < m; i++ {
		op(X[i*m:(i+1)*m], src[i*m:(i+1)*m])
	}
	Y := f.Y
	for i := 0; i < m; i++ {
		for j := 0; j < m; j++ {
			Y[j*m+i] = X[i*m+j]
		}
	}
	for i := 0; i < m; i++ {
		op(dst[i*m:(i+1)*m], Y[i*m:(i+1)*m])
	}
}
