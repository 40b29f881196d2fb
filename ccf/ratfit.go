package ccf

import (
	"context"
	"math"

	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/poly"
)

// rationalFit is the fit of one rational form B^b omega(B)/delta(B) to the
// weights v_b..v_K.
type rationalFit struct {
	num, den []float64 // omega (s+1), delta (r+1, den[0] = 1), as stored
	chi2     float64   // sum ((v_k - vhat_k)/se_k)^2 over k = b..K
	ok       bool      // converged to a stable delta
}

// divideSeries writes into dst the weights of omega(B)/delta(B), dst[j] =
// coefficient of B^j (j relative to the dead time), by the power-series
// division of internal/poly. den[0] is always 1 here, so the division
// cannot fail and its results equal the plain recursion bit for bit.
func divideSeries(dst, num, den []float64) {
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
func fitRational(v, se []float64, corr func(i, j int) float64, b, r, s int) rationalFit {
	m := len(v) - b // weights fitted
	if m < r+s+1 {
		return rationalFit{chi2: math.Inf(1)}
	}
	rp := &rationalProblem{w: v[b:], se: se[b:], r: r, s: s, wh: newWhitener(corr, b, m),
		vh: make([]float64, m), g: make([]float64, m), num: make([]float64, s+1), den: make([]float64, r+1)}
	x0 := startPoint(rp.w, r, s)
	res, err := lm.Minimize(context.Background(), rp.problem(), x0, &lm.Settings{MaxIter: 200})
	x := x0
	if err == nil {
		x = res.X
	}
	fit := rationalFit{num: append([]float64(nil), x[:s+1]...), den: append([]float64{1}, x[s+1:]...)}
	if !stableDen(fit.den) {
		fit.chi2 = math.Inf(1)
		return fit
	}
	fit.chi2 = rp.chi2(fit.num, fit.den)
	fit.ok = true
	return fit
}

// startPoint returns the start of fitRational's search, omega then
// delta_1..delta_r: the linear solution of the weight recursion, with
// delta = 1 instead when that solution is unstable.
func startPoint(w []float64, r, s int) []float64 {
	num, den := linearStart(w, r, s)
	x0 := make([]float64, s+1+r)
	copy(x0, num)
	if stableDen(den) {
		copy(x0[s+1:], den[1:])
	}
	return x0
}

// rationalProblem is the weighted least-squares problem of fitRational:
// the standardised, whitened differences between the weights w (from
// the dead time on, standard errors se) and those of omega(B)/delta(B).
type rationalProblem struct {
	w, se    []float64
	r, s     int
	wh       whitener
	vh, g    []float64 // scratch: fitted weights, 1/delta impulse
	num, den []float64 // scratch: omega, delta of the point evaluated
}

// problem returns the lm.Problem of p, parameters omega_0..omega_s then
// delta_1..delta_r.
func (p *rationalProblem) problem() lm.Problem {
	return lm.Problem{M: len(p.w), N: p.s + 1 + p.r, Eval: p.eval}
}

// eval writes the residuals (w - vhat)/se, whitened, and when jac is not
// nil their derivatives; an unstable delta is not admissible.
func (p *rationalProblem) eval(x, res []float64, jac [][]float64) error {
	copy(p.num, x[:p.s+1])
	p.den[0] = 1
	copy(p.den[1:], x[p.s+1:])
	if !stableDen(p.den) {
		return errUnstable
	}
	divideSeries(p.vh, p.num, p.den)
	for k := range res {
		res[k] = (p.w[k] - p.vh[k]) / p.se[k]
	}
	p.wh.apply(res)
	if jac == nil {
		return nil
	}
	p.jacobian(jac)
	for _, col := range jac {
		p.wh.apply(col)
	}
	return nil
}

// jacobian writes the derivatives of the unwhitened residuals at the
// point of the last eval (p.num, p.den, p.vh).
func (p *rationalProblem) jacobian(jac [][]float64) {
	s, r, g, db := p.s, p.r, p.g, p.den
	// d vhat / d omega_j = B^j / delta, impulse; g = 1/delta impulse.
	divideSeries(g, []float64{1}, db)
	for j := 0; j <= s; j++ {
		col := jac[j]
		for k := range col {
			if k >= j {
				col[k] = -g[k-j] / p.se[k]
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
				u = p.vh[k-i]
			}
			for q := 1; q <= r && q <= k; q++ {
				u -= db[q] * g[k-q] // reuse g as scratch for the filtered series
			}
			g[k] = u
		}
		for k := range col {
			col[k] = g[k] / p.se[k] // residual is (w - vhat)/se: minus of -u
		}
	}
}

// chi2 returns the whitened sum of squares of the standardised
// differences between the weights and those of num/den.
func (p *rationalProblem) chi2(num, den []float64) float64 {
	divideSeries(p.vh, num, den)
	d := make([]float64, len(p.w))
	for k := range p.w {
		d[k] = (p.w[k] - p.vh[k]) / p.se[k]
	}
	p.wh.apply(d)
	sum := 0.0
	for _, v := range d {
		sum += v * v
	}
	return sum
}

// unstableError is the error of rationalProblem.eval at an unstable
// delta; internal/lm treats such a point as worse than any other.
type unstableError struct{}

func (unstableError) Error() string { return "ccf: unstable denominator" }

var errUnstable error = unstableError{}

// linearStart solves the weight recursion
//
//	v_j = -den_1 v_{j-1} - ... - den_r v_{j-r} + num_j   (num_j = 0 for j > s)
//
// for den by least squares over j = s+1..m-1 (internal/lm; den = 1 when
// the lagged weights are collinear), then num_j for j = 0..s.
func linearStart(w []float64, r, s int) (num, den []float64) {
	den = make([]float64, r+1)
	den[0] = 1
	at := func(j int) float64 {
		if j < 0 {
			return 0
		}
		return w[j]
	}
	if rows := len(w) - s - 1; r > 0 && rows > 0 {
		// Residual of row j: w_j + sum_i den_i v_{j-i}.
		prob := lm.Problem{M: rows, N: r, WritesAll: true, Eval: func(d, res []float64, jac [][]float64) error {
			for row := range res {
				j := s + 1 + row
				v := w[j]
				for i := 1; i <= r; i++ {
					v += d[i-1] * at(j-i)
				}
				res[row] = v
				for i := 1; jac != nil && i <= r; i++ {
					jac[i-1][row] = at(j - i)
				}
			}
			return nil
		}}
		res, err := lm.Minimize(context.Background(), prob, make([]float64, r), nil)
		if err == nil && res.JTJInv != nil {
			copy(den[1:], res.X)
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

// whitener applies L^-1, L the Cholesky factor of the correlation matrix
// R_ij = corr(off+i, off+j) of the weight errors (i, j < m), so that
// correlated errors count once in the sum of squares. A nil corr, or one
// whose matrix is not positive definite, gives the identity.
type whitener struct {
	m int
	l []float64 // row-major lower triangle, nil for the identity
}

// newWhitener returns the whitener of the correlations corr(off+i,
// off+j), i, j < m: the identity for a nil corr or one whose matrix is
// not positive definite.
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
