// Package predict runs a fitted model in a service: fed each new sample,
// it predicts the output one step and k steps ahead, with intervals.
//
// # What a service does with it
//
// A service that watches a loop builds one Predictor per loop from the
// fitted model, its estimates held (Estimate.Held()), the estimate's
// Sigma2 and the fit's start-up (Conditioning.First and ZeroPreSample in
// Settings):
//
//   - Warm start: Warm feeds a stretch of recent history (the last hours
//     of the record, say) so that the states have settled before the
//     first live sample. Its first samples settle the states by the
//     fit's start-up convention, below.
//   - Each new sample: Update(x, y) with the inputs x (in the order of
//     Inputs()) and the output y, or NaN when the output is missing
//     (a failed sensor, a late laboratory value). It returns the
//     one-step prediction of y with its interval, the prediction error,
//     the standardised error Z = Error/SE and the innovation. Z is what
//     a drift monitor watches (tf/monitor with Settings.Sigma 1): it is
//     standard normal under the model also after missing outputs, where
//     Error/sigma is not. It does not allocate.
//   - Looking ahead: Forecast(dst, plan) writes the predictions of the
//     next len(dst) samples for planned inputs (an input is held at its
//     last planned or last fed value beyond its plan), without changing
//     the predictor.
//   - Restart: MarshalBinary stores the state (a version byte, the
//     model's fingerprint and the state values); after a restart the
//     service builds a predictor from the same model and restores the
//     state with UnmarshalBinary, which refuses a snapshot of another
//     model (ErrOtherModel) so that a redeployed model cannot pick up a
//     state that is not its own.
//
// A Predictor is not safe for concurrent use: give each goroutine its
// own, with Clone. Building many from one model, concurrently, is safe.
//
// Caution: a prediction is the model's, and an identified model is an
// approximation of the plant. Where predictions drive equipment (a
// controller, an alarm), commission on the plant under the site's safety
// procedures with independent interlocks, deferring to local codes and
// licensed practice; an alarm raised from prediction errors is advice to
// an operator, not an interlock.
//
// # The recursions
//
// With w_t = D(B) y_t, z_i,t = D_i(B) x_i,t, u_i,t = omega_i(B)/delta_i(B)
// B^b_i z_i,t and n_t = w_t - c - sum_i u_i,t, the innovation is
// a_t = phi(B)/theta(B) n_t and the one-step prediction of y_t sets a_t
// to zero:
//
//	n^_t = (sum_k theta_k a_{t-k} - sum_k phi_k n_{t-k}) / phi_0,  k >= 1
//	y^_t = (c + sum_i u_i,t + n^_t - sum_k d_k y_{t-k}) / d_0,    k >= 1
//
// with D(B) = sum d_k B^k, so that y_t - y^_t = theta_0/(phi_0 d_0) a_t
// (a_t itself when the constant terms are 1). These are the fit's
// recursions, operation for operation, so on a fitted record the
// innovations equal the fit's residuals.
//
// Start-up: the same convention as the fit's conditional least squares
// (package tf, Conditioning). An input without differencing is taken as
// held at its first value before the first sample (its term starts at
// its steady state), unless Settings.ZeroPreSample; a differenced input
// is taken as zero before its differencing has data. The noise series
// is used from NoiseStart = max(d, max_i(d_i + b_i + s_i)) and the
// innovations from First = NoiseStart + p (or Settings.First), zero
// before; predictions start at First. The samples before First must
// have their output.
//
// A missing output is replaced by its prediction and its innovation by
// zero, so the predictions that follow are forecasts from the last
// observed output, exactly the batch forecast of the fit from that
// sample with the inputs as fed. The predictor then keeps the
// covariance of the errors of the values it filled in, and the next
// observed output corrects them as the Kalman filter of the model does
// (the outputs, noise values and innovations held for the gap move to
// their conditional means given that output): the errors after a gap
// are the Kalman filter's, independent, with the standard errors in
// SE, so that Z = Error/SE stays standard normal. The first error after
// a gap of g outputs is the (g+1)-step forecast error; the SEs of the
// next samples stay above the steady one until the uncertainty left by
// the gap has died out (at the rate of the MA roots), when the
// predictor is back on the fit's exact recursion. Checked against
// statsmodels' SARIMAX filter (gap_reference_test.go).
//
// # Intervals
//
// The standard error of a prediction h steps after the last observed
// output is sigma sqrt(psi_0^2 + ... + psi_{h-1}^2), psi_j the weights
// of theta(B)/(phi(B) D(B)), when the history before that output is
// exact (no earlier gap left uncertainty); in general it is the Kalman
// filter's prediction variance, which the predictor carries through
// gaps. The interval is Mean -/+ z SE with z the normal quantile of
// Level. It assumes Gaussian innovations and known
// parameters (the estimates' own uncertainty is not in it) and takes
// the inputs as known: a plan's uncertainty is not in it either.
//
// # Events
//
// Event inputs (tf.Input.Event: step(T), pulse(T)) are not fed and not
// in Inputs(): the predictor builds their indicators from the sample
// count, as the fit builds them from the record (tf.Model.EventData).
// An event given as a sample index T falls at the predictor's sample
// T - Settings.Offset, counted from the first sample fed after New,
// Reset or Warm: Offset is the record sample of that first sample, so
// that a predictor started on a live stream that begins at record
// sample P (Offset P) places the fit's events where the fit placed
// them, and Offset 0 with a Warm from the fit's record keeps the fit's
// indices. An event given as a time is placed by Settings.Start (the
// time of that first sample) and the model's sample interval. A step is
// 1 from its sample on and a pulse 1 at its sample only; Forecast
// continues them. An event that falls before the first sample has
// happened: a step is 1 throughout and held at 1 before the first
// sample, so that its term starts in its steady state, and a pulse
// never shows. The placement is part of the Fingerprint: a snapshot
// taken under another Offset or Start is refused.
//
// # Refused models
//
// A model without a noise term is taken with white noise, as the fit
// takes it.
//
// New refuses a free coefficient, an input denominator with a pole on or
// outside the unit circle (its state would grow without bound), a noise
// AR polynomial with a root there (differencing belongs in D(B)) and a
// noise MA polynomial with a zero there (the innovations would not
// forget their start), each with a *ModelError naming the part.
//
// References: Box, G. E. P., Jenkins, G. M., Reinsel, G. C. and Ljung,
// G. M. (2015). Time Series Analysis: Forecasting and Control, 5th ed.,
// Wiley: the chapters on forecasting and on transfer-function models.
package predict
