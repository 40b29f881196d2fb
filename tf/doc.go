// Package tf holds transfer-function models in the backshift operator B
// (B x_t = x_{t-1}) and what can be computed from a model alone:
// rational terms omega(B)/delta(B) B^b and the whole
// transfer-function-noise model, their responses, poles, zeros,
// stability, gain and frequency response, composition and stability
// margins of loops, step-response metrics, conversion from and to
// continuous-time process models, and batch and streaming simulation.
//
// Estimation has rooms of its own below this package: tf/fit estimates
// a model from data by conditional least squares, checks the estimate
// and forecasts with it; tf/identify proposes and ranks model
// structures from data in one call.
//
// # The rational term
//
// A Rational is
//
//	G(B) = omega(B) / delta(B) * B^b,   y_t = G(B) x_t,
//
// with omega(B) = omega_0 + omega_1 B + ... + omega_s B^s the numerator,
// delta(B) = 1 + delta_1 B + ... + delta_r B^r the denominator and b >= 0
// the dead time in whole samples. As a difference equation,
//
//	y_t = -delta_1 y_{t-1} - ... - delta_r y_{t-r} + omega_0 x_{t-b} + ... + omega_s x_{t-b-s}.
//
// # Conventions
//
// Polynomials are []float64 in ascending powers of B: index k holds the
// coefficient of B^k. Signs are kept as written: the first-order
// denominator (1 - 0.8 B) is {1, -0.8}, and a model written with a minus
// sign in the numerator keeps that minus sign in the coefficient.
//
// Poles and zeros are reported in the z-plane, z = 1/B, as engineers read
// them: a pole is a root z of z^r delta(1/z), so the term above has its
// pole at z = 0.8. The term is stable when every pole lies strictly inside
// the unit circle, equivalently when every root of delta(B) lies outside
// it. A pole at z = 1 is an integrator (no steady-state gain); a zero
// outside the unit circle gives an inverse response (non-minimum phase).
//
// Frequencies are in radians per sample, 0..pi; the frequency response is
// G evaluated at B = e^{-i w}.
//
// # Causality
//
// Causality is structural: b >= 0 and delta_0 != 0, so y_t depends only on
// inputs up to x_{t-b} and on past outputs. With b = 0 and omega_0 != 0 the
// output responds within the same sample (direct feedthrough); a
// closed-loop simulation that feeds y_t back into x_t then has an
// algebraic loop, and should use a dead time of at least one sample or
// act on y_{t-1} (see Plant).
//
// # Time units
//
// Dead time, rise time, settling time and time constants are in samples.
// Where a sample interval T is given, they are also reported in its units.
// Continuous-time models (first and second order plus dead time) are
// converted under a zero-order hold, exactly, including dead time that is
// not a whole number of samples (modified z-transform).
//
// # Errors and inputs
//
// Functions and methods never modify the slices, maps and models they are
// given, and never keep them: constructors copy. Bad data and bad
// settings give typed errors in the library's one vocabulary (see
// internal/errs, re-exported here): every error matches one kind with
// errors.Is (ErrSample, ErrShort, ErrConstant, ErrLength, ErrName,
// ErrSetting, ErrModel, ErrConvergence, ErrOverflow, ErrInternal,
// ErrFormat), and its
// shape, for errors.As, carries the facts and an Op naming the exported
// function the caller called ("tf.NewRational", "tf.Model.Simulate"):
// *SampleError (series name, 0-based index, value), *SeriesError (a whole
// series too short, of the wrong length or not known), *SettingError (a
// setting by its field name, where zero means the default; SimSettings
// and StepSettings check themselves with Validate),
// *ModelError (a model or term that cannot be used, such as a structure
// no spec can have, checked by Model.Validate, or a model that cannot be
// simulated). Four shapes of this package carry facts the shared ones do
// not, and match ErrModel: *CoefError (which polynomial, which power of
// B, the value; its precise cause is one of ErrEmpty, ErrZeroConstant,
// ErrNotFinite, ErrDegree, ErrNormalise), *DelayError (the dead time),
// *GainError (delta(1) and omega(1) of a pole at z = 1) and
// *UnstableError (the largest pole magnitude of a term that must be
// stable); *SimError (the step and value where a simulation stopped being
// finite) matches ErrOverflow, or ErrSample for a non-finite input. On
// error the other results are zero values. Panics are kept for programmer
// errors the types cannot exclude, each documented where it can happen
// (a destination slice of the wrong length, a Step with the wrong number
// of inputs). Limits: polynomial degree MaxDegree (64), dead time
// MaxDelay (10000 samples).
//
// # Concurrency
//
// Rational values are immutable and safe for concurrent use. A Model may
// be read (printed, simulated, converted) by several goroutines at once as
// long as none of them modifies it; Model.Clone gives a private copy.
// Plant and System hold the state of one simulation and are not safe for
// concurrent use: give each goroutine its own Clone.
//
// # Records that start settled
//
// Model.Simulate takes by default each input as held at its first value
// before the record (the process settled there), the convention under
// which package fit estimates by default, so that simulating and then
// fitting agree. SimSettings.FromRest takes the inputs as zero before
// the record instead. A streaming System starts at rest until SetSteady.
//
// # Overflow in streaming
//
// Plant.Step and System.Step return no error, to stay cheap in control
// loops; each records the first output that is NaN or infinite (a
// non-finite input, an unstable term, or values too large for float64),
// and Err reports it with its step.
//
// # Cautions
//
// An identified model is an approximation, valid near the operating
// conditions of the data it was fitted to: the range of the inputs, the
// throughput, the season, the state of the equipment. Outside them its
// gains, time constants and dead time may be wrong. A controller tuned on
// such a model must be commissioned under the site's safety procedures,
// with independent interlocks and trips that do not rely on the model, and
// by people qualified to do so; defer to local codes and licensed
// engineering practice. Nothing in this package is a safety function.
package tf
