package arma

import (
	"gonum.org/v1/gonum/stat/distuv"
)

// Portmanteau is the result of the Ljung-Box test.
type Portmanteau struct {
	// Q is the statistic n (n+2) sum_{k=1}^{Lags} r_k^2 / (n-k), with r_k
	// the sample autocorrelations (divisor n, mean removed).
	Q float64
	// Lags is the number of autocorrelations summed.
	Lags int
	// DF = Lags - fitted, the degrees of freedom of the reference
	// chi-squared distribution.
	DF int
	// P is the upper-tail probability of Q under chi-squared(DF)
	// (gonum distuv.ChiSquared).
	P float64
}

// LjungBox tests whether resid is white noise up to lag lags. fitted is
// the number of estimated ARMA coefficients, subtracted from lags for the
// degrees of freedom (0 for a raw series; p+q for ARMA residuals).
//
// Fit residuals start with NaN over the conditioning samples: pass
// res.Resid[res.Start:]. NaN or infinite values give a *SampleError;
// lags < 1 or lags <= fitted a *SettingError; lags >= len(resid) a
// *SeriesError of kind ErrShort; a constant series one of kind
// ErrConstant.
//
// References: Ljung, G. M. and Box, G. E. P. (1978). On a measure of lack
// of fit in time series models. Biometrika 65(2), 297-303.
func LjungBox(resid []float64, lags, fitted int) (pm Portmanteau, err error) {
	defer withOp("arma.LjungBox", &err)
	return ljungBox(resid, lags, fitted)
}

func ljungBox(resid []float64, lags, fitted int) (Portmanteau, error) {
	if lags < 1 {
		return Portmanteau{}, settingErr("lags", itoa(lags), "must be at least 1")
	}
	if fitted < 0 || fitted >= lags {
		return Portmanteau{}, settingErr("fitted", itoa(fitted), "must be in 0..lags-1 = "+itoa(lags-1))
	}
	c, err := acf(resid, lags)
	if err != nil {
		return Portmanteau{}, err
	}
	n := float64(c.N)
	q := 0.0
	for k := 1; k <= lags; k++ {
		q += c.R[k] * c.R[k] / (n - float64(k))
	}
	q *= n * (n + 2)
	df := lags - fitted
	p := distuv.ChiSquared{K: float64(df)}.Survival(q)
	return Portmanteau{Q: q, Lags: lags, DF: df, P: p}, nil
}
