// Package control turns a plant model into a feedback controller and
// checks the loop: PI and PID controllers and their discretisation,
// tuning by published rules, and the closed loop's stability, margins,
// sensitivity peaks and step responses, nominally and over the model's
// uncertainty.
//
// # Plants and controllers
//
// A plant is the tf.Rational of one input's whole path to the output,
// tf.Model.Path, in samples of the model's interval. Use the whole path,
// not Input.Rational: a model with differencing, D(B) y = G(B) D_i(B) u,
// has the plant G(B) D_i(B) / D(B), so (1 - B) y = G(B) u is the
// integrating G(B)/(1 - B), and a controller tuned on G(B) alone may
// destabilise the real loop (for a model without differencing the two
// are the same). A controller is any tf.Rational
// u = C(B) e acting on the control error e = r - y. PID holds continuous
// PI/PID parameters in either Form, in the time unit of the interval, and
// Discrete makes the discrete controller by a stated Method (backward
// difference or Tustin).
//
// # Tuning
//
// Tune applies SIMC (Skogestad 2003), IMC / lambda tuning (Rivera, Morari
// & Skogestad 1986) or Dahlin's discrete direct synthesis (Dahlin 1968).
// SIMC and IMC need a continuous reading of the discrete model (Read:
// gain, lags, leads, inverse responses, dead time) reduced by the half
// rule (HalfRule) to first or second order plus dead time, or to an
// integrator with dead time. The user sets the closed-loop time (tc or
// lambda) or a target peak sensitivity, and gets the rest. The default
// closed-loop time keeps the loop on the model at a peak sensitivity of
// at most 2; a tuning whose loop on the model is unstable is an error,
// and one above Ms 2 carries the note "aggressive: Ms above 2".
//
// # The loop
//
// Analyze closes a controller around a plant: closed-loop poles and
// stability, gain, phase and delay margins, peaks of |S| and |T|,
// set-point and load step responses with their figures and integrated
// absolute errors; for an unstable closed loop the frequency figures
// are marked (Ms and Mt +Inf, margins NaN), not computed. Robust repeats
// it over plants drawn from a seeded random source (ModelDraw draws them
// from a parameter covariance), keeping Draws x Horizon samples of
// three series, at most MaxBandSamples; WorstCase over a grid of gain
// and dead-time errors the user names.
//
// # Concurrency and determinism
//
// The functions keep no state between calls and never modify their
// arguments: Tune, Analyze, Robust and CheckWorstCase are safe to call
// from many goroutines at once, and their results are plain values.
// Robust calls the Draw function on the caller's goroutine, one draw
// after another with one random source seeded by RobustSettings.Seed, so
// a seed fixes the result.
//
// # Caution
//
// Every tuning result drives equipment. An identified model is an
// approximation: commission the controller on the plant under the
// site's safety procedures, with independent interlocks, deferring to
// local codes and licensed practice. Tuning.String prints this Caution.
//
// References:
//
//   - S. Skogestad (2003), Simple analytic rules for model reduction and
//     PID controller tuning, J. Process Control 13:291-309.
//   - D. E. Rivera, M. Morari, S. Skogestad (1986), Internal model
//     control. 4. PID controller design, Ind. Eng. Chem. Process Des.
//     Dev. 25:252-265.
//   - E. B. Dahlin (1968), Designing and tuning digital controllers,
//     Instruments and Control Systems 41(6):77-83 (issue and pages from
//     memory).
//   - G. F. Franklin, J. D. Powell, M. L. Workman (1998), Digital Control
//     of Dynamic Systems, 3rd ed., Addison-Wesley.
package control
