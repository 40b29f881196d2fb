// Package kalman computes the exact Gaussian likelihood of an ARIMA noise
// series with missing samples by the Kalman filter, and smooths the
// missing samples.
//
// # The state-space form
//
// The series z_t follows
//
//	phi(B) (diff(B) z_t - mu) = theta(B) a_t,   var(a_t) = sigma^2,
//
// phi, theta and diff polynomials in the backshift B in ascending powers
// (index k holds the coefficient of B^k), phi stationary. With u_t =
// diff(B) z_t - mu, r = max(p, q+1) and dd = deg(diff), the state is
//
//	alpha_t = (u_t, x_2,t, ..., x_r,t, z_{t-1}, ..., z_{t-dd})   (m = r + dd)
//
// in Harvey's form for the ARMA block (Harvey 1989, sec. 3.4: T holds
// -phi_1..-phi_r in its first column and ones on the superdiagonal, R =
// (1, theta_1, ..., theta_{r-1})), and the lags of z for the
// differencing:
//
//	z_t = Z alpha_t + mu/diff_0,  Z = (1, 0, ..., 0, -diff_1, ..., -diff_dd)/diff_0,
//
// the lag block moving z_t (= Z alpha_t + mu/diff_0) into its first slot.
// There is no observation noise; sigma^2 is concentrated out, so the
// filter runs in units of sigma^2.
//
// # Start
//
// The ARMA block starts from its stationary distribution (mean zero,
// covariance sum_k T^k R R' T'^k, found by doubling; Gardner, Harvey &
// Phillips 1980 start the same way from the solution of the same
// equation). With differencing (dd > 0) the filter conditions on the
// first dd consecutive observed samples z_s..z_{s+dd-1}: they fill the
// lag block exactly (zero variance) and the likelihood is that of the
// samples after them. This equals the exact diffuse likelihood of the
// differenced model when no sample is missing (Ansley & Kohn 1985: the
// diffuse likelihood of an ARIMA model is the likelihood of the
// differenced series), needs no large-variance approximation (R's
// arima uses a prior variance of 1e6 instead) and keeps the filter in
// exact arithmetic. Samples before s are left out of the likelihood and
// are not smoothed.
//
// # Use
//
// New builds the filter of (ar, ma, diff); Set changes the coefficients
// during a search. Run returns the likelihood terms (Stats: LogLik,
// Sigma2, Objective) with, optionally, the standardised innovations and
// the prediction variances; Scaled returns the innovations whose sum of
// squares is minimised at the maximum likelihood (for Gauss-Newton
// searches); Smooth estimates the missing samples; Forecast predicts past
// the end. A model with inputs calls them on its noise series, the
// output less the transfer terms and regressors (mu the constant).
//
// # Missing samples
//
// A NaN sample is skipped exactly: the state is predicted across it and
// nothing is updated. The standardised innovation there is NaN. The
// fixed-interval smoother (Durbin & Koopman 2012, sec. 4.4 and 4.10)
// then estimates each missing sample with its variance.
//
// # Cost
//
// One pass costs O(n m^2) operations and no allocation: T is applied
// through its structure, and once the covariance recursion has settled
// (a change below 1e-15 of the innovation variance over one step) only
// the state is carried until the next missing sample.
//
// References:
//
//	Harvey, A. C. (1989). Forecasting, Structural Time Series Models and
//	the Kalman Filter. Cambridge University Press, sec. 3.4.
//	Gardner, G., Harvey, A. C. & Phillips, G. D. A. (1980). Algorithm AS
//	154: An algorithm for exact maximum likelihood estimation of
//	autoregressive-moving average models by means of Kalman filtering.
//	Applied Statistics 29(3), 311-322. doi:10.2307/2346910
//	Ansley, C. F. & Kohn, R. (1985). Estimation, filtering and smoothing
//	in state space models with incompletely specified initial
//	conditions. Annals of Statistics 13(4), 1286-1316.
//	Durbin, J. & Koopman, S. J. (2012). Time Series Analysis by State
//	Space Methods, 2nd ed. Oxford University Press, ch. 4.
package kalman
