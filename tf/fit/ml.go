package fit

import (
	"context"
	"errors"
	"math"
	"strconv"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/est"
	"github.com/backshift/backshift/internal/kalman"
	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// Method chooses how Model estimates the coefficients: LeastSquares
// (the zero value, the default) or ExactML (see the package doc,
// Methods). It is the one method type of the library, shared with
// package arma.
type Method = arma.Method

const (
	// LeastSquares is conditional least squares (the package doc,
	// Conditioning and Estimation), the default.
	LeastSquares = arma.LeastSquares
	// ExactML is exact Gaussian maximum likelihood of the whole model
	// through the Kalman filter of its noise, with missing output samples
	// (NaN) skipped exactly (the package doc, Methods).
	ExactML = arma.ExactML
)

// MissingValue is the smoothed estimate of one missing output sample
// of an ExactML fit: its Index, E(y_t | observed samples) at the
// estimates (Value) and the standard error of that estimate for known
// coefficients (SE, from the fixed-interval smoother). Value and SE are
// NaN for a missing sample before Conditioning.First.
type MissingValue = arma.MissingValue

// mlStartCap bounds the samples of the least-squares fit that gives the
// start of an exact-likelihood search: a longer record is started from
// the fit of its last samples, as Model's own first stage does (see
// Estimation in the package doc).
const mlStartCap = stagedMin

// errInadmissible marks a point of the search where the likelihood is
// not defined or not kept: a noise AR part that is not stationary, an
// MA part that left the invertible region it started in, or a transfer
// term that overflowed.
var errInadmissible = errors.New("fit: the exact likelihood is not defined at this point")

// mlProblem is the exact likelihood of a model over the parameter
// vector of its work w. Used by one goroutine.
type mlProblem struct {
	w   *work
	y   []float64 // the output as given, NaN where missing
	dc  []float64 // output differencing D(B)
	ts  int       // NoiseStart: the likelihood is that of z[ts:]
	kf  *kalman.Filter
	v   []float64 // sum over inputs of their terms, at the current values
	s   []float64 // S, the solution of D(B) S = v (zero before deg D)
	z   []float64 // the noise series y - S from ts on, NaN where y is
	nob int       // observed samples in the likelihood
	// keepMA refuses points whose MA part is not invertible (the search
	// started inside); anyMA lifts that for the curvature's stencil.
	keepMA, anyMA bool
	// cross lets load accept a non-invertible MA part for the whole fit:
	// the search may cross the boundary and is mapped back by root
	// inversion of flip (see ml_boundary.go).
	cross bool
	flip  []poly.FactorMap
	evals int
}

// newMLProblem prepares the exact likelihood of y over w's parameters,
// of the noise series from index max(NoiseStart, first) on (first is
// Settings.First: samples before it, the start-up of the pre-sample
// convention, stay out of the likelihood as they stay out of the sum of
// squares).
func newMLProblem(w *work, y []float64, first int) (*mlProblem, error) {
	n := w.n
	ts := max(w.cond.NoiseStart, first)
	p := &mlProblem{w: w, y: y, dc: w.m.Diff.Coeffs(), ts: ts,
		v: make([]float64, n), s: make([]float64, n), z: make([]float64, n-ts)}
	kf, err := kalman.New([]float64{1}, []float64{1}, p.dc)
	if err != nil {
		return nil, errs.Model("output differencing", err.Error())
	}
	p.kf = kf
	for t := range p.z { // the observed pattern; load writes the values
		p.z[t] = 0
		if math.IsNaN(y[ts+t]) {
			p.z[t] = math.NaN()
		}
	}
	st, err := kf.Run(p.z, 0, nil, nil)
	if err != nil {
		return nil, errs.Series(w.m.Output, errs.ErrShort, countObserved(y[ts:]), len(w.names)+2,
			"observed output samples for the exact likelihood, from index "+strconv.Itoa(ts)+" on: "+err.Error())
	}
	p.nob = st.NObs
	if p.nob <= len(w.names)+1 {
		return nil, errs.Series(w.m.Output, errs.ErrShort, p.nob, len(w.names)+2,
			"observed output samples in the exact likelihood (from index "+strconv.Itoa(ts+st.Start)+" on), one more than the free coefficients and sigma^2")
	}
	return p, nil
}

// load sets the coefficients x, the noise polynomials of the filter and
// the noise series z; it returns errInadmissible (wrapped) where the
// likelihood is not defined or not kept.
func (p *mlProblem) load(x []float64) error {
	w := p.w
	w.set(x)
	k := len(w.names)
	ar, ma := w.ar.Coeffs(), w.ma.Coeffs()
	if p.keepMA && !p.anyMA && !p.cross && len(ma) > 1 && maxZ(ma) >= 1 {
		return errInadmissible
	}
	if err := p.kf.Set(ar, ma); err != nil {
		return errors.Join(errInadmissible, err)
	}
	off := 0.0
	for i := range w.ins {
		fi := &w.ins[i]
		fi.runFilters(w.idx, k, w.n)
		off += fi.gain * fi.z0
	}
	v := p.v
	for t := range v {
		v[t] = off
	}
	for i := range w.ins {
		u := w.ins[i].u[:len(v)]
		for t := range v {
			v[t] += u[t]
		}
	}
	integrateTo(p.s, v, p.dc)
	z, s, y := p.z, p.s[p.ts:], p.y[p.ts:]
	s = s[:len(z)]
	y = y[:len(z)]
	for t := range z {
		if s[t]-s[t] != 0 {
			return errInadmissible
		}
		z[t] = y[t] - s[t]
	}
	return nil
}

// mu returns the constant of the differenced noise series, c.
func (p *mlProblem) mu() float64 {
	if c := p.w.m.Const; c != nil {
		return c.Value
	}
	return 0
}

// integrateTo writes into s the solution of D(B) s_t = v_t for t >=
// deg D, zero before.
func integrateTo(s, v, dc []float64) {
	d := len(dc) - 1
	if d == 0 {
		for t := range s {
			s[t] = v[t] / dc[0]
		}
		return
	}
	clear(s[:min(d, len(s))])
	for t := d; t < len(s); t++ {
		a := v[t]
		for k := 1; k <= d; k++ {
			a -= dc[k] * s[t-k]
		}
		s[t] = a / dc[0]
	}
}

// stats runs the filter at x, the standardised innovations into std
// (may be nil).
func (p *mlProblem) stats(x, std []float64) (kalman.Stats, error) {
	p.evals++
	if err := p.load(x); err != nil {
		return kalman.Stats{}, err
	}
	st, err := p.kf.Run(p.z, p.mu(), std, nil)
	if err == nil && !(st.SSQ > 0 && st.SSQ < math.Inf(1)) {
		err = errInadmissible
	}
	return st, err
}

// negLogLik is minus the exact concentrated log-likelihood at x (+Inf
// where it is not defined).
func (p *mlProblem) negLogLik(x []float64) float64 {
	st, err := p.stats(x, nil)
	if err != nil {
		return math.Inf(1)
	}
	return -st.LogLik()
}

// residuals writes the scaled innovations at x into r (kalman.Filter.
// Scaled): their sum of squares is least at the maximum likelihood.
func (p *mlProblem) residuals(x, r []float64) error {
	p.evals++
	if err := p.load(x); err != nil {
		return err
	}
	st, err := p.kf.Scaled(r, p.z, p.mu())
	if err == nil && !(st.SSQ > 0 && st.SSQ < math.Inf(1)) {
		err = errInadmissible
	}
	return err
}

// shrinkStart moves a start whose noise AR part is not stationary, or
// whose MA part has a zero at |z| >= 0.98, inside: the free
// coefficients of that part are scaled by 0.7 until it is (at most 20
// times). The exact likelihood needs a stationary AR part, and a start
// on the MA boundary would hold the search there when it may not cross
// (an MA part that root inversion cannot rewrite, see maFlip).
func (p *mlProblem) shrinkStart(x []float64) {
	w := p.w
	for _, pl := range []tf.Poly{w.ar, w.ma} {
		_, ids := w.polyParams(pl)
		for it := 0; it < 20 && len(ids) > 0; it++ {
			w.set(x)
			if maxZ(pl.Coeffs()) < 0.98 {
				break
			}
			for _, k := range ids {
				x[k] *= 0.7
			}
		}
	}
	w.set(x)
}

// fitML fits the model of w by exact maximum likelihood to y (NaN where
// missing): start values by conditional least squares on w (whose
// output has its gaps filled by linear interpolation), Levenberg-
// Marquardt on the scaled innovations, Newton steps with the numerical
// Hessian, and the estimate.
func fitML(ctx context.Context, w *work, y []float64, set Settings) (*Estimate, error) {
	maxIter := set.MaxIter
	if maxIter <= 0 {
		maxIter = 200
	}
	x0, start, tried, err := w.clsStart(ctx, set, maxIter)
	if err != nil {
		return nil, err
	}
	p, err := newMLProblem(w, y, set.First)
	if err != nil {
		return nil, err
	}
	x0 = append([]float64(nil), x0...)
	p.shrinkStart(x0)
	p.keepMA = len(w.ma.Coeffs()) > 1 && maxZ(w.ma.Coeffs()) < 1
	if p.keepMA {
		p.flip = w.maFlip()
		p.cross = p.flip != nil
	}
	if _, err := p.stats(x0, nil); err != nil {
		return nil, errs.Model("start values", "the exact likelihood of output "+strconv.Quote(w.m.Output)+" cannot be computed at the least-squares start: "+err.Error())
	}
	prob := lm.Problem{M: p.nob, N: len(w.names), Eval: kalman.JacobianEval(p.residuals), WritesAll: true}
	lres, atBoundary, err := p.search(ctx, prob, x0, lm.Settings{MaxIter: maxIter, FTol: set.Tol})
	if err != nil {
		return nil, errs.Model("start values", "the exact likelihood of output "+strconv.Quote(w.m.Output)+" is not finite at the start values")
	}
	x, hess, err := p.finish(ctx, &lres, atBoundary)
	if err != nil {
		lres.Reason = lm.Canceled // ctx was done during a Hessian: report as a cancelled search
	}
	e, err := p.estimate(x, hess, lres, start, tried)
	if err != nil {
		return nil, err
	}
	e.Evals = p.evals
	return e, nil
}

// clsStart returns the conditional least-squares estimate of w that
// starts the exact-likelihood search (on the last samples of a long
// record, as Model's first stage), the start of that fit and the number
// of candidates screened.
func (w *work) clsStart(ctx context.Context, set Settings, maxIter int) (x, start []float64, tried int, err error) {
	if w.n-w.cond.First >= mlStartCap {
		auto := w.cond.NoiseStart + w.ar.Degree()
		sub := w.window(max(stagedWindow, stagedPerParam*len(w.names)) + auto)
		ws, err := newWork(w.m, sub, Settings{IgnoreExtra: true, ZeroPreSample: set.ZeroPreSample, Start: set.Start})
		if err == nil {
			best, start, tried, err := ws.search(ctx, set, maxIter)
			ws.release()
			if ws.panicErr != nil {
				return nil, nil, 0, ws.panicErr
			}
			if err == nil {
				return best.X, start, tried, nil
			}
		}
	}
	best, start, tried, err := w.search(ctx, set, maxIter)
	if w.panicErr != nil {
		return nil, nil, 0, w.panicErr
	}
	if err != nil {
		return nil, nil, 0, err
	}
	return best.X, start, tried, nil
}

// estimate builds the Estimate of an exact-likelihood fit at x: the
// estimates with standard errors from the observed information hess
// (nil: NaN), the standardised innovations as residuals, the exact
// log-likelihood and criteria, and the smoothed missing outputs.
func (p *mlProblem) estimate(x []float64, hess *mat.SymDense, lres lm.Result, start []float64, tried int) (*Estimate, error) {
	w := p.w
	k := len(x)
	std := make([]float64, len(p.z))
	st, err := p.stats(x, std)
	if err != nil {
		return nil, errs.Model("fit of output "+strconv.Quote(w.m.Output), "the exact likelihood cannot be computed at the estimates: "+err.Error())
	}
	cond := w.cond
	cond.First = p.ts + st.Start
	cond.LikelihoodStart = p.ts
	e := &Estimate{Model: w.m.Clone(), Method: ExactML, SSQ: st.SSQ, N: st.NObs, Conditioning: cond,
		Iter: lres.Iter, StartsTried: tried, Converged: lres.Reason.Converged(), Reason: lres.Reason.String()}
	e.Sigma2 = est.Sigma2(st.SSQ, st.NObs, k)
	e.LogLik = st.LogLik()
	e.AIC = -2*e.LogLik + 2*float64(k+1)
	e.BIC = -2*e.LogLik + float64(k+1)*math.Log(float64(st.NObs))
	e.Resid = make([]float64, w.n)
	for t := range e.Resid {
		e.Resid[t] = math.NaN()
		if t >= p.ts {
			e.Resid[t] = std[t-p.ts]
		}
	}
	inv := invertInformation(hess, k)
	e.Cov = make([][]float64, k)
	e.Params = make([]Param, k)
	for i := range e.Cov {
		e.Cov[i] = make([]float64, k)
		for j := range e.Cov[i] {
			e.Cov[i][j] = math.NaN()
			if inv != nil {
				e.Cov[i][j] = inv.At(i, j)
			}
		}
		se := math.NaN()
		if v := e.Cov[i][i]; v > 0 && !math.IsInf(v, 0) {
			se = math.Sqrt(v)
		}
		e.Params[i] = Param{Name: w.names[i], Value: x[i], Start: start[i], SE: se, T: x[i] / se}
	}
	if err := p.smoothMissing(e); err != nil {
		return nil, err
	}
	// The screen reads the output as given: a NaN breaks a run of equal
	// samples and is never a spike, where the interpolated record would
	// show a gap held flat at an end as a stuck sensor.
	e.Warnings = append(warningsOf(compactResid(e), inv == nil, nil), w.screen(p.y)...)
	return e, nil
}

// invertInformation returns the inverse of the observed information
// hess, nil when it is missing or not positive definite.
func invertInformation(hess *mat.SymDense, k int) *mat.SymDense {
	if hess == nil {
		return nil
	}
	var c mat.Cholesky
	if !c.Factorize(hess) {
		return nil
	}
	inv := mat.NewSymDense(k, nil)
	if c.InverseTo(inv) != nil {
		return nil
	}
	return inv
}

// smoothMissing sets e.Missing: the smoothed estimates of the missing
// output samples with their standard errors (the filter loaded at the
// estimates).
func (p *mlProblem) smoothMissing(e *Estimate) error {
	var idx []int
	for t, v := range p.y {
		if math.IsNaN(v) {
			idx = append(idx, t)
		}
	}
	if len(idx) == 0 {
		return nil
	}
	fill, vr, _, err := p.kf.Smooth(p.z, p.mu())
	if err != nil {
		return errs.Model("fit of output "+strconv.Quote(p.w.m.Output), "the smoother failed at the estimates: "+err.Error())
	}
	e.Missing = make([]MissingValue, len(idx))
	for i, t := range idx {
		mv := MissingValue{Index: t, Value: math.NaN(), SE: math.NaN()}
		if t >= e.Conditioning.First {
			mv.Value = fill[t-p.ts] + p.s[t]
			mv.SE = math.Sqrt(vr[t-p.ts] * e.Sigma2)
		}
		e.Missing[i] = mv
	}
	return nil
}

// compactResid returns a shallow copy of e whose residuals from
// Conditioning.First on hold only the available ones (the missing
// samples' NaN left out, the rest in order), for the warnings' tests
// of the residuals.
func compactResid(e *Estimate) *Estimate {
	c := *e
	t0 := e.Conditioning.First
	c.Resid = append([]float64(nil), e.Resid[:t0]...)
	for _, v := range e.Resid[t0:] {
		if !math.IsNaN(v) {
			c.Resid = append(c.Resid, v)
		}
	}
	return &c
}

// countObserved returns the number of samples of y that are not NaN.
func countObserved(y []float64) int {
	n := 0
	for _, v := range y {
		if !math.IsNaN(v) {
			n++
		}
	}
	return n
}
