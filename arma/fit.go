package arma

import (
	"context"
	"errors"
	"math"
	"strconv"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/est"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/sym"

	"github.com/backshift/backshift/internal/vec"
)

// ConstantRule says whether Fit estimates the constant c, the mean of
// the (differenced) series (parameter name "c").
type ConstantRule int

const (
	// ConstantUnlessDifferenced, the default, estimates c when the model
	// has no differencing and holds it at zero otherwise. The reason:
	// after differencing, c is a drift, a trend of c per sample (for
	// D = 1) that every forecast extends without end; a trend that strong
	// a claim should be asked for (ConstantFree), not added by default.
	ConstantUnlessDifferenced ConstantRule = iota
	// ConstantZero holds c at zero, unless FitSettings.Held holds "c".
	ConstantZero
	// ConstantFree always estimates c; with differencing it is a drift.
	ConstantFree
)

// FitSettings tunes Fit, FitNoise and Select. The zero value gives the
// defaults (the settings rule of the library: zero means the default, a
// negative count or tolerance is a *SettingError).
type FitSettings struct {
	// Name names the series in errors; empty means "series".
	Name string
	// Constant says whether the constant c, the mean of the (differenced)
	// series, is estimated. Default ConstantUnlessDifferenced.
	Constant ConstantRule
	// Regressors holds regressor columns, each of the series' length: the
	// model is for z_t = y_t - sum_k beta_k Regressors[k][t]. The
	// regression coefficients are estimated jointly with the ARMA
	// coefficients; the columns are differenced with the series. A linear
	// trend is the column {0, 1, 2, ...}.
	Regressors [][]float64
	// RegressorNames names the regression coefficients (default "x1",
	// "x2", ...).
	RegressorNames []string
	// Held holds parameters at given values instead of estimating them,
	// by name: "phi1".."phip", "Phi1".. (seasonal AR), "theta1"..,
	// "Theta1".. (seasonal MA), "c" and the regressor names. Unknown
	// names are a *SettingError.
	Held map[string]float64
	// StartValues overrides start values of the search by name (default:
	// Hannan-Rissanen on the last 20000 samples for the ordinary ARMA
	// part, zero for seasonal coefficients, least squares for the
	// constant and regressors).
	StartValues map[string]float64
	// First is the index of the first residual in the sum of squares.
	// Zero means the conditional default: the degree of the expanded AR
	// polynomial (P + SP*Period) plus that of the differencing
	// (D + SD*Period). Smaller nonzero values are a *SettingError.
	First int
	// AllowNonInvertible lets the optimiser leave the invertible region
	// of the MA polynomial. By default, when the start is invertible,
	// steps to MA roots on or outside the unit circle (z-plane) are
	// refused, so that an estimate that wants to cross ends on the
	// boundary and is flagged there (Result.Boundary). Conditional least
	// squares itself is defined on both sides.
	AllowNonInvertible bool
	// MaxIter bounds the optimiser's iterations; zero means 500.
	MaxIter int
	// Tol is the relative reduction of the sum of squares below which the
	// optimiser stops; zero means 1e-14.
	Tol float64
}

// Boundary flags a fitted polynomial with z-plane roots on or outside the
// unit circle: modulus at least 1 - 1e-6. Part is "AR" (not stationary)
// or "MA" (not invertible). Roots is nil when the root finder failed on
// the polynomial (coefficients of extreme size), which is flagged too.
type Boundary struct {
	Part  string
	Roots []complex128
}

// Result is the outcome of a conditional least-squares fit.
type Result struct {
	// Order is the order that was fitted (zero for FitNoise).
	Order Order
	// Model holds the fitted coefficients, Mean and Sigma2 (for FitNoise
	// only Mean and Sigma2 are set; use Noise and the polynomials).
	Model Model
	// Noise is the fitted noise term with the estimates as values.
	Noise Noise
	// AR and MA are the fitted expanded polynomials phi(B)Phi(B^s) and
	// theta(B)Theta(B^s); Diff is the differencing polynomial.
	AR, MA, Diff []float64
	// Beta holds the regression coefficients (held ones included), in
	// the order of FitSettings.Regressors.
	Beta []float64
	// Params lists the estimated (free) parameters: ARMA coefficients in
	// written order, then "c" (the constant c, the mean of the
	// (differenced) series), then the regressors. SE are
	// sqrt(diag(Sigma2 (J'J)^-1)) with J the Jacobian of the residuals at
	// the estimate (Gauss-Newton), T = Value/SE; SE is NaN when J'J is
	// singular. Start is the start value of the search.
	Params []Param
	// SEHessian are standard errors from the observed Hessian of the sum
	// of squares, sqrt(diag(Sigma2 (J'J + sum_t a_t d^2 a_t)^-1)), in
	// Params order, which differ from SE when the second-derivative term
	// matters (MA coefficients, small samples). NaN when that matrix is
	// not positive definite.
	SEHessian []float64
	// Cov and Corr are the covariance and correlation matrices of the
	// Params, in their order (NaN entries when J'J is singular). For a
	// series of extreme scale (about 1e-150) a variance in Cov can
	// underflow to 0; SE and Corr are computed without that loss.
	Cov, Corr [][]float64
	// SSQ is the conditional sum of squares sum_{t >= Start} a_t^2.
	SSQ float64
	// Sigma2 = SSQ / (NUsed - len(Params)), the innovation variance of
	// the library's convention (est.Sigma2; see the package doc).
	Sigma2 float64
	// N is the series length, Start the first summed residual, NUsed =
	// N - Start the number of residuals summed.
	N, Start, NUsed int
	// Resid holds the residuals a_t aligned with the input: Resid[t] for
	// t >= Start, NaN before Start (the conditioning samples).
	Resid []float64
	// LogLik is the Gaussian log-likelihood of the NUsed residuals,
	// conditional on the first Start samples and zero pre-sample
	// innovations, at its maximising variance SSQ/NUsed (not Sigma2):
	//
	//	LogLik = -NUsed/2 (log(2 pi SSQ/NUsed) + 1)
	LogLik float64
	// K is the number of estimated parameters including sigma^2.
	K int
	// AIC = -2 LogLik + 2K, AICc = AIC + 2K(K+1)/(NUsed-K-1),
	// BIC = -2 LogLik + K log(NUsed).
	AIC, AICc, BIC float64
	// Iter and Evals count optimiser iterations and residual evaluations.
	Iter, Evals int
	// Converged reports convergence; Reason says why the optimiser stopped.
	Converged bool
	Reason    string
	// Boundary lists polynomials with roots on or outside the unit circle.
	Boundary []Boundary

	// Forecast state: the last values of z = y - X beta and of the
	// residuals.
	zTail, aTail []float64
	z            []float64 // y - X beta, for the exact forecast state
	narma        int       // free ARMA coefficients (degrees of freedom used)
	byOrder      bool      // fitted by Fit (an Order) rather than FitNoise
}

// Fit estimates a seasonal ARIMA model of y by conditional least squares
// (CLS).
//
// Conditioning: the series is differenced, w_t = (1-B)^D (1-B^s)^SD z_t
// with z_t = y_t - X_t'beta, and the residuals follow the recursion
//
//	a_t = phi*(B) (w_t - mu) - sum_{j>=1} theta*_j a_{t-j},   t >= Start,
//
// phi* and theta* the expanded AR and MA polynomials, with a_t = 0 for t
// < Start (pre-sample innovations zero). Start defaults to the degree of
// phi* plus the degree of the differencing, the first index whose AR
// lags are all observed. The sum of squares of a_Start..a_{n-1} is
// minimised by Levenberg-Marquardt (internal/lm) with the Jacobian
// computed exactly by filtering: for a coefficient c,
//
//	theta*(B) da_t/dc = (dphi*/dc)(B) (w_t - mu) - (dtheta*/dc)(B) a_t,
//
// again from zero at Start; for the mean and regressors the right side is
// -phi*(B) of the (differenced) constant or column.
//
// The fit works in units of a power of two near the size of the
// differenced series' deviations (and of each free regressor column), so
// that its results do not depend on the series' units; the powers of
// two scale exactly, and every result is reported in the series' units.
//
// Errors: *SettingError for a bad order or settings
// (FitSettings.Validate), *SampleError for NaN/Inf in y or a regressor,
// *SeriesError of kind ErrShort when fewer residuals than parameters + 1
// remain and of kind ErrConstant when the series is constant, or
// constant after the differencing (the message says which), a
// *ModelError naming the series when the residual sum of squares is 0
// (an exact fit, or samples so small that their squares underflow) and a
// *SeriesError of kind ErrOverflow when it overflows, where Sigma2 and
// the criteria would not be finite. When the optimiser stops without
// converging Fit returns the best point as a valid *Result together with
// a *ConvergenceError. ctx cancels the fit (the best point so far is
// returned with a *ConvergenceError that also matches ctx's error).
func Fit(ctx context.Context, y []float64, ord Order, opt *FitSettings) (res *Result, err error) {
	defer withOp("arma.Fit", &err)
	return fit(ctx, y, ord, opt)
}

func fit(ctx context.Context, y []float64, ord Order, opt *FitSettings) (*Result, error) {
	if err := ord.validate(); err != nil {
		return nil, err
	}
	s := max(ord.Period, 1)
	ar := factors(make([]float64, ord.P), make([]float64, ord.SP), "phi", "Phi", s)
	ma := factors(make([]float64, ord.Q), make([]float64, ord.SQ), "theta", "Theta", s)
	res, err := fitCore(ctx, y, Noise{AR: ar, MA: ma}, diffPoly(ord.D, ord.SD, s), ord.D+ord.SD > 0, opt, &ord)
	if res != nil {
		res.Order = ord
		res.byOrder = true
		m := Model{D: ord.D, SD: ord.SD, Period: ord.Period, Mean: res.Model.Mean, Sigma2: res.Sigma2}
		m.AR, m.SAR = coefsOf(res.Noise.AR, ord.P, ord.SP)
		m.MA, m.SMA = coefsOf(res.Noise.MA, ord.Q, ord.SQ)
		if ord.SP+ord.SD+ord.SQ == 0 {
			m.Period = 0
		}
		res.Model = m
	}
	return res, err
}

// coefsOf reads back the values of factors built by factors().
func coefsOf(p sym.Poly, n, sn int) (c, sc []float64) {
	i := 0
	read := func(k int) []float64 {
		if k == 0 {
			return nil
		}
		f := p.Factors[i]
		i++
		out := make([]float64, k)
		for j := range out {
			out[j] = f.Terms[j+1].Coef.Value
		}
		return out
	}
	c = read(n)
	sc = read(sn)
	return c, sc
}

// FitNoise estimates a noise model written as factors with named
// coefficients (subset and multiplicative models, shared names) by the
// same conditional least squares as Fit. Free named coefficients are
// estimated from their Values as start values (FitSettings.StartValues
// overrides); unnamed or non-free coefficients are held. diff is the
// differencing polynomial applied to the series (nil for none);
// ConstantUnlessDifferenced estimates c when diff has degree 0; its
// degree is at most MaxLag (a *ModelError otherwise). noise is not
// modified.
func FitNoise(ctx context.Context, y []float64, noise Noise, diff []float64, opt *FitSettings) (res *Result, err error) {
	defer withOp("arma.FitNoise", &err)
	if len(diff) == 0 {
		diff = []float64{1}
	}
	for _, v := range diff {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, modelErr("diff", "coefficients must be finite")
		}
	}
	if diff[0] == 0 {
		return nil, modelErr("diff", "constant term must be non-zero")
	}
	d := poly.Degree(diff)
	if d > MaxLag {
		return nil, modelErr("diff", "degree "+itoa(d)+" above MaxLag = "+itoa(MaxLag))
	}
	diff = diff[:d+1] // trailing zeros would only cost time
	return fitCore(ctx, y, noise.Clone(), diff, d > 0, opt, nil)
}

type coefRef struct {
	c *sym.Coef
	k int
}

// engine holds one fit's data and scratch space; it is used by one
// goroutine.
type engine struct {
	n, t0, m       int
	ar, ma         sym.Poly
	refs           []coefRef
	index          map[string]int
	narma          int
	kmu            int // index of the mean in x, -1 when held
	mu             float64
	shift          float64 // level removed from wy when the mean is free (accuracy)
	kb             []int   // index in x of each regressor, -1 when held
	beta           []float64
	wy             []float64   // differenced y minus held regressors
	wx             [][]float64 // differenced free regressor columns
	w              []float64   // scratch: current w - mu
	one            []float64
	keepInvertible bool // refuse non-invertible MA polynomials in eval
	// scale is the working unit of the differenced series (a power of
	// two), pscale[k] that of parameter k (1 for ARMA coefficients).
	scale  float64
	pscale []float64
	// curvature scratch, allocated on first use
	hr, hlam []float64
	hjac     [][]float64
}

func fitCore(ctx context.Context, y []float64, noise Noise, diff []float64, differenced bool, opt *FitSettings, ord *Order) (*Result, error) {
	var o FitSettings
	if opt != nil {
		o = *opt
	}
	n := len(y)
	if err := o.validate(); err != nil {
		return nil, err
	}
	if err := checkFinite(o.Name, y); err != nil {
		return nil, err
	}
	for k, x := range o.Regressors {
		if len(x) != n {
			return nil, &SeriesError{Series: xName(o, k), Kind: errs.ErrLength, Have: len(x), Need: n, Detail: "a regressor needs the length of " + seriesName(o.Name)}
		}
	}
	e := &engine{n: n, ar: noise.AR, ma: noise.MA, index: map[string]int{}, kmu: -1, one: []float64{1}}
	// Collect the free ARMA coefficients in written order.
	var names []string
	fixedUsed := map[string]bool{}
	badValue := false
	collect := func(c *sym.Coef) {
		if math.IsNaN(c.Value) || math.IsInf(c.Value, 0) {
			badValue = true
		}
		if c.Name == "" {
			return
		}
		if v, ok := o.Held[c.Name]; ok {
			c.Value, c.Free = v, false
			fixedUsed[c.Name] = true
			return
		}
		if !c.Free {
			return
		}
		k, ok := e.index[c.Name]
		if !ok {
			k = len(names)
			e.index[c.Name] = k
			names = append(names, c.Name)
		}
		e.refs = append(e.refs, coefRef{c: c, k: k})
	}
	e.ar.Each(collect)
	e.ma.Each(collect)
	e.narma = len(names)
	if badValue {
		return nil, modelErr("noise", "coefficient values must be finite")
	}
	if _, dup := e.index["c"]; dup {
		return nil, modelErr("noise", `coefficient name "c" is reserved for the constant`)
	}
	phi0 := e.ar.Coeffs()
	th0 := e.ma.Coeffs()
	if phi0[0] == 0 || th0[0] == 0 {
		return nil, modelErr("noise", "AR and MA polynomials need a non-zero constant term")
	}
	degAR, degMA := len(phi0)-1, len(th0)-1
	if degAR > MaxLag || degMA > MaxLag {
		return nil, modelErr("noise", "polynomial degree above MaxLag = "+itoa(MaxLag))
	}
	dd := poly.Degree(diff)
	e.t0 = dd + degAR
	if o.First != 0 {
		if o.First < e.t0 {
			return nil, settingErr("FitSettings.First", itoa(o.First), "must be zero or at least "+itoa(e.t0)+" (AR degree plus differencing)")
		}
		e.t0 = o.First
	}
	// Mean and regressors.
	meanVal, meanFixed := o.Held["c"]
	hasMean := meanFixed || o.Constant == ConstantFree || (o.Constant == ConstantUnlessDifferenced && !differenced)
	if meanFixed {
		fixedUsed["c"] = true
		e.mu = meanVal
	}
	if hasMean && !meanFixed {
		e.kmu = len(names)
		names = append(names, "c")
	}
	e.beta = make([]float64, len(o.Regressors))
	e.kb = make([]int, len(o.Regressors))
	for k := range o.Regressors {
		nm := xName(o, k)
		if _, dup := e.index[nm]; dup || nm == "c" {
			return nil, settingErr("FitSettings.RegressorNames", strconv.Quote(nm), "is also a coefficient of the noise model; name the regressor otherwise")
		}
		e.index[nm] = -1
		if v, ok := o.Held[nm]; ok {
			fixedUsed[nm] = true
			e.beta[k] = v
			e.kb[k] = -1
			continue
		}
		e.kb[k] = len(names)
		names = append(names, nm)
	}
	for nm := range o.Held {
		if !fixedUsed[nm] {
			return nil, settingErr("FitSettings.Held", strconv.Quote(nm), "names no parameter of the model")
		}
	}
	np := len(names)
	e.m = n - e.t0
	// At least two residuals: a single differenced sample would be
	// reported as "constant".
	if e.m < np+1 || e.m < 2 {
		return nil, shortErr(o.Name, n, addSat(e.t0, max(np+1, 2)), "a fit with "+itoa(np)+" parameters from index "+itoa(e.t0))
	}
	// Differenced series and free regressor columns.
	z := append([]float64(nil), y...)
	for k, x := range o.Regressors {
		if e.kb[k] < 0 {
			for t := range z {
				z[t] -= e.beta[k] * x[t]
			}
		}
	}
	e.wy = applyDiff(diff, z)
	for k, x := range o.Regressors {
		if e.kb[k] >= 0 {
			e.wx = append(e.wx, applyDiff(diff, x))
		} else {
			e.wx = append(e.wx, nil)
		}
	}
	if constantFrom(e.wy, dd) && len(o.Regressors) == 0 {
		v := 0.0
		if dd < n {
			v = e.wy[dd]
		}
		vs := strconv.FormatFloat(v, 'g', 6, 64)
		ce := &SeriesError{Series: seriesName(o.Name), Kind: ErrConstant, Detail: "every sample is " + vs + " over its " + itoa(n) + " samples"}
		if dd > 0 {
			ce.Detail = "after the differencing " + diffText(diff) + ": every differenced sample is " + vs + " over its " + itoa(n) + " samples; its levels lie on a line or repeat; use less differencing"
		}
		return nil, ce
	}
	// Work in units of a power of two near the size of the differenced
	// series' deviations (and of each free regressor column), so that
	// the normal equations of the optimiser stay well scaled whatever
	// the series' units: at deviations of 1e8 and beyond the mean's
	// column of J'J was 1e16 times smaller than the coefficients' and the
	// fit stalled. Powers of two scale every operation exactly; the
	// results are scaled back below.
	e.scale = pow2Scale(e.wy[dd:])
	e.pscale = make([]float64, np)
	for k := range e.pscale {
		e.pscale[k] = 1
	}
	if e.scale != 1 {
		for t := range e.wy {
			e.wy[t] /= e.scale
		}
		e.mu /= e.scale
	}
	if e.kmu >= 0 {
		e.pscale[e.kmu] = e.scale
	}
	for k, b := range e.kb {
		if b < 0 {
			continue
		}
		c := pow2Scale(e.wx[k][dd:])
		if c != 1 {
			for t := range e.wx[k] {
				e.wx[k][t] /= c
			}
		}
		e.pscale[b] = e.scale / c
	}
	if e.kmu >= 0 {
		// Estimate the mean as a deviation from the sample level, so that
		// residuals of a series far from zero are not formed by cancelling
		// large numbers (the reported mean adds the level back).
		e.shift = meanOf(e.wy[dd:])
		for t := dd; t < n; t++ {
			e.wy[t] -= e.shift
		}
	}
	e.w = make([]float64, n)
	if testEngineHook != nil {
		testEngineHook(e)
	}
	x0, err := e.start(names, o, ord, dd)
	if err != nil {
		return nil, err
	}
	for nm, v := range o.StartValues {
		k, ok := e.index[nm]
		if nm == "c" && e.kmu >= 0 {
			k, ok = e.kmu, true
		}
		for j, b := range e.kb {
			if b >= 0 && xName(o, j) == nm {
				k, ok = b, true
			}
		}
		if !ok || k < 0 {
			return nil, settingErr("FitSettings.StartValues", strconv.Quote(nm), "names no free parameter of the model")
		}
		v /= e.pscale[k]
		if k == e.kmu {
			v -= e.shift
		}
		x0[k] = v
	}
	// The start values in the series' units, for Params.
	starts := make([]float64, np)
	for k := range starts {
		starts[k] = x0[k]
		if k == e.kmu {
			starts[k] += e.shift
		}
		starts[k] *= e.pscale[k]
	}
	res := &Result{N: n, Start: e.t0, NUsed: e.m, Diff: diff, narma: e.narma}
	var lres lm.Result
	var cerr error
	if np == 0 {
		r := make([]float64, e.m)
		if err := e.eval(nil, r, nil); err != nil {
			return nil, err
		}
		lres = lm.Result{X: nil, SSQ: vec.Dot(r, r), Resid: r, Reason: lm.SmallGradient}
	} else {
		if !o.AllowNonInvertible && e.narma > 0 {
			e.set(x0)
			e.keepInvertible = schurStable(e.ma.Coeffs())
		}
		prob := lm.Problem{M: e.m, N: np, Eval: e.eval}
		lres, err = lm.Minimize(ctx, prob, x0, &lm.Settings{MaxIter: o.MaxIter, FTol: o.Tol})
		if err != nil {
			// The residuals at the start point overflow (the only failure
			// of the optimiser's start with a valid problem).
			return nil, modelErr("start values", "the residuals of "+seriesName(o.Name)+" at the start values are not finite: a FitSettings.StartValues or FitSettings.Held value, or a coefficient value of the noise model, is too large for the series' scale")
		}
	}
	// Newton polish with the exact Hessian (after convergence only): in
	// flat valleys Gauss-Newton converges linearly; a Newton step lands on
	// the minimum. Steps are kept while the sum of squares does not rise
	// above its rounding floor. The last curvature gives the SEs.
	x := append([]float64(nil), lres.X...)
	f := lres.SSQ
	var hess, jtj *mat.SymDense
	var polishedR []float64
	if np > 0 {
		floor := 10 * 0x1p-52 * math.Sqrt(float64(e.m))
		for it := 0; it < 3; it++ {
			h, jj, g, fx, ok := e.curvature(x)
			if !ok {
				break
			}
			hess, jtj, f = h, jj, fx
			if !lres.Reason.Converged() || it == 2 {
				break
			}
			var c mat.Cholesky
			if !c.Factorize(h) {
				break
			}
			var dx mat.VecDense
			if c.SolveVecTo(&dx, mat.NewVecDense(np, append([]float64(nil), g...))) != nil {
				break
			}
			trial := make([]float64, np)
			step := 0.0 // largest relative step component
			for k := range x {
				d := -dx.AtVec(k)
				trial[k] = x[k] + d
				step = math.Max(step, math.Abs(d)/(math.Abs(x[k])+1e-10))
			}
			if step <= 1e-10 {
				break
			}
			trialR := make([]float64, e.m)
			if e.eval(trial, trialR, nil) != nil {
				break
			}
			ft := vec.Dot(trialR, trialR)
			if !(ft <= f*(1+floor)) {
				break
			}
			x, polishedR = trial, trialR
			if step < 1e-6 {
				// A tiny correction: the curvature (and so the SEs) at the
				// new point is the same to that order.
				break
			}
		}
	}
	finalR := lres.Resid
	if polishedR != nil {
		finalR = polishedR
	}
	f = vec.Dot(finalR, finalR)
	// The library's variance convention, SSQ/(N-k) (internal/est).
	sigma2Scaled := est.Sigma2(f, e.m, np) // in the working units
	e.set(x)
	res.Noise = Noise{AR: e.ar, MA: e.ma}
	res.AR = e.ar.Coeffs()
	res.MA = e.ma.Coeffs()
	value := append([]float64(nil), x...)
	if e.kmu >= 0 {
		value[e.kmu] += e.shift
	}
	// Back to the series' units.
	for k := range value {
		value[k] *= e.pscale[k]
	}
	f *= e.scale * e.scale
	for i := range finalR {
		finalR[i] *= e.scale
	}
	res.SSQ = f
	res.Sigma2 = est.Sigma2(f, e.m, np)
	switch {
	case res.Sigma2 == 0:
		return nil, modelErr("fit of "+seriesName(o.Name), "residual sum of squares is 0: the model fits exactly or the residuals are too small for their squares (below about 1e-162, whose square is under the smallest float64); rescale the series")
	case !(res.Sigma2 < math.Inf(1)):
		return nil, &SeriesError{Series: seriesName(o.Name), Kind: ErrOverflow, Detail: "the residual sum of squares overflows: a diff or FitSettings.Held coefficient too large for the series' scale"}
	}
	res.Iter, res.Evals = lres.Iter, lres.Evals
	res.Converged = lres.Reason.Converged()
	res.Reason = lres.Reason.String()
	if !res.Converged {
		ce := &ConvergenceError{Reason: res.Reason, Iter: lres.Iter}
		cerr = ce
		if lres.Reason == lm.Canceled {
			cerr = &canceled{ConvergenceError: ce, ctx: ctx.Err()}
		}
	}
	res.Model.Mean = e.mu * e.scale
	if e.kmu >= 0 {
		res.Model.Mean = value[e.kmu]
	}
	res.Model.Sigma2 = res.Sigma2
	res.Beta = append([]float64(nil), e.beta...)
	for k, b := range e.kb {
		if b >= 0 {
			res.Beta[k] = value[b]
		}
	}
	res.Resid = make([]float64, n)
	for t := 0; t < e.t0; t++ {
		res.Resid[t] = math.NaN()
	}
	copy(res.Resid[e.t0:], finalR)
	// Uncertainty.
	res.Params = make([]Param, np)
	res.SEHessian = make([]float64, np)
	res.Cov = make([][]float64, np)
	res.Corr = make([][]float64, np)
	for k := range res.Params {
		res.Params[k] = Param{Name: names[k], Value: value[k], Start: starts[k], SE: math.NaN(), T: math.NaN()}
		res.SEHessian[k] = math.NaN()
		res.Cov[k] = make([]float64, np)
		res.Corr[k] = make([]float64, np)
		for j := range res.Cov[k] {
			res.Cov[k][j], res.Corr[k][j] = math.NaN(), math.NaN()
		}
	}
	if inv := invSym(jtj); inv != nil {
		for i := 0; i < np; i++ {
			for j := 0; j < np; j++ {
				res.Cov[i][j] = sigma2Scaled * inv.At(i, j) * e.pscale[i] * e.pscale[j]
			}
		}
		// SE and Corr from the working units: a variance of a series at
		// 1e-150 can underflow in Cov where its square root is fine.
		for i := 0; i < np; i++ {
			p := &res.Params[i]
			p.SE = math.Sqrt(sigma2Scaled*inv.At(i, i)) * e.pscale[i]
			p.T = p.Value / p.SE
		}
		for i := 0; i < np; i++ {
			for j := 0; j < np; j++ {
				res.Corr[i][j] = inv.At(i, j) / math.Sqrt(inv.At(i, i)*inv.At(j, j))
			}
		}
	}
	if inv := invSym(hess); inv != nil {
		for k := range res.SEHessian {
			res.SEHessian[k] = math.Sqrt(sigma2Scaled*inv.At(k, k)) * e.pscale[k]
		}
	}
	nu := float64(e.m)
	res.K = np + 1
	// The likelihood at its maximising variance SSQ/N, whatever the
	// reported Sigma2 (see the package doc).
	res.LogLik = -nu / 2 * (math.Log(2*math.Pi*res.SSQ/nu) + 1)
	k := float64(res.K)
	res.AIC = -2*res.LogLik + 2*k
	res.AICc = math.Inf(1)
	if nu-k-1 > 0 {
		res.AICc = res.AIC + 2*k*(k+1)/(nu-k-1)
	}
	res.BIC = -2*res.LogLik + k*math.Log(nu)
	for _, part := range []struct {
		name string
		c    []float64
	}{{"AR", res.AR}, {"MA", res.MA}} {
		bad, err := outside(part.c, 1e-6)
		if err != nil || len(bad) > 0 {
			// Roots that cannot be computed are flagged too (Roots nil):
			// the polynomial cannot be shown to be inside.
			res.Boundary = append(res.Boundary, Boundary{Part: part.name, Roots: bad})
		}
	}
	// Forecast state.
	zf := append([]float64(nil), y...)
	for k, x := range o.Regressors {
		for t := range zf {
			zf[t] -= res.Beta[k] * x[t]
		}
	}
	full := poly.Mul(res.AR, diff)
	res.z = zf
	res.zTail = append([]float64(nil), zf[max(0, n-(len(full)-1)):]...)
	res.aTail = make([]float64, len(res.MA)-1)
	for j := range res.aTail {
		t := n - len(res.aTail) + j
		if t >= e.t0 {
			res.aTail[j] = res.Resid[t]
		}
	}
	return res, cerr
}

func xName(o FitSettings, k int) string {
	if k < len(o.RegressorNames) {
		return o.RegressorNames[k]
	}
	return "x" + itoa(k+1)
}

// applyDiff returns diff(B) x with the first deg(diff) values (which need
// pre-sample data) set to zero; they are never used.
func applyDiff(diff, x []float64) []float64 {
	dd := poly.Degree(diff)
	w := make([]float64, len(x))
	for t := dd; t < len(x); t++ {
		s := 0.0
		for j, c := range diff[:dd+1] {
			if c != 0 {
				s += c * x[t-j]
			}
		}
		w[t] = s
	}
	return w
}

// pow2Scale returns the power of two nearest (in log scale) to the
// largest deviation of w from its mean, 1 when that is zero or not
// finite.
func pow2Scale(w []float64) float64 {
	if len(w) == 0 {
		return 1
	}
	m := meanOf(w)
	d := 0.0
	for _, v := range w {
		d = math.Max(d, math.Abs(v-m))
	}
	if !(d > 0) || math.IsInf(d, 0) {
		return 1
	}
	return math.Ldexp(1, int(math.Round(math.Log2(d))))
}

// diffText writes a differencing polynomial for messages, "(1 - B)".
func diffText(c []float64) string {
	out := "(1"
	for k, v := range c[1:] {
		if v == 0 {
			continue
		}
		sign := " + "
		if v < 0 {
			sign, v = " - ", -v
		}
		out += sign
		if v != 1 {
			out += strconv.FormatFloat(v, 'g', 6, 64) + " "
		}
		out += "B"
		if k+1 > 1 {
			out += "^" + itoa(k+1)
		}
	}
	return out + ")"
}

func constantFrom(w []float64, from int) bool {
	if from >= len(w) {
		return true
	}
	for _, v := range w[from:] {
		if v != w[from] {
			return false
		}
	}
	return true
}

// set writes x into the engine's coefficient values.
func (e *engine) set(x []float64) {
	for _, r := range e.refs {
		r.c.Value = x[r.k]
	}
}

// eval computes the residuals a_t0..a_{n-1} into r and, when jac is not
// nil, their derivatives by filtering.
func (e *engine) eval(x, r []float64, jac [][]float64) error {
	e.set(x)
	phi, dphi := e.ar.Grad(e.lookup, e.narma)
	theta, dtheta := e.ma.Grad(e.lookup, e.narma)
	if e.keepInvertible && !schurStable(theta) {
		return errNonInvertible
	}
	mu := e.mu
	if e.kmu >= 0 {
		mu = x[e.kmu]
	}
	w := e.w
	for t, v := range e.wy {
		w[t] = v - mu
	}
	for k, b := range e.kb {
		if b < 0 {
			continue
		}
		beta, col := x[b], e.wx[k]
		for t := range w {
			w[t] -= beta * col[t]
		}
	}
	t0 := e.t0
	lagApply(r, phi, w, t0, 0)
	maOne := len(theta) == 1 && theta[0] == 1
	if !maOne {
		filter.Run(r, e.one, theta, r)
	}
	if jac == nil {
		return nil
	}
	for k := 0; k < e.narma; k++ {
		col := jac[k]
		if dphi[k] != nil {
			lagApply(col, dphi[k], w, t0, 0)
		} else {
			clear(col)
		}
		if dtheta[k] != nil {
			lagSub(col, dtheta[k], r)
		}
		if !maOne {
			filter.Run(col, e.one, theta, col)
		}
	}
	if e.kmu >= 0 {
		col := jac[e.kmu]
		s := 0.0
		for _, c := range phi {
			s += c
		}
		for i := range col {
			col[i] = -s
		}
		if !maOne {
			filter.Run(col, e.one, theta, col)
		}
	}
	for k, b := range e.kb {
		if b < 0 {
			continue
		}
		col := jac[b]
		lagApply(col, phi, e.wx[k], t0, 0)
		for i := range col {
			col[i] = -col[i]
		}
		if !maOne {
			filter.Run(col, e.one, theta, col)
		}
	}
	return nil
}

func (e *engine) lookup(name string) int {
	k, ok := e.index[name]
	if !ok {
		return -1
	}
	return k
}

// lagApply writes dst[i] = sum_j c_j src[t0+i-j] over the non-zero c_j;
// acc = 1 adds to dst instead of overwriting (dst was cleared).
func lagApply(dst, c, src []float64, t0 int, acc int) {
	var idx [MaxLag + 1]int
	var val [MaxLag + 1]float64
	nz := 0
	for j, v := range c {
		if v != 0 {
			idx[nz], val[nz] = j, v
			nz++
		}
	}
	m := len(dst)
	switch {
	case nz == 1 && idx[0] == 0 && val[0] == 1 && acc == 0:
		copy(dst, src[t0:t0+m])
	case nz == 1 && acc == 0:
		v, s := val[0], src[t0-idx[0]:t0-idx[0]+m]
		for i := range dst {
			dst[i] = v * s[i]
		}
	case nz == 3 && acc == 0:
		v0, v1, v2 := val[0], val[1], val[2]
		s0 := src[t0-idx[0] : t0-idx[0]+m]
		s1 := src[t0-idx[1] : t0-idx[1]+m]
		s2 := src[t0-idx[2] : t0-idx[2]+m]
		for i := range dst {
			dst[i] = v0*s0[i] + v1*s1[i] + v2*s2[i]
		}
	default:
		if acc == 0 {
			clear(dst)
		}
		for q := 0; q < nz; q++ {
			v, s := val[q], src[t0-idx[q]:t0-idx[q]+m]
			for i := range dst {
				dst[i] += v * s[i]
			}
		}
	}
}

// lagSub subtracts sum_j c_j a_{i-j} (a zero before index 0) from dst.
func lagSub(dst, c, a []float64) {
	m := len(dst)
	for j, v := range c {
		if v == 0 || j >= m {
			continue
		}
		d, s := dst[j:], a[:m-j]
		for i := range d {
			d[i] -= v * s[i]
		}
	}
}

// start returns the start vector: Hannan-Rissanen for the ordinary ARMA
// part of an Order fit, the written values for FitNoise, least squares
// for the mean and regressors.
func (e *engine) start(names []string, o FitSettings, ord *Order, dd int) ([]float64, error) {
	x0 := make([]float64, len(names))
	for _, r := range e.refs {
		x0[r.k] = r.c.Value
	}
	// Regression part by OLS of w on the free differenced columns (+1).
	w := e.wy[dd:]
	var cols [][]float64
	var ks []int
	if e.kmu >= 0 {
		cols = append(cols, nil) // the constant column, filled below if needed
		ks = append(ks, e.kmu)
	}
	for k, b := range e.kb {
		if b >= 0 {
			cols = append(cols, e.wx[k][dd:])
			ks = append(ks, b)
		}
	}
	resid := append([]float64(nil), w...)
	for i := range resid {
		resid[i] -= e.mu // zero unless the mean is held at a value
	}
	if len(cols) == 1 && e.kmu >= 0 {
		// Mean only: the least-squares start is the average.
		mu := meanOf(resid)
		x0[e.kmu] = mu
		for i := range resid {
			resid[i] -= mu
		}
	} else if len(cols) > 0 && len(w) > len(cols) {
		a := mat.NewDense(len(w), len(cols), nil)
		for j, c := range cols {
			for i := range w {
				if c == nil {
					a.Set(i, j, 1)
				} else {
					a.Set(i, j, c[i])
				}
			}
		}
		var qr mat.QR
		qr.Factorize(a)
		var beta mat.VecDense
		if err := qr.SolveVecTo(&beta, false, mat.NewVecDense(len(resid), append([]float64(nil), resid...))); err == nil {
			for j := range cols {
				x0[ks[j]] = beta.AtVec(j)
				for i := range resid {
					if cols[j] == nil {
						resid[i] -= beta.AtVec(j)
					} else {
						resid[i] -= beta.AtVec(j) * cols[j][i]
					}
				}
			}
		}
	}
	if ord == nil || ord.P+ord.Q == 0 {
		return x0, nil
	}
	// Start values need no more than the last hrMax samples.
	if len(resid) > hrMax {
		resid = resid[len(resid)-hrMax:]
	}
	phi, theta, err := hannanRissanen(resid, ord.P, ord.Q, 0)
	if err != nil {
		if errors.Is(err, ErrShort) || errors.Is(err, ErrConstant) {
			return x0, nil // too short for the long AR: start from zero
		}
		return nil, err
	}
	for j := 1; j <= ord.P; j++ {
		if k, ok := e.index["phi"+itoa(j)]; ok {
			x0[k] = -phi[j]
		}
	}
	for j := 1; j <= ord.Q; j++ {
		if k, ok := e.index["theta"+itoa(j)]; ok {
			x0[k] = -theta[j]
		}
	}
	return x0, nil
}

// hrMax bounds the samples used for Hannan-Rissanen start values.
const hrMax = 20000

// testEngineHook lets tests reach the engine of a fit (nil otherwise).
var testEngineHook func(*engine)

// invSym returns the inverse of a positive definite matrix, nil when a is
// nil or not positive definite.
func invSym(a *mat.SymDense) *mat.SymDense {
	if a == nil {
		return nil
	}
	var c mat.Cholesky
	if !c.Factorize(a) {
		return nil
	}
	inv := mat.NewSymDense(a.SymmetricDim(), nil)
	if c.InverseTo(inv) != nil {
		return nil
	}
	return inv
}

var errNonInvertible = errors.New("arma: MA polynomial not invertible")

// schurStable reports whether every root in B of a (a[0] != 0) lies
// strictly outside the unit circle (every z-plane root strictly inside),
// by the Schur-Cohn step-down recursion: the reflection coefficients must
// all have modulus below 1. It allocates only for degrees above 32.
func schurStable(a []float64) bool {
	m := len(a) - 1
	for m > 0 && a[m] == 0 {
		m--
	}
	if m == 0 {
		return true
	}
	// The stack buffer serves degrees up to 32; the size is checked
	// before slicing (slicing first panicked for every degree above 32).
	var buf [2][33]float64
	var cur, nxt []float64
	if m < len(buf[0]) {
		cur, nxt = buf[0][:m+1], buf[1][:m+1]
	} else {
		cur, nxt = make([]float64, m+1), make([]float64, m+1)
	}
	for j := 0; j <= m; j++ {
		cur[j] = a[j] / a[0]
	}
	for k := m; k >= 1; k-- {
		kap := cur[k]
		if !(math.Abs(kap) < 1) {
			return false
		}
		d := 1 - kap*kap
		nxt[0] = 1
		for j := 1; j < k; j++ {
			nxt[j] = (cur[j] - kap*cur[k-j]) / d
		}
		cur, nxt = nxt, cur
	}
	return true
}
