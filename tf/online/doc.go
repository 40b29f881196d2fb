// Package online re-estimates a transfer-function noise model while it
// is in service: recursively, one sample at a time (Estimator), or by
// periodic batch refits in the background with an atomic swap of the
// live model (Refitter).
//
// # The model and the prediction error
//
// The model is tf's (see package tf for the conventions),
//
//	D(B) y_t = c + sum_i omega_i(B)/delta_i(B) B^b_i D_i(B) x_i,t + theta(B)/phi(B) a_t,
//
// and the one-step prediction error at the coefficients p is
//
//	n_t   = D(B) y_t - c - sum_i u_i,t,   u_i,t = omega_i(B)/delta_i(B) B^b_i D_i(B) x_i,t,
//	eps_t = phi(B)/theta(B) n_t,
//
// the residual a_t of the batch fit's conditional least squares. An
// Estimator takes its structure (inputs, dead times, orders,
// differencing, noise model) and start values from a tf.Model whose
// every coefficient is set, usually a fitted model; it estimates the
// free coefficients and leaves fixed numbers and held names where they
// are. A name used in several places is one parameter, as in the fit
// (so "d" in both a denominator and the noise AR polynomial ties them).
//
// # The algorithm: recursive prediction-error method
//
// The estimates follow the recursive prediction-error method (RPEM) of
// Ljung & Soderstrom (1983), a Gauss-Newton step per sample on the
// criterion sum_t lambda^(n-t) eps_t^2, with exponential forgetting
// lambda (Settings.Forgetting):
//
//	psi_t = -d eps_t / d p                (the gradient, by filters below)
//	L_t   = P psi_t / (lambda + psi_t' P psi_t)
//	p    += L_t eps_t
//	P     = (P - L_t psi_t' P) / lambda
//
// RPEM was chosen over pseudo-linear regression (PLR, extended least
// squares) because PLR converges only under a strictly-positive-real
// condition on the noise (and, for a model with separate input
// denominators, the Box-Jenkins structure, on those denominators too;
// Ljung & Soderstrom 1983, ch. 4), while RPEM converges to a local
// minimum of the same prediction-error criterion that the batch fit
// minimises: the recursive estimates of a stationary record approach
// the batch fit's, the property the tests check. Its cost is a second
// set of filters for the gradient.
//
// The gradient is a sum of lagged values of a few filtered signals,
// each computed recursively with the current estimates (the recursive
// approximation of L&S, ch. 3):
//
//	s_i  = B^b_i D_i(B) x_i / delta_i   d eps/d omega_i,j = -(phi/theta) B^j s_i
//	q_i  = u_i / delta_i                d eps/d delta_i,j = +(phi/theta) B^j q_i
//	                                    d eps/d phi_j     = +B^j n / theta
//	                                    d eps/d theta_j   = -B^j eps / theta
//	                                    d eps/d c         = -phi(1)/theta  (filtered)
//
// A coefficient of a polynomial written as a product of factors (or a
// factor raised to a power) enters through the derivatives of the
// expanded coefficients (forward-mode dual numbers; constant for a
// polynomial of one factor). After an update the current sample's
// input-term outputs u_i, noise n and error eps are computed again with
// the new estimates (the a posteriori values of L&S, which the next
// sample's recursion reads); the gradient filters run once a sample.
//
// The filters start as if the record had been settled before its first
// sample: each input held at its first value and every filter at its
// steady state, the batch fit's convention. For the first
// Settings.Warmup samples the filters run and the information sum
// lambda^(n-t) psi psi' is gathered without moving the estimates; P
// then starts as its inverse, so that P is, as in least squares, the
// inverse of the weighted information of every sample fed.
//
// # Safeguards
//
//   - Stability projection: an update that would put a root of a free
//     denominator delta_i(B), of the noise MA polynomial theta(B) or of
//     the noise AR polynomial phi(B) on or inside the unit circle in B
//     (a pole, a noise zero or a noise pole on or outside the unit
//     circle in z) is refused, by the Schur-Cohn step-down test; the
//     previous estimates are kept and Counts.Rejected counts it. The
//     predictor and the gradient filters divide by delta_i and theta, so
//     they stay stable; phi is kept stationary because a noise AR root
//     wandering onto the unit circle lets the level and the gains
//     trade places (integration belongs in the model's differencing).
//   - Trace bound: P is scaled down whenever its trace exceeds
//     Settings.MaxTrace (Counts.Bounded), against wind-up of the
//     covariance when the inputs stop moving under forgetting.
//   - Reset: when psi' P psi is not positive (P has lost positive
//     definiteness in rounding), P is set back to its value at the end
//     of the warm-up (Counts.Resets).
//   - Dead zone: errors smaller than Settings.DeadZone running standard
//     deviations leave estimates and P as they are (Counts.DeadZone).
//
// # Standard errors over time
//
// Estimator.Params gives each estimate's standard error at any time,
// SE_k = sqrt(sigma2 P_kk (1 + lambda^n)/(1 + lambda)), sigma2 being the
// exponentially weighted mean of the squared prediction errors (see
// Params for the derivation). Without forgetting this is the batch
// fit's sigma2 (J'J)^-1 in the limit.
//
// # Speed
//
// Update does not allocate. For the eight-coefficient model of
// BenchmarkUpdate (two inputs with first-order terms, a constant,
// ARMA(1,1) noise) an update took 165-173 ns on one core of a 2-core
// virtual machine shared with other work (best-ns/op: the fastest blocks
// of 1024 updates; ns/op, the mean, was 300-800 ns under a load average
// of 8): the two O(k^2) products of the covariance recursion and about
// twenty first-order filter steps.
//
// # Background refits
//
// A Refitter keeps the live model behind an atomic pointer, collects a
// window of the latest samples, and every Every samples hands a copy of
// the window and the live model to a caller-supplied refit function in
// a goroutine of its own; a model it returns replaces the live one
// atomically. Errors (and panics) of the refit are reported, never
// raised; Close cancels a refit in progress and waits for it. A sample
// the Refitter refuses (a NaN output, unless RefitSettings.MissingOutputs
// is set) restarts its window, so that no refit joins the two sides of a
// dropout as adjacent samples; with MissingOutputs a NaN output stays in
// its place in the window, for a refit function that fits by exact
// likelihood (fit.ExactML), which skips it exactly.
//
// A re-estimated model is an approximation of the plant fitted to
// recent data: before it retunes a controller or moves an alarm,
// review it, and commission any change on the plant under the site's
// safety procedures with independent interlocks, deferring to local
// codes and licensed practice.
//
// References:
//
// L. Ljung and T. Soderstrom, Theory and Practice of Recursive
// Identification, MIT Press, 1983: ch. 3 (RPEM, PLR), ch. 4
// (convergence analysis, PLR's positive-real condition), ch. 5 and 6
// (forgetting and its schedule, projection into the stability region).
// Chapter numbers from memory.
//
// K. J. Astrom and B. Wittenmark, Computer-Controlled Systems, 3rd
// ed., Prentice Hall, 1997, ch. 3 (the Jury and Schur-Cohn stability
// tests; chapter from memory).
package online
