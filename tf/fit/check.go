package fit

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/sym"
	"github.com/backshift/backshift/prewhiten"
	"github.com/backshift/backshift/tf"
	"gonum.org/v1/gonum/stat/distuv"
)

// CheckSettings tunes Check. The zero value (or nil) gives the defaults.
type CheckSettings struct {
	// Lags is the number K of residual autocorrelations in the Ljung-Box
	// test. Zero means min(24, N/4), raised to the number of noise
	// parameters + 1 when that is larger (and at most N - 1). A K of
	// N or more, or not above the number of free noise parameters, is an
	// *SettingError. Every field follows the settings rule of the package
	// doc: zero means the default, a negative value is a *SettingError
	// naming the field.
	Lags int
	// CrossLags is K for the residual-input cross-correlations at lags
	// 0..K. Zero means Lags. K is cut to M - 2, M the number of samples
	// where both the residuals and the prewhitened input exist
	// (CrossCheck.Lags reports the K used).
	CrossLags int
	// Alpha is the significance level of every verdict: a check fails
	// when its p-value is below Alpha. Zero means 0.05.
	Alpha float64
}

// ResidualCheck is the whiteness check of the residuals.
type ResidualCheck struct {
	// ACF holds the residual autocorrelations at lags 1..Lags (index
	// k-1 = lag k; divisor N, mean removed); Band = 1.96/sqrt(N) is the
	// approximate 95 % limit for white noise.
	ACF  []float64
	Band float64
	// Q is the Ljung-Box statistic N(N+2) sum_k r_k^2/(N-k) with DF =
	// Lags - (number of free noise parameters) degrees of freedom, and P
	// its upper-tail chi-squared probability.
	Q    float64
	Lags int
	DF   int
	P    float64
	// Pass reports P >= Alpha.
	Pass bool
}

// CrossCheck is the check that the residuals are uncorrelated with one
// prewhitened input, which they are when the transfer function is
// adequate.
type CrossCheck struct {
	// Input names the input series; Prewhiten is the filter fitted to it
	// (an autoregression by Yule-Walker with AIC order choice after the
	// input's own differencing, package prewhiten).
	Input     string
	Prewhiten prewhiten.Filter
	// CCF holds r_alpha,a(k) for k = 0..Lags, the correlation of the
	// prewhitened input alpha_t with the residual a_{t+k} (input
	// leading), over the samples where both exist; M is their number and
	// Band = 1.96/sqrt(M).
	CCF  []float64
	M    int
	Band float64
	// S = M sum_{k=0}^{Lags} r_k^2 is the portmanteau statistic. DF =
	// Lags + 1 - (r + s + 1) (at least 1), r + s + 1 being the number of
	// free coefficients of this input's transfer function, is the
	// textbook count of its degrees of freedom, and PPlain the
	// upper-tail chi-squared(DF) probability of S.
	S      float64
	Lags   int
	DF     int
	PPlain float64
	// Scale and EffDF give the reference the verdict uses: S is referred
	// to Scale * chi-squared(EffDF), the scaled chi-squared with the mean
	// and variance that S has under an adequate model given this input
	// and the fitted coefficients (see Cross-correlation check in the
	// package doc); P is its upper-tail probability. For a white
	// prewhitened input and transfer-function weights that die out
	// within Lags, Scale is near 1 and EffDF near DF; where the
	// reference cannot be formed (a singular information matrix),
	// Scale is 1, EffDF is DF and P is PPlain.
	Scale float64
	EffDF float64
	P     float64
	// Pass reports P >= Alpha.
	Pass bool
}

// Diagnostics is the result of Check.
type Diagnostics struct {
	// Alpha is the significance level used.
	Alpha float64
	// Residual is the whiteness check of the residuals.
	Residual ResidualCheck
	// Cross holds one check per input read from the data, in the model's
	// order; an event input (a step or a pulse at a known time) has none:
	// its indicator is not a series to prewhiten, and its own coefficient
	// has taken up what it explains.
	Cross []CrossCheck
	// Failures lists, in words, every reason the model must not be
	// trusted, the estimate's own first (see Soundness): the fit did not
	// converge, a standard error or estimate is not finite, an
	// estimated root lies on or outside the unit circle, too few
	// residuals per coefficient, a serious warning of the estimate
	// (WarningKind.Serious); then every failed check. Empty when the
	// model passes.
	Failures []string
	// Pass reports whether every check passed and the estimate itself
	// is sound: len(Failures) == 0.
	Pass bool
}

// Thresholds of the verdict.
const (
	// CheckMinResidualsPerCoef and MinResiduals set the least
	// number of residuals N for a sound estimate with k free
	// coefficients: N >= max(MinResiduals, CheckMinResidualsPerCoef
	// k), the rule of the fit's FewResiduals warning. Ten observations
	// per estimated coefficient is a rule of thumb of regression
	// practice (common practice, not from a source); at least 50
	// observations is the least Box and Jenkins advise for
	// identifying and fitting such models (from memory). With fewer,
	// the estimates and their standard errors rest on too little data
	// to be trusted even when the fit converges.
	MinResidualsPerCoef = 10
	MinResiduals        = 50
	// BoundaryZ is the root magnitude, in the z-plane, from which an
	// estimated input pole, noise AR root or noise MA zero counts as on
	// or outside the unit circle (0.999, the threshold of the fit's
	// warnings, common practice): such a path is unstable or at the
	// stability boundary (an estimate on the boundary of the admissible
	// region), noise so estimated is not stationary or not invertible.
	BoundaryZ = 0.999
)

// Check runs the diagnostic checks of a fitted model on the data it was
// fitted to, or other data with the same series (the residuals are
// recomputed from data with the estimates and e's conditioning,
// Conditioning.First and Conditioning.ZeroPreSample): the Ljung-Box
// test of the residual autocorrelations, with degrees of freedom reduced
// by the number of free noise parameters, and for each input the
// portmanteau test of the cross-correlations between the residuals and
// the prewhitened input at lags 0..K,
//
//	S = M sum_{k=0}^{K} r_alpha,a(k)^2,
//
// referred to the scaled chi-squared that S follows under an adequate
// model given the input and the estimates (see Cross-correlation check
// in the package doc; the textbook chi-squared(K + 1 - (r + s + 1)) is
// reported beside it), with a verdict per check and overall. The overall verdict (Pass) also
// requires a sound estimate (see Soundness). data is not modified.
//
// For an ExactML estimate the residuals are the standardised
// innovations of the Kalman filter recomputed on data (NaN where the
// output is missing). The checks use the available ones only: the
// missing samples are left out and the rest taken in order as one
// series (the autocorrelations, Ljung-Box and the cross-correlations,
// where the prewhitened input is left out at the same samples), a
// treatment that is exact for white residuals and, for a few short
// gaps, changes the autocorrelation at a lag by O(gaps/N).
//
// Errors (the shared shapes, Op "fit.Check"): *ModelError for a nil
// estimate or a coefficient that is not finite; *SettingError for a bad
// setting (CheckSettings.Lags, CrossLags, Alpha); the *SeriesError and
// *SampleError of Model for missing, unequal or non-finite series; a
// *SeriesError of kind ErrOverflow when the residuals overflow (the
// model diverges on data) and of kind ErrConstant for an input that is
// constant after its differencing; *StageError wrapping the error of
// the prewhitening or correlation step otherwise.
//
// References: Box, G. E. P., Jenkins, G. M., Reinsel, G. C. and Ljung,
// G. M. (2015). Time Series Analysis, 5th ed., Wiley: the chapter on
// diagnostic checking of transfer-function models. Ljung, G. M. and
// Box, G. E. P. (1978). Biometrika 65(2), 297-303.
func Check(e *Estimate, data map[string][]float64, s *CheckSettings) (_ *Diagnostics, err error) {
	defer setOp("fit.Check", &err)
	defer errs.Recover("fit.Check", &err)
	var set CheckSettings
	if s != nil {
		set = *s
	}
	if err := set.validate(); err != nil {
		return nil, err
	}
	if set.Alpha == 0 {
		set.Alpha = 0.05
	}
	if err := estimateUsable("Check", e); err != nil {
		return nil, err
	}
	resid, first, err := residualsOf("Check", e, data)
	if err != nil {
		return nil, err
	}
	a := available(resid[first:])
	noisePar := 0
	if e.Model.Noise != nil {
		noisePar = len(freeNames(e.Model.Noise.MA, e.Model.Noise.AR))
	}
	lags, err := checkLags(set, len(a), noisePar, e.Model.Output)
	if err != nil {
		return nil, err
	}
	d := &Diagnostics{Alpha: set.Alpha, Pass: true}
	if d.Residual, err = whitenessCheck(a, lags, noisePar, set.Alpha); err != nil {
		return nil, err
	}
	kx := set.CrossLags
	if kx <= 0 {
		kx = lags
	}
	if d.Cross, err = crossChecks(e, data, resid, first, kx, set.Alpha); err != nil {
		return nil, err
	}
	d.Failures = e.Soundness()
	if !d.Residual.Pass {
		d.Failures = append(d.Failures, fmt.Sprintf("the residuals are autocorrelated (Ljung-Box p = %s below %s)", formatSig(d.Residual.P, 3), formatSig(set.Alpha, 3)))
	}
	for _, cc := range d.Cross {
		if !cc.Pass {
			d.Failures = append(d.Failures, fmt.Sprintf("the residuals correlate with input %q (p = %s below %s)", cc.Input, formatSig(cc.P, 3), formatSig(set.Alpha, 3)))
		}
	}
	d.Pass = len(d.Failures) == 0
	return d, nil
}

// crossChecks runs the cross-check of the residuals resid (from first
// on) against each input that is not an event, at lags 0..kx, on the
// inputs as the fit saw them (gaps filled by its rule).
func crossChecks(e *Estimate, data map[string][]float64, resid []float64, first, kx int, alpha float64) ([]CrossCheck, error) {
	xdata, _, _, err := prepareGaps(e.Model, data, Settings{Method: e.Method, InputGaps: e.Conditioning.InputGaps})
	if err != nil {
		return nil, err
	}
	var out []CrossCheck
	var grad [][]float64
	for _, in := range e.Model.Inputs {
		if in.Event != nil {
			continue
		}
		if grad == nil {
			if grad, err = residualGradient(e, data); err != nil {
				return nil, err
			}
		}
		cc, err := crossCheck(in, xdata[in.Series], resid, grad, first, kx, alpha)
		if err != nil {
			return nil, err
		}
		out = append(out, cc)
	}
	return out, nil
}

// checkLags returns the number of autocorrelation lags of the Ljung-Box
// check of nres residuals (set.Lags, or min(24, nres/4) but more than
// the noisePar free noise coefficients and below nres), refusing a
// setting out of range and too few residuals.
func checkLags(set CheckSettings, nres, noisePar int, output string) (int, error) {
	lags := set.Lags
	if lags == 0 {
		lags = max(min(24, nres/4), noisePar+1)
		lags = min(lags, nres-1)
	} else if lags >= nres {
		return 0, errs.Setting("CheckSettings.Lags", strconv.Itoa(set.Lags),
			"must be below the number of residuals ("+strconv.Itoa(nres)+"); 0 means min(24, N/4)")
	}
	if lags < noisePar+1 {
		if set.Lags > 0 {
			return 0, errs.Setting("CheckSettings.Lags", strconv.Itoa(set.Lags),
				"must exceed the number of free noise coefficients ("+strconv.Itoa(noisePar)+") so that the Ljung-Box test has a degree of freedom")
		}
		return 0, errs.Series(output, errs.ErrShort, nres, noisePar+2,
			"counting residuals: the Ljung-Box check needs more residuals than free noise coefficients + 1")
	}
	return lags, nil
}

// whitenessCheck returns the autocorrelations of the residuals a and
// their Ljung-Box test over lags lags with noisePar fitted noise
// coefficients, passing at level alpha.
func whitenessCheck(a []float64, lags, noisePar int, alpha float64) (ResidualCheck, error) {
	acf, err := arma.ACF(a, lags)
	if err != nil {
		return ResidualCheck{}, &StageError{Stage: "residual autocorrelations", Err: err}
	}
	lb, err := arma.LjungBox(a, lags, noisePar)
	if err != nil {
		return ResidualCheck{}, &StageError{Stage: "Ljung-Box test of the residuals", Err: err}
	}
	return ResidualCheck{ACF: append([]float64(nil), acf.R[1:]...), Band: 1.96 / math.Sqrt(float64(len(a))),
		Q: lb.Q, Lags: lags, DF: lb.DF, P: lb.P, Pass: lb.P >= alpha}, nil
}

// crossCheck prewhitens input x of term in, cross-correlates it with the
// residuals from index first on at lags 0..kx (fewer for a short
// record), and tests the sum of squares against the scaled chi-squared
// that crossReference forms from the residuals' derivatives grad (and
// reports the textbook chi-squared with one degree of freedom per lag
// less the term's free coefficients beside it).
func crossCheck(in tf.Input, x, resid []float64, grad [][]float64, first, kx int, alpha float64) (CrossCheck, error) {
	if err := CheckSeries(in.Series, "input", x, in.Diff.Coeffs()); err != nil {
		return CrossCheck{}, err
	}
	stage := fmt.Sprintf("prewhitening input %q for the residual cross-correlation check", in.Series)
	f, err := prewhiten.Fit(x, &prewhiten.Settings{Diff: in.Diff.Coeffs(), Name: in.Series})
	if err != nil {
		return CrossCheck{}, &StageError{Stage: stage, Err: err}
	}
	alphaX, start, err := f.Apply(x, in.Series)
	if err != nil {
		return CrossCheck{}, &StageError{Stage: stage, Err: err}
	}
	t0 := max(start, first)
	ax, ra := pairsAvailable(alphaX[t0:], resid[t0:])
	m := len(ax)
	k := min(kx, m-2)
	c, err := ccf.Cross(ax, ra, k, &ccf.Settings{Names: [2]string{in.Series + " prewhitened", "residuals"}})
	if err != nil {
		return CrossCheck{}, &StageError{Stage: fmt.Sprintf("cross-correlating the residuals with input %q", in.Series), Err: err}
	}
	cc := CrossCheck{Input: in.Series, Prewhiten: f, M: c.N, Lags: k, Band: 1.96 / math.Sqrt(float64(c.N))}
	cc.CCF = make([]float64, k+1)
	for j := 0; j <= k; j++ {
		cc.CCF[j] = c.At(j)
		cc.S += cc.CCF[j] * cc.CCF[j]
	}
	cc.S *= float64(c.N)
	cc.DF = max(k+1-len(freeNames(in.Num, in.Den)), 1)
	cc.PPlain = distuv.ChiSquared{K: float64(cc.DF)}.Survival(cc.S)
	cc.Scale, cc.EffDF, cc.P = 1, float64(cc.DF), cc.PPlain
	gc := make([][]float64, len(grad))
	for j, g := range grad {
		gc[j], _ = pairsAvailable(g[t0:], resid[t0:])
	}
	if c, nu, ok := crossReference(ax, gc, k); ok {
		cc.Scale, cc.EffDF, cc.P = c, nu, scaledChiSquareSurvival(cc.S, c, nu)
	}
	cc.Pass = cc.P >= alpha
	return cc, nil
}

// Validate checks the settings by the library's settings rule (zero
// means the default; a negative count, and an Alpha outside (0, 1), is
// an error) and returns a *SettingError naming the field
// ("CheckSettings.Alpha"), or nil. Lags is also checked against the
// residuals by Check.
func (s CheckSettings) Validate() (err error) {
	defer setOp("fit.CheckSettings.Validate", &err)
	return s.validate()
}

// validate is Validate without the Op.
func (s CheckSettings) validate() error {
	return errs.First(
		errs.Count("", "CheckSettings.Lags", s.Lags, "0 means min(24, N/4)"),
		errs.Count("", "CheckSettings.CrossLags", s.CrossLags, "0 means Lags"),
		errs.Probability("", "CheckSettings.Alpha", s.Alpha, "0 means 0.05"),
	)
}

// Soundness lists, in words, what makes the estimate itself
// untrustworthy whatever its residuals look like (empty when nothing
// does); Check puts these first in Diagnostics.Failures:
//
//   - the fit did not converge;
//   - a standard error is NaN, infinite or zero, or an estimate or the
//     noise variance is not finite;
//   - an estimated input pole, noise AR root or noise MA zero has
//     |z| >= BoundaryZ (on or near the unit circle), computed
//     from the estimate's polynomials; a factor written with numbers
//     only (such as a fixed integrator 1 - B) is the user's choice and
//     does not count;
//   - fewer residuals than max(MinResiduals,
//     CheckMinResidualsPerCoef k), that is N < max(50, 10 k) for k free
//     coefficients;
//   - any other serious warning of the fit (WarningKind.Serious).
func (e *Estimate) Soundness() []string {
	if e == nil {
		return []string{"there is no estimate"}
	}
	var out []string
	if !e.Converged {
		out = append(out, "the fit did not converge ("+e.Reason+")")
	}
	var bad, nonFinite []string
	for _, p := range e.Params {
		if math.IsNaN(p.Value) || math.IsInf(p.Value, 0) {
			nonFinite = append(nonFinite, p.Name)
		}
		if !(p.SE > 0) || math.IsInf(p.SE, 0) {
			bad = append(bad, p.Name)
		}
	}
	if len(nonFinite) > 0 {
		out = append(out, "the estimate of "+strings.Join(nonFinite, ", ")+" is not a finite number")
	}
	if len(bad) > 0 {
		out = append(out, "no standard error for "+strings.Join(bad, ", ")+" (the coefficients are not determined by the data)")
	}
	if !(e.Sigma2 >= 0) || math.IsInf(e.Sigma2, 0) {
		out = append(out, "the noise variance is "+formatSig(e.Sigma2, 4)+", not a finite number")
	}
	out = append(out, rootFailures(e.Model)...)
	k := len(e.Params)
	need := max(MinResiduals, MinResidualsPerCoef*k)
	few := k > 0 && e.N < need
	if few {
		out = append(out, fmt.Sprintf("only %d residuals for %d free coefficients: fewer than max(%d, %d per coefficient) = %d, too few to trust the estimates (use a longer record or fewer coefficients)",
			e.N, k, MinResiduals, MinResidualsPerCoef, need))
	}
	for _, w := range e.Warnings {
		switch {
		case !w.Kind.Serious():
		case w.Kind == NotConverged, w.Kind == BadStandardError, w.Kind == SingularInformation:
			// Reported above from the estimate itself.
		case w.Kind == UnstableDenominator, w.Kind == NonStationaryNoise, w.Kind == NonInvertibleNoise:
			// Checked above from the polynomials, factor by factor.
		case w.Kind == FewResiduals && few:
		default:
			out = append(out, w.Message)
		}
	}
	return out
}

// rootFailures checks every factor of the estimated input
// denominators and noise polynomials that holds a free coefficient for a
// root with |z| >= BoundaryZ.
func rootFailures(m tf.Model) []string {
	var out []string
	check := func(p tf.Poly, what, root, why string) {
		for _, f := range p.Factors {
			var names []string
			seen := map[string]bool{}
			for _, t := range f.Terms {
				if t.Coef.Free && !seen[t.Coef.Name] {
					seen[t.Coef.Name] = true
					names = append(names, t.Coef.Name)
				}
			}
			if len(names) == 0 {
				continue
			}
			c := poly.Trim(tf.Poly{Factors: []tf.Factor{{Terms: f.Terms, Exp: 1}}}.Coeffs(), 0)
			if len(c) <= 1 {
				continue
			}
			var mz float64
			finite := true
			for _, v := range c {
				finite = finite && !math.IsNaN(v) && !math.IsInf(v, 0)
			}
			zs, err := poly.Roots(poly.Reciprocal(c))
			if !finite || err != nil {
				out = append(out, fmt.Sprintf("%s (%s): its %ss cannot be computed from the estimates", what, strings.Join(names, ", "), root))
				continue
			}
			mz = poly.MaxAbsRoot(zs)
			if mz >= BoundaryZ {
				where := "on or near the unit circle (|z| >= 0.999)"
				if mz > 1 {
					where = "outside the unit circle"
				}
				out = append(out, fmt.Sprintf("%s (%s) has a %s at |z| = %s, %s: %s",
					what, strings.Join(names, ", "), root, strconv.FormatFloat(mz, 'g', 5, 64), where, why))
			}
		}
	}
	for _, in := range m.Inputs {
		check(in.Den, fmt.Sprintf("input %q: the estimated denominator", in.Series), "pole",
			"the path is unstable or at the stability limit, so its gain and time constants are not to be trusted")
	}
	if m.Noise != nil {
		check(m.Noise.AR, "the estimated noise AR", "root",
			"the noise is not stationary (difference the output instead, or write the factor as fixed numbers such as 1 - B)")
		check(m.Noise.MA, "the estimated noise MA", "zero",
			"the noise is not invertible, so the residuals do not forget their start-up values")
	}
	return out
}

// estimateUsable reports a nil estimate or a coefficient of its model
// that is not finite.
func estimateUsable(fn string, e *Estimate) error {
	if e == nil {
		return estimateErr("", 0, "the estimate is nil; pass the *Estimate that fit.Model returned")
	}
	var err error
	visit := func(c *tf.Coef) {
		if err == nil && (math.IsNaN(c.Value) || math.IsInf(c.Value, 0)) {
			name := c.Name
			if name == "" {
				name = "fixed number"
			}
			err = estimateErr("coefficient "+name, c.Value, "not a finite number; refit the model")
		}
	}
	if e.Model.Const != nil {
		visit(e.Model.Const)
	}
	for _, in := range e.Model.Inputs {
		in.Num.Each(visit)
		in.Den.Each(visit)
	}
	if e.Model.Noise != nil {
		e.Model.Noise.MA.Each(visit)
		e.Model.Noise.AR.Each(visit)
	}
	return err
}

// CheckSeries refuses a series that carries no response because it is
// constant after its differencing: name is the series' name as the
// caller gave it, role "output" or "input" (for the message), x its
// samples and diff the coefficients of its differencing operator D(B),
// constant term first (nil or {1} for none). D(B) x, from index deg D
// on, counts as constant when its spread is within 1e-12 of the largest
// magnitude of x (the rounding of the differencing). The error is a
// *SeriesError of kind ErrConstant naming the series, the value and the
// differencing; a series that varies, or is too short to difference,
// gives nil. Check (before the residual cross-correlation of an input)
// and identify.Candidates refuse a constant series through this one
// function, so that they agree. x is not modified.
func CheckSeries(name, role string, x, diff []float64) (err error) {
	defer setOp("fit.CheckSeries", &err)
	if v, ok := constantAfterDiff(x, diff); ok {
		return constantErr(name, role, v, diffText(diff))
	}
	return nil
}

// constantAfterDiff reports whether x differenced by dc (from index deg dc on)
// is constant, and its value: a spread within 1e-12 of the largest
// magnitude of x (rounding of the differencing) counts as constant.
func constantAfterDiff(x, dc []float64) (float64, bool) {
	if len(dc) == 0 {
		dc = unitPoly
	}
	d := len(dc) - 1
	if len(x) <= d {
		return 0, false
	}
	z := applyDiff(x, dc)[d:]
	scale := 0.0
	for _, v := range x {
		scale = math.Max(scale, math.Abs(v))
	}
	lo, hi := z[0], z[0]
	for _, v := range z {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if hi-lo > 1e-12*scale {
		return 0, false
	}
	v := z[0]
	if math.Abs(v) <= 1e-12*scale {
		v = 0
	}
	return v, true
}

// diffText writes a differencing operator for messages, "" for none.
func diffText(dc []float64) string {
	if len(dc) <= 1 {
		return ""
	}
	return tf.FormatPoly(sym.FromCoeffs(dc))
}

// freeNames returns the distinct free parameter names of the polys.
func freeNames(ps ...tf.Poly) []string {
	seen := map[string]bool{}
	var out []string
	for _, p := range ps {
		p.Each(func(c *tf.Coef) {
			if c.Free && c.Name != "" && !seen[c.Name] {
				seen[c.Name] = true
				out = append(out, c.Name)
			}
		})
	}
	return out
}

// residualsOf returns the residuals of e's model on data (aligned to
// the data index, zero before first) and the first residual index,
// with e's conditioning; residuals that are not finite are a
// *SeriesError of kind ErrOverflow.
func residualsOf(fn string, e *Estimate, data map[string][]float64) ([]float64, int, error) {
	if err := condCheck(e, data); err != nil {
		return nil, 0, err
	}
	if e.Method == ExactML {
		return mlResiduals(e, data)
	}
	w, err := newWork(e.Model, data, Settings{IgnoreExtra: true, First: e.Conditioning.First, ZeroPreSample: e.Conditioning.ZeroPreSample, Start: e.Conditioning.Start, InputGaps: e.Conditioning.InputGaps})
	if err != nil {
		return nil, 0, err
	}
	w.set(w.params())
	w.noiseSeries()
	w.resid()
	for t := w.cond.First; t < w.n; t++ {
		if v := w.a[t]; math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, 0, overflowErr("residuals", t, v, divergeHint(e))
		}
	}
	return w.a, w.cond.First, nil
}

// divergeHint names the likely cause of residuals or forecasts that
// overflow.
func divergeHint(e *Estimate) string {
	if !e.Conditioning.ZeroPreSample {
		for _, in := range e.Model.Inputs {
			if in.Diff.IsOne() && math.Abs(sumCoeffs(in.Den.Coeffs())) < 1e-12 {
				return fmt.Sprintf("input %q has an integrating term (a pole at z = 1) and is taken as held at its first value before the record, a level it would integrate forever; fit with fit.Settings.ZeroPreSample, or difference the input", in.Series)
			}
		}
	}
	return "the model with these estimates diverges on this data (a pole or noise root on or outside the unit circle, or samples far larger than in the fit)"
}

// condCheck reports data too short for e's conditioning (residuals are
// summed from Conditioning.First on) as a *SeriesError of kind ErrShort
// naming the output, instead of a message about a setting the caller
// never made.
func condCheck(e *Estimate, data map[string][]float64) error {
	y, ok := data[e.Model.Output]
	if !ok || e.Conditioning.First < len(y) {
		return nil // a missing output is reported by the fit preparation
	}
	return errs.Series(e.Model.Output, errs.ErrShort, len(y), e.Conditioning.First+1,
		"the estimate's residuals start at index "+strconv.Itoa(e.Conditioning.First)+" (its conditioning: dead times, differencing and noise order), so the record must reach beyond it")
}
