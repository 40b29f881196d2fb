package fit

import (
	"context"
	"errors"
	"math"
	"sort"
	"strconv"
	"time"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/est"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/sym"
	"github.com/backshift/backshift/tf"
)

// Settings tunes Model. The zero value (or a nil pointer) gives the
// defaults.
type Settings struct {
	// MaxIter bounds the Levenberg-Marquardt iterations of each start.
	// Zero means 200.
	MaxIter int
	// Starts is the number of start points refined by Levenberg-Marquardt
	// after screening the candidates by their sum of squares. Zero means 2
	// when the model has a free denominator or moving-average coefficient
	// (surfaces that can have several minima) and 1 otherwise.
	Starts int
	// First, when larger than the automatic first residual index (see
	// Conditioning), sums the residuals from First instead, for example to
	// compare models of different orders over the same residuals.
	First int
	// Tol stops the optimiser when an accepted step (and the full
	// Gauss-Newton step) reduce the sum of squares by less than Tol
	// relative. Zero means 1e-14 (near the rounding floor of the sum)
	// up to N = 10^4 residuals, rising as (N/10^4)^5 to 1e-9 at N = 10^5
	// and beyond. The excess of the sum of squares over its minimum
	// before the last step is then below Tol SSQ, that is the estimates
	// are within sqrt(Tol N) standard errors of the minimum (1e-5 at
	// N = 10^4, 0.03 at N = 10^6), and the last Gauss-Newton step reduces
	// that by orders of magnitude.
	Tol float64
	// ZeroPreSample takes inputs without differencing as zero before
	// their first sample instead of held at it (see Conditioning in the
	// package doc), the textbook
	// convention for inputs that vary about zero.
	ZeroPreSample bool
	// Settle, after a converged fit, moves the first residual index to
	// NoiseStart + p + k, k the number of samples in which the slowest
	// estimated input pole or noise MA zero decays to 1 % (ln 0.01 /
	// ln |z|), capped at n/10, and refits by the same method, so that
	// the start-up transient of the pre-sample assumption (an input that
	// was not settled at its first value, as in closed-loop records) is
	// left out of the sum of squares, or of the exact likelihood
	// (ExactML: Conditioning.LikelihoodStart). Conditioning reports the
	// index used.
	Settle bool
	// Start is the time of the record's sample 0, used only to place
	// events given as times (step(2026-03-01T08:00)); events given as
	// sample indices need none. A model with an event given as a time
	// needs Start: with the zero time Model refuses it (a *ModelError
	// naming the event).
	Start time.Time
	// IgnoreExtra accepts data holding series the model does not use.
	// By default such series are an error (ExtraSeries), because they
	// usually mean a misspelt input name.
	IgnoreExtra bool
	// Method is the estimation method: LeastSquares (the zero value,
	// conditional least squares) or ExactML (exact maximum likelihood,
	// which also accepts missing output samples). The package doc's
	// Methods section says why least squares stays the default. First
	// and Settle apply to both: ExactML starts the noise from its
	// stationary distribution, but the inputs' pre-sample convention can
	// still leave a start-up transient in the noise series, and its
	// likelihood is taken from max(NoiseStart, First) on
	// (Conditioning.LikelihoodStart).
	Method Method
	// InputGaps fills missing (NaN) input samples by a stated rule; the
	// zero value refuses them with their positions. The estimate
	// reports every gap filled (Estimate.Filled), and warns
	// (FilledGapMove) where the input moved across a filled gap or the
	// residuals after it are extreme: a fill is wrong by up to what the
	// input moved during the gap, whatever the process's speed.
	InputGaps GapFill
}

// MaxMagnitude is the largest sample magnitude Model accepts (1e150):
// beyond it the squares of the residuals, and the products of the
// Jacobian, can overflow float64. Rescale such series (change units).
const MaxMagnitude = 1e150

// Validate checks the settings by the library's settings rule (zero
// means the default, a negative or non-finite value is an error; see the
// package doc) and returns a *SettingError naming the field
// ("Settings.Tol"), or nil. Tol must also be below 1 (it is a
// relative reduction of the sum of squares; 1 or more would stop at the
// start point). First is checked against the data's length by Model. The
// boolean fields have no bad value.
func (s Settings) Validate() (err error) {
	defer setOp("fit.Settings.Validate", &err)
	return s.validate()
}

// validate is Validate without the Op, for the functions taking a
// Settings (they set their own).
func (s Settings) validate() error {
	if err := errs.First(
		errs.Count("", "Settings.MaxIter", s.MaxIter, "0 means 200 iterations"),
		errs.Count("", "Settings.Starts", s.Starts, "0 means 2 with a free denominator or MA coefficient, 1 otherwise"),
		errs.Count("", "Settings.First", s.First, "0 means the automatic first residual index"),
		errs.NonNegative("", "Settings.Tol", s.Tol, "0 means 1e-14 up to 10^4 residuals, rising to 1e-9 at 10^5"),
	); err != nil {
		return err
	}
	if !(s.Tol < 1) {
		return errs.Setting("Settings.Tol", errs.Num(s.Tol), "must be below 1 (a relative reduction of the sum of squares; 0 means the default)")
	}
	if s.Method != LeastSquares && s.Method != ExactML {
		return errs.Setting("Settings.Method", strconv.Itoa(int(s.Method)), "must be fit.LeastSquares (0, the default) or fit.ExactML")
	}
	return s.InputGaps.validate()
}

// Conditioning states the start-up convention of a fit by either method,
// with indices into the data (0 = oldest sample): where the least
// squares residuals are summed from, and for ExactML where its
// likelihood starts (LikelihoodStart); the package doc sets the
// convention out under Conditioning.
type Conditioning struct {
	// OutputDiff is the degree of the output differencing D(B): w_t =
	// D(B) y_t exists from this index on.
	OutputDiff int
	// NoiseStart is the first index at which the noise series n_t is
	// used: max(OutputDiff, max over inputs of d_i + b_i + s_i).
	NoiseStart int
	// First is the first index whose residual enters the sum of squares:
	// NoiseStart + p (p the degree of phi(B)), or Settings.First when
	// larger.
	First int
	// LikelihoodStart is, for an ExactML estimate, the first index of
	// the noise series whose likelihood was computed: max(NoiseStart,
	// Settings.First). Check and Forecast filter from it again.
	LikelihoodStart int
	// ZeroPreSample reports that inputs were taken as zero before their
	// first sample (Settings.ZeroPreSample) instead of held at it.
	// Check and Forecast recompute residuals with the same convention.
	ZeroPreSample bool
	// Start is Settings.Start, the time of sample 0 that placed the
	// model's events given as times; Check and Forecast place them
	// again with it.
	Start time.Time
	// InputGaps is Settings.InputGaps, the rule that filled missing
	// input samples; Check and Forecast fill their data with it.
	InputGaps GapFill
}

// Param is one estimated parameter: its name in the model, the
// estimate, the start value of the best start, the standard error
// (from sigma^2 (J'J)^-1, NaN when J'J is singular) and T = Value/SE.
// It is the one parameter type of the library (package arma uses it
// too).
type Param = est.Param

// Estimate is the result of Model. For an ExactML fit, SSQ is the sum
// of the squared standardised innovations v_t^2/F_t (F_t the one-step
// prediction variance in units of sigma^2), N the number of observed
// samples in the likelihood, Conditioning.First the first of them,
// Resid the standardised innovations v_t/sqrt(F_t) (in the output's
// units; NaN where the output is missing and before First), LogLik the
// exact log-likelihood and Cov the inverse of the observed information
// (see Methods in the package doc).
type Estimate struct {
	// Method is the estimation method used (Settings.Method).
	Method Method
	// Model is the model with every free coefficient set to its estimate
	// (still marked free, so that it prints as a spec with the estimates
	// as start values, "~", and can be refitted from them); Held gives
	// it with the estimates held ("="), for a configuration file.
	Model tf.Model
	// Params lists the free parameters in order of first appearance
	// (constant, inputs' numerators and denominators, noise MA, noise AR).
	Params []Param
	// Cov is the covariance sigma^2 (J'J)^-1 of the estimates, in the
	// order of Params (NaN entries when J'J is singular); Corr gives the
	// correlations.
	Cov [][]float64
	// SSQ is the sum of squared residuals; Sigma2 = SSQ/(N - k) with k
	// free parameters, the library's one variance convention (the
	// README's Vocabulary); multiply a standard error by
	// sqrt((N - k)/N) to compare with a program that divides by N.
	SSQ, Sigma2 float64
	// LogLik is the conditional Gaussian log-likelihood at the maximum
	// over sigma^2, -N/2 (log(2 pi SSQ/N) + 1); AIC = -2 LogLik + 2 (k+1)
	// and BIC = -2 LogLik + (k+1) log N count sigma^2 as a parameter.
	LogLik, AIC, BIC float64
	// N is the number of residuals summed, n - Conditioning.First.
	N int
	// Conditioning is the start-up convention used.
	Conditioning Conditioning
	// Resid holds the residuals a_t aligned to the data index (length n),
	// NaN before Conditioning.First.
	Resid []float64
	// Iter and Evals count Levenberg-Marquardt iterations and residual
	// evaluations of the best start; StartsTried counts the candidate
	// start points screened.
	Iter, Evals, StartsTried int
	// Converged reports whether the best start met a convergence test;
	// Reason says which, or why it stopped.
	Converged bool
	Reason    string
	// Warnings lists problems found with the estimates; empty when none.
	Warnings []Warning
	// Missing holds, for an ExactML fit, the smoothed estimate of each
	// missing (NaN) output sample with its standard error, in index
	// order; empty when none is missing.
	Missing []MissingValue
	// Filled lists the input gaps filled by Settings.InputGaps (series,
	// first index, length, rule), by input name then index; empty when
	// none was.
	Filled []InputFill
}

// Held returns a copy of the fitted model with every coefficient held at
// its estimate, so that it prints with "=" (name = value) where
// Estimate.Model, whose estimated coefficients stay free so that it can
// be refitted from them, prints "~" (free, start value). It is the form
// a configuration file wants: a model to simulate, forecast or tune a
// controller with, not one to refit. Printing it and parsing the text
// gives the same model.
func (e *Estimate) Held() tf.Model { return e.Model.Held() }

// Corr returns the correlations of the estimates, in the order of
// Params, computed from Cov (NaN entries where a variance is not
// positive and finite, as when J'J is singular).
func (e *Estimate) Corr() [][]float64 { return est.Corr(e.Cov) }

// Model estimates the free coefficients of m from data jointly, by
// conditional least squares (the default) or exact maximum likelihood
// (Settings.Method; the package doc, Methods). data maps series names to
// samples (index 0 oldest), all of one length n, with an entry for
// m.Output and for every input's Series; s may be nil for the defaults.
// m and data are not modified, and Model may be called from many
// goroutines at once.
//
// The residuals and their start-up convention are set out in the package
// doc under Conditioning (and returned in Estimate.Conditioning), the
// search under Estimation, and the errors under Errors. Estimate.Warnings
// lists what makes the estimate doubtful; WarningKind.Serious says which
// make it unfit for use. When ctx is done before the fit converges,
// Model returns the best point so far together with an *InterruptedError.
func Model(ctx context.Context, m tf.Model, data map[string][]float64, s *Settings) (_ *Estimate, err error) {
	defer setOp("fit.Model", &err)
	defer errs.Recover("fit.Model", &err)
	var set Settings
	if s != nil {
		set = *s
	}
	if err := set.validate(); err != nil {
		return nil, err
	}
	if ctx == nil {
		ctx = context.Background()
	}
	w, err := newWork(m, data, set)
	if err != nil {
		return nil, err
	}
	if set.Method == ExactML {
		if err := eventsInGaps(m, w.obs, set.Start); err != nil {
			w.release()
			return nil, err
		}
	}
	var e *Estimate
	if set.Method == ExactML {
		e, err = fitML(ctx, w, w.obs, set)
	} else {
		e, err = w.run(ctx, set)
	}
	filled := w.filled
	w.release()
	if err != nil {
		return nil, err
	}
	if set.Settle && e.Converged {
		e = settleRefit(ctx, e, data, set, w.n, w.ar.Degree())
	}
	e.Filled = filled
	e.Warnings = append(e.Warnings, fillWarnings(e, data)...)
	return finishEstimate(ctx, e)
}

// ConditioningOf returns the conditioning that Model would use to fit m
// to data with the settings s (nil for the defaults) before any Settle,
// without fitting: the same checks of the model, the data and the
// settings as Model, with the same errors. Candidates use it to compare
// models over one common first residual index.
func ConditioningOf(m tf.Model, data map[string][]float64, s *Settings) (_ Conditioning, err error) {
	defer setOp("fit.ConditioningOf", &err)
	var set Settings
	if s != nil {
		set = *s
	}
	if err := set.validate(); err != nil {
		return Conditioning{}, err
	}
	w, err := newWork(m, data, set)
	if err != nil {
		return Conditioning{}, err
	}
	defer w.release()
	return w.cond, nil
}

// settleRefit is Settings.Settle: it moves First past the start-up
// transient of the estimated input poles and MA zeros and refits by the
// same method (from the estimates for least squares; the exact
// likelihood from its own least-squares start); it returns e when there
// is nothing to move or the refit fails.
func settleRefit(ctx context.Context, e *Estimate, data map[string][]float64, set Settings, n, p int) *Estimate {
	k := SettleSamples(e.Model)
	first := min(e.Conditioning.NoiseStart+p+k, n/10)
	if first <= e.Conditioning.First {
		return e
	}
	s2 := set
	s2.First = first
	s2.Settle = false
	w2, err := newWork(e.Model, data, s2)
	if err != nil {
		return e
	}
	var e2 *Estimate
	if set.Method == ExactML {
		e2, err = fitML(ctx, w2, w2.obs, s2)
	} else {
		e2, err = w2.run(ctx, s2)
	}
	w2.release()
	if err != nil {
		return e
	}
	for i := range e2.Params {
		e2.Params[i].Start = e.Params[i].Start
	}
	return e2
}

// finishEstimate refuses an estimate whose sum of squares is zero (sigma^2,
// the log-likelihood and the criteria would not exist), and returns the
// best point of a fit whose context was done before it converged
// together with an *InterruptedError wrapping the context's error.
func finishEstimate(ctx context.Context, e *Estimate) (*Estimate, error) {
	out := e.Model.Output
	if !(e.SSQ > 0) || math.IsInf(e.LogLik, 0) || math.IsNaN(e.LogLik) {
		return nil, errs.Model("fit of output "+strconv.Quote(out), "the residual sum of squares is zero: the model reproduces the output exactly (a noise-free or constant output), "+
			"or the samples are so small that the squares of the residuals underflow float64 (below about 1e-162); "+
			"sigma^2, the log-likelihood and AIC/BIC would not exist: rescale the series (change its units) or check the data")
	}
	if err := ctx.Err(); err != nil && !e.Converged {
		return e, &InterruptedError{Series: out, Iter: e.Iter, Err: err}
	}
	return e, nil
}

// SettleSamples returns the number of samples after which the slowest
// input pole or noise MA zero of m (from the values of its coefficients)
// has decayed to 1 %: ln 0.01 / ln |z|max, 0 when all are zero, and
// math.MaxInt32 for a pole or zero on or outside the unit circle. Model
// leaves this many samples out when Settings.Settle asks it to.
func SettleSamples(m tf.Model) int {
	z := 0.0
	for _, in := range m.Inputs {
		z = math.Max(z, maxZ(in.Den.Coeffs()))
	}
	if m.Noise != nil {
		z = math.Max(z, maxZ(m.Noise.MA.Coeffs()))
	}
	if z <= 0 {
		return 0
	}
	if z >= 1 {
		return math.MaxInt32
	}
	return int(math.Ceil(math.Log(0.01) / math.Log(z)))
}

var unitPoly = []float64{1}

// bindModel checks m for fitting and binds its free coefficients to a
// parameter vector, in order of first appearance (constant, inputs'
// numerators and denominators, noise MA, noise AR) in a clone of m. It
// refuses a model without an output or with nothing free, one that
// Model.Validate refuses, free differencing coefficients and a name free
// in one place and held in another.
func bindModel(m tf.Model) (binding, error) {
	if m.Output == "" {
		return binding{}, errs.Model("model", "it names no output series (Model.Output is empty)")
	}
	if err := m.Validate(); err != nil {
		return binding{}, err
	}
	b := binding{m: m.Clone()}
	p := sym.GroupParams(b.m.EachParam)
	b.names, b.coefs, b.index = p.Names, p.Coefs, p.Index
	if err := fixedDifferencing(b.m); err != nil {
		return binding{}, err
	}
	if p.Conflict != "" {
		return binding{}, errs.Model("coefficient "+p.Conflict, "it is free in one place and held in another; one name is one parameter, so mark it the same way everywhere (or rename one)")
	}
	if len(b.names) == 0 {
		return binding{}, errs.Model("model", "nothing is free to estimate (every coefficient is held); mark at least one coefficient free")
	}
	return b, nil
}

// fixedDifferencing refuses a free coefficient in the differencing of
// the output (checked first) or of an input.
func fixedDifferencing(m tf.Model) error {
	var err error
	noFree := func(p tf.Poly) {
		p.Each(func(c *tf.Coef) {
			if c.Name != "" && c.Free && err == nil {
				err = errs.Model("differencing coefficient "+c.Name, "differencing must be given as fixed numbers, not estimated (write the value, or hold it with =)")
			}
		})
	}
	noFree(m.Diff)
	for _, in := range m.Inputs {
		noFree(in.Diff)
	}
	return err
}

// checkData checks the data of a fit of m: the output and every
// input present, no series the model does not use (unless
// set.IgnoreExtra), one length, and every sample finite and at most
// MaxMagnitude (series checked in name order). It returns the output.
func checkData(m tf.Model, data map[string][]float64, set Settings) ([]float64, error) {
	y, ok := data[m.Output]
	if !ok {
		return nil, errs.Series(m.Output, errs.ErrName, 0, 0, "the model's output is not in the data; check the series names")
	}
	used := map[string]bool{m.Output: true}
	for _, in := range m.Inputs {
		if _, ok := data[in.Series]; !ok {
			return nil, errs.Series(in.Series, errs.ErrName, 0, 0, "an input of the model is not in the data; check the series names")
		}
		used[in.Series] = true
	}
	if !set.IgnoreExtra {
		var extra []string
		for name := range data {
			if !used[name] {
				extra = append(extra, name)
			}
		}
		if len(extra) > 0 {
			sort.Strings(extra)
			return nil, errs.Series(extra[0], errs.ErrName, 0, 0, "it is in the data but not used by the model, often a misspelt input name; set fit.Settings.IgnoreExtra to allow extra series")
		}
	}
	n := len(y)
	names := make([]string, 0, len(used))
	for name := range used {
		names = append(names, name)
	}
	sort.Strings(names)
	for _, name := range names {
		x := data[name]
		if len(x) != n {
			return nil, errs.Series(name, errs.ErrLength, len(x), n, "the length of the output "+strconv.Quote(m.Output)+"; every series of one fit has one length")
		}
		for t, v := range x {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, &errs.SampleError{Series: name, Index: t, Value: v}
			}
			if math.Abs(v) > MaxMagnitude {
				return nil, &errs.SampleError{Series: name, Index: t, Value: v, Limit: MaxMagnitude}
			}
		}
	}
	return y, nil
}

// isConstant reports whether every sample of x equals the first.
func isConstant(x []float64) bool {
	for _, v := range x {
		if v != x[0] {
			return false
		}
	}
	return true
}

// checkConstTerms reports a zero constant term in a denominator or noise
// polynomial as written.
func checkConstTerms(m tf.Model) error {
	chk := func(p tf.Poly, what string) error {
		if c := p.Coeffs(); c[0] == 0 {
			return errs.Model(what, "the constant term is zero, so the term is not causal; write it as 1 + ... (or move the dead time to the input's delay)")
		}
		return nil
	}
	for _, in := range m.Inputs {
		if err := chk(in.Den, "input "+strconv.Quote(in.Series)+" denominator"); err != nil {
			return err
		}
	}
	if m.Noise != nil {
		if err := chk(m.Noise.MA, "noise MA"); err != nil {
			return err
		}
		if err := chk(m.Noise.AR, "noise AR"); err != nil {
			return err
		}
	}
	return nil
}

// applyDiff returns D(B) x over the full length with zeros before index
// deg D (filter.Diff into a new slice).
func applyDiff(x, dc []float64) []float64 {
	return filter.Diff(make([]float64, len(x)), x, dc)
}

var errFilter = errors.New("tf: filter output not finite")

// runFirstOrder computes, for delta(B) = 1 + d1 B and omega(B) = c0 + c1 B +
// c2 B^2 (c of length 1..3), from zero pre-sample values and dead time b
// (< len(zc)), with the same operations in the same order as the
// general path (filter.Run, fir, filter.Run), so bit for bit alike:
//
//	s_t = zc_{t-b} - d1 s_{t-1},  u_t = c0 s_t + c1 s_{t-1} + c2 s_{t-2},
//	q_t = u_t - d1 q_{t-1}.
//
// s[:b] must already be zero.
func runFirstOrder(s, u, q, zc []float64, b int, d1 float64, c []float64) {
	n := len(s)
	var cc [3]float64
	copy(cc[:], c)
	c0, c1, c2 := cc[0], cc[1], cc[2]
	var s1, s2, q1 float64
	s = s[:n]
	u = u[:n]
	q = q[:n]
	for t := 0; t < b; t++ {
		u[t] = 0
		q[t] = 0
	}
	x := zc[:n-b]
	ss := s[b:]
	us := u[b:]
	qs := q[b:]
	ss = ss[:len(x)]
	us = us[:len(x)]
	qs = qs[:len(x)]
	for i, v := range x {
		s0 := v - d1*s1
		u0 := c0*s0 + c1*s1 + c2*s2
		q0 := u0 - d1*q1
		ss[i], us[i], qs[i] = s0, u0, q0
		s2, s1, q1 = s1, s0, q0
	}
}

// singlePower reports whether g has exactly one non-zero coefficient,
// and its power and value.
func singlePower(g []float64) (int, float64, bool) {
	l, c, n := 0, 0.0, 0
	for i, v := range g {
		if v != 0 {
			l, c = i, v
			n++
		}
	}
	return l, c, n == 1
}

// pushHistory shifts the last outputs y into h (oldest first), keeping
// len(h) values.
func pushHistory(h, y []float64) {
	q := len(h)
	if len(y) >= q {
		copy(h, y[len(y)-q:])
		return
	}
	copy(h, h[len(y):])
	copy(h[q-len(y):], y)
}

// negateAll returns the negated polynomials of g (nil stays nil), reusing
// dst's storage.
func negateAll(dst, g [][]float64) [][]float64 {
	if cap(dst) < len(g) {
		dst = make([][]float64, len(g))
	}
	dst = dst[:len(g)]
	for k, c := range g {
		if c == nil {
			dst[k] = nil
			continue
		}
		d := dst[k][:0]
		for _, v := range c {
			d = append(d, -v)
		}
		dst[k] = d
	}
	return dst
}

func sumCoeffs(c []float64) float64 {
	s := 0.0
	for _, v := range c {
		s += v
	}
	return s
}

// Staging: a long series is first fitted on its last
// max(stagedWindow, stagedPerParam k) samples (start values, screening and all starts), and the full series
// is then refined from that estimate by a single Levenberg-Marquardt run,
// which from so close a start takes a few iterations.
const (
	stagedWindow   = 2500
	stagedPerParam = 400
	stagedMin      = 40000
)

// Param returns the estimate named name and whether it exists.
func (e *Estimate) Param(name string) (Param, bool) {
	for _, p := range e.Params {
		if p.Name == name {
			return p, true
		}
	}
	return Param{}, false
}

// hannanRissanen is a convenience used by the start values: Hannan-Rissanen on
// a window of n_t, NaN-free.
func hannanRissanen(x []float64, p, q int) (phi, theta []float64, err error) {
	return arma.HannanRissanen(x, p, q, 0)
}
