package arma

import (
	"context"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/est"
	"github.com/backshift/backshift/internal/kalman"
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
	// Method chooses the estimator: LeastSquares (the default,
	// conditional least squares; NaN samples are refused) or ExactML
	// (exact Gaussian maximum likelihood by the Kalman filter; NaN
	// samples of the series are missing values, skipped exactly, and
	// Result.Missing holds their smoothed estimates). ExactML starts
	// from the least-squares estimate on the series with its gaps filled
	// by linear interpolation (the last 20000 samples of a longer
	// series), searches by Levenberg-Marquardt on the scaled innovations
	// (forward-difference Jacobian, step 2^-26 max(|x|, 1) in working
	// units) and ends with Newton steps on the numerical Hessian of the
	// log-likelihood (central differences along the axes that the
	// search's Gauss-Newton information makes uncorrelated, a tenth of a
	// standard error or less; see kalman.Information), whose inverse
	// gives the standard errors (the observed information).
	// Regressor columns must be complete under both methods; First
	// applies to the least-squares start only, Tol and MaxIter to both
	// searches. Result.Evals counts likelihood evaluations (filter
	// passes) for ExactML.
	Method Method
}

// Boundary flags a fitted polynomial with z-plane roots on or outside the
// unit circle: modulus at least 1 - 1e-6. Part is "AR" (not stationary)
// or "MA" (not invertible). Roots is nil when the root finder failed on
// the polynomial (coefficients of extreme size), which is flagged too.
type Boundary struct {
	Part  string
	Roots []complex128
}

// Result is the outcome of a fit. The comments below describe the
// conditional least-squares fit; for an exact-likelihood fit (Method
// ExactML) Start is the first index of the likelihood (0, or after the
// differencing's conditioning samples), NUsed the observed samples from
// Start on, SSQ the sum of squared standardised innovations sum v_t^2/F_t
// (series units), Resid the standardised innovations v_t F_t^(-1/2)
// (NaN where missing and before Start), LogLik the exact log-likelihood
// at sigma^2 = SSQ/NUsed,
//
//	LogLik = -NUsed/2 (log(2 pi SSQ/NUsed) + 1) - 1/2 sum_t log F_t,
//
// the criteria from it, SE and SEHessian both from the inverse of the
// numerical Hessian of minus the log-likelihood (Cov and Corr too), and
// Missing the smoothed missing samples.
type Result struct {
	// Method is the estimator that was used.
	Method Method
	// Missing lists the smoothed estimates of the NaN samples of the
	// series, in index order (exact-likelihood fits only).
	Missing []MissingValue
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

// fit is Fit without the Op of its errors (Select calls it too).
func fit(ctx context.Context, y []float64, ord Order, opt *FitSettings) (*Result, error) {
	if err := ord.validate(); err != nil {
		return nil, err
	}
	noise, diff := ord.terms()
	res, err := estimate(ctx, y, noise, diff, ord.D+ord.SD > 0, opt, &ord)
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

// terms returns the noise term of the order with zero free coefficients
// phi1.., Phi1.., theta1.., Theta1.. and its differencing polynomial.
func (ord Order) terms() (Noise, []float64) {
	s := max(ord.Period, 1)
	ar := factors(make([]float64, ord.P), make([]float64, ord.SP), "phi", "Phi", s)
	ma := factors(make([]float64, ord.Q), make([]float64, ord.SQ), "theta", "Theta", s)
	return Noise{AR: ar, MA: ma}, diffPoly(ord.D, ord.SD, s)
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
	return estimate(ctx, y, noise.Clone(), diff, d > 0, opt, nil)
}

// estimate fits noise to y by conditional least squares, the work of Fit
// and FitNoise: it checks the inputs, binds the parameters (bind), finds
// the start values, minimises the sum of squares (solve), refines the
// minimum by Newton steps (polish) and reports the estimates with their
// uncertainty, the criteria and the forecast state (report). ord is the
// order of a Fit call (Hannan-Rissanen start values), nil for FitNoise;
// noise is used in place (the caller passes a copy).
func estimate(ctx context.Context, y []float64, noise Noise, diff []float64, differenced bool, opt *FitSettings, ord *Order) (*Result, error) {
	var o FitSettings
	if opt != nil {
		o = *opt
	}
	if o.Method == ExactML {
		return estimateML(ctx, y, noise, diff, differenced, o, ord)
	}
	if err := checkInputs(y, o); err != nil {
		return nil, err
	}
	e, err := bind(y, noise, diff, differenced, o)
	if err != nil {
		return nil, err
	}
	x0, lres, err := e.search(ctx, o, ord)
	if err != nil {
		return nil, err
	}
	return e.report(ctx, y, o, x0, lres, e.polish(lres))
}

// search runs the least-squares search of e from its start values
// (start, with FitSettings.StartValues applied) and returns the start
// and the search's result.
func (e *engine) search(ctx context.Context, o FitSettings, ord *Order) ([]float64, lm.Result, error) {
	x0, err := e.start(ord)
	if err != nil {
		return nil, lm.Result{}, err
	}
	if err := e.applyStartValues(o, x0); err != nil {
		return nil, lm.Result{}, err
	}
	lres, err := e.solve(ctx, x0, o)
	return x0, lres, err
}

// solve minimises the sum of squares from x0 by Levenberg-Marquardt
// (internal/lm); with no free parameter it computes the residuals once.
// Unless FitSettings.AllowNonInvertible, a start with an invertible MA
// polynomial keeps the search in the invertible region.
func (e *engine) solve(ctx context.Context, x0 []float64, o FitSettings) (lm.Result, error) {
	np := len(e.names)
	if np == 0 {
		r := make([]float64, e.m)
		if err := e.eval(nil, r, nil); err != nil {
			return lm.Result{}, err
		}
		return lm.Result{X: nil, SSQ: vec.Dot(r, r), Resid: r, Reason: lm.SmallGradient}, nil
	}
	if !o.AllowNonInvertible && e.narma > 0 {
		e.set(x0)
		e.keepInvertible = schurStable(e.ma.Coeffs())
	}
	prob := lm.Problem{M: e.m, N: np, Eval: e.eval}
	lres, err := lm.Minimize(ctx, prob, x0, &lm.Settings{MaxIter: o.MaxIter, FTol: o.Tol})
	if err != nil {
		// The residuals at the start point overflow (the only failure
		// of the optimiser's start with a valid problem).
		return lm.Result{}, modelErr("start values", "the residuals of "+seriesName(o.Name)+" at the start values are not finite: a FitSettings.StartValues or FitSettings.Held value, or a coefficient value of the noise model, is too large for the series' scale")
	}
	return lres, nil
}

// optimum is the point a fit reports, in working units: the parameters
// x, the residuals r there, and the curvature (half the Hessian of the
// sum of squares, and J'J) for the standard errors (nil when they could
// not be computed).
type optimum struct {
	x, r      []float64
	hess, jtj *mat.SymDense
}

// polish refines the optimiser's point by Newton steps with the exact
// Hessian, after convergence only: in flat valleys Gauss-Newton converges
// linearly; a Newton step lands on the minimum. Steps are kept while the
// sum of squares does not rise above its rounding floor (10 eps
// sqrt(NUsed) relative, the floor internal/lm uses). The last curvature
// computed gives the standard errors.
func (e *engine) polish(lres lm.Result) optimum {
	opt := optimum{x: append([]float64(nil), lres.X...), r: lres.Resid}
	if len(e.names) == 0 {
		return opt
	}
	f := lres.SSQ
	floor := 10 * 0x1p-52 * math.Sqrt(float64(e.m))
	for it := 0; it < 3; it++ {
		h, jj, g, fx, ok := e.curvature(opt.x)
		if !ok {
			break
		}
		opt.hess, opt.jtj, f = h, jj, fx
		if !lres.Reason.Converged() || it == 2 {
			break
		}
		trial, step, ok := kalman.NewtonStep(opt.x, h, g)
		if !ok || step <= 1e-10 {
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
		opt.x, opt.r = trial, trialR
		if step < 1e-6 {
			// A tiny correction: the curvature (and so the SEs) at the
			// new point is the same to that order.
			break
		}
	}
	return opt
}

// report builds the Result at the optimum in the series' units: the
// estimates, residuals and variance (refusing a sum of squares that is 0
// or overflows), how the search ended (with the *ConvergenceError to
// return when it did not converge), the standard errors, the criteria,
// the boundary flags and the forecast state. x0 is the start vector.
func (e *engine) report(ctx context.Context, y []float64, o FitSettings, x0 []float64, lres lm.Result, opt optimum) (*Result, error) {
	np := len(e.names)
	f := vec.Dot(opt.r, opt.r)
	// The library's variance convention, SSQ/(N-k) (internal/est), in
	// the working units.
	sigma2Scaled := est.Sigma2(f, e.m, np)
	res := &Result{N: e.n, Start: e.t0, NUsed: e.m, Diff: e.diff, narma: e.narma}
	if err := e.residuals(res, o.Name, opt.r, f); err != nil {
		return nil, err
	}
	e.set(opt.x)
	e.estimates(res, opt.x, x0)
	e.uncertainty(res, opt, sigma2Scaled)
	res.criteria(np)
	res.flagBoundary()
	res.forecastState(y, o.Regressors)
	return res, searchEnd(ctx, res, lres)
}

// estimates sets the estimates of res in the series' units from the
// working vector x (start vector x0), the engine's polynomials set at x:
// the noise polynomials, the mean, the regression coefficients, the model
// variance (res.Sigma2, set before) and the parameters, their SE and T
// NaN until the uncertainty is known.
func (e *engine) estimates(res *Result, x, x0 []float64) {
	res.Noise = Noise{AR: e.ar, MA: e.ma}
	res.AR = e.ar.Coeffs()
	res.MA = e.ma.Coeffs()
	value := e.seriesUnits(x)
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
	starts := e.seriesUnits(x0)
	res.Params = make([]Param, len(e.names))
	for k := range res.Params {
		res.Params[k] = Param{Name: e.names[k], Value: value[k], Start: starts[k], SE: math.NaN(), T: math.NaN()}
	}
}

// residuals sets the residuals (NaN before Start), SSQ and Sigma2 of res
// in the series' units from the residuals r of the working units (scaled
// in place) and their sum of squares f; a sum of squares that is 0 is a
// *ModelError, one that overflows a *SeriesError of kind ErrOverflow.
func (e *engine) residuals(res *Result, name string, r []float64, f float64) error {
	f *= e.scale * e.scale
	for i := range r {
		r[i] *= e.scale
	}
	res.SSQ = f
	res.Sigma2 = est.Sigma2(f, e.m, len(e.names))
	switch {
	case res.Sigma2 == 0:
		return modelErr("fit of "+seriesName(name), "residual sum of squares is 0: the model fits exactly or the residuals are too small for their squares (below about 1e-162, whose square is under the smallest float64); rescale the series")
	case !(res.Sigma2 < math.Inf(1)):
		return &SeriesError{Series: seriesName(name), Kind: ErrOverflow, Detail: "the residual sum of squares overflows: a diff or FitSettings.Held coefficient too large for the series' scale"}
	}
	res.Resid = make([]float64, e.n)
	for t := 0; t < e.t0; t++ {
		res.Resid[t] = math.NaN()
	}
	copy(res.Resid[e.t0:], r)
	return nil
}

// searchEnd copies how the optimiser ended into res and returns the
// *ConvergenceError of a search that did not converge (matching ctx's
// error too when ctx stopped it), nil otherwise.
func searchEnd(ctx context.Context, res *Result, lres lm.Result) error {
	res.Iter, res.Evals = lres.Iter, lres.Evals
	res.Converged = lres.Reason.Converged()
	res.Reason = lres.Reason.String()
	if res.Converged {
		return nil
	}
	ce := &ConvergenceError{Reason: res.Reason, Iter: lres.Iter}
	if lres.Reason == lm.Canceled {
		return &canceled{ConvergenceError: ce, ctx: ctx.Err()}
	}
	return ce
}

// uncertainty sets SE, T, SEHessian, Cov and Corr of res.Params (NaN
// where the curvature is singular) from the curvature at the optimum and
// the innovation variance of the working units.
func (e *engine) uncertainty(res *Result, opt optimum, sigma2Scaled float64) {
	res.setCovariance(invSym(opt.jtj), sigma2Scaled, e.pscale)
	if inv := invSym(opt.hess); inv != nil {
		for k := range res.SEHessian {
			res.SEHessian[k] = math.Sqrt(sigma2Scaled*inv.At(k, k)) * e.pscale[k]
		}
	}
}

// setCovariance sets Cov and Corr, and the SE and T of res.Params, from
// inv, the inverse curvature in working units, times s2 (the innovation
// variance of those units; 1 for the inverse of an observed
// information), pscale the parameters' units; SEHessian, Cov and Corr
// are NaN where inv is nil (singular), SEHessian always (the caller
// sets it). SE and Corr come from the working units: a variance of a
// series at 1e-150 can underflow in Cov where its square root is fine.
func (res *Result) setCovariance(inv *mat.SymDense, s2 float64, pscale []float64) {
	np := len(res.Params)
	res.SEHessian = nanVector(np)
	res.Cov = make([][]float64, np)
	res.Corr = make([][]float64, np)
	for k := range res.Cov {
		res.Cov[k] = nanVector(np)
		res.Corr[k] = nanVector(np)
	}
	if inv == nil {
		return
	}
	for i := 0; i < np; i++ {
		for j := 0; j < np; j++ {
			res.Cov[i][j] = s2 * inv.At(i, j) * pscale[i] * pscale[j]
			res.Corr[i][j] = inv.At(i, j) / math.Sqrt(inv.At(i, i)*inv.At(j, j))
		}
		p := &res.Params[i]
		p.SE = math.Sqrt(s2*inv.At(i, i)) * pscale[i]
		p.T = p.Value / p.SE
	}
}

// nanVector returns n NaNs.
func nanVector(n int) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = math.NaN()
	}
	return v
}

// criteria sets K, LogLik, AIC, AICc and BIC of res for np estimated
// parameters. The likelihood is taken at its maximising variance
// SSQ/NUsed, whatever the reported Sigma2 (see the package doc).
func (res *Result) criteria(np int) {
	nu := float64(res.NUsed)
	res.LogLik = -nu / 2 * (math.Log(2*math.Pi*res.SSQ/nu) + 1)
	res.mlCriteria(np)
}

// flagBoundary lists in res.Boundary the fitted AR and MA polynomials
// with z-plane roots of modulus at least 1 - 1e-6, and those whose roots
// cannot be computed (Roots nil): such a polynomial cannot be shown to be
// inside.
func (res *Result) flagBoundary() {
	for _, part := range []struct {
		name string
		c    []float64
	}{{"AR", res.AR}, {"MA", res.MA}} {
		bad, err := outside(part.c, 1e-6)
		if err != nil || len(bad) > 0 {
			res.Boundary = append(res.Boundary, Boundary{Part: part.name, Roots: bad})
		}
	}
}

// forecastState keeps what Forecast needs of the fit of y with the
// regressor columns xs: z = y - X beta and the last values of z and of
// the residuals.
func (res *Result) forecastState(y []float64, xs [][]float64) {
	n := len(y)
	zf := append([]float64(nil), y...)
	for k, x := range xs {
		for t := range zf {
			zf[t] -= res.Beta[k] * x[t]
		}
	}
	full := poly.Mul(res.AR, res.Diff)
	res.z = zf
	res.zTail = append([]float64(nil), zf[max(0, n-(len(full)-1)):]...)
	res.aTail = make([]float64, len(res.MA)-1)
	for j := range res.aTail {
		t := n - len(res.aTail) + j
		if t >= res.Start {
			res.aTail[j] = res.Resid[t]
		}
	}
}

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
