// Package identify proposes transfer-function-noise model structures
// from data and ranks them: the one-call identification of the dead
// time, the (r, s) orders of each input and the noise orders.
//
// # Steps
//
// Candidates goes from named series to a ranked list of fitted
// candidate models in one call. For each input it prewhitens the input with an
// autoregression and applies the same filter to the output
// (prewhiten.Pair, after the differencing in s), estimates the
// impulse-response weights from the prewhitened pair
// (ccf.ImpulseWeights), and takes the best s.Forms (b, r, s) forms with
// start values (ccf.Identify). The best forms give a preliminary model,
// fitted with white noise; its residuals, a first estimate of the noise,
// give the noise orders (prewhiten.IdentifyNoise). Every combination of
// forms and noise orders (at most s.MaxCandidates, lowest form scores
// first) is fitted with a constant on s.Workers goroutines, all summing
// the residuals from the same index so that the criteria compare, and
// checked (fit.Check). Refinement rounds fit the lower-order neighbours of
// the best fit (one coefficient of one polynomial fewer, started from
// its estimates), repeated from the new best while the score improves,
// so that a simpler form the weights missed can still win. The
// candidates are returned ranked by BIC (or AIC), failed fits last;
// each carries its report.
//
// The candidates are fitted and checked with package fit (fit.Model,
// fit.Check) and their structures are tf.Model values, printed by
// tf.StructureLabel.
//
// # Cautions
//
// The ranking says which structure explains the record best by a
// criterion, not that it is right: an identified model is an
// approximation, valid near the operating conditions of the record. A
// controller tuned on it must be commissioned on the plant under the
// site's safety procedures, with independent interlocks and trips that
// do not rely on the model, by people qualified to do so; defer to local
// codes and licensed engineering practice.
//
// References: Box, G. E. P., Jenkins, G. M., Reinsel, G. C. and Ljung,
// G. M. (2015). Time Series Analysis: Forecasting and Control, 5th ed.,
// Wiley: chapters on the identification of transfer-function models.
package identify
