package testutil

// SARIMAXFit is one fit of testdata/sarimax_ref.py, the statsmodels
// SARIMAX reference of a regression with ARMA errors that the arma and
// tf/fit exact-likelihood tests read (testdata/arma_ml/sarimax.json,
// testdata/fit_ml/sarimax.json): the parameter names, estimates and
// standard errors, the log-likelihood and scale, the smoothed missing
// samples with their standard errors, and (when the file has them) the
// forecasts with theirs.
type SARIMAXFit struct {
	Names      []string
	Params     []float64
	BSE        []float64
	LLF        float64
	Scale      float64
	Missing    []int
	Smooth     []float64
	SmoothSE   []float64 `json:"smooth_se"`
	Forecast   []float64
	ForecastSE []float64 `json:"forecast_se"`
}
