// Package ccf identifies transfer functions from data: the sample
// cross-correlation of two series with significance bands, impulse-response
// weight estimates from prewhitened series or from a joint distributed-lag
// regression, and proposals for the dead time b and the orders (r, s) of a
// rational input term, each returned as numbers (the dead time, the
// orders and the fitted coefficients of omega and delta); package tf turns
// them into model values with named coefficients.
//
// Cross computes the sums directly for few lags (an AVX2/FMA kernel on
// amd64 processors that have it, Go elsewhere) and by a blocked FFT for
// many, switching at a measured crossover; both agree with the definition
// to 1e-12.
//
// # Definitions and lag convention
//
// For series x and y of length n with means xbar and ybar,
//
//	c_xy(k) = (1/n) sum_{t} (x_t - xbar)(y_{t+k} - ybar),   t over 0..n-1 with 0 <= t+k < n
//	r_xy(k) = c_xy(k) / sqrt(c_xx(0) c_yy(0))
//
// for k = -K..K. The divisor is n at every lag, so the sequence is positive
// semi-definite and shrinks towards zero at long lags. A positive lag k
// pairs x at time t with y at the later time t+k: x leads y. An input's
// effect on the output therefore shows at positive lags, and a significant
// value at negative lags hints at feedback from the output to the input.
//
// For a white series x and any series y independent of it, r_xy(k) is
// approximately normal with mean zero and standard error 1/sqrt(n); the
// significance band at level p is +-z_{(1+p)/2}/sqrt(n).
//
// # Impulse-response weights
//
// With an input series prewhitened to alpha_t (white) and the output passed
// through the same filter to beta_t, the impulse-response weights of the
// input-to-output transfer function are estimated by
//
//	v_k = r_alpha,beta(k) s_beta / s_alpha,   se(v_k) ~ (s_beta / s_alpha) / sqrt(n)
//
// with s the divisor-n standard deviations. With several inputs, possibly
// correlated with one another, DistributedLag fits all weights jointly by
// least squares with a low-order autoregressive noise (the linear transfer
// function approach of Liu and Hanssens).
//
// # Identification
//
// Identify reads the dead time b as the first non-negative lag with a
// significant weight, ignoring a lone spike that is neither strong nor
// followed by further significant weights, and weights too small to
// matter next to the largest (closed-loop records show such a bias before
// the dead time). A common level of the cross-correlation at negative
// lags, left by incomplete prewhitening, is removed first. It then fits
// every rational form
//
//	v(B) = B^b omega(B) / delta(B),  deg omega = s, deg delta = r
//
// with r and s up to a bound to the estimated weights by weighted least
// squares, ranks the forms by an information criterion, and marks the form
// picked by the corner method (a table of determinants of Toeplitz
// matrices of the weights whose zero pattern has its corner at lag b+s+1,
// order r+1). Each proposed Form holds the fitted omega(B) and delta(B)
// coefficients, the start values of a later whole-model fit.
//
// # Errors
//
// Errors use the library's shared shapes (SampleError, SeriesError,
// SettingError, ModelError) and kinds (ErrSample, ErrShort, ...), whose
// Op names the exported function called ("ccf.Cross"); NoResponseError
// carries the evidence of Identify's dead-time rule and matches ErrModel.
//
// References:
//
//	Box, G.E.P., Jenkins, G.M., Reinsel, G.C. Time Series Analysis:
//	Forecasting and Control, chapter 11 (identification of transfer
//	function models).
//	Liu, L.-M., Hanssens, D.M. (1982). Identification of multiple-input
//	transfer function models. Communications in Statistics - Theory and
//	Methods 11(3), 297-314.
//	Beguin, J.-M., Gourieroux, C., Monfort, A. (1980). Identification of a
//	mixed autoregressive-moving average process: the corner method. In
//	Time Series, ed. O.D. Anderson, North-Holland, 423-436.
package ccf
