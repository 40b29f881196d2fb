// Package arma holds ARMA and ARIMA noise models: the model type with
// multiplicative seasonal factors and differencing, stationarity and
// invertibility checks, psi and pi weights, seeded simulation, sample
// autocorrelation and partial autocorrelation, the Ljung-Box test, AR
// fitting by Yule-Walker with the order chosen by AIC, Hannan-Rissanen
// start values, conditional least-squares fitting, order selection (by
// BIC by default) and forecasts with intervals.
//
// # Conventions
//
// Series are []float64 with index 0 the oldest sample. Polynomials are
// []float64 in ascending powers of the backshift operator B with constant
// term 1: {1, -0.5} is 1 - 0.5 B. The ARIMA model is
//
//	phi(B) Phi(B^s) (1-B)^d (1-B^s)^D (y_t - x_t'beta) = mu' + theta(B) Theta(B^s) a_t
//
// written in this package as phi(B) Phi(B^s) (w_t - c) = theta(B) Theta(B^s) a_t
// with w_t = (1-B)^d (1-B^s)^D (y_t - x_t'beta) the differenced series and c
// the constant c, the mean of the (differenced) series: the parameter
// "c" of fits, Model.Mean, and the same idea as tf's constant c.
// Coefficients follow the Box-Jenkins signs:
//
//	phi(B)   = 1 - phi_1 B - ... - phi_p B^p
//	theta(B) = 1 - theta_1 B - ... - theta_q B^q
//
// so a positive theta_1 is a negative coefficient of B in theta(B). Some
// statistics libraries write the moving-average polynomial as
// 1 + theta_1 B; their theta_1 is minus ours.
//
// Roots are reported in the z-plane, z = 1/B: a model is stationary when
// every root z of the AR polynomial lies strictly inside the unit circle
// and invertible when every root of the MA polynomial does.
//
// # Conditional least squares
//
// Fit differences the series (after subtracting any regressors), and
// computes the residuals by the ARMA recursion from the index Start (the
// AR degree plus the differencing degree, by default) with innovations
// before Start taken as zero. The sum of squares of the residuals from
// Start on is minimised by Levenberg-Marquardt with an exact Jacobian
// obtained by filtering, then polished by Newton steps with the exact
// Hessian. Standard errors: SE from Sigma2 (J'J)^-1 (Gauss-Newton),
// SEHessian from the observed Hessian. The package is checked against
// reference values from general-purpose statistics libraries
// (testdata/arma).
//
// # Variance convention
//
// Sigma2 follows the library's convention (internal/est): Sigma2 =
// SSQ/(NUsed - k), k the number of free parameters (len(Result.Params)),
// and the standard errors and forecast intervals are computed from it.
// The log-likelihood and the criteria AIC, AICc and BIC keep their
// formula, with the maximising variance SSQ/NUsed inside the likelihood
// (Result.LogLik). A program that divides SSQ by the residual count
// reports standard errors smaller by sqrt((NUsed - k)/NUsed); the tests
// map ours to such references with that factor.
//
// # Forecasts
//
// Result.Forecast gives the exact conditional expectations of the future
// given the data for the fitted coefficients (a Kalman filter of the
// stationary part started in its stationary distribution) when the AR
// part is stationary, with standard errors that include the uncertainty
// of the final state; otherwise it falls back to the conditional
// recursion of the fit.
//
// # Errors and settings
//
// Functions never modify their inputs and are safe for concurrent use.
// Their errors are the library's shared shapes, re-exported here
// (SampleError, SeriesError, SettingError, ModelError, ConvergenceError,
// InternalError); each matches one kind (ErrSample, ErrShort,
// ErrConstant, ErrLength, ErrSetting, ErrModel, ErrConvergence,
// ErrOverflow, ErrInternal) with errors.Is, and its Op names the exported
// function the caller called ("arma.Fit"). Every settings struct
// (FitSettings, SimSettings, Grid) follows the library's settings rule
// (zero means the documented default; a negative count or tolerance is
// a *SettingError unless the field gives it a meaning, as
// SimSettings.BurnIn does) and has a Validate method that names the bad
// field; the functions that take the settings call it first. Select
// runs its fits on worker goroutines, each of which recovers a panic (a
// bug) into an *InternalError instead of ending the caller's process.
//
// A Noise is written with the polynomial vocabulary Poly, Factor, Term
// and Coef, re-exported here, so that it can be built from arma alone.
package arma
