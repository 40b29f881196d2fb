package arma

import (
	"github.com/backshift/backshift/internal/kalman"
)

// exactForecast returns forecasts of z (mean and variance in units of
// sigma^2, before adding the regression part) for h = 1..steps from the
// exact state at the end of the fitted series (internal/kalman: the
// stationary ARMA part started from its stationary distribution, the
// differencing conditioned on the first deg(Diff) observed samples,
// missing samples skipped). ok is false when the fitted AR part is not
// stationary or the filter cannot run; callers then use the conditional
// recursion.
func (r *Result) exactForecast(steps int) (mean, vr []float64, ok bool) {
	f, err := kalman.New(r.AR, r.MA, r.Diff)
	if err != nil {
		return nil, nil, false
	}
	mean, vr, err = f.Forecast(r.z, r.Model.Mean, steps)
	if err != nil {
		return nil, nil, false
	}
	for h := range mean {
		if !finiteF(mean[h]) || !finiteF(vr[h]) {
			return nil, nil, false
		}
	}
	return mean, vr, true
}

func finiteF(v float64) bool { return v-v == 0 }
