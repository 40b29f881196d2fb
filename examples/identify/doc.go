// Command identify does the whole job on a record of process data: from
// the series to a checked transfer-function-noise model, its gains, dead
// times and time constants, and a forecast for a planned input schedule.
//
//	go run ./examples/identify                      # the built-in greenhouse demo
//	go run ./examples/identify -pictures out        # also write PNG pictures to out/
//	go run ./examples/identify -data plant.csv -output temp -inputs valve,outdoor -interval 1min
//	go run ./examples/identify -spec 'temp = c + w0/(1 - d1 B) B^3 valve + (1 - t1 B) a'
//	go run ./examples/identify -save fitted.json    # the fitted model as a config for examples/config
//	go run ./examples/identify -write-data greenhouse.csv
//
// By default it identifies the model in one call: prewhitening, dead time
// and (r, s) candidates from the impulse-response weights, noise orders,
// a concurrent fit of every candidate, ranking by BIC and the diagnostic
// checks. It prints the ranked candidate table, the chosen model's
// report (estimates with standard errors, diagnostics with verdicts,
// gains and time constants in minutes), and a forecast for a planned
// valve schedule (-plan, -horizon; the other inputs are forecast from
// their own ARMA models and their uncertainty enters the intervals). With
// -spec it fits the given model instead. On the built-in demo data, whose
// true model is known, it also prints how close the identified model is
// to the truth.
//
// The fits leave the first -skip samples (by default 5 % of the record,
// at most 500) out of the sums of squares: the input filters start from
// the first input values, and on a record that begins in motion (here a
// dithered valve under feedback) the start-up transient would otherwise
// be read as slow noise.
//
// Pictures (-pictures DIR): data.png (the record: output with its
// setpoint on the demo, and each input), ccf.png (prewhitened cross-correlation with
// 95 % bands), weights.png (impulse-response weights with +-2 standard
// errors), residual-acf.png (residual autocorrelation with bands),
// step.png (step responses in minutes with the dead time and settling
// time marked), fit.png (observed against one-step-ahead fitted values,
// and the residuals), simulation.png (observed against the noise-free
// simulation from the inputs alone, the part a controller acts on, and
// their difference) and forecast.png (forecast with its interval, and the
// planned input).
//
// Progress goes to standard error; results to standard output.
//
// An identified model is an approximation valid near the operating
// conditions of the data it came from. A controller tuned on it must be
// commissioned under the site's safety procedures, with independent
// safety interlocks; defer to local codes and licensed practice.
package main
