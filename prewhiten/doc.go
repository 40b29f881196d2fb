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
// model's Mean for a given one), phi(B) an autoregression or the AR part
// of an ARMA model the caller gives, and theta(B) its MA part. The
// autoregression is fitted by the Yule-Walker equations for every order
// p = 0..P and the order with the smallest n log(v_p) + 2p is kept, v_p
// being the prediction-error variance of order p (Durbin-Levinson) and P
// = min(n-1, floor(10 log10 n)) by default for n differenced samples: a
// bound that grows with the log of the record length, so that long
// records may need long autoregressions and short ones cannot overfit. Passing the output y through the same
// phi/theta and D (with its own mean) gives beta_t; the cross-correlation
// of alpha and beta is then proportional to the impulse-response weights
// of the input-to-output transfer function (package ccf).
//
// The first D + p values of a filtered series (p = deg phi, D = deg D)
// need samples before the start and are returned as NaN; the MA part is
// run with zero pre-sample values from there (conditional on them).
// Prewhitening that leaves the input autocorrelated (Ljung-Box) is
// reported with a *NotWhiteError alongside the result, never silently.
//
// # Errors
//
// Errors use the library's shared shapes (SampleError, SeriesError,
// SettingError) and kinds (ErrSample, ErrShort, ErrConstant, ...), whose
// Op names the exported function called ("prewhiten.Pair"); facts such as
// "after the differencing (1 - B)" are in SeriesError.Detail.
// NotWhiteError carries the Ljung-Box figures and matches ErrModel.
//
// # Numbers, not text
//
// The package returns numbers: filter polynomials, orders and fitted
// coefficients. Package tf turns them into model values with named
// coefficients and prints them (tf.Model.String).
package prewhiten
