package kalman

import "github.com/backshift/backshift/internal/errs"

// Forecast runs the filter over z (NaN where missing) with the constant
// mu and returns the forecasts of z for h = 1..steps after its last
// sample, the conditional expectations given every observed sample, and
// their variances in units of sigma^2 (the state's uncertainty at the
// end carried forward: a = T a + c, P = T P T' + R R'). It costs O(n m^2
// + steps m^2). Errors as for Run, and a *errs.SettingError for steps <
// 1.
func (f *Filter) Forecast(z []float64, mu float64, steps int) (mean, vr []float64, err error) {
	if steps < 1 {
		return nil, nil, &errs.SettingError{Setting: "steps", Value: itoa(steps), Rule: "must be at least 1"}
	}
	if _, err := f.run(z, mu, nil, nil, nil); err != nil {
		return nil, nil, err
	}
	c0 := mu * f.z[0]
	mean, vr = make([]float64, steps), make([]float64, steps)
	for h := 0; h < steps; h++ {
		F := f.gain(f.pz)
		za := 0.0
		for j, v := range f.z {
			za += v * f.a[j]
		}
		mean[h], vr[h] = za+c0, F
		f.predict(c0)
		f.sandwichAdd(nil, 1)
	}
	return mean, vr, nil
}
