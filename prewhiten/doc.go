// Package prewhiten fits a prewhitening filter to an input series and
// applies the same filter to other series, the first step of transfer
// function identification.
//
// A filter is
//
//	alpha_t = phi(B) / theta(B) * (D(B) x_t - m)
//
// with D(B) the differencing of the input (empty for none), m = Filter.Mean
// the level of the differenced input (its sample mean for an
// autoregression, the estimated mean for a fitted ARMA filter, the
// model's Mean for a given one), phi(B) an autoregression chosen by AIC
// (Yule-Walker, as R's ar()) or the AR part of an ARMA model the caller
// gives, and theta(B) its MA part. Passing the output y through the same
// phi/theta and D (with its own mean) gives beta_t; the cross-correlation
// of alpha and beta is then proportional to the impulse-response weights
// of the input-to-output transfer function (package ccf).
//
// The first D + p values of a filtered series (p = deg phi, D = deg D)
// need samples before the start and are returned as NaN; the MA part is
// run with zero pre-sample values from there (conditional on them).
// Prewhitening that leaves the input autocorrelated (Ljung-Box) is
// reported with a *NotWhiteError alongside the result, never silently.
package prewhiten
