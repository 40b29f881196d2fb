package fit

import (
	"strings"
)

// forecastML is Forecast for an ExactML estimate: the noise series z
// (output less the integrated input terms) forecast by the Kalman
// filter from its state at the end of data, plus the input terms over
// the horizon integrated through the output differencing.
func (e *Estimate) forecastML(data map[string][]float64, h int, set ForecastSettings) (*Forecast, error) {
	p, err := e.mlLoad(data)
	if err != nil {
		return nil, err
	}
	defer p.w.release()
	w := p.w
	n := w.n
	zf, zv, err := p.kf.Forecast(p.z, p.mu(), h)
	if err != nil {
		return nil, overflowErr("noise forecast", n, 0, divergeHint(e))
	}
	fc := &Forecast{Origin: n, Level: set.Level, Mean: make([]float64, h), SE: make([]float64, h),
		Lower: make([]float64, h), Upper: make([]float64, h)}
	vr := make([]float64, h)
	for j := range vr {
		vr[j] = zv[j] * e.Sigma2
	}
	dc := w.m.Diff.Coeffs()
	what := make([]float64, h) // the input terms of D(B) y over the horizon
	if err := fc.addInputs(w, set, n, h, dc, vr, what); err != nil {
		return nil, err
	}
	se := make([]float64, n+h)
	copy(se, p.s)
	for t := n; t < n+h; t++ {
		v := what[t-n]
		for k := 1; k < len(dc); k++ {
			v -= dc[k] * se[t-k]
		}
		se[t] = v / dc[0]
	}
	mean := make([]float64, h)
	for j := range mean {
		mean[j] = zf[j] + se[n+j]
	}
	if err := fc.setIntervals(mean, vr, e); err != nil {
		return nil, err
	}
	if bad := e.Soundness(); len(bad) > 0 {
		fc.Warnings = append(fc.Warnings, ForecastWarning{Kind: UnsoundEstimate,
			Message: "the estimate is not to be trusted, nor forecasts from it: " + strings.Join(bad, "; ")})
	}
	return fc, nil
}
