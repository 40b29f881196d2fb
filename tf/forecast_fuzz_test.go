package tf

import (
	"context"
	"math"
	"testing"
)

// FuzzForecast forecasts from a fit of mcModel (300 samples of its
// own simulation) with fuzzed horizons, levels, known future values,
// input models, estimates (the denominator, noise AR and variance
// overwritten) and data (one sample overwritten), NaN and huge values
// included. Every call must return a typed error of the library or a
// result whose every number is finite; never a panic.
func FuzzForecast(f *testing.F) {
	y, x := mcSim(newRand(5), 300)
	base := map[string][]float64{"y": y, "x": x}
	est, err := Fit(context.Background(), mcModel(), base, nil)
	if err != nil {
		f.Fatal(err)
	}
	f.Add(int16(5), 0.95, true, 1.0, 2.0, 0.5, 0.0, 0.0, 1.0, 0.6, 0.5, 1.0, uint16(10), 0.0, false)
	f.Add(int16(0), 0.0, false, 0.0, 0.0, 0.5, 0.3, 5.0, 1.0, 0.6, 0.5, 1.0, uint16(10), 0.0, false)
	f.Add(int16(40), 0.5, false, 0.0, 0.0, 1.0, -2.0, math.Inf(1), -1.0, 1.5, 1.0, math.NaN(), uint16(3), 1e300, true)
	f.Add(int16(3000), 0.99, true, 1e150, -1e150, 0.999, 0.999, 1e100, 1e100, 0.9999, 0.9999, 1e200, uint16(299), math.NaN(), true)
	f.Fuzz(func(t *testing.T, h int16, level float64, known bool, f1, f2, ar1, ma1, mean, sig2, d1, p1, s2 float64, at uint16, v float64, touch bool) {
		e := *est
		e.Model = est.Model.Clone()
		if touch {
			e.Model.Inputs[0].Den.Factors[0].Terms[1].Coef.Value = d1
			e.Model.Noise.AR.Factors[0].Terms[1].Coef.Value = p1
			e.Sigma2 = s2
		}
		data := map[string][]float64{"y": base["y"], "x": append([]float64(nil), base["x"]...)}
		if touch {
			data["x"][int(at)%len(data["x"])] = v
		}
		set := &ForecastSettings{Level: level}
		hh := int(h)
		if known {
			fut := make([]float64, max(hh, 0))
			for i := range fut {
				fut[i] = f1 + f2*float64(i%7)
			}
			set.Future = map[string][]float64{"x": fut}
		} else {
			set.InputModels = map[string]InputModel{"x": {AR: []float64{1, -ar1}, MA: []float64{1, -ma1}, C: mean, Sigma2: sig2}}
		}
		fc, err := e.Forecast(data, hh, set)
		if err != nil {
			if !tfHasKind(err) {
				t.Fatalf("error of no kind %T: %v", err, err)
			}
			return
		}
		for _, s := range [][]float64{fc.Mean, fc.SE, fc.Lower, fc.Upper} {
			for j, v := range s {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("step %d: %v with a nil error", j+1, v)
				}
			}
		}
		for _, in := range fc.Inputs {
			for j, v := range in.Values {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("input %s step %d: %v with a nil error", in.Series, j+1, v)
				}
			}
		}
	})
}
