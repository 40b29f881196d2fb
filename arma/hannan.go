package arma

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// HannanRissanen returns start values for an ARMA(p, q) model of w by the
// Hannan-Rissanen two-step method:
//
//  1. fit a long autoregression of order longAR by Yule-Walker to w
//     (centred by its sample mean) and take its residuals ehat_t;
//  2. regress w_t on w_{t-1..t-p} and ehat_{t-1..t-q} by ordinary least
//     squares over t = longAR+q .. n-1.
//
// longAR = 0 means max(p+q+1, min(floor(10 log10 n), n/4)). The result is
// returned as stored polynomials phi(B) = {1, -phi_1, ..., -phi_p} and
// theta(B) = {1, -theta_1, ..., -theta_q}; the regression coefficient of
// ehat_{t-j} is -theta_j. Roots on or outside the unit circle are pulled
// inside (to |z| = 0.95) so that the start is stationary and invertible,
// as an optimiser needs; pure AR orders (q = 0) use the Yule-Walker fit of
// order p directly.
//
// Errors: *SettingError for negative orders or a negative longAR, a
// *SeriesError of kind ErrShort
// when n is too small for the regression (any order or longAR of n or
// more, however large), and the errors of ACF for bad data.
//
// References: Hannan, E. J. and Rissanen, J. (1982). Recursive estimation
// of mixed autoregressive-moving average order. Biometrika 69(1), 81-94.
func HannanRissanen(w []float64, p, q, longAR int) (phi, theta []float64, err error) {
	defer withOp("arma.HannanRissanen", &err)
	return hannanRissanen(w, p, q, longAR)
}

func hannanRissanen(w []float64, p, q, longAR int) (phi, theta []float64, err error) {
	if p < 0 || q < 0 {
		return nil, nil, settingErr("p, q", itoa(p)+", "+itoa(q), "orders must not be negative")
	}
	if longAR < 0 {
		return nil, nil, settingErr("longAR", itoa(longAR), "must not be negative (zero means the default)")
	}
	n := len(w)
	if q > 0 && (p >= n || q >= n || longAR >= n) {
		// Bounded before any arithmetic: p+q or longAR+q could overflow.
		k := addSat(p, q)
		long := max(longAR, addSat(k, 1))
		return nil, nil, shortErr("", n, addSat(addSat(long, q), addSat(k, 1)),
			"a Hannan-Rissanen start of an ARMA("+itoa(p)+","+itoa(q)+")")
	}
	if q == 0 {
		f, err := ywFit(w, p, p)
		if err != nil {
			return nil, nil, err
		}
		return shrinkInside(f.Poly(), 0.95), []float64{1}, nil
	}
	if longAR == 0 {
		longAR = max(p+q+1, min(int(math.Floor(10*math.Log10(float64(n)))), n/4))
	}
	first := longAR + q
	rows := n - first
	k := p + q
	if rows < k+1 {
		return nil, nil, shortErr("", n, first+k+1, "a Hannan-Rissanen start of an ARMA("+itoa(p)+","+itoa(q)+")")
	}
	long, err := ywFit(w, longAR, longAR)
	if err != nil {
		return nil, nil, err
	}
	phi, theta = lagRegression(w, long.Residuals(w), long.Mean, p, q, first)
	return shrinkInside(phi, 0.95), shrinkInside(theta, 0.95), nil
}

// lagRegression is the second step of Hannan-Rissanen: the ordinary
// least-squares regression of w_t - m on w_{t-1..t-p} - m and
// e_{t-1..t-q} over t = first..n-1, returned as the polynomials phi(B)
// and theta(B). Collinear regressors (for example an over-parameterised
// model of white noise) give zero coefficients.
func lagRegression(w, e []float64, m float64, p, q, first int) (phi, theta []float64) {
	rows, k := len(w)-first, p+q
	a := mat.NewDense(rows, k, nil)
	b := mat.NewVecDense(rows, nil)
	for i := 0; i < rows; i++ {
		t := first + i
		b.SetVec(i, w[t]-m)
		for j := 1; j <= p; j++ {
			a.Set(i, j-1, w[t-j]-m)
		}
		for j := 1; j <= q; j++ {
			a.Set(i, p+j-1, e[t-j])
		}
	}
	phi = make([]float64, p+1)
	theta = make([]float64, q+1)
	phi[0], theta[0] = 1, 1
	var qr mat.QR
	qr.Factorize(a)
	var beta mat.VecDense
	if err := qr.SolveVecTo(&beta, false, b); err != nil {
		return phi, theta
	}
	for j := 1; j <= p; j++ {
		phi[j] = -beta.AtVec(j - 1)
	}
	for j := 1; j <= q; j++ {
		theta[j] = beta.AtVec(p + j - 1)
	}
	return phi, theta
}
