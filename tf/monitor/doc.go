// Package monitor watches a model in service for drift: it takes the
// one-step prediction errors of a transfer-function model, sample by
// sample, and raises an alarm when they stop behaving as the model
// says they should.
//
// # The tests
//
// Each error e_t is divided by the model's noise standard deviation
// (Settings.Sigma) to give z_t, which is standard normal and independent
// from sample to sample while the plant behaves as its model. Three
// two-sided CUSUM tests (Page 1954) run on it:
//
//   - Mean: S+ = max(0, S+ + z_t - k), S- = max(0, S- - z_t - k), with
//     k = Settings.Shift / 2: a bias, an unmodelled load, a sensor offset.
//   - Variance: the same on z_t^2, with the likelihood-ratio references
//     for a variance ratio r = Settings.VarianceRatio (up side, reference
//     r ln r / (r - 1)) and 1/r (down side, reference ln r / (r - 1)):
//     noisier errors (a worn valve, a new disturbance) or quieter ones (a
//     frozen sensor).
//   - Correlation: for each input i and each lag k of Settings.Lags[i],
//     the same on w_t = s_{t-k} z_t, where s_t = +1 or -1 is the sign of
//     the input's deviation from its running level (an exponentially
//     weighted mean over Settings.InputMemory samples). A change of gain
//     or dead time makes e_t correlate with past inputs; the sign keeps
//     w_t exactly standard normal in control whatever the input's
//     distribution (z_t is independent of the past, and s_{t-k} is a
//     function of it), so the thresholds of the mean test apply.
//
// The tests overlap: a shift of the mean also raises z_t^2, and any
// unmodelled part of the output (a gain change included) raises the
// variance of w_t at every lag, so several tests may alarm for one
// change; the test and the lag with the earliest alarm point to it.
//
// A test that alarms starts again from zero (both its sides; for the
// correlation test, the pair that alarmed); the other tests go on.
//
// # What to feed it
//
// Feed the standardised one-step errors when the predictor gives them:
// from tf/predict, Step.Z with Settings.Sigma 0 (that is 1), skipping
// samples whose output is missing (Z is NaN). Z = Error/SE is standard
// normal under the model whatever the gaps in the output, while the raw
// error divided by sigma is not: the first error after a gap is a
// multi-step forecast error, with a larger standard error, and the
// errors that follow have standard errors above sigma until the
// uncertainty left by the gap has died out. In a seeded experiment
// (tf/predict's TestGapNoFalseAlarms: an integrating loop with MA(1)
// noise, a 60-sample gap, 200 runs) feeding Error with Sigma set raised
// false alarms in 77 runs in the 15 samples after the gap; feeding Z,
// the alarms after the gap stayed at the in-control rate. Feed Error
// with Settings.Sigma (the noise model's sigma) only for a predictor
// that gives no standardised error and never misses an output.
//
// # Thresholds
//
// Each test's threshold h is set so that its in-control average run
// length, the mean number of samples between its false alarms, is
// Settings.TargetARL. For the mean and correlation tests, h comes from
// Siegmund's corrected diffusion approximation (CusumARL), each side
// asked for twice the target so that the two sides together give it
// (their alarm rates add); the correlation test's P pairs each get
// 2 P times the target. The variance test's squared errors are far from
// normal, so its thresholds come from the Markov chain of Brook and
// Evans (1972) with the exact distribution of z_t^2 (200 states,
// checked against a 3000-state chain to 1 %).
//
// Measured by seeded simulation (monitor_arl_test.go; the standard
// error of each figure is 0.5 to 2.5 %): at the default target of 10080
// samples the in-control run lengths were within 3.5 % of it for all
// three tests (mean -3.3 %, variance +1.7 %, correlation -0.2 %). A
// shift of one standard deviation is detected after 16.5 samples from
// zero (Siegmund: 16.4) and after 15.8 when it comes after an in-control
// stretch; at h = 4 the figures are 168 in control and 8.37 at one
// standard deviation (tables, from memory: 168 and 8.38). The delays of
// the variance test (a doubled variance: 44 samples; a halved one: 72)
// and of the correlation test (63 samples for a gain change that moves
// the signed errors by 0.5) match the chain and Siegmund's approximation
// within 1 %.
//
// # Delivery
//
// Alarms go to Settings.OnAlarm (called on the caller's goroutine) and
// to Settings.Alarms by a send that never waits: when the channel is full
// the alarm is dropped and counted (Monitor.Dropped). Update does not
// allocate. A Monitor is stateful: one goroutine at a time.
// MarshalBinary and UnmarshalBinary save and restore its state, so that
// a service can restart without losing it.
//
// # Caution
//
// An alarm is advice to an operator, not an interlock: it says the
// errors no longer look like the model's, with a known rate of false
// alarms, and it may come late or not at all for a change the tests are
// not made for. Protect the plant with independent interlocks under the
// site's safety procedures, deferring to local codes and licensed
// practice. An identified model is an approximation.
//
// References:
//   - Page, E. S. (1954). Continuous inspection schemes. Biometrika
//     41:100-115.
//   - Siegmund, D. (1985). Sequential Analysis: Tests and Confidence
//     Intervals. Springer (the corrected diffusion approximation).
//   - Brook, D. and Evans, D. A. (1972). An approach to the probability
//     distribution of CUSUM run length. Biometrika 59:539-549.
package monitor
