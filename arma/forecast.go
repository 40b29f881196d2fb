package arma

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/backshift/backshift/internal/poly"
)

// MaxHorizon is the largest number of steps accepted by Result.Forecast
// and of weights by Psi and Pi. A forecast costs O(steps m^2) time and
// O(steps m) memory for a stationary part of state dimension m (at most
// MaxLag+1), so 2^16 steps take milliseconds for low orders and about
// 15 s and 130 MiB at m = 257 (where the filter over the data, which does
// not depend on steps, takes longer still). That is far past the horizon
// at which a stationary forecast has settled on the mean and an
// integrated one's interval has stopped being informative. Without the
// bound a horizon of 1<<40 exhausted memory.
const MaxHorizon = 1 << 16

// Forecast holds forecasts of the series h = 1..H steps after its last
// sample.
type Forecast struct {
	// Mean[h-1] is the minimum mean-square-error forecast of y_{n-1+h}
	// given the data and the fitted coefficients (see Result.Forecast for
	// the two ways it is computed).
	Mean []float64
	// SE[h-1] is the forecast standard error for known coefficients: at
	// least sqrt(Sigma2 sum_{j<h} psi_j^2) (psi weights of the ARIMA
	// model, differencing included), plus the uncertainty of the state at
	// the end of the data when Exact.
	SE []float64
	// Lower and Upper bound the two-sided interval Mean -+ z SE at Level,
	// z the standard normal quantile (1+Level)/2.
	Lower, Upper []float64
	// Level is the interval's coverage probability.
	Level float64
	// Exact reports whether the forecasts come from the exact state of
	// the stationary part (true whenever the fitted AR part is
	// stationary) rather than the conditional recursion.
	Exact bool
}

// Forecast returns forecasts h = 1..steps after the end of the fitted
// series, with standard errors and intervals at the given level (0 means
// 0.95), for the fitted coefficients taken as known.
//
// When the fitted AR part is stationary the forecasts are the exact
// conditional expectations given all observed differences: a Kalman
// filter of the stationary ARMA part, started from its stationary
// distribution, runs over w_t = D(B) z_t (z_t = y_t - X_t'beta), and the
// forecasts of w are integrated with the last observed z (a diffuse start
// for the differencing). The standard errors add the remaining state
// uncertainty to Sigma2 sum_{j<h} psi_j^2 (psi weights of the ARIMA
// model). Otherwise
// (Forecast.Exact false) the conditional recursion of the fit is used,
//
//	phi*(B) D(B) z_t = phi*(1) mu + theta*(B) a_t,
//
// with future innovations zero and past ones the fit's residuals. The
// two agree closely unless the MA part has roots near the unit circle.
// The regression part is added back from futureX, which must hold one
// column of length steps per regressor of the fit (nil when the fit had
// none).
//
// Errors: *SettingError for steps < 1 or above MaxHorizon, level outside
// (0, 1), futureX of the wrong shape, a *SampleError ("futureX column k",
// with the index) for a NaN, infinite or too large future regressor
// value, a *ModelError for r not a result of Fit or FitNoise (nil or the
// zero Result), and a *SeriesError of kind ErrOverflow for forecasts that
// overflow float64 (an explosive fitted AR part; the Forecast is still
// returned, finite up to the step the message names).
func (r *Result) Forecast(steps int, level float64, futureX [][]float64) (fc Forecast, err error) {
	defer withOp("arma.Result.Forecast", &err)
	if r == nil || len(r.AR) == 0 || len(r.MA) == 0 || len(r.Diff) == 0 {
		return Forecast{}, modelErr("result", "Forecast needs a result of Fit or FitNoise")
	}
	if steps < 1 || steps > MaxHorizon {
		return Forecast{}, settingErr("steps", itoa(steps), "must be in 1..MaxHorizon = "+itoa(MaxHorizon))
	}
	if level == 0 {
		level = 0.95
	}
	if !(level > 0 && level < 1) {
		return Forecast{}, settingErr("level", fmtFloat(level), "must be in (0, 1) (zero means 0.95)")
	}
	if len(futureX) != len(r.Beta) {
		return Forecast{}, settingErr("futureX", itoa(len(futureX))+" columns", "needs "+itoa(len(r.Beta))+" regressor columns, one per regressor of the fit")
	}
	for k, c := range futureX {
		if len(c) != steps {
			return Forecast{}, settingErr("futureX column "+itoa(k+1), itoa(len(c))+" values", "needs "+itoa(steps)+" values, one per step")
		}
		if err := checkFinite("futureX column "+itoa(k+1), c); err != nil {
			return Forecast{}, err
		}
	}
	q := distuv.UnitNormal.Quantile((1 + level) / 2)
	f := Forecast{Mean: make([]float64, steps), SE: make([]float64, steps),
		Lower: make([]float64, steps), Upper: make([]float64, steps), Level: level}
	if mean, vr, ok := r.exactForecast(steps); ok {
		f.Exact = true
		for h := range mean {
			f.Mean[h] = mean[h]
			for k, col := range futureX {
				f.Mean[h] += r.Beta[k] * col[h]
			}
			f.SE[h] = math.Sqrt(r.Sigma2 * vr[h])
			f.Lower[h] = f.Mean[h] - q*f.SE[h]
			f.Upper[h] = f.Mean[h] + q*f.SE[h]
		}
		return f, checkForecast(f)
	}
	f = r.conditionalForecast(steps, level, futureX)
	return f, checkForecast(f)
}

// checkForecast returns a *SeriesError of kind ErrOverflow when a forecast or its interval
// overflowed (an explosive fitted AR part over a long horizon).
func checkForecast(f Forecast) error {
	first := -1
	for _, x := range [][]float64{f.Mean, f.SE, f.Lower, f.Upper} {
		if k := firstNonFinite(x); k >= 0 && (first < 0 || k < first) {
			first = k
		}
	}
	if first < 0 {
		return nil
	}
	return &SeriesError{Series: "forecast", Kind: ErrOverflow, Detail: "the forecast overflows at step " + itoa(first+1) + " (explosive fitted AR part); ask for fewer than " + itoa(first+1) + " steps"}
}

// conditionalForecast runs the conditional recursion (arguments checked).
func (r *Result) conditionalForecast(steps int, level float64, futureX [][]float64) Forecast {
	q := distuv.UnitNormal.Quantile((1 + level) / 2)
	f := Forecast{Mean: make([]float64, steps), SE: make([]float64, steps),
		Lower: make([]float64, steps), Upper: make([]float64, steps), Level: level}
	full := poly.Mul(r.AR, r.Diff)
	c := poly.EvalReal(r.AR, 1) * r.Model.Mean
	pz, qa := len(full)-1, len(r.MA)-1
	// Histories: z oldest first then forecasts; a past then zeros.
	z := make([]float64, pz+steps)
	copy(z[pz-len(r.zTail):pz], r.zTail)
	a := make([]float64, qa+steps)
	copy(a[:qa], r.aTail)
	for h := 0; h < steps; h++ {
		s := c
		for k := 1; k <= pz; k++ {
			s -= full[k] * z[pz+h-k]
		}
		for j := 1; j <= qa; j++ {
			s += r.MA[j] * a[qa+h-j]
		}
		s /= full[0] // Diff_0: FitNoise accepts any non-zero value
		z[pz+h] = s
		f.Mean[h] = s
		for k, col := range futureX {
			f.Mean[h] += r.Beta[k] * col[h]
		}
	}
	// full[0] != 0: cannot fail. Not Psi, which refuses weights that
	// overflow: checkForecast reports those with the step.
	psi, _ := poly.Divide(r.MA, full, steps)
	acc := 0.0
	for h := 0; h < steps; h++ {
		acc += psi[h] * psi[h]
		f.SE[h] = math.Sqrt(r.Sigma2 * acc)
		f.Lower[h] = f.Mean[h] - q*f.SE[h]
		f.Upper[h] = f.Mean[h] + q*f.SE[h]
	}
	return f
}
