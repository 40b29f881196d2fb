// Package testsignal designs the input signals of a plant test: the
// moves a test applies to a valve or set point so that the data carry
// enough information to identify a transfer-function model.
//
// Four families, all deterministic (a seed fixes every random choice):
//
//   - MaxLength: one period of a maximum-length binary sequence from a
//     linear feedback shift register of 2 to 24 stages (period 2^n - 1,
//     a flat power spectrum, a two-valued periodic autocorrelation).
//   - MultiLevel: one period of a maximum-length sequence over GF(3),
//     GF(5) or GF(7), with 3, 5 or 7 levels symmetric about zero (period
//     q^n - 1, an inverse repeat, a known periodic autocorrelation), for
//     tests that must show non-linearity, which a two-valued signal
//     cannot.
//   - BinaryNoise: generalised binary noise, a two-level signal that
//     switches at each sample with a fixed probability (Tulleken 1990);
//     SwitchProbability chooses the probability from the expected
//     dominant time constant.
//   - Multisine: sums of cosines on a frequency grid for several inputs
//     at once, with random or Schroeder (1970) phases, each input on its
//     own interleaved lines so that the inputs are uncorrelated over a
//     period.
//
// Design turns what the engineer knows (expected time constant and dead
// time, sample interval, amplitude about the operating point, the time
// the test may take) into a signal, its clock period, its periodogram
// and the frequency band it excites, and refuses, with a *SettingError
// naming DesignSettings.Budget, a budget too short for the slowest
// expected dynamics. Its rules and their sources are stated on
// DesignSettings.
//
// Frequencies are in radians per time unit of the caller's sample
// interval (rad/s for seconds), unless a name says otherwise.
//
// A test signal moves real equipment: choose the amplitude within the
// plant's safe operating range, run the test under the site's safety
// procedures with independent interlocks, and defer to local codes and
// licensed practice. An identified model is an approximation.
package testsignal
