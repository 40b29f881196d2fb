// Package fit estimates transfer-function-noise models (tf.Model) from
// data, checks the estimates and forecasts with them.
//
// Model fits the free coefficients of a model to a record and returns an
// Estimate: the estimates with their standard errors and correlations,
// the residuals, the information criteria and Warnings that say what
// makes the estimate doubtful. Check runs the diagnostic checks of an
// estimate on its data (Ljung-Box on the residuals, cross-correlation of
// the residuals with the prewhitened inputs, soundness of the roots) and
// gives a verdict; Estimate.Forecast forecasts the output with intervals,
// from planned or forecast inputs. Screen is the screening of an output
// record (stuck runs, spikes) that Model runs first; CheckSeries refuses
// a series that is constant after its differencing, for Check and for
// tf/identify.
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
// differencing). tf.Model.Simulate makes records of exactly this kind by
// default, so that simulating and then fitting with the defaults agree.
// Settings.ZeroPreSample takes every input as zero before its record
// (the records of tf.Model.Simulate with tf.SimSettings.FromRest, for inputs
// without differencing). A record that starts away from that assumption
// shows a start-up transient, which the StartupTransient warning reports
// and Settings.Settle leaves out. n_t is used from NoiseStart = max(d,
// max_i(d_i + b_i + s_i)), where d is the degree of D and s_i that of
// omega_i, so that every numerator sees only real data. The noise
// recursion theta(B) a_t = phi(B) n_t starts at First = NoiseStart + p
// with a_t = 0 for t < First and the actual n_{t-1..t-p}. The sum of
// squares is sum_{t=First}^{n-1} a_t^2 over N = n - First residuals.
//
// The same convention serves Check and Forecast, which recompute the
// residuals of an estimate, and identify.Candidates, which compares
// candidates over one common First (from ConditioningOf, which returns
// the conditioning of a fit without fitting).
//
// # Estimation
//
// Model minimises the sum of squares over all free coefficients jointly
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
// their sum of squares and the best Settings.Starts refined; the
// lowest sum of squares wins. A long series (N >= 40000) goes through
// all of this on its last max(2500, 400 k) samples only (k free
// parameters), and the whole series is then refined from that estimate
// by one Levenberg-Marquardt run, which takes a few iterations from so
// close a start.
//
// Summation: Model may be called from many goroutines at once (for many
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
// # Methods
//
// Settings.Method chooses the estimator; Estimate.Method and the report
// say which was used.
//
// LeastSquares (the default) is the conditional least squares above.
//
// ExactML maximises the exact Gaussian likelihood of the whole model
// (transfer terms, constant, noise, differencing) jointly. With V_t =
// sum_i u_i,t (the input terms as above, from index 0 with the same
// pre-sample convention) and S the solution of D(B) S_t = V_t (S = 0
// before deg D), the noise series z_t = y_t - S_t follows
//
//	phi(B) (D(B) z_t - c) = theta(B) a_t,
//
// an ARIMA model whose likelihood the Kalman filter of internal/kalman
// computes exactly: the ARMA part started from its stationary
// distribution (Gardner, Harvey & Phillips 1980; Harvey 1989, sec. 3.4),
// the differencing conditioned on the first deg D consecutive observed
// samples of z (the exact diffuse likelihood of the differenced model
// when nothing is missing: Ansley & Kohn 1985), over the samples from
// NoiseStart on (the input numerators see only real data there, as in
// least squares), missing output samples (NaN) skipped exactly by
// predicting across them. sigma^2 is concentrated out: logL = -N/2
// (log(2 pi SSQ/N) + 1) - 1/2 sum log F_t, N the observed samples in the
// likelihood, v_t the innovations, F_t their variances in units of
// sigma^2 and SSQ = sum v_t^2/F_t. The search starts from the
// least-squares estimate on the record with its output gaps interpolated
// (for a record of 40000 residuals or more, the least-squares fit of its
// last samples, as in Model's first stage), runs Levenberg-Marquardt on
// the scaled innovations v_t F_t^(-1/2) (prod F)^(1/(2N)), whose sum of
// squares is least at the maximum likelihood, with a forward-difference
// Jacobian (steps 2^-26 max(|x_k|, 1)), and ends with up to three Newton
// steps on the central-difference Hessian of -logL (kalman.Polish and
// kalman.Information: differences along the axes that the Gauss-Newton
// information at the search's end makes uncorrelated, 0.1 conditional
// standard error or less and no more than 2^-13 max(|x_k|, 1) in any
// parameter; axis steps where that guide is poor. The likelihood departs
// from its quadratic form on the scale of the conditional standard
// error, far below the marginal one for correlated parameters such as a
// gain and a slow pole, and a parameter far below one, such as the gain
// of an input recorded in large units, gets a step small against it),
// each kept only when the likelihood rises. The covariance of the
// estimates is the inverse of that Hessian, the observed information
// (NaN when it is not positive definite). A noise AR part must stay
// stationary; an MA part that starts invertible may cross the unit
// circle during the search (the exact likelihood is the same for a
// polynomial and for the one with its roots inverted, Brockwell & Davis
// 1991, 4.4) and is mapped back by inverting the roots outside, so the
// estimate is invertible; a zero within 1e-3 of the circle gives
// NonInvertibleNoise. LogLik is the exact log-likelihood and AIC = -2
// LogLik + 2 (k+1), BIC = -2 LogLik + (k+1) log N; Sigma2 = SSQ/(N - k)
// as in the library's convention. Residuals are the standardised
// innovations v_t/sqrt(F_t), NaN where the output is missing;
// Estimate.Missing holds the fixed-interval smoothed estimates of the
// missing outputs with their standard errors (Durbin & Koopman 2012,
// sec. 4.4 and 4.10); Check runs its tests on the available residuals,
// and Estimate.Forecast starts from the filter's state at the end of the
// record. Settings.First applies to both methods: the exact likelihood
// is that of the noise series from max(NoiseStart, Settings.First) on
// (Conditioning.LikelihoodStart), so that a start-up transient of the
// pre-sample convention stays out of it as it stays out of the sum of
// squares (left in, the noise AR part absorbs it: on the greenhouse
// record a phi of 0.79 became 0.97). Settings.Settle applies to it too:
// the refit is by exact likelihood from the moved start.
//
// Least squares stays the default: on a long record the two agree to a
// small fraction of a standard error (the conditioning touches only the
// first p + q samples of N), least squares costs less (its Jacobian is
// analytic and it needs no Hessian; exact ML of a two-input ARMA(1,1)
// model at n = 10^5 takes 1.6 to 2.8 times as long (BenchmarkModelML),
// its least-squares start on the last samples included), and its residuals
// are defined without a state-space model. Choose ExactML for short
// records, for noise near the invertibility boundary (on records of 50
// to 100 samples its estimate of an MA coefficient of 0.9 has a root
// mean square error of 0.07 to 0.12 against least squares' 0.08 to
// 0.30, and never leaves the invertible region: TestExactMLMonteCarlo),
// and for records with missing output
// samples, which only it accepts.
//
// Missing input samples cannot be skipped: the transfer filters need
// every past input value. Model refuses them with their positions
// (a *SampleError of the first and a *SeriesError listing the gaps)
// unless Settings.InputGaps gives a rule (HoldFill, LinearFill) and a
// longest gap (MaxLen, 3 samples by default); Estimate.Filled and the
// report list every gap filled, and Check and Forecast fill their data
// by the same rule. A filled value is wrong by up to what the input
// moved during the gap: a slow process does not make a fill safe when
// the input stepped inside the gap (routine in step and PRBS tests), so
// Model warns (FilledGapMove) where the input moved across a filled gap
// by more than its typical steps, or where the residuals on which the
// filled values act exceed 5 standard deviations.
//
// References: Gardner, G., Harvey, A. C. & Phillips, G. D. A. (1980),
// Applied Statistics 29(3), 311-322; Harvey, A. C. (1989), Forecasting,
// Structural Time Series Models and the Kalman Filter, Cambridge;
// Ansley, C. F. & Kohn, R. (1985), Annals of Statistics 13(4),
// 1286-1316; Durbin, J. & Koopman, S. J. (2012), Time Series Analysis by
// State Space Methods, 2nd ed., Oxford.
//
// # Estimates
//
// Every fit of the library (fit.Model, arma.Fit) reports its free
// coefficients as []Param (name, estimate, start, standard error, t) and
// their covariance as a [][]float64 in the same order, NaN where it does
// not exist. The innovation variance is SSQ/(N - k), N residuals and k
// free coefficients, and the covariance sigma^2 (J'J)^-1; to compare with
// a program that divides by N, scale the standard errors by
// sqrt((N - k)/N). The log-likelihood, AIC and BIC use SSQ/N, as their
// formulas require.
//
// # Cross-correlation check
//
// Check tests each input's prewhitened series alpha_t against the
// residuals a_t by S = M sum_{k=0}^{K} r_k^2, r_k their correlation at
// lag k (input leading). The textbook reference (Box, Jenkins, Reinsel
// & Ljung 2015, diagnostic checking of transfer-function models) is
// chi-squared with K + 1 - (r + s + 1) degrees of freedom, one lost per
// coefficient of the input's transfer function. That count holds when
// the weights by which a coefficient moves the residuals (the input
// through 1/delta(B), the noise filter and the inverse of the
// prewhitening filter) die out within lags 0..K, and alpha is white. A
// slow path or a smooth input (one whose prewhitening autoregression
// has roots near 1) spreads those weights far beyond K: fewer than one
// degree of freedom is lost per coefficient, S runs larger than the
// textbook reference and the check rejects an adequate model too often
// (measured: 7 to 8 % at the 5 % level for a smooth AR(2) input through
// a pole of 0.95, against 3.8 to 4.6 % with the reference below; 7.75
// against 6.25 % for the outdoor temperature of the harness example).
//
// Check therefore refers S to the distribution it has under an adequate
// model given the input and the fitted coefficients. Linearising the
// residuals in the coefficients, a = a0 - Z (x^ - x) with Z_tj = -d a_t /
// d x_j (central differences of the residuals Check computes, relative
// step 1e-6), sqrt(M) r is approximately normal with covariance
//
//	V = R - G H^-1 G' / c_0,  G_kj = (1/M) sum_t alpha_t Z_{t+k,j},  H = Z'Z / M,
//
// R being the autocorrelation matrix of alpha at lags |i - j| (the
// identity for a white alpha) and c_0 its variance; so S is a weighted
// sum of chi-squared(1) variables with V's eigenvalues as weights. Check
// uses the scaled chi-squared with the same mean and variance, c
// chi-squared(nu) with c = tr V^2 / tr V and nu = (tr V)^2 / tr V^2
// (Satterthwaite, F. E. (1946), Biometrics Bulletin 2(6), 110-114; Box,
// G. E. P. (1954), Annals of Mathematical Statistics 25(2), 290-302),
// reported as CrossCheck.Scale and EffDF beside the textbook DF and its
// p-value PPlain. When V is a projection removing r + s + 1 directions
// (white alpha, weights within K), c = 1 and nu is the textbook count.
// Over 1000 records each of a white and a smooth input the mean of S
// lies within 1.6 standard errors of c nu and the rejections at 5 % are
// 3.8 to 4.8 %; for exact-likelihood fits with missing outputs (the
// residuals are the available standardised innovations) 13 of 333
// (TestCrossCheckLevel).
//
// # Records that start settled
//
// Model assumes by default that each input was held at its first value
// before the record (the process settled there), and tf.Model.Simulate
// makes such records by default, so that simulating and then fitting
// agree. Settings.ZeroPreSample takes the inputs as zero before the
// record instead (the records of tf.SimSettings.FromRest). When the
// residuals or the noise series at the start of a fit show a transient
// that this assumption does not explain, Model warns (StartupTransient)
// and Settings.Settle leaves it out.
//
// # Concurrency
//
// Model, Check and Estimate.Forecast may be called from many goroutines
// at once (for many series or candidate models); fits share nothing but
// pools of work buffers. An Estimate is not modified by Check or
// Forecast and may be read by several goroutines at once.
//
// # Errors
//
// Every function of the package returns the library's shared error
// shapes (see tf's package doc), with Op naming the function the caller
// called ("fit.Model", "fit.Check", "fit.Estimate.Forecast"), each
// matching one kind with errors.Is. Two shapes are the package's own:
// *StageError says which stage of Check or Forecast failed (errors.As
// reaches the inner error) and *InterruptedError is a fit stopped by its
// context; *InternalError is a recovered panic, a fault of the library.
// On error the other results are zero values, except that a fit
// interrupted by its context returns its best point with the error.
//
// Model returns a *SeriesError naming the series for one missing from the
// data or not used by the model (ErrName), of unequal length
// (ErrLength), too short (ErrShort: N must exceed the number of free
// parameters; Have and Need count residuals), constant, or an input with
// free coefficients that never moves (ErrConstant), or when no start
// point gives finite residuals (ErrOverflow); a *SampleError for a NaN
// or infinite sample, or one above MaxMagnitude (series and index; a
// missing sample's error is joined with a *SeriesError of kind
// ErrSample listing every gap and the remedy, see Methods);
// a *SettingError from Settings.Validate (a negative or NaN setting,
// Tol of 1 or more) or for Settings.First at or beyond the data's
// length; a *ModelError for a model that tf.Model.Validate refuses (a
// factor power below 1, a negative dead time, ...), a model with no
// output or nothing free, free differencing coefficients, a name free
// in one place and held in another, a zero constant term in a
// denominator, an undifferenced input whose fixed denominator has a
// pole at z = 1 and whose first sample is not zero (no steady state to
// hold it at), or a residual sum of squares of 0 at the estimate (an
// exact fit, or samples so small that their squares underflow), where
// sigma^2, LogLik, AIC and BIC would not exist; an *InternalError for a
// fault of the library (a recovered panic).
// When ctx is done before the fit converges, Model returns the best point
// so far (a non-nil Estimate with Converged false and Reason saying so)
// together with an *InterruptedError that wraps the context's error, so
// that errors.Is(err, context.Canceled) (or context.DeadlineExceeded)
// holds; a caller that checks only err does not use an unfinished fit
// by mistake. A fit that stops for another reason without converging
// returns its best point with a nil error and a NotConverged warning.
//
// # Cautions
//
// An estimated model is an approximation, valid near the operating
// conditions of the data it was fitted to. A controller tuned on it must
// be commissioned on the plant under the site's safety procedures, with
// independent interlocks and trips that do not rely on the model, by
// people qualified to do so; defer to local codes and licensed
// engineering practice. A failed check or a warning is advice to the
// person using the model, not an interlock.
package fit
