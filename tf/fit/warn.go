package fit

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strings"

	"github.com/backshift/backshift/tf"
	"gonum.org/v1/gonum/stat/distuv"
)

// WarningKind classifies a Warning.
type WarningKind int

const (
	// UnstableDenominator: an input's estimated delta(B) has a pole at
	// or outside the unit circle (|z| >= 0.999).
	UnstableDenominator WarningKind = iota + 1
	// NonStationaryNoise: the estimated phi(B) has a root at or outside
	// the unit circle in the z-plane (|z| >= 0.999).
	NonStationaryNoise
	// NonInvertibleNoise: the estimated theta(B) has a zero at or
	// outside the unit circle (|z| >= 0.999).
	NonInvertibleNoise
	// CancellingRoots: a numerator zero lies within 0.05 of a
	// denominator pole (or an MA zero of an AR root) in the z-plane, so
	// that the parameters are redundant.
	CancellingRoots
	// HighCorrelation: two estimates correlate above 0.95 in magnitude.
	HighCorrelation
	// NotConverged: the optimiser stopped without meeting a convergence
	// test (iteration limit, stall, or cancellation).
	NotConverged
	// SingularInformation: the information matrix (J'J for least
	// squares, the observed information for ExactML) is singular at the
	// estimate, so standard errors do not exist (an unidentifiable
	// parameter).
	SingularInformation
	// StartupTransient: the start of the fit shows a transient that the
	// pre-sample convention does not explain (an input that was not
	// settled at its first value, as in a record that starts from rest);
	// Settings.Settle or a larger Settings.First leaves it out.
	// Two tests, each at a false-alarm rate of 5e-5 for white Gaussian
	// residuals (1e-4 together), made with at least 40 residuals:
	//
	// The residuals: for windows of the first m = 5, 10, 20, 40, ...
	// residuals (m at most N/4), the mean square of the window over the
	// robust scale median(a_t^2)/0.4549 of the M residuals after the
	// largest window (at most 20000 of them; 0.4549 is the median of
	// chi-squared(1)) is referred to the F distribution with m and
	// 0.368 M degrees of freedom (the variance of a sample median,
	// 1/(4 M f(median)^2), makes the scale as uncertain as a variance
	// estimate on 0.368 M degrees of freedom); the smallest p-value
	// times the number of windows (Bonferroni) is the test's.
	//
	// The noise series n_t (output minus the fitted input terms), which
	// shows a transient that a fitted AR root near an input pole removed
	// from the residuals: the largest |n_t - median| over the first
	// min(10, N/4) samples in standard deviations of the fitted noise
	// model (sigma^2 times the sum of its squared psi weights), with the
	// union bound m * 2 Phi(-z) as its p-value (valid for correlated
	// samples); not made for a noise model with a root at |z| >= 0.999.
	StartupTransient
	// FewResiduals: the number of residuals N is small against the number
	// k of free coefficients, N < max(50, 10 k) (about 50 observations
	// as the least for a time-series model, ten per coefficient: common
	// practice), so the estimates and their standard errors are
	// unreliable.
	FewResiduals
	// SlowPole: an estimated input pole or noise AR root (of a
	// polynomial with free coefficients) is so slow that the N
	// residuals span fewer than 5 of its time constants -1/ln|z|, so
	// the gain and the time constant are poorly determined (a
	// first-order response reaches 99.3 % of its final value in 5 time
	// constants; common practice). The message says where the pole
	// lies: a pole on the negative real axis is no slow lag but a mode
	// that changes sign every sample (an oscillation at the Nyquist
	// frequency, which no sampled lag has), and a complex pair an
	// oscillation; for a negative real pole the message advises a lower
	// order or another dead time, not a longer record.
	SlowPole
	// BadStandardError: a standard error is NaN, infinite or zero.
	BadStandardError
	// StuckOutput: the output holds one value for a stretch far longer
	// than the series' own rate of repeats makes plausible (a stuck
	// sensor or a historian that held its last value): n p^(L-1) < 1e-3
	// for a stretch of L >= 10 samples, p the share of the other samples
	// that equal their predecessor. The stretch biases every estimate.
	StuckOutput
	// OutputSpike: an output sample jumps away from both neighbours by
	// more than 10 robust standard deviations of the first differences
	// (1.4826 times their median absolute deviation), in opposite
	// directions: a bad reading, which conditional least squares spreads
	// over the estimates.
	OutputSpike
	// FilledGapMove: an input gap filled by Settings.InputGaps where the
	// fill is likely wrong because the input moved during the gap (a
	// step test's move, a set-point change): the filled values then
	// differ from the truth by up to the move, whatever the process's
	// speed, and the output's response to the wrong values biases the
	// estimates. Either of two rules fires it, each stated with its
	// threshold:
	//
	// The input moved across the gap: |x after - x before| exceeds
	// fillMoveSteps = 3 times what L + 1 typical steps make, (L + 1)
	// times the median |x_t - x_(t-1)| over the observed samples, L the
	// gap's length (any move, when the input usually holds its value,
	// as a staircase does); a smooth input that drifts at its usual rate
	// across the gap does not fire it.
	//
	// The output shows it: a residual beyond fillResidSDs = 5 standard
	// deviations (sqrt(Sigma2)) where the filled values act on the
	// output, from the gap's first sample plus the input's dead time to
	// its last plus the dead time and the numerator's and the input
	// differencing's degrees. For Gaussian residuals one sample exceeds
	// 5 SD with probability 5.7e-7 (scipy.stats.norm.sf(5) * 2), so a
	// gap of up to 20 such samples fires falsely with probability below
	// 1.2e-5.
	FilledGapMove
)

// Serious reports whether a warning of this kind means the estimate must
// not be trusted (for control work or forecasts): every kind except
// CancellingRoots and HighCorrelation, which point to a simpler model but
// do not make the estimates wrong.
func (k WarningKind) Serious() bool {
	return k != CancellingRoots && k != HighCorrelation
}

// Thresholds of the warnings (common practice, not from a source).
const (
	boundaryZ   = 0.999
	cancelDist  = 0.05
	corrWarning = 0.95
	// FewResiduals fires when N < max(fewMin, fewPerParam k) for
	// k free coefficients: about 50 observations as the least for a
	// time-series model (Box, Jenkins & Reinsel's rule of thumb) and ten
	// residuals per coefficient (common practice).
	fewMin      = 50
	fewPerParam = 10
	// SlowPole fires when the N residuals span fewer than
	// slowSpans time constants -1/ln|z| of an estimated pole: a
	// first-order response reaches 1 - e^-5 = 99.3 % of its final value
	// in 5 time constants, so a shorter record leaves the gain to
	// extrapolation (common practice).
	slowSpans = 5
	// transientAlpha is the false-alarm rate of the StartupTransient
	// test on residuals that are white and Gaussian (all windows
	// together, Bonferroni).
	transientAlpha = 1e-4
	// chi2Median1 is the median of the chi-squared distribution with
	// one degree of freedom (scipy.stats.chi2(1).median() =
	// 0.454936423119572), so that median(a_t^2)/chi2Median1
	// estimates sigma^2 for Gaussian a_t.
	chi2Median1 = 0.454936423119572
)

// Warning is one problem found with an Estimate: its Kind, a sentence for
// people, and the parameters or series concerned.
type Warning struct {
	Kind    WarningKind
	Message string
	Params  []string
}

// String names the kind of warning in a few words.
func (k WarningKind) String() string {
	switch k {
	case UnstableDenominator:
		return "unstable denominator"
	case NonStationaryNoise:
		return "non-stationary noise AR"
	case NonInvertibleNoise:
		return "non-invertible noise MA"
	case CancellingRoots:
		return "cancelling roots"
	case HighCorrelation:
		return "highly correlated estimates"
	case NotConverged:
		return "not converged"
	case SingularInformation:
		return "singular information matrix"
	case StartupTransient:
		return "start-up transient"
	case FewResiduals:
		return "few residuals"
	case SlowPole:
		return "pole too slow for the record"
	case StuckOutput:
		return "stuck output"
	case OutputSpike:
		return "spike in the output"
	case FilledGapMove:
		return "input moved across a filled gap"
	case BadStandardError:
		return "standard error not available"
	}
	return fmt.Sprintf("WarningKind(%d)", int(k))
}

// polyNames returns the free parameter names of p.
func polyNames(p tf.Poly) []string {
	var out []string
	seen := map[string]bool{}
	p.Each(func(c *tf.Coef) {
		if c.Free && c.Name != "" && !seen[c.Name] {
			seen[c.Name] = true
			out = append(out, c.Name)
		}
	})
	return out
}

// warningsOf returns the warnings of e; noise holds the noise series
// n_t of the estimate from Conditioning.First on.
func warningsOf(e *Estimate, singular bool, noise []float64) []Warning {
	var ws warningList
	ws.precision(e, singular)
	ws.transient(e, noise)
	ws.slowPoles(e)
	ws.roots(e)
	ws.correlations(e)
	return ws
}

// warningList collects the warnings of an estimate in the order the
// checks run.
type warningList []Warning

// add appends a warning of kind k about the parameters names.
func (ws *warningList) add(k WarningKind, names []string, format string, args ...any) {
	*ws = append(*ws, Warning{Kind: k, Message: fmt.Sprintf(format, args...), Params: names})
}

// precision warns of a fit that did not converge, singular information,
// standard errors that are not finite positive numbers and too few
// residuals for the free coefficients.
func (ws *warningList) precision(e *Estimate, singular bool) {
	add := ws.add
	if !e.Converged {
		add(NotConverged, nil, "the fit stopped before converging: %s", e.Reason)
	}
	if singular {
		what := "J'J (the least-squares information)"
		if e.Method == ExactML {
			what = "the observed information (the Hessian of the exact log-likelihood)"
		}
		add(SingularInformation, nil, "%s is singular at the estimate, so standard errors are not available: a coefficient the data do not determine", what)
	}
	var badSE []string
	for _, p := range e.Params {
		if math.IsNaN(p.SE) || math.IsInf(p.SE, 0) || p.SE == 0 {
			badSE = append(badSE, p.Name)
		}
	}
	if len(badSE) > 0 {
		add(BadStandardError, badSE, "the standard error of %s is not available (not a finite positive number): the estimate's precision is unknown", strings.Join(badSE, ", "))
	}
	k := len(e.Params)
	if need := max(fewMin, fewPerParam*k); e.N < need {
		add(FewResiduals, nil, "only %d residuals for %d free coefficients (fewer than max(50, 10 per coefficient) = %d): the estimates and standard errors are unreliable; use a longer record or a smaller model", e.N, k, need)
	}
}

// transient warns of a start-up transient in the residuals, or else in
// the noise series.
func (ws *warningList) transient(e *Estimate, noise []float64) {
	add := ws.add
	remedy := "a start-up transient that the pre-sample assumption (each input held at its first value) does not explain, such as a record that starts from rest or after an upset; set fit.Settings.Settle, or fit.Settings.First to %d or more, to leave it out of the fit"
	t0 := e.Conditioning.First
	if m, p, ok := residualTransient(e.Resid[t0:]); ok {
		add(StartupTransient, nil, "the residuals at samples %d..%d are far larger than the rest (p %s against white noise of one variance): "+remedy, t0, t0+m-1, formatP(p), t0+m)
	} else if last, z, p, ok := noiseTransient(noise, e); ok {
		add(StartupTransient, nil, "the noise series (output minus the fitted input terms) at samples %d..%d lies up to %.3g standard deviations of the fitted noise model from its median (p %s): "+remedy, t0, t0+last, z, formatP(p), t0+last+1)
	}
}

// slowPoles warns of an estimated input or noise AR pole too slow for the
// record (fewer than slowSpans time constants in the residuals). The
// message names where the dominant pole lies: a positive real pole is a
// lag; a negative real one a mode that changes sign every sample (an
// oscillation at the Nyquist frequency, which no sampled lag makes); a
// complex pair an oscillation of period 2 pi / |arg z| samples.
func (ws *warningList) slowPoles(e *Estimate) {
	add := ws.add
	slow := func(coeffs []float64, names []string, what string) {
		if len(names) == 0 {
			return
		}
		p, ok := dominantRoot(coeffs)
		z := cmplx.Abs(p)
		if !ok || !(z > 0 && z < 1) {
			return
		}
		tau := -1 / math.Log(z)
		if float64(e.N) < slowSpans*tau {
			spans := fmt.Sprintf("the %d residuals span only %.2g of them (fewer than 5)", e.N, float64(e.N)/tau)
			add(SlowPole, names, "%s has %s", what, slowPoleText(p, tau, spans))
		}
	}
	for _, in := range e.Model.Inputs {
		slow(in.Den.Coeffs(), polyNames(in.Den), fmt.Sprintf("input %q", in.Series))
	}
	if e.Model.Noise != nil {
		slow(e.Model.Noise.AR.Coeffs(), polyNames(e.Model.Noise.AR), "the noise AR")
	}
}

// dominantRoot returns the z-plane root of c of largest modulus (the
// one with the positive imaginary part of a complex pair), and false if c
// has none.
func dominantRoot(c []float64) (complex128, bool) {
	var best complex128
	found := false
	for _, z := range zRoots(c) {
		if !found || cmplx.Abs(z) > cmplx.Abs(best)*(1+1e-12) || (cmplx.Abs(z) >= cmplx.Abs(best)*(1-1e-12) && imag(z) > imag(best)) {
			best, found = z, true
		}
	}
	return best, found
}

// slowPoleText words a SlowPole warning for the dominant pole p of
// modulus e^(-1/tau): a lag for a positive real pole, an alternating
// mode for a negative real one, an oscillation for a complex pair. A
// root whose imaginary part is below 1e-9 |p| is taken as real (the
// eigenvalue solver's rounding of a double root).
func slowPoleText(p complex128, tau float64, spans string) string {
	z := cmplx.Abs(p)
	switch {
	case math.Abs(imag(p)) <= 1e-9*z && real(p) > 0:
		return fmt.Sprintf("a pole with |z| = %.6g, time constant %.4g samples, and %s: %s", real(p), tau, spans,
			"its gain and time constant are poorly determined; use a longer record, or hold the pole at a known value")
	case math.Abs(imag(p)) <= 1e-9*z:
		return fmt.Sprintf("a pole on the negative real axis at z = %.6g: a mode that changes sign every sample (an oscillation at the Nyquist frequency, period 2 samples) whose envelope decays with time constant %.4g samples; %s. "+
			"No sampled lag has such a pole (a zero-order hold of a real continuous-time pole lands on the positive real axis), so it is the fit's, not the plant's: usually a denominator of too high an order, a wrong dead time, or a path the data do not excite; "+
			"a longer record does not cure it: try a lower denominator order or another dead time, and compare the candidates' residual checks", real(p), tau, spans)
	default:
		period := 2 * math.Pi / math.Abs(cmplx.Phase(p))
		return fmt.Sprintf("a complex pole pair at z = %s (|z| = %.6g): an oscillation of period %.4g samples whose envelope decays with time constant %.4g samples, and %s: %s", formatComplex(p), z, period, tau, spans,
			"its gain, damping and period are poorly determined; use a longer record, or check whether the plant really oscillates (if not, try a lower denominator order)")
	}
}

// roots warns of poles and noise roots on or outside the unit circle
// (beyond boundaryZ) and of zeros that nearly cancel poles.
func (ws *warningList) roots(e *Estimate) {
	add := ws.add
	cancel := func(zeros, poles []complex128) (complex128, complex128, bool) {
		for _, z := range zeros {
			for _, p := range poles {
				if cmplx.Abs(z-p) < cancelDist {
					return z, p, true
				}
			}
		}
		return 0, 0, false
	}
	for _, in := range e.Model.Inputs {
		den := in.Den.Coeffs()
		poles := zRoots(den)
		if m := maxZ(den); m >= boundaryZ {
			add(UnstableDenominator, polyNames(in.Den), "input %q: the denominator has a pole with |z| = %.4g, %s", in.Series, m, circleText(m))
		}
		zeros := zRoots(in.Num.Coeffs())
		if z, p, ok := cancel(zeros, poles); ok {
			add(CancellingRoots, append(polyNames(in.Num), polyNames(in.Den)...),
				"input %q: numerator zero %s nearly cancels pole %s; a lower order may do", in.Series, formatComplex(z), formatComplex(p))
		}
	}
	if e.Model.Noise != nil {
		ar, ma := e.Model.Noise.AR.Coeffs(), e.Model.Noise.MA.Coeffs()
		if m := maxZ(ar); m >= boundaryZ {
			add(NonStationaryNoise, polyNames(e.Model.Noise.AR), "noise AR has a root with |z| = %.4g, %s", m, circleText(m))
		}
		if m := maxZ(ma); m >= boundaryZ {
			add(NonInvertibleNoise, polyNames(e.Model.Noise.MA), "noise MA has a zero with |z| = %.4g, %s", m, circleText(m))
		}
		if z, p, ok := cancel(zRoots(ma), zRoots(ar)); ok {
			add(CancellingRoots, append(polyNames(e.Model.Noise.MA), polyNames(e.Model.Noise.AR)...),
				"noise MA zero %s nearly cancels AR root %s; a lower order may do", formatComplex(z), formatComplex(p))
		}
	}
}

// correlations warns of pairs of estimates correlated beyond
// corrWarning.
func (ws *warningList) correlations(e *Estimate) {
	corr := e.Corr()
	for i := range corr {
		for j := i + 1; j < len(corr); j++ {
			if c := corr[i][j]; math.Abs(c) > corrWarning {
				a, b := e.Params[i].Name, e.Params[j].Name
				ws.add(HighCorrelation, []string{a, b}, "estimates of %s and %s correlate at %.3f", a, b, c)
			}
		}
	}
}

func formatComplex(z complex128) string {
	if math.Abs(imag(z)) < 1e-12 {
		return fmt.Sprintf("%.4g", real(z))
	}
	return fmt.Sprintf("%.4g%+.4gi", real(z), imag(z))
}

// residualTransient tests the residuals a (from the first one summed) for a
// start-up transient (see StartupTransient): it returns the window
// length m of the smallest p-value, that p-value times the number of
// windows (Bonferroni), and whether it is below half of
// transientAlpha (the other half is noiseTransient's).
func residualTransient(a []float64) (m int, p float64, ok bool) {
	n := len(a)
	if n < 40 {
		return 0, 1, false
	}
	var wins []int
	for w := 5; w <= n/4; w *= 2 {
		wins = append(wins, w)
	}
	rest := a[wins[len(wins)-1]:]
	rest = rest[:min(len(rest), scaleSamples)]
	sq := make([]float64, len(rest))
	for i, v := range rest {
		sq[i] = v * v
	}
	s2 := median(sq) / chi2Median1
	if !(s2 > 0) || math.IsInf(s2, 0) {
		return 0, 1, false
	}
	nu := 0.368 * float64(len(sq))
	best, bestM := 1.0, 0
	sum, j := 0.0, 0
	for _, w := range wins {
		for ; j < w; j++ {
			sum += a[j] * a[j]
		}
		f := sum / float64(w) / s2
		q := distuv.F{D1: float64(w), D2: nu}.Survival(f)
		if q < best || bestM == 0 {
			best, bestM = q, w
		}
	}
	p = min(best*float64(len(wins)), 1)
	return bestM, p, p < transientAlpha/2
}

// scaleSamples caps the samples after the tested windows from which
// the transient tests take their scale and centre (the ones nearest the
// windows), so that the tests cost O(1) sorting for any record length.
const scaleSamples = 20000

// noiseWindow is the number of noise samples, from the first residual
// on, that noiseTransient examines.
const noiseWindow = 10

// noiseTransient tests the noise series n (from Conditioning.First
// on) for a start-up transient that the fitted noise model absorbed (an
// AR root near an input pole makes the residuals of a transient of that
// pole vanish, so that residualTransient cannot see it): the largest
// |n_t - median(n)| over the first m = min(10, N/4) samples, in units of
// the standard deviation of the fitted noise model, sigma_n^2 = sigma^2
// sum psi_j^2, as z. Its p-value is bounded by m * 2 Phi(-z) (the union
// bound, valid for correlated samples), and the test fires below half of
// transientAlpha. It returns the offset of the last of the first N/4
// samples beyond the test's critical value (the transient's extent), z,
// the p-value and whether the test fired. It is not made for fewer than
// 40 residuals or a noise model that is not stationary.
func noiseTransient(n []float64, e *Estimate) (last int, z, p float64, ok bool) {
	if len(n) < 40 || !(e.Sigma2 > 0) {
		return 0, 0, 1, false
	}
	v := 1.0
	if e.Model.Noise != nil {
		r, err := e.Model.NoiseRational()
		if err != nil || !(r.MaxPoleMagnitude() < boundaryZ) {
			return 0, 0, 1, false
		}
		// psi_j decays as rho^j: enough weights for rho^j < 1e-9.
		rho := r.MaxPoleMagnitude()
		k := r.NumDegree() + 1
		if rho > 0 {
			k += int(math.Ceil(math.Log(1e-9) / math.Log(rho)))
		}
		v = 0
		for _, c := range r.Impulse(k) {
			v += c * c
		}
	}
	sd := math.Sqrt(e.Sigma2 * v)
	m := min(noiseWindow, len(n)/4)
	med := median(append([]float64(nil), n[m:min(len(n), m+scaleSamples)]...))
	for _, x := range n[:m] {
		z = math.Max(z, math.Abs(x-med)/sd)
	}
	p = math.Min(float64(m)*2*distuv.UnitNormal.Survival(z), 1)
	if !(p < transientAlpha/2) {
		return 0, z, p, false
	}
	// The extent: the last of the first N/4 samples beyond the critical
	// value of the test.
	crit := distuv.UnitNormal.Quantile(1 - transientAlpha/4/float64(m))
	for t, x := range n[:len(n)/4] {
		if math.Abs(x-med)/sd > crit {
			last = t
		}
	}
	return last, z, p, true
}

// formatP formats a p-value for a message: "= 0.0012", or "< 1e-16"
// below the resolution of float64 near 1.
func formatP(p float64) string {
	if p < 1e-16 {
		return "< 1e-16"
	}
	return fmt.Sprintf("= %.2g", p)
}

// median returns the median of x, sorting x in place.
func median(x []float64) float64 {
	sort.Float64s(x)
	h := len(x) / 2
	if len(x)%2 == 0 {
		return 0.5 * (x[h-1] + x[h])
	}
	return x[h]
}

// circleText says where a root of modulus m (at least boundaryZ) lies.
func circleText(m float64) string {
	if m > 1 {
		return "outside the unit circle"
	}
	return "on or near the unit circle (|z| >= 0.999)"
}

// Thresholds of FilledGapMove (see its doc).
const (
	fillMoveSteps = 3
	fillResidSDs  = 5
)

// fillWarnings returns a FilledGapMove warning for every gap of
// e.Filled where the input moved across the gap or the residuals where
// the filled values act on the output are extreme; data are the
// caller's series, with the gaps as NaN.
func fillWarnings(e *Estimate, data map[string][]float64) []Warning {
	var ws []Warning
	sigma := math.Sqrt(e.Sigma2)
	for _, f := range e.Filled {
		x := data[f.Series]
		s, L := f.Index, f.Len
		if s < 1 || s+L > len(x) {
			continue
		}
		var why []string
		if s+L < len(x) {
			jump, step := math.Abs(x[s+L]-x[s-1]), typicalStep(x)
			if jump > fillMoveSteps*float64(L+1)*step {
				why = append(why, fmt.Sprintf("the input moved across it from %s to %s (its typical step %s)",
					formatSig(x[s-1], 5), formatSig(x[s+L], 5), formatSig(step, 3)))
			}
		}
		if at, z := fillResidual(e, f, sigma); at >= 0 {
			why = append(why, fmt.Sprintf("the residual at %d is %.1f standard deviations", at, z))
		}
		if len(why) == 0 {
			continue
		}
		ws = append(ws, Warning{Kind: FilledGapMove, Message: fmt.Sprintf("input %q: the gap at %d..%d (%d samples) was filled (%s), but %s: "+
			"the filled values are likely far from the truth (the fill error comes from the input moving during the gap, not from the process's speed) and bias the estimates; "+
			"cut the record at the gap, or fit the stretches before and after it", f.Series, s, s+L-1, L, f.Rule, strings.Join(why, ", and "))})
	}
	return ws
}

// typicalStep returns the median of |x_t - x_(t-1)| over consecutive
// observed samples.
func typicalStep(x []float64) float64 {
	var d []float64
	for t := 1; t < len(x); t++ {
		if v := math.Abs(x[t] - x[t-1]); !math.IsNaN(v) {
			d = append(d, v)
		}
	}
	if len(d) == 0 {
		return 0
	}
	sort.Float64s(d)
	return d[len(d)/2]
}

// fillResidual returns the sample and size, in standard deviations
// sigma, of the largest residual beyond fillResidSDs where the gap f's
// filled values act on the output through each input term on its
// series, or at = -1 when there is none.
func fillResidual(e *Estimate, f InputFill, sigma float64) (at int, z float64) {
	at = -1
	if !(sigma > 0) {
		return at, 0
	}
	for _, in := range e.Model.Inputs {
		if in.Series != f.Series {
			continue
		}
		lo := f.Index + in.Delay
		hi := min(f.Index+f.Len-1+in.Delay+in.Num.Degree()+in.Diff.Degree(), len(e.Resid)-1)
		for t := lo; t <= hi; t++ {
			if v := math.Abs(e.Resid[t]) / sigma; v > fillResidSDs && v > z {
				at, z = t, v
			}
		}
	}
	return at, z
}
