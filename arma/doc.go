// Package arma holds ARMA and ARIMA noise models: the model type with
// multiplicative seasonal factors and differencing, stationarity and
// invertibility checks, psi and pi weights, seeded simulation, sample
// autocorrelation and partial autocorrelation, the Ljung-Box test, AR
// fitting by Yule-Walker with the order chosen by AIC, Hannan-Rissanen
// start values, conditional least-squares fitting, order selection and
// forecasts with intervals.
//
// # Conventions
//
// Series are []float64 with index 0 the oldest sample. Polynomials are
// []float64 in ascending powers of the backshift operator B with constant
// term 1: {1, -0.5} is 1 - 0.5 B. The ARIMA model is
//
//	phi(B) Phi(B^s) (1-B)^d (1-B^s)^D (y_t - x_t'beta) = mu' + theta(B) Theta(B^s) a_t
//
// written in this package as phi(B) Phi(B^s) (w_t - mu) = theta(B) Theta(B^s) a_t
// with w_t = (1-B)^d (1-B^s)^D (y_t - x_t'beta) the differenced series and mu
// its mean. Coefficients follow the Box-Jenkins signs:
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
// Hessian. Sigma2 = SSQ/NUsed. Standard errors: SE from Sigma2 (J'J)^-1
// (Gauss-Newton), SEHessian from the observed Hessian. The package is
// checked against reference values from general-purpose statistics
// libraries (testdata/arma).
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
// Functions never modify their inputs, return typed errors (inspect them
// with errors.As) for bad data and are safe for concurrent use. Every
// settings struct (Options, SimSettings, Grid) has a Validate method that
// names the bad field; the functions that take the settings call it
// first. Select runs its fits on worker goroutines, each of which
// recovers a panic (a bug) into an *InternalError instead of ending the
// caller's process.
package arma
