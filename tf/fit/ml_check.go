package fit

import (
	"math"
)

// mlLoad rebuilds the exact likelihood of e's model on data with e's
// conventions (input gap rule, pre-sample inputs, event times) and
// loads e's coefficients; the caller releases p.w.
func (e *Estimate) mlLoad(data map[string][]float64) (*mlProblem, error) {
	c := e.Conditioning
	w, err := newWork(e.Model, data, Settings{IgnoreExtra: true, Method: ExactML, InputGaps: c.InputGaps, ZeroPreSample: c.ZeroPreSample, Start: c.Start})
	if err != nil {
		return nil, err
	}
	p, err := newMLProblem(w, w.obs, c.LikelihoodStart)
	if err != nil {
		w.release()
		return nil, err
	}
	if err := p.load(w.params()); err != nil {
		w.release()
		return nil, overflowErr("noise series", p.ts, math.NaN(), divergeHint(e))
	}
	return p, nil
}

// mlResiduals returns the standardised innovations of the ExactML
// estimate e on data (NaN where the output is missing and before the
// first sample of the likelihood) and that first index.
func mlResiduals(e *Estimate, data map[string][]float64) ([]float64, int, error) {
	p, err := e.mlLoad(data)
	if err != nil {
		return nil, 0, err
	}
	defer p.w.release()
	std := make([]float64, len(p.z))
	st, err := p.kf.Run(p.z, p.mu(), std, nil)
	if err != nil {
		return nil, 0, overflowErr("residuals", p.ts, math.NaN(), divergeHint(e))
	}
	resid := make([]float64, p.w.n)
	for t := range resid {
		resid[t] = math.NaN()
		if t >= p.ts {
			resid[t] = std[t-p.ts]
		}
	}
	for t := p.ts + st.Start; t < len(resid); t++ {
		if math.IsInf(resid[t], 0) || (math.IsNaN(resid[t]) && !math.IsNaN(p.y[t])) {
			return nil, 0, overflowErr("residuals", t, resid[t], divergeHint(e))
		}
	}
	return resid, p.ts + st.Start, nil
}

// available returns a without its NaN entries (a itself when it has
// none).
func available(a []float64) []float64 {
	n := countObserved(a)
	if n == len(a) {
		return a
	}
	out := make([]float64, 0, n)
	for _, v := range a {
		if !math.IsNaN(v) {
			out = append(out, v)
		}
	}
	return out
}

// pairsAvailable returns x and r without the samples where r is NaN
// (the slices themselves when there are none).
func pairsAvailable(x, r []float64) ([]float64, []float64) {
	if countObserved(r) == len(r) {
		return x, r
	}
	var ox, or []float64
	for t, v := range r {
		if !math.IsNaN(v) {
			ox = append(ox, x[t])
			or = append(or, v)
		}
	}
	return ox, or
}
