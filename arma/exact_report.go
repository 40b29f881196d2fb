package arma

import (
	"context"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/est"
	"github.com/backshift/backshift/internal/lm"
)

// report builds the Result of an exact-likelihood fit at x (working
// units): the estimates with standard errors from the observed
// information hess (the numerical Hessian of minus the log-likelihood;
// nil gives NaN), the standardised innovations as residuals, the exact
// log-likelihood and criteria, the smoothed missing samples and the
// forecast state. x0 is the start (the least-squares estimate).
func (p *mlProblem) report(ctx context.Context, y []float64, o FitSettings, x0, x []float64, hess *mat.SymDense, lres lm.Result) (*Result, error) {
	e := p.e
	np := len(e.names)
	st, err := p.stats(x)
	if err != nil {
		return nil, modelErr("fit of "+seriesName(o.Name), "the exact likelihood cannot be computed at the estimates: "+err.Error())
	}
	mu, _ := p.load(x)
	sc := e.scale
	res := &Result{Method: ExactML, N: e.n, Start: st.Start, NUsed: st.NObs, Diff: e.diff, narma: e.narma}
	res.SSQ = st.SSQ * sc * sc
	res.Sigma2 = est.Sigma2(res.SSQ, st.NObs, np)
	switch {
	case res.Sigma2 == 0:
		return nil, modelErr("fit of "+seriesName(o.Name), "the innovations' sum of squares is 0: the model fits exactly or the samples are too small for their squares; rescale the series")
	case !(res.Sigma2 < math.Inf(1)):
		return nil, &SeriesError{Series: seriesName(o.Name), Kind: ErrOverflow, Detail: "the innovations' sum of squares overflows: a diff or FitSettings.Held coefficient too large for the series' scale"}
	}
	res.Resid = make([]float64, e.n)
	for t, v := range p.std {
		res.Resid[t] = v * sc
	}
	e.estimates(res, x, x0)
	p.uncertainty(res, hess)
	res.LogLik = st.LogLik() - float64(st.NObs)*math.Log(sc)
	res.mlCriteria(np)
	res.flagBoundary()
	if e.keepInvertible {
		res.flagNearMA()
	}
	res.forecastState(y, o.Regressors)
	if err := p.missing(res, y, o, mu); err != nil {
		return nil, err
	}
	err = searchEnd(ctx, res, lres)
	res.Evals = p.evals
	return res, err
}

// uncertainty sets SE, T, SEHessian, Cov and Corr from the inverse of
// the observed information hess (working units), NaN where it is not
// positive definite.
func (p *mlProblem) uncertainty(res *Result, hess *mat.SymDense) {
	inv := invSym(hess)
	res.setCovariance(inv, 1, p.e.pscale)
	if inv != nil {
		for i, pr := range res.Params {
			res.SEHessian[i] = pr.SE
		}
	}
}

// mlCriteria sets K, AIC, AICc and BIC from LogLik (the exact one of
// an exact-likelihood fit, or the one criteria sets), with NUsed the
// observed samples in the likelihood.
func (res *Result) mlCriteria(np int) {
	nu := float64(res.NUsed)
	res.K = np + 1
	k := float64(res.K)
	res.AIC = -2*res.LogLik + 2*k
	res.AICc = math.Inf(1)
	if nu-k-1 > 0 {
		res.AICc = res.AIC + 2*k*(k+1)/(nu-k-1)
	}
	res.BIC = -2*res.LogLik + k*math.Log(nu)
}

// missing sets res.Missing: the smoothed estimates of the NaN samples
// of y with their standard errors (the filter's state at the estimates,
// p.z loaded, mu the working mean).
func (p *mlProblem) missing(res *Result, y []float64, o FitSettings, mu float64) error {
	var idx []int
	for t, v := range y {
		if math.IsNaN(v) {
			idx = append(idx, t)
		}
	}
	if len(idx) == 0 {
		return nil
	}
	fill, vr, _, err := p.kf.Smooth(p.cur, mu)
	if err != nil {
		return modelErr("fit of "+seriesName(o.Name), "the smoother failed at the estimates: "+err.Error())
	}
	e := p.e
	back := 0.0
	if e.dd == 0 {
		back = e.shift
	}
	res.Missing = make([]MissingValue, len(idx))
	for i, t := range idx {
		v := (fill[t] + back) * e.scale
		for k, x := range o.Regressors {
			v += res.Beta[k] * x[t]
		}
		res.Missing[i] = MissingValue{Index: t, Value: v, SE: math.Sqrt(vr[t] * res.Sigma2)}
	}
	return nil
}
