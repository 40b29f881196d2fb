package arma

import (
	"math"
	"slices"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
	"gonum.org/v1/gonum/stat/distuv"
)

// OutlierKind says how a single disturbance of size w at time T enters
// the series y_t, I_t(T) being 1 at t = T and 0 elsewhere (Chang, Tiao &
// Chen 1988; Chen & Liu 1993):
//
//	Additive         y_t + w I_t(T)                  one sample off (a bad reading)
//	LevelShift       y_t + w / (1 - B) I_t(T)        a step from T on
//	TemporaryChange  y_t + w / (1 - d B) I_t(T)      a jump that dies out as d^(t-T)
//	Innovational     y_t + w psi(B) I_t(T)           a shock passed through the noise model
//
// psi(B) = theta(B) / (phi(B) D(B)) is the noise model with its
// differencing D(B). As a known event in a spec (package parse;
// tf.Model.WithOutliers) the disturbance enters the model's differenced
// equation through D(B): an additive outlier is w D(B) pulse(T), a
// level shift w D(B) step(T) (w pulse(T) when D(B) = 1 - B), a
// temporary change w D(B) / (1 - d B) pulse(T); without differencing,
// w pulse(T), w step(T) and w / (1 - d B) pulse(T). An innovational
// outlier is a shock of the noise, not an input term.
type OutlierKind int

// The outlier kinds.
const (
	Additive OutlierKind = iota + 1
	LevelShift
	TemporaryChange
	Innovational
)

// String names the kind in words ("level shift").
func (k OutlierKind) String() string {
	switch k {
	case Additive:
		return "additive"
	case LevelShift:
		return "level shift"
	case TemporaryChange:
		return "temporary change"
	case Innovational:
		return "innovational"
	}
	return "OutlierKind(" + strconv.Itoa(int(k)) + ")"
}

// allKinds is the default of OutlierSettings.Kinds.
var allKinds = []OutlierKind{Additive, LevelShift, TemporaryChange, Innovational}

// OutlierSettings tunes Outliers and OutliersPi. The zero value (or nil)
// means every default.
type OutlierSettings struct {
	// Kinds are the kinds looked for; nil means all four.
	Kinds []OutlierKind
	// Decay is d of a temporary change, in (0, 1); 0 means 0.7 (the
	// value Chen & Liu 1993 use in their examples: half the jump is
	// gone after two samples).
	Decay float64
	// Rate is the family-wise rate of false detections on a series
	// without outliers, in (0, 1); 0 means 0.05. It sets the critical
	// value through a Bonferroni bound over the m K tests (m times with
	// a residual, K kinds), each two-sided:
	//
	//	C = q(1 - Rate / (2 m K))
	//
	// so that the chance of any false detection on a clean series is at
	// most Rate. q is the quantile of Student's t with 0.37 m degrees of
	// freedom when the scale is estimated (Sigma 0), of the standard
	// normal when Sigma is given: the MAD estimates sigma about as well
	// as the standard deviation of 0.37 m normal samples (its asymptotic
	// efficiency, 37 %: Rousseeuw & Croux 1993, JASA 88, 1273-1283), and
	// with the normal quantile the error of the scale estimate lifts the
	// rate of false detections above Rate on short records (5.5 to 7.7 % at
	// n = 200 in this package's Monte Carlo tests). With four kinds C is
	// 4.25 for n = 200 and 4.43 for n = 1000 (4.00 and 4.37 with Sigma
	// given).
	Rate float64
	// Critical, when positive, is the critical value of |t| itself and
	// Rate is not used; 0 means the Bonferroni value above.
	Critical float64
	// Sigma is the standard deviation of the innovations, when known; 0
	// means a robust estimate from the residuals of each pass: the
	// median absolute deviation from the median times 1.4826 (the
	// factor that makes it consistent for a normal distribution), or,
	// when more than half the residuals are equal and the MAD is zero,
	// the root mean square. Either way the scale is at least 1e-12 times
	// the root mean square of all the residuals, so that t stays finite
	// when the residuals besides the outliers vanish.
	Sigma float64
	// MaxCount bounds the number of outliers found; 0 means n/10, at
	// least 1 and at most 50.
	MaxCount int
	// Edge is the number of samples at each end of the record and on
	// each side of a gap within which a found outlier is marked (AtStart,
	// AtEnd, NearGap); 0 means 5.
	Edge int
}

// Validate returns a *SettingError naming the first field that breaks
// its rule, or nil.
func (s *OutlierSettings) Validate() (err error) {
	defer withOp("arma.OutlierSettings.Validate", &err)
	return s.validate("")
}

func (s *OutlierSettings) validate(op string) error {
	if s == nil {
		return nil
	}
	seen := map[OutlierKind]bool{}
	for i, k := range s.Kinds {
		if k < Additive || k > Innovational || seen[k] {
			return &SettingError{Op: op, Setting: "OutlierSettings.Kinds[" + itoa(i) + "]", Value: k.String(),
				Rule: "must be Additive, LevelShift, TemporaryChange or Innovational, each at most once (nil means all four)"}
		}
		seen[k] = true
	}
	if s.Decay != 0 && !(s.Decay > 0 && s.Decay < 1) {
		return &SettingError{Op: op, Setting: "OutlierSettings.Decay", Value: ftoa(s.Decay), Rule: "must lie strictly between 0 and 1 (0 means 0.7)"}
	}
	if err := errs.Probability(op, "OutlierSettings.Rate", s.Rate, "0 means 0.05"); err != nil {
		return err
	}
	if err := errs.NonNegative(op, "OutlierSettings.Critical", s.Critical, "0 means the Bonferroni value from Rate"); err != nil {
		return err
	}
	if err := errs.NonNegative(op, "OutlierSettings.Sigma", s.Sigma, "0 means a robust estimate, the MAD"); err != nil {
		return err
	}
	if err := errs.Count(op, "OutlierSettings.MaxCount", s.MaxCount, "0 means n/10, from 1 to 50"); err != nil {
		return err
	}
	return errs.Count(op, "OutlierSettings.Edge", s.Edge, "0 means 5")
}

func ftoa(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// Outlier is one outlier found: its time (0-based sample Index), Kind,
// Size w (in the series' units; see OutlierKind), and T, the
// t-statistic of the size from the joint re-estimation. AtStart and
// AtEnd mark an outlier within Edge samples of the first or last
// residual: at the end only a few residuals follow it, so an additive
// outlier, a level shift and a temporary change there look alike and the
// kind reported is the one with the largest |t|, not a firm finding; at
// the start the residuals depend on the fit's conditioning. NearGap
// marks one with a missing residual within Edge samples on either side:
// its size rests on fewer residuals than its kind needs.
type Outlier struct {
	Index   int
	Kind    OutlierKind
	Size    float64
	T       float64
	AtStart bool
	AtEnd   bool
	NearGap bool
}

// OutlierReport is the result of Outliers: the outliers found, in time
// order, and the figures of the search. A report is not modified by its
// methods and is safe for concurrent use.
type OutlierReport struct {
	Outliers []Outlier
	// Critical is the critical value of |t| used, Rate the family-wise
	// rate it came from (0 when Settings.Critical was given), Tests the
	// number of tests it covers (times with a residual times kinds).
	Critical float64
	Rate     float64
	Tests    int
	// Sigma is the scale of the final t-statistics (the MAD of the
	// adjusted residuals, or Settings.Sigma), Robust whether it was
	// estimated.
	Sigma  float64
	Robust bool
	// Decay is the decay of a temporary change used.
	Decay float64
	// Trunc is the number of pi weights used: they are cut where every
	// later weight of every kind's pattern is below 1e-10 times its
	// largest (or at the caller's length, for OutliersPi).
	Trunc int
	// Passes is the number of detection passes made.
	Passes int
	// Adjusted are the residuals with the found outliers' effects
	// removed (NaN where the residuals were missing).
	Adjusted []float64

	n      int
	psiNum []float64
	psiDen []float64
}

// Effect returns the effect of outlier k (an index into Outliers) on the
// series, a slice of length n: Size times the kind's pattern of
// OutlierKind from its Index on, zero before; subtract it from the
// series to remove the outlier. The innovational pattern is the noise
// model's psi weights (with its differencing), computed to n terms.
func (r *OutlierReport) Effect(k int) []float64 {
	o := r.Outliers[k]
	out := make([]float64, r.n)
	tail := out[o.Index:]
	switch o.Kind {
	case Additive:
		tail[0] = o.Size
	case LevelShift:
		for j := range tail {
			tail[j] = o.Size
		}
	case TemporaryChange:
		v := o.Size
		for j := range tail {
			tail[j] = v
			v *= r.Decay
		}
	case Innovational:
		_ = poly.DivideTo(tail, r.psiNum, r.psiDen) // psiDen[0] == 1, checked on entry
		for j := range tail {
			tail[j] *= o.Size
		}
	}
	return out
}

// Effects returns the sum of the effects of all outliers found (length
// n), the series' outlier part.
func (r *OutlierReport) Effects() []float64 {
	sum := make([]float64, r.n)
	for k := range r.Outliers {
		for t, v := range r.Effect(k) {
			sum[t] += v
		}
	}
	return sum
}

// Outliers looks for outliers in the residuals resid of a fitted model
// whose noise is noise with the differencing diff (the constant 1 for
// none): an ARMA or ARIMA model, or the noise of a whole
// transfer-function model. The residuals estimate the innovations a_t =
// pi(B) N_t, pi(B) = phi(B) D(B) / theta(B); NaN marks a missing residual
// (a gap, or the samples before the fit's conditioning start).
//
// An outlier of kind k and size w at time T adds w x_t to the residuals,
// x_t = h_(t-T) for t >= T, h the coefficients of pi(B) xi_k(B) (xi_k the
// kind's pattern: 1, 1/(1-B), 1/(1-d B) and psi(B), so h = pi, the
// partial sums of pi, pi filtered by 1/(1-d B), and 1 alone). For each
// time and kind the least-squares size and its t-statistic are
//
//	w(T) = sum_t x_t e_t / sum_t x_t^2,   t(T) = w(T) sqrt(sum_t x_t^2) / sigma
//
// over the residuals present (Chang, Tiao & Chen 1988, eq. 2.4-2.7; Chen
// & Liu 1993, eq. 6-9). The sums are cross-correlations of the residuals
// with the truncated h (plus, for a level shift in a stationary model,
// the constant tail pi(1) times a running sum), computed with FFTs, so a
// pass costs O(n log n). Each pass takes the largest |t| over all times
// and kinds; above the critical value (see OutlierSettings.Rate) its
// effect is removed from the residuals and the search repeats, a time
// being found at most once. Then the sizes of all outliers found are
// re-estimated jointly by least squares from the original residuals, and
// the one with the smallest |t| below the critical value is dropped, and
// so on until every |t| is above it.
//
// Gaps and ends: a time whose residual is missing is not tested (the
// record holds no direct evidence there), and every sum runs over the
// residuals present only, so a gap shortens an outlier's evidence
// instead of being filled. Outliers within OutlierSettings.Edge samples
// of a gap or of either end are marked (Outlier.NearGap, AtStart,
// AtEnd): near the end a level shift, a temporary change and an additive
// outlier differ in only a few residuals, and the kind reported is the
// one with the largest |t|. The residual patterns are cut where every
// later value is below 1e-10 times the largest (OutlierReport.Trunc),
// at most n lags.
//
// The MA polynomial must be invertible (pi weights that die out): a
// *ModelError otherwise. Errors: a *SettingError for bad settings, a
// *SampleError for an infinite residual, a *SeriesError when fewer than
// 10 residuals are present (ErrShort) or they are all equal
// (ErrConstant). resid is not modified.
//
// References: Chang, I., Tiao, G. C. & Chen, C. (1988), Estimation of
// time series parameters in the presence of outliers, Technometrics 30,
// 193-204. Chen, C. & Liu, L.-M. (1993), Joint estimation of model
// parameters and outlier effects in time series, JASA 88, 284-297.
func Outliers(resid []float64, noise Noise, diff Poly, s *OutlierSettings) (r *OutlierReport, err error) {
	const op = "arma.Outliers"
	defer withOp(op, &err)
	defer errs.Recover(op, &err)
	ar, ma, d := noise.AR.Coeffs(), noise.MA.Coeffs(), diff.Coeffs()
	for _, p := range []struct {
		name string
		c    []float64
	}{{"noise AR", ar}, {"noise MA", ma}, {"differencing", d}} {
		if firstNonFinite(p.c) >= 0 {
			return nil, modelErr(p.name, "coefficients must be finite")
		}
		if p.c[0] != 1 {
			return nil, modelErr(p.name, "constant term must be 1, not "+ftoa(p.c[0]))
		}
	}
	if bad, err := outside(ma, 1e-9); err != nil || len(bad) > 0 {
		return nil, modelErr("noise MA", "not invertible (z-plane roots "+rootList(bad)+" on or outside the unit circle), so the pi weights do not die out and the residuals cannot show an outlier's effect; fit an invertible MA")
	}
	num := poly.Mul(ar, d)
	pi, err := poly.Divide(num, ma, max(len(resid), 1))
	if err != nil || firstNonFinite(pi) >= 0 {
		return nil, modelErr("noise", "its pi weights overflow")
	}
	return outliers(op, resid, pi, ma, num, s)
}

// OutliersPi is Outliers for a noise model given by its pi weights
// (pi_0 = 1, the coefficients of phi(B) D(B) / theta(B), see Pi), used
// as given: the caller's length is the truncation (weights beyond it are
// taken as zero, so they should have died out; see Pi for computing
// them), and, as in Outliers, each kind's pattern is cut where every
// later value is below 1e-10 times its largest. The innovational
// pattern of Effect is the power series 1/pi(B).
func OutliersPi(resid, pi []float64, s *OutlierSettings) (r *OutlierReport, err error) {
	const op = "arma.OutliersPi"
	defer withOp(op, &err)
	defer errs.Recover(op, &err)
	if len(pi) == 0 || pi[0] != 1 || firstNonFinite(pi) >= 0 {
		return nil, modelErr("pi weights", "must be finite with pi_0 = 1")
	}
	return outliers(op, resid, pi, []float64{1}, pi, s)
}

// outliers checks the residuals and settings and runs the search.
func outliers(op string, resid, pi []float64, psiNum, psiDen []float64, s *OutlierSettings) (*OutlierReport, error) {
	if err := s.validate(op); err != nil {
		return nil, err
	}
	present := 0
	for i, v := range resid {
		if math.IsInf(v, 0) || math.Abs(v) > MaxAbs {
			return nil, &SampleError{Series: "residuals", Index: i, Value: v, Limit: MaxAbs}
		}
		if !math.IsNaN(v) {
			present++
		}
	}
	if present < 10 {
		return nil, &SeriesError{Series: "residuals", Kind: ErrShort, Have: present, Need: 10, Detail: "residuals present (not NaN), needed for a robust scale"}
	}
	set := outlierDefaults(s, len(resid))
	sc := newScanner(resid, pi, set.kinds, set.decay)
	r := &OutlierReport{Rate: set.rate, Critical: set.crit, Tests: present * len(set.kinds), Decay: set.decay,
		Robust: set.sigma == 0, Trunc: sc.trunc, n: len(resid), psiNum: psiNum, psiDen: psiDen}
	if r.Critical == 0 {
		r.Critical = critical(set.rate, r.Tests, present, set.sigma == 0)
	}
	found, err := sc.search(r.Critical, set.sigma, set.maxCount, &r.Passes)
	if err != nil {
		return nil, err
	}
	r.Outliers, r.Adjusted, r.Sigma, err = sc.joint(found, r.Critical, set.sigma)
	if err != nil {
		return nil, err
	}
	sc.mark(r.Outliers, set.edge)
	return r, nil
}

// critical returns the Bonferroni critical value of OutlierSettings.Rate
// for tests two-sided tests on m residuals, with a robust scale or a
// known one.
func critical(rate float64, tests, m int, robust bool) float64 {
	// The upper quantile as minus the lower one: 1 - p would lose the
	// digits of a tail probability of 1e-8.
	p := rate / (2 * float64(tests))
	z := -distuv.UnitNormal.Quantile(p)
	nu := madEfficiency * float64(m)
	switch {
	case !robust:
		return z
	case nu <= 2000:
		return -distuv.StudentsT{Mu: 0, Sigma: 1, Nu: nu}.Quantile(p)
	}
	// gonum's t quantile fails for many degrees of freedom (49.7 instead
	// of 5.29 at 37000); there the Cornish-Fisher expansion of the t
	// quantile about the normal one (Abramowitz & Stegun 26.7.5) is
	// exact to about 1e-9 (its next term is of order z^11 / nu^5).
	z2 := z * z
	g1 := (z2 + 1) * z / 4
	g2 := ((5*z2+16)*z2 + 3) * z / 96
	g3 := (((3*z2+19)*z2+17)*z2 - 15) * z / 384
	g4 := ((((79*z2+776)*z2+1482)*z2-1920)*z2 - 945) * z / 92160
	return z + g1/nu + g2/(nu*nu) + g3/(nu*nu*nu) + g4/(nu*nu*nu*nu)
}

// madEfficiency is the asymptotic efficiency of the MAD as an estimate
// of a normal standard deviation (Rousseeuw & Croux 1993, sec. 1: 37 %).
const madEfficiency = 0.37

// outlierSet is OutlierSettings with the defaults filled in.
type outlierSet struct {
	kinds          []OutlierKind
	decay, rate    float64
	crit, sigma    float64
	maxCount, edge int
}

func outlierDefaults(s *OutlierSettings, n int) outlierSet {
	set := outlierSet{kinds: allKinds, decay: 0.7, rate: 0.05, maxCount: min(50, max(1, n/10)), edge: 5}
	if s == nil {
		return set
	}
	if s.Kinds != nil {
		set.kinds = slices.Clone(s.Kinds)
	}
	if s.Decay != 0 {
		set.decay = s.Decay
	}
	if s.Critical > 0 {
		set.crit, set.rate = s.Critical, 0
	} else if s.Rate != 0 {
		set.rate = s.Rate
	}
	set.sigma = s.Sigma
	if s.MaxCount > 0 {
		set.maxCount = s.MaxCount
	}
	if s.Edge > 0 {
		set.edge = s.Edge
	}
	return set
}

// robustScale returns 1.4826 times the median absolute deviation from the
// median of the values e_t with mask_t = 1, or their root mean square
// when that is zero; buf is scratch of length >= len(e).
func robustScale(e, mask, buf []float64) float64 {
	x := buf[:0]
	for t, v := range e {
		if mask[t] != 0 {
			x = append(x, v)
		}
	}
	med := median(x)
	ss := 0.0
	for i, v := range x {
		ss += v * v
		x[i] = math.Abs(v - med)
	}
	if mad := 1.4826 * median(x); mad > 0 {
		return mad
	}
	return math.Sqrt(ss / float64(len(x)))
}

// median returns the median of x, reordering x.
func median(x []float64) float64 {
	n := len(x)
	m := nth(x, n/2)
	if n%2 == 1 {
		return m
	}
	lo := x[0]
	for _, v := range x[:n/2] {
		lo = math.Max(lo, v)
	}
	return (lo + m) / 2
}

// nth partially orders x so that x[k] is the value of rank k, smaller
// values before it, and returns it (Hoare's selection, middle pivot).
func nth(x []float64, k int) float64 {
	lo, hi := 0, len(x)-1
	for lo < hi {
		p := x[lo+(hi-lo)/2]
		i, j := lo, hi
		for i <= j {
			for x[i] < p {
				i++
			}
			for x[j] > p {
				j--
			}
			if i <= j {
				x[i], x[j] = x[j], x[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return x[k]
		}
	}
	return x[k]
}
