// Package tf holds transfer-function models in the backshift operator B
// (B x_t = x_{t-1}): rational terms omega(B)/delta(B) B^b, their responses,
// poles, zeros, stability, gain and frequency response, composition and
// stability margins of loops, step-response metrics, conversion from and
// to continuous-time process models, streaming simulation, and the whole
// transfer-function-noise model with its estimation, diagnostics and
// forecasts.
//
// # The rational term
//
// A Rational is
//
//	G(B) = omega(B) / delta(B) * B^b,   y_t = G(B) x_t,
//
// with omega(B) = omega_0 + omega_1 B + ... + omega_s B^s the numerator,
// delta(B) = 1 + delta_1 B + ... + delta_r B^r the denominator and b >= 0
// the dead time in whole samples. As a difference equation,
//
//	y_t = -delta_1 y_{t-1} - ... - delta_r y_{t-r} + omega_0 x_{t-b} + ... + omega_s x_{t-b-s}.
//
// # Conventions
//
// Polynomials are []float64 in ascending powers of B: index k holds the
// coefficient of B^k. Signs are kept as written: the first-order
// denominator (1 - 0.8 B) is {1, -0.8}, and a model written with a minus
// sign in the numerator keeps that minus sign in the coefficient.
//
// Poles and zeros are reported in the z-plane, z = 1/B, as engineers read
// them: a pole is a root z of z^r delta(1/z), so the term above has its
// pole at z = 0.8. The term is stable when every pole lies strictly inside
// the unit circle, equivalently when every root of delta(B) lies outside
// it. A pole at z = 1 is an integrator (no steady-state gain); a zero
// outside the unit circle gives an inverse response (non-minimum phase).
//
// Frequencies are in radians per sample, 0..pi; the frequency response is
// G evaluated at B = e^{-i w}.
//
// # Causality
//
// Causality is structural: b >= 0 and delta_0 != 0, so y_t depends only on
// inputs up to x_{t-b} and on past outputs. With b = 0 and omega_0 != 0 the
// output responds within the same sample (direct feedthrough); a
// closed-loop simulation that feeds y_t back into x_t then has an
// algebraic loop, and should use a dead time of at least one sample or
// act on y_{t-1} (see Plant).
//
// # Time units
//
// Dead time, rise time, settling time and time constants are in samples.
// Where a sample interval T is given, they are also reported in its units.
// Continuous-time models (first and second order plus dead time) are
// converted under a zero-order hold, exactly, including dead time that is
// not a whole number of samples (modified z-transform).
//
// # Errors and inputs
//
// Functions and methods never modify the slices, maps and models they are
// given, and never keep them: constructors copy. Bad data and bad
// settings give typed errors in the library's one vocabulary (see
// internal/errs, re-exported here): every error matches one kind with
// errors.Is (ErrSample, ErrShort, ErrConstant, ErrLength, ErrName,
// ErrSetting, ErrModel, ErrConvergence, ErrOverflow, ErrInternal,
// ErrFormat), and its
// shape, for errors.As, carries the facts and an Op naming the exported
// function the caller called ("tf.NewRational", "tf.Model.Simulate"):
// *SampleError (series name, 0-based index, value), *SeriesError (a whole
// series too short, of the wrong length or not known), *SettingError (a
// setting by its field name, where zero means the default; FitSettings,
// SimSettings and StepSettings check themselves with Validate),
// *ModelError (a model or term that cannot be used, such as a structure
// no spec can have, checked by Model.Validate, or a model that cannot be
// simulated). Four shapes of this package carry facts the shared ones do
// not, and match ErrModel: *CoefError (which polynomial, which power of
// B, the value; its precise cause is one of ErrEmpty, ErrZeroConstant,
// ErrNotFinite, ErrDegree, ErrNormalise), *DelayError (the dead time),
// *GainError (delta(1) and omega(1) of a pole at z = 1) and
// *UnstableError (the largest pole magnitude of a term that must be
// stable); *SimError (the step and value where a simulation stopped being
// finite) matches ErrOverflow, or ErrSample for a non-finite input. On
// the estimation side, *StageError says which stage of Check, Forecast or
// Identify failed (errors.As reaches the inner error), *InterruptedError
// is a Fit stopped by its context (matching the context's error too) and
// *InternalError a recovered panic, a fault of the library. On error the
// other results are zero values, except that a Fit interrupted by its
// context returns its best point with the error. Panics are kept for programmer
// errors the types cannot exclude, each documented where it can happen
// (a destination slice of the wrong length, a Step with the wrong number
// of inputs). Limits: polynomial degree MaxDegree (64), dead time
// MaxDelay (10000 samples).
//
// # Estimates
//
// Every fit of the library (tf.Fit, arma.Fit) reports its free
// coefficients as []Param (name, estimate, start, standard error, t) and
// their covariance as a [][]float64 in the same order, NaN where it does
// not exist. The innovation variance is SSQ/(N - k), N residuals and k
// free coefficients, and the covariance sigma^2 (J'J)^-1; to compare with
// a program that divides by N, scale the standard errors by
// sqrt((N - k)/N). The log-likelihood, AIC and BIC use SSQ/N, as their
// formulas require.
//
// # Concurrency
//
// Rational values are immutable and safe for concurrent use. A Model may
// be read (printed, simulated, converted) by several goroutines at once as
// long as none of them modifies it; Model.Clone gives a private copy.
// Plant and System hold the state of one simulation and are not safe for
// concurrent use: give each goroutine its own Clone.
//
// # Records that start settled
//
// Fit assumes by default that each input was held at its first value
// before the record (the process settled there), and Model.Simulate makes
// such records by default, so that simulating and then fitting agree.
// SimSettings.FromRest and FitSettings.ZeroPreSample take the inputs as
// zero before the record instead. A streaming System starts at rest until
// SetSteady. When the residuals or the noise series at the start of a fit
// show a transient that this assumption does not explain, Fit warns
// (StartupTransient) and FitSettings.Settle leaves it out.
//
// # Conditioning
//
// With w_t = D(B) y_t and z_i,t = D_i(B) x_i,t the differenced series,
//
//	u_i,t = omega_i(B)/delta_i(B) B^b_i z_i,t
//	n_t   = w_t - c - sum_i u_i,t
//	a_t   = phi(B)/theta(B) n_t.
//
// The input filters run from index 0. An input without differencing is
// taken as held at its first value x_i,0 before the record, with u_i at
// its steady state omega_i(1)/delta_i(1) x_i,0 (the process settled at
// the input's first level, so that an input far from zero gives no
// start-up transient): u_i = omega_i/delta_i B^b_i (x_i - x_i,0) from
// rest plus omega_i(1)/delta_i(1) x_i,0. A differenced input z_i (which
// varies about zero) is taken as zero before index d_i, the degree of
// D_i, with u_i zero before the start (zero pre-sample values after
// differencing). Model.Simulate makes records of exactly this kind by
// default, so that simulating and then fitting with the defaults agree.
// FitSettings.ZeroPreSample takes every input as zero before its record
// (the records of Model.Simulate with SimSettings.FromRest, for inputs
// without differencing). A record that starts away from that assumption
// shows a start-up transient, which the StartupTransient warning reports
// and FitSettings.Settle leaves out. n_t is used from NoiseStart = max(d,
// max_i(d_i + b_i + s_i)), where d is the degree of D and s_i that of
// omega_i, so that every numerator sees only real data. The noise
// recursion theta(B) a_t = phi(B) n_t starts at First = NoiseStart + p
// with a_t = 0 for t < First and the actual n_{t-1..t-p}. The sum of
// squares is sum_{t=First}^{n-1} a_t^2 over N = n - First residuals.
//
// The same convention serves Check and Forecast, which recompute the
// residuals of an estimate, and Identify, which compares candidates over
// one common First.
//
// # Estimation
//
// Fit minimises the sum of squares over all free coefficients jointly
// by Levenberg-Marquardt.
//
// Each derivative of a_t is itself a filtered series. Writing g_k(B) for
// the derivative of a polynomial's expanded coefficients with respect to
// parameter k (through products and powers of factors by the product
// rule, sym.Poly.Grad):
//
//	omega_i:  d n_t = -g_k(B)/delta_i(B) B^b_i z_i,t          (numerator)
//	delta_i:  d n_t = +g_k(B)/delta_i(B) u_i,t                (d(1/delta) = -g/delta^2)
//	c:        d n_t = -1
//	then      d a_t = phi(B)/theta(B) d n_t
//	phi:      d a_t = +g_k(B)/theta(B) n_t
//	theta:    d a_t = -g_k(B)/theta(B) a_t                    (from theta a = phi n)
//
// with the same conditioning (derivatives zero before First, the
// moving-average recursion started at First), z_i and u_i standing for
// their parts filtered from rest; an input held at x_i,0 adds the
// constants -g_k(1)/delta_i(1) x_i,0 (numerator) and +omega_i(1) g_k(1)/
// delta_i(1)^2 x_i,0 (denominator) to d n_t. The sums of contributions
// give each Jacobian column; all are computed with the recursive filter
// kernel and moving-average loops without allocation per sample, and a
// numerator or AR column whose g_k is a single power of B is a shifted
// copy of a series formed once per evaluation. The Jacobian is never
// stored: the solver needs only J'J and J'r, and each block of 256 rows
// of every column is formed in cache and multiplied there (the
// moving-average recursion carrying its state from block to block).
//
// Start values: a polynomial whose free coefficients all have Value 0
// gets computed start values; one with any non-zero free Value is started from the
// values as written (the spec's start values). Computed starts: the
// impulse-response weights of each input by least squares of w_t on
// c and z_i,t-b_i-k, k = 0..s_i+3r_i+2 (over at most the last 20000
// samples), turned into delta_i from the weights beyond lag s_i and into
// omega_i = delta_i v_i (truncated) (Box, Jenkins & Reinsel, chapter on
// transfer-function identification); the noise by Hannan-Rissanen on the
// implied n_t. A polynomial with several factors or powers is matched to
// the target coefficients by least squares. Further candidates (noise at
// zero, denominators scaled by 0.5 and 1.5 when stable) are screened by
// their sum of squares and the best FitSettings.Starts refined; the
// lowest sum of squares wins. A long series (N >= 40000) goes through
// all of this on its last max(2500, 400 k) samples only (k free
// parameters), and the whole series is then refined from that estimate
// by one Levenberg-Marquardt run, which takes a few iterations from so
// close a start.
//
// Summation: Fit may be called from many goroutines at once (for many
// series or candidate models); fits share nothing but pools of work buffers. For
// N >= 50000 residuals the products J'J and J'r are summed over the two
// halves of the rows separately and then added; without a moving-average
// part the halves run on two goroutines when GOMAXPROCS > 1. The
// summation order depends only on N, so results are the same bit for bit
// with one goroutine or two.
//
// References: Box, G. E. P., Jenkins, G. M., Reinsel, G. C. and Ljung,
// G. M. (2015). Time Series Analysis: Forecasting and Control, 5th ed.,
// Wiley: chapters on identification, fitting and checking of
// transfer-function models.
//
// # Overflow in streaming
//
// Plant.Step and System.Step return no error, to stay cheap in control
// loops; each records the first output that is NaN or infinite (a
// non-finite input, an unstable term, or values too large for float64),
// and Err reports it with its step.
//
// # Cautions
//
// An identified model is an approximation, valid near the operating
// conditions of the data it was fitted to: the range of the inputs, the
// throughput, the season, the state of the equipment. Outside them its
// gains, time constants and dead time may be wrong. A controller tuned on
// such a model must be commissioned under the site's safety procedures,
// with independent interlocks and trips that do not rely on the model, and
// by people qualified to do so; defer to local codes and licensed
// engineering practice. Nothing in this package is a safety function.
package tf
