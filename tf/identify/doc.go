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
// # Records with gaps
//
// Every step of the identification needs a gap-free record: the
// prewhitening filters and the cross-correlations run over consecutive
// samples, and the candidates are ranked by conditional least squares,
// which needs every output sample. Candidates therefore refuses missing
// (NaN) samples, naming the series, the gaps and the longest gap-free
// stretch, rather than bridge them silently. The rule for a record whose
// output has gaps (a sensor dropout) is: identify on the longest
// gap-free stretch (GapFree), then fit the chosen structure to the
// whole record by exact maximum likelihood (fit.Settings.Method =
// fit.ExactML), whose Kalman filter skips the missing outputs exactly
// and returns their smoothed values. examples/identify does so and
// reports it. Missing input samples cannot be skipped by any fit (the
// transfer filters need every past input value): fill short ones by a
// stated rule (fit.Settings.InputGaps) or cut the record.
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
