// Package statespace turns a whole transfer-function-noise model into
// discrete state-space form, for an observer or a model-predictive
// controller.
//
// # The form
//
// Realise builds, for the model of package tf,
//
//	D(B) y_t = c + sum_i omega_i(B)/delta_i(B) B^b_i D_i(B) x_i,t + theta(B)/phi(B) a_t,
//
// the matrices of
//
//	x_{t+1} = A x_t + B u_t + G a_t
//	y_t     = C x_t + D u_t + a_t,
//
// with u_t = (x_1,t, ..., x_m,t) the inputs in model order and a_t the
// innovation. Matrices are gonum's mat.Dense, returned as copies by the
// methods A, B, C, D and G; the simulation methods work on plain slices.
// Every coefficient is taken at its value: a model with free
// coefficients is refused (realise a fitted model's Held form). The
// sample interval is not needed (everything is in samples) and is kept
// only for reference.
//
// Each input path is realised as its transfer function to y,
//
//	H_i(B) = omega_i(B) D_i(B) / (delta_i(B) D(B)) * B^b_i,
//
// after dividing out every factor of the input's written differencing
// D_i that divides the output's D exactly: an input differenced as the
// output (the usual case) keeps no differencing at all. The noise part is
// theta(B) / (phi(B) D(B)), the ARMA noise with the output differencing
// (an ARIMA model), driven by a_t; the constant c enters it as
// c/D(B) = c phi(B)/(phi(B) D(B)), driven by the constant state.
//
// # State ordering
//
// Path by path, in the order of the model's inputs; then the noise part
// (present when the model has a noise term or a constant); then the
// constant state (present when the model has a constant). Parts reports
// where each part starts and how many states it has. Within an input
// path the delay states come first: state j of the path (j = 0, 1, ...)
// holds the input j+1 samples back, u_{t-1-j}, the last of them feeding
// the path's rational part; then come the rational part's states in the
// observer (output-feedback) form: with N(B)/Q(B) the part's numerator
// and denominator (Q_0 = 1) and s_1..s_k its states,
//
//	path output = s_1 + N_0 v_t
//	s_j(t+1)    = s_{j+1}(t) - Q_j s_1(t) + (N_j - Q_j N_0) v_t,
//
// v_t the part's driving signal, so that s_1 is the path's output due to
// inputs before the present sample. The noise part has the same form
// with v_t = a_t (N = theta, N_0 = 1) plus the constant state. The
// constant state has A = 1 and no input: it holds 1 in a default start,
// 0 in the impulse and step responses.
//
// # Starts
//
// Simulate and NewPredictor start by default with every path at rest
// (the record of tf's Model.Simulate with SimSettings.FromRest);
// Realisation.Steady gives the state settled at constant inputs (the
// record Model.Simulate and the fit assume by default), for a start at
// an operating point.
//
// # Minimal
//
// A realisation is minimal when no realisation with fewer states has the
// same transfer function; for a single path that is, equivalently, when
// it is controllable and observable (Kalman's rank tests). A path whose
// numerator omega_i D_i and denominator delta_i D (after the cancelling
// above) share no root is realised minimal, with
//
//	max(s_i + b_i, r_i)
//
// states, s_i and r_i the degrees of that numerator and denominator and
// b_i the dead time: the transfer function omega B^b / delta in the
// z-plane has exactly that many poles. The dead time is realised as
// b_i - k_i explicit delay states, where k_i = min(b_i, max(r_i - s_i, 0))
// samples of it are taken up by the rational part (B^k_i omega/delta, of
// order max(s_i + k_i, r_i) = r_i when k_i > 0), because a path with fewer
// numerator than denominator coefficients has room for them: a
// first-order lag with dead time b takes b states (b - 1 delay states and
// one for the lag), not b + 1. Without such room (k_i = 0) all b_i
// samples are delay states. The noise part has max(p + d, q) states
// (p, q the degrees of phi and theta, d of D), minimal when theta and
// phi D share no root. The whole count is
//
//	sum_i max(s_i + b_i, r_i) + max(p + d, q) + 1 if there is a constant.
//
// The realisation as a whole is minimal only when the paths and the
// noise share no pole (a shared differencing D that the inputs do not
// cancel appears in each path that keeps it and in the noise part); the
// constant state is not driven by any input.
//
// # Innovations form and predictor
//
// The observer form of the noise part is already the innovations form:
// with e_t = a_t, K = G (see Realisation.Gain for why this is the
// Kalman predictor gain, exact in the infinite-past sense). Predictor
// runs the one-step predictor yhat_t = C x_t + D u_t, x_{t+1} = A x_t +
// B u_t + K (y_t - yhat_t); its errors are the model's residuals a_t once
// the start has been forgotten (at the rate of theta's roots and the
// input paths' poles).
//
// # Errors
//
// Realise refuses, with a *ModelError (Op "statespace.Realise"), a
// model Model.Validate refuses, free coefficients (naming them), an
// input or noise term package tf refuses (Err holds tf's error), an
// output differencing with a zero constant term, and more than MaxStates
// states. The simulation methods refuse series of the wrong count or
// length (*SeriesError, ErrLength) and NaN or infinite values
// (*SampleError). Nothing passed is modified.
//
// # Caution
//
// An identified model is an approximation, valid near the conditions of
// the data it was fitted to. An observer or controller built on this
// realisation must be commissioned on the plant under the site's safety
// procedures, with independent interlocks that do not rely on the
// model, deferring to local codes and licensed practice.
//
// References: Kailath, T. (1980). Linear Systems, Prentice-Hall
// (observer canonical form, minimality); Box, G. E. P., Jenkins, G. M.,
// Reinsel, G. C. and Ljung, G. M. (2015). Time Series Analysis:
// Forecasting and Control, 5th ed., Wiley (state-space form of ARIMA
// models); Harvey, A. C. (1989). Forecasting, Structural Time Series
// Models and the Kalman Filter, Cambridge University Press (the
// innovations form).
package statespace
