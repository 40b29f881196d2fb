package est

import "math"

// Param is one estimated parameter.
type Param struct {
	// Name is the coefficient's name in the model.
	Name string
	// Value is the estimate; Start the start value of the search that
	// gave it.
	Value, Start float64
	// SE is the standard error (see the variance convention), NaN when
	// it does not exist; T = Value/SE.
	SE, T float64
}

// Sigma2 returns the innovation variance of the library's convention,
// ssq / (n - k), or NaN when n <= k.
func Sigma2(ssq float64, n, k int) float64 {
	if n <= k {
		return math.NaN()
	}
	return ssq / float64(n-k)
}

// MLScale returns sqrt((n - k) / n), the factor that turns standard
// errors of the library's convention into those of the conditional
// maximum-likelihood variance ssq / n; NaN when n <= k or n <= 0.
func MLScale(n, k int) float64 {
	if n <= k || n <= 0 {
		return math.NaN()
	}
	return math.Sqrt(float64(n-k) / float64(n))
}

// Corr returns the correlation matrix of a covariance matrix: cov[i][j]
// / sqrt(cov[i][i] cov[j][j]), with exactly 1 on the diagonal where the
// variance is positive and NaN where a variance is not positive or not
// finite. cov is not modified.
func Corr(cov [][]float64) [][]float64 {
	out := make([][]float64, len(cov))
	for i := range cov {
		out[i] = make([]float64, len(cov))
		for j := range cov {
			vi, vj := cov[i][i], cov[j][j]
			switch {
			case !(vi > 0) || !(vj > 0) || math.IsInf(vi, 0) || math.IsInf(vj, 0):
				out[i][j] = math.NaN()
			case i == j:
				out[i][j] = 1
			default:
				out[i][j] = cov[i][j] / math.Sqrt(vi*vj)
			}
		}
	}
	return out
}
