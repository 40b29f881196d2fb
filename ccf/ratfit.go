package ccf

import (
	"context"
	"math"

	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/poly"
)

// ratFit is the fit of one rational form B^b omega(B)/delta(B) to the
// weights v_b..v_K.
type ratFit struct {
	num, den []float64 // omega (s+1), delta (r+1, den[0] = 1), as stored
	chi2     float64   // sum ((v_k - vhat_k)/se_k)^2 over k = b..K
	ok       bool      // converged to a stable delta
}

// ratImpulse writes into dst the weights of omega(B)/delta(B), dst[j] =
// coefficient of B^j (j relative to the dead time), by the power-series
// division of internal/poly. den[0] is always 1 here, so the division
// cannot fail and its results equal the plain recursion bit for bit.
func ratImpulse(dst, num, den []float64) {
	_ = poly.DivideTo(dst, num, den)
}

// stableDen reports whether delta(B) = 1 + den[1] B + den[2] B^2 has all
// its roots outside the unit circle (poles inside), for degree <= 2 in
// closed form and by the Schur-Cohn (Jury) recursion above.
func stableDen(den []float64) bool {
	// Reflection coefficients by the step-down recursion on
	// a(z) = z^r + den[1] z^(r-1) + ... + den[r], the reciprocal polynomial.
	a := append([]float64(nil), den...)
	for m := len(a) - 1; m >= 1; m-- {
		k := a[m]
		if !(math.Abs(k) < 1) {
			return false
		}
		b := make([]float64, m)
		for i := 0; i < m; i++ {
			b[i] = (a[i] - k*a[m-i]) / (1 - k*k)
		}
		a = b
	}
	return true
}

// fitRational fits B^b omega(B)/delta(B) with deg omega = s, deg delta = r
// to v[b..] by weighted least squares (weights 1/se^2), starting from the
// linear solution of the weight recursion, refined by Levenberg-Marquardt.
//
// corr, when not nil, gives the correlation of the errors of v_i and v_j;
// the sum of squares is then the generalised one, r' R^-1 r with r the
// standardised residuals over lags b..K.
func fitRational(v, se []float64, corr func(i, j int) float64, b, r, s int) ratFit {
	m := len(v) - b // weights fitted
	if m < r+s+1 {
		return ratFit{chi2: math.Inf(1)}
	}
	w := v[b:]
	sw := se[b:]
	num, den := linearStart(w, r, s)
	np := s + 1 + r
	x0 := make([]float64, np)
	copy(x0, num)
	for i := 1; i <= r; i++ {
		x0[s+i] = den[i]
	}
	if !stableDen(den) {
		// An unstable linear start: begin from delta = 1 instead.
		for i := 1; i <= r; i++ {
			x0[s+i] = 0
		}
	}
	wh := newWhitener(corr, b, m)
	vh := make([]float64, m)
	g := make([]float64, m)
	nb := make([]float64, s+1)
	db := make([]float64, r+1)
	prob := lm.Problem{M: m, N: np, Eval: func(x, res []float64, jac [][]float64) error {
		copy(nb, x[:s+1])
		db[0] = 1
		copy(db[1:], x[s+1:])
		if !stableDen(db) {
			return errUnstable
		}
		ratImpulse(vh, nb, db)
		for k := range res {
			res[k] = (w[k] - vh[k]) / sw[k]
		}
		wh.apply(res)
		if jac == nil {
			return nil
		}
		defer func() {
			for _, col := range jac {
				wh.apply(col)
			}
		}()
		// d vhat / d omega_j = B^j / delta, impulse; g = 1/delta impulse.
		ratImpulse(g, []float64{1}, db)
		for j := 0; j <= s; j++ {
			col := jac[j]
			for k := range col {
				if k >= j {
					col[k] = -g[k-j] / sw[k]
				} else {
					col[k] = 0
				}
			}
		}
		// d vhat / d den_i = -B^i vhat / delta.
		for i := 1; i <= r; i++ {
			col := jac[s+i]
			// u = vhat shifted by i, filtered by 1/delta.
			for k := range col {
				u := 0.0
				if k >= i {
					u = vh[k-i]
				}
				for q := 1; q <= r && q <= k; q++ {
					u -= db[q] * g[k-q] // reuse g as scratch for the filtered series
				}
				g[k] = u
			}
			for k := range col {
				col[k] = g[k] / sw[k] // residual is (w - vhat)/se: minus of -u
			}
		}
		return nil
	}}
	res, err := lm.Minimize(context.Background(), prob, x0, &lm.Settings{MaxIter: 200})
	x := x0
	if err == nil {
		x = res.X
	}
	fit := ratFit{num: append([]float64(nil), x[:s+1]...), den: append([]float64{1}, x[s+1:]...)}
	if !stableDen(fit.den) {
		fit.chi2 = math.Inf(1)
		return fit
	}
	ratImpulse(vh, fit.num, fit.den)
	d := make([]float64, m)
	for k := range w {
		d[k] = (w[k] - vh[k]) / sw[k]
	}
	wh.apply(d)
	for _, v := range d {
		fit.chi2 += v * v
	}
	fit.ok = true
	return fit
}

type unstableError struct{}

func (unstableError) Error() string { return "ccf: unstable denominator" }

var errUnstable error = unstableError{}

// linearStart solves the weight recursion
//
//	v_j = -den_1 v_{j-1} - ... - den_r v_{j-r} + num_j   (num_j = 0 for j > s)
//
// for den by least squares over j = s+1..m-1, then num_j for j = 0..s.
func linearStart(w []float64, r, s int) (num, den []float64) {
	den = make([]float64, r+1)
	den[0] = 1
	at := func(j int) float64 {
		if j < 0 {
			return 0
		}
		return w[j]
	}
	if r > 0 {
		// Normal equations (r <= a few): sum over j of row_j row_j' d = sum row_j w_j,
		// row_j = (v_{j-1}, ..., v_{j-r}), d_i = -den_i.
		A := make([]float64, r*r)
		rhs := make([]float64, r)
		for j := s + 1; j < len(w); j++ {
			for p := 0; p < r; p++ {
				rhs[p] += at(j-1-p) * w[j]
				for q := 0; q < r; q++ {
					A[p*r+q] += at(j-1-p) * at(j-1-q)
				}
			}
		}
		d, ok := solveSmall(A, rhs, r)
		if ok {
			for i := 1; i <= r; i++ {
				den[i] = -d[i-1]
			}
		}
	}
	num = make([]float64, s+1)
	for j := 0; j <= s; j++ {
		v := at(j)
		for i := 1; i <= r; i++ {
			v += den[i] * at(j-i)
		}
		num[j] = v
	}
	return num, den
}

// solveSmall solves the n-by-n system A x = b (row-major A) by Gaussian
// elimination with partial pivoting; ok is false for a singular system.
func solveSmall(A, b []float64, n int) (x []float64, ok bool) {
	a := append([]float64(nil), A...)
	x = append([]float64(nil), b...)
	for c := 0; c < n; c++ {
		p := c
		for i := c + 1; i < n; i++ {
			if math.Abs(a[i*n+c]) > math.Abs(a[p*n+c]) {
				p = i
			}
		}
		if a[p*n+c] == 0 {
			return nil, false
		}
		if p != c {
			for j := 0; j < n; j++ {
				a[c*n+j], a[p*n+j] = a[p*n+j], a[c*n+j]
			}
			x[c], x[p] = x[p], x[c]
		}
		for i := c + 1; i < n; i++ {
			f := a[i*n+c] / a[c*n+c]
			for j := c; j < n; j++ {
				a[i*n+j] -= f * a[c*n+j]
			}
			x[i] -= f * x[c]
		}
	}
	for c := n - 1; c >= 0; c-- {
		s := x[c]
		for j := c + 1; j < n; j++ {
			s -= a[c*n+j] * x[j]
		}
		x[c] = s / a[c*n+c]
	}
	for _, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, false
		}
	}
	return x, true
}

// whitener applies L^-1, L the Cholesky factor of the correlation matrix
// R_ij = corr(off+i, off+j) of the weight errors (i, j < m), so that
// correlated errors count once in the sum of squares. A nil corr, or one
// whose matrix is not positive definite, gives the identity.
type whitener struct {
	m int
	l []float64 // row-major lower triangle, nil for the identity
}

func newWhitener(corr func(i, j int) float64, off, m int) whitener {
	if corr == nil {
		return whitener{m: m}
	}
	l := make([]float64, m*m)
	for i := 0; i < m; i++ {
		for j := 0; j <= i; j++ {
			s := corr(off+i, off+j)
			for k := 0; k < j; k++ {
				s -= l[i*m+k] * l[j*m+k]
			}
			if i == j {
				if !(s > 1e-12) {
					return whitener{m: m}
				}
				l[i*m+i] = math.Sqrt(s)
			} else {
				l[i*m+j] = s / l[j*m+j]
			}
		}
	}
	return whitener{m: m, l: l}
}

// apply overwrites v with L^-1 v (forward substitution).
func (w whitener) apply(v []float64) {
	if w.l == nil {
		return
	}
	m := w.m
	for i := 0; i < m; i++ {
		s := v[i]
		row := w.l[i*m : i*m+i]
		for k, lk := range row {
			s -= lk * v[k]
		}
		v[i] = s / w.l[i*m+i]
	}
}
