package arma

import (
	"context"
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/kalman"
	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/sym"
)

// Method chooses how Fit, FitNoise and Select estimate a model.
type Method int

const (
	// LeastSquares, the default, is conditional least squares (see Fit).
	// It stays the default because on long records it agrees with exact
	// maximum likelihood to a small fraction of a standard error (the
	// conditioning affects O(p + q) of n samples) at less cost, and its
	// residuals are defined without a state-space model. It refuses
	// missing samples.
	LeastSquares Method = iota
	// ExactML is exact Gaussian maximum likelihood through the Kalman
	// filter of internal/kalman, with sigma^2 concentrated out; NaN
	// samples of the series are skipped exactly (see FitSettings.Method).
	// The search may cross the MA invertibility boundary, where the
	// likelihood is the same for a polynomial and for the one with its
	// roots inverted (Brockwell & Davis 1991, 4.4), and maps its point
	// back by inverting the roots outside the unit circle, as R's arima
	// does; an estimate with an MA root within 1e-3 of the circle
	// (kalman.BoundaryTol) is flagged in Result.Boundary. MA parts whose
	// factors cannot be rewritten so (a held coefficient beside free
	// ones, a name shared with another polynomial, a sparse factor with
	// several free terms) keep the search inside instead.
	ExactML
)

// String returns "conditional least squares" or "exact maximum
// likelihood".
func (m Method) String() string {
	switch m {
	case LeastSquares:
		return "conditional least squares"
	case ExactML:
		return "exact maximum likelihood"
	}
	return "Method(" + strconv.Itoa(int(m)) + ")"
}

// MissingValue is the smoothed estimate of one missing sample of the
// series (an exact-likelihood fit): its index, E(y_t | observed samples)
// at the estimates (regression part included) and the standard error of
// that estimate for known coefficients, sqrt(Sigma2 var_t) with var_t
// the smoother's variance in units of sigma^2. Value and SE are NaN for
// a missing sample before the likelihood's Start (with differencing:
// before the first deg(Diff) consecutive observed samples).
type MissingValue struct {
	Index     int
	Value, SE float64
}

// startMax bounds the samples of the least-squares fit that gives the
// start values of an exact-likelihood fit.
const startMax = 20000

// mlProblem is the exact likelihood over the parameter vector of an
// engine, in its working units. Used by one goroutine.
type mlProblem struct {
	e       *engine
	kf      *kalman.Filter
	base    []float64   // (y - held regressors)/scale, less the level shift when dd = 0
	xs      [][]float64 // free regressor columns in working units (nil for held ones)
	z       []float64   // scratch: base - free regression part
	cur     []float64   // the noise series at the last load: base, or z with free regressors
	std     []float64   // scratch: standardised innovations
	obs     []int       // indices of the observed samples from Start on
	mushift float64     // added to the working mean (the shift when dd > 0)
	evals   int
	// anyMA lets load accept a non-invertible MA polynomial (the exact
	// likelihood is defined there): the Hessian's stencil around an
	// estimate on the invertibility boundary may cross it.
	anyMA bool
	// cross lets load accept a non-invertible MA polynomial for the
	// whole fit: the search may cross the boundary and is mapped back
	// by root inversion of flip (see exact_flip.go).
	cross bool
	flip  []poly.FactorMap
}

// estimateML fits by exact maximum likelihood (the ExactML method of
// Fit and FitNoise): start values by conditional least squares on the
// series with gaps filled by linear interpolation (at most the last
// startMax samples), the search by Levenberg-Marquardt on the scaled
// innovations, a Newton step with the numerical Hessian, and the report.
func estimateML(ctx context.Context, y []float64, noise Noise, diff []float64, differenced bool, o FitSettings, ord *Order) (*Result, error) {
	if err := checkInputsML(y, o); err != nil {
		return nil, err
	}
	yf := interpolate(y)
	e, err := bind(yf, noise, diff, differenced, o)
	if err != nil {
		return nil, err
	}
	x0, err := clsStart(ctx, e, yf, noise, diff, differenced, o, ord)
	if err != nil {
		return nil, err
	}
	p, err := newMLProblem(e, y, o)
	if err != nil {
		return nil, err
	}
	e.shrinkInside(e.ar, x0)
	if !o.AllowNonInvertible && e.narma > 0 {
		e.shrinkInside(e.ma, x0)
		e.set(x0)
		e.keepInvertible = schurStable(e.ma.Coeffs())
	}
	m := len(p.obs)
	if m < len(e.names)+1 || m < 2 {
		return nil, shortErr(o.Name, m, max(len(e.names)+1, 2), "an exact-likelihood fit with "+itoa(len(e.names))+" parameters; the count is of observed (not missing) samples after the conditioning, of the record's "+itoa(len(y)))
	}
	if e.keepInvertible {
		p.flip = newMAFlip(e)
		p.cross = p.flip != nil
	}
	lres := lm.Result{X: x0, Reason: lm.SmallGradient}
	atBoundary := false
	if len(e.names) > 0 {
		if _, err := p.stats(x0); err != nil {
			return nil, modelErr("start values", "the exact likelihood of "+seriesName(o.Name)+" cannot be computed at the start values: "+err.Error())
		}
		prob := lm.Problem{M: m, N: len(e.names), Eval: kalman.JacobianEval(p.residuals), WritesAll: true}
		lres, atBoundary, err = p.search(ctx, prob, x0, lm.Settings{MaxIter: o.MaxIter, FTol: o.Tol})
		if err != nil {
			return nil, modelErr("start values", "the exact likelihood of "+seriesName(o.Name)+" is not finite at the start values")
		}
	}
	x, hess, err := p.finish(ctx, &lres, atBoundary)
	if err != nil {
		lres.Reason = lm.Canceled // ctx was done during a Hessian: report as a cancelled search
	}
	return p.report(ctx, y, o, x0, x, hess, lres)
}

// checkInputsML is checkInputs with NaN samples of y accepted (missing);
// infinite or too large samples are still a *SampleError.
func checkInputsML(y []float64, o FitSettings) error {
	if err := o.validate(); err != nil {
		return err
	}
	for i, v := range y {
		if !math.IsNaN(v) && !(math.Abs(v) <= MaxAbs) {
			return &SampleError{Series: seriesName(o.Name), Index: i, Value: v, Limit: MaxAbs}
		}
	}
	for k, x := range o.Regressors {
		if len(x) != len(y) {
			return &SeriesError{Series: xName(o, k), Kind: errs.ErrLength, Have: len(x), Need: len(y), Detail: "a regressor needs the length of " + seriesName(o.Name)}
		}
	}
	for _, v := range y {
		if !math.IsNaN(v) {
			return nil
		}
	}
	return &SeriesError{Series: seriesName(o.Name), Kind: ErrShort, Have: 0, Need: 2, Detail: "every sample is missing (NaN)"}
}

// interpolate returns y with NaN runs filled by linear interpolation
// between their observed neighbours (held flat at the ends); used only
// for the start values of an exact-likelihood fit.
func interpolate(y []float64) []float64 {
	out := append([]float64(nil), y...)
	last := -1
	for t, v := range y {
		if math.IsNaN(v) {
			continue
		}
		if last < 0 {
			for i := 0; i < t; i++ {
				out[i] = v
			}
		} else if t > last+1 {
			for i := last + 1; i < t; i++ {
				out[i] = y[last] + (v-y[last])*float64(i-last)/float64(t-last)
			}
		}
		last = t
	}
	for i := last + 1; i < len(y); i++ {
		out[i] = y[last]
	}
	return out
}

// clsStart returns the start of the exact-likelihood search in the
// working units of e: the conditional least-squares estimate on yf (the
// gap-filled series), on its last startMax samples when it is longer.
// A least-squares search that stops without converging still gives its
// best point.
func clsStart(ctx context.Context, e *engine, yf []float64, noise Noise, diff []float64, differenced bool, o FitSettings, ord *Order) ([]float64, error) {
	es := e
	if len(yf) > startMax {
		cut := len(yf) - startMax
		os := o
		os.Regressors = make([][]float64, len(o.Regressors))
		for k, c := range o.Regressors {
			os.Regressors[k] = c[cut:]
		}
		var err error
		if es, err = bind(yf[cut:], noise.Clone(), diff, differenced, os); err != nil {
			return nil, err
		}
	}
	_, lres, err := es.search(ctx, o, ord)
	if err != nil {
		return nil, err
	}
	x := lres.X
	if es == e {
		return append([]float64(nil), x...), nil
	}
	return e.workingUnits(es.seriesUnits(x)), nil
}

// shrinkInside moves a start whose polynomial pl (the AR or the MA part
// of e) has a z-plane root of modulus 0.98 or more into the interior:
// its free coefficients are scaled by 0.7 until no root is that close to
// the unit circle (at most 20 times). The exact likelihood needs a
// stationary AR part, and a least-squares start on the MA invertibility
// boundary would hold the search there when its steps may not cross
// (an MA part that root inversion cannot rewrite, see newMAFlip; the MA
// part is not moved under FitSettings.AllowNonInvertible).
func (e *engine) shrinkInside(pl sym.Poly, x0 []float64) {
	ks := map[int]bool{}
	pl.Each(func(c *sym.Coef) {
		for _, r := range e.refs {
			if r.c == c {
				ks[r.k] = true
			}
		}
	})
	if len(ks) == 0 {
		return
	}
	for it := 0; it < 20; it++ {
		e.set(x0)
		if bad, err := outside(pl.Coeffs(), 0.02); err != nil || len(bad) == 0 {
			return
		}
		for k := range ks {
			x0[k] *= 0.7
		}
	}
}

// workingUnits is the inverse of seriesUnits.
func (e *engine) workingUnits(v []float64) []float64 {
	x := make([]float64, len(v))
	for k := range v {
		x[k] = v[k] / e.pscale[k]
	}
	if e.kmu >= 0 {
		x[e.kmu] -= e.shift
	}
	return x
}

// newMLProblem prepares the exact likelihood of y (NaN where missing)
// over e's parameters: the series and free regressor columns in e's
// working units, the filter, and the observed samples.
func newMLProblem(e *engine, y []float64, o FitSettings) (*mlProblem, error) {
	n := len(y)
	p := &mlProblem{e: e, base: make([]float64, n), z: make([]float64, n), std: make([]float64, n)}
	for t, v := range y {
		for k, x := range o.Regressors {
			if e.kb[k] < 0 {
				v -= e.beta[k] * x[t]
			}
		}
		p.base[t] = v / e.scale
	}
	if e.dd == 0 {
		for t := range p.base {
			p.base[t] -= e.shift
		}
	} else {
		p.mushift = e.shift
	}
	p.xs = make([][]float64, len(o.Regressors))
	for k, x := range o.Regressors {
		if b := e.kb[k]; b >= 0 {
			c := e.scale / e.pscale[b]
			col := make([]float64, n)
			for t := range col {
				col[t] = x[t] / c
			}
			p.xs[k] = col
		}
	}
	e.set(make([]float64, len(e.names)))
	kf, err := kalman.New([]float64{1}, []float64{1}, e.diff)
	if err != nil {
		return nil, modelErr("diff", err.Error())
	}
	p.kf = kf
	st0 := -1
	run := 0
	for t, v := range y {
		if st0 < 0 && run == e.dd {
			st0 = t
		}
		if st0 >= 0 && !math.IsNaN(v) {
			p.obs = append(p.obs, t)
		}
		if math.IsNaN(v) {
			run = 0
		} else {
			run++
		}
	}
	if len(p.obs) == 0 {
		return nil, &SeriesError{Series: seriesName(o.Name), Kind: ErrShort, Have: n, Need: e.dd + 1, Detail: "no observed sample after " + itoa(e.dd) + " consecutive observed samples to condition the differencing on"}
	}
	return p, nil
}

// load sets the filter's polynomials and the noise series z at x and
// returns the working mean.
func (p *mlProblem) load(x []float64) (float64, error) {
	e := p.e
	e.set(x)
	if e.keepInvertible && !p.anyMA && !p.cross && !schurStable(e.ma.Coeffs()) {
		return 0, errNonInvertible
	}
	if err := p.kf.Set(e.ar.Coeffs(), e.ma.Coeffs()); err != nil {
		return 0, err
	}
	p.cur = p.base
	for k, col := range p.xs {
		if col == nil {
			continue
		}
		if p.cur != nil && &p.cur[0] == &p.base[0] {
			copy(p.z, p.base)
			p.cur = p.z
		}
		b := x[e.kb[k]]
		for t, v := range col {
			p.z[t] -= b * v
		}
	}
	mu := e.mu
	if e.kmu >= 0 {
		mu = x[e.kmu] + p.mushift
	}
	return mu, nil
}

// stats runs the filter at x (standardised innovations into p.std).
func (p *mlProblem) stats(x []float64) (kalman.Stats, error) {
	p.evals++
	mu, err := p.load(x)
	if err != nil {
		return kalman.Stats{}, err
	}
	st, err := p.kf.Run(p.cur, mu, p.std, nil)
	if err == nil && !(st.SSQ > 0 && st.SSQ < math.Inf(1)) {
		err = errNonInvertible // a degenerate point: refuse the step
	}
	return st, err
}

// negLogLik returns minus the exact concentrated log-likelihood at x in
// working units (+Inf where it cannot be computed).
func (p *mlProblem) negLogLik(x []float64) float64 {
	st, err := p.stats(x)
	if err != nil {
		return math.Inf(1)
	}
	return -st.LogLik()
}

// residuals writes the scaled innovations of the observed samples at x
// into r (kalman.Filter.Scaled): their sum of squares is minimised at
// the maximum of the likelihood.
func (p *mlProblem) residuals(x, r []float64) error {
	p.evals++
	mu, err := p.load(x)
	if err != nil {
		return err
	}
	st, err := p.kf.Scaled(r, p.cur, mu)
	if err == nil && !(st.SSQ > 0 && st.SSQ < math.Inf(1)) {
		err = errNonInvertible // a degenerate point: refuse the step
	}
	return err
}
