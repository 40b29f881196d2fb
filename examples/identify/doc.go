// Command identify does the whole job on a record of process data: from
// the series to a checked transfer-function-noise model, its gains, dead
// times and time constants, and a forecast for a planned input schedule.
//
//	go run ./examples/identify                      # the built-in greenhouse demo
//	go run ./examples/identify -pictures out        # also write PNG pictures to out/
//	go run ./examples/identify -data plant.csv -output temp -inputs valve,outdoor -interval 1min
//	go run ./examples/identify -data plant.csv -time stamp -gaps linear:5   # fill gaps of up to 5 samples
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
// schedule of the first input (-plan, -horizon; the other inputs are
// forecast from their own ARMA models and their uncertainty enters the
// intervals). The demo's plan (valve 65 %, 85 %, 70 %) is used only on
// the built-in record; for a file the first input holds its last value
// unless -plan says otherwise, and a plan that leaves the range of the
// input seen in the record is warned about, naming both ranges; a plan
// step at or beyond the horizon, or a sample given two values, is
// refused. With -spec it fits the given model instead, and its output
// and inputs are the spec's: -output or -inputs that disagree with it
// are refused. On the built-in demo data, whose
// true model is known, it also prints how close the identified model is
// to the truth.
//
// The verdict follows the library's checks (fit.Diagnostics): a model
// that did not converge, has no standard errors, has roots on or outside
// the unit circle, too few residuals, or fails a check is reported as
// NOT ADEQUATE with its reasons. Its input paths are then not offered
// for control work, no controller test is suggested, and -save refuses
// it unless -save-untrusted is given, in which case the saved record
// says so. -save writes, beside the model, its "validity" record
// (examples/internal/modelinfo.Validity): the sample count and interval,
// the range of the output and of every input, the verdict, its reasons,
// whether the save was forced, and "sigma", the noise SD that
// examples/monitor should expect on clean data: the residual SD of the
// fit, or, when outliers were found in the residuals, the robust
// residual scale of the outlier search (the outliers inflate the
// residual SD, and a monitor given it sees clean data as a fall in
// variance), or under -outliers refit the refit's residual SD; the
// notes say which. The folder of -save is checked before
// any work is done. A refused save is said in one short line on standard
// error (the reasons are in the report).
//
// Exit status: 0 for a model that passed its checks, 1 for a run that
// failed, 2 for a command line that cannot be read, and 3 when the
// report was printed but its verdict is NOT ADEQUATE, so that scripts
// notice without reading the report.
//
// A CSV file has a header line of column names; only the columns the run
// names are read as numbers, so a column of notes or dates elsewhere is
// no obstacle. -sep reads other separators (';', tab). The time column
// (-time; by default the first column when its first cell is a
// timestamp or a date, or when its name is a time name such as "time",
// "minute" or "time (s)" over numbers; a first column named so, or
// "date" or "timestamp", in a form not read is refused rather than
// ignored; -time none for no time column)
// holds numbers (seconds, or the unit of its name or of -time-unit) or
// RFC 3339 timestamps (also with a space for the T, or without a zone,
// read as UTC: a local clock's times across a change of daylight saving
// are refused, naming the likely cause) or dates alone (2026-01-01, for
// daily records). A spec's event given as a time (step(2026-03-29T13:00))
// is placed on the time column's clock. The
// sample interval comes from its median step, and must agree with
// -interval and the spec's every when they are given. Rows that are not
// one interval apart (within 1 %) are refused with an error naming the
// lines, unless -gaps picks a remedy: hold:N or linear:N fill gaps of
// whole intervals of up to N missing samples by holding the last value
// or on a straight line, longest fits only the longest evenly spaced
// stretch (ties go to the later one). The report says what was done.
// An empty cell of the output column, or one that says NaN, NA or N/A,
// is read as a missing sample (record.Settings.Missing), as a logger
// writes a sensor's dropout; one of an input column is refused with its
// line and column, since an input gap cannot be skipped (fill it in the
// file, or delete the row and let -gaps fill it).
// The reading is the library's package tf/record (record.Read), which a
// program of your own can call the same way; the flags are its Settings.
//
// The fits leave the first -skip samples (by default 5 % of the record,
// at most 500) out of the sums of squares: the input filters start from
// the first input values, and on a record that begins in motion (here a
// dithered valve under feedback) the start-up transient would otherwise
// be read as slow noise.
//
// Gaps in the output (missing samples, NaN) are reported before the fit:
// each gap's first and last sample, its time stamps and its length in
// samples and in time. Identification needs consecutive samples
// (prewhitening, cross-correlation, least-squares ranking), so it runs
// on the longest gap-free stretch (identify.GapFree; the report names
// it); the best-ranked candidate of each noise order (at most three) is
// then fitted to the whole record by exact maximum likelihood, whose
// Kalman filter skips the missing samples exactly, and the one with the
// least whole-record BIC among those that pass their checks is chosen
// (the stretch holds less evidence about the noise than the whole
// record). A record with gaps is always fitted by exact likelihood, and
// with -method least-squares (the default) the report says the method
// was switched and why: least squares needs every output sample, and
// filling the gap would fit invented readings as if measured; refusing
// would leave a record with a dropout without a model for no gain. With
// -spec the given model is fitted to the whole record so. After the fit
// the report gives, for each gap, the range of the smoothed values
// (Estimate.Missing: estimates from the model, not readings, used in no
// fit or check) and of their standard errors, and any input gaps the
// fit filled (Estimate.Filled). The checks and the outlier search use
// the residuals present; an outlier within 5 samples of a gap is noted.
//
// Outliers (-outliers, default report): after the fit, the chosen
// model's residuals are searched for outliers with the model's own noise
// and differencing (arma.Outliers: additive, level shift, temporary
// change, innovational; a critical value of |t| that bounds the chance
// of any false finding on a clean record by 5 %, printed with the
// report, with the samples searched: the first -skip samples and the
// model's start-up have no residual and are not searched). Each is
// reported with its time (the record's time stamp when it has a time
// column, in the offset from UTC the file writes at that row, so that
// it can be found in the file; else the sample; the demo's as day and
// time of day), sample, kind, size in the output's units with its standard
// error, t, and whether it lies near an end or a gap, where its kind or
// size is less firm. -outliers refit also adds the outliers as event
// inputs (tf.Model.WithOutliers: an additive one as a pulse, a level
// shift as a step, a temporary change as a decaying pulse, each through
// the output's differencing D(B) when the spec differences the output;
// an innovational one is a shock of the noise and is left out), refits by
// the first fit's method (with a gap in the output, the whole record's
// exact likelihood) from the same first residual, and prints sigma^2,
// AIC and BIC of both fits, the estimates that moved by more than one
// standard error of the first fit, and the refit's own verdict; -save
// then saves the refit, judged by its own checks (the rest of the
// report, the paths, forecast and pictures, is of the first fit). A
// refit that fails its checks comes with the advice to re-identify on
// the cleaned record (a structure chosen with the outliers in the record
// can be bent by them): blank the output cells of the additive outliers,
// which are then read as missing and skipped. When outliers are found,
// the verdict of a model that passes its checks says so rather than
// "adequate": the checks test the residuals as a whole, and one reading
// far off can pass them while it pulls the estimates (on the demo it
// halves the noise's MA coefficient); the saved model's notes carry the
// same words. -outliers off skips the search. The
// built-in demo record carries one planted bad reading of the logged
// temperature (greenhouse.Spike: +1 degC at day 2 09:20) and an hour of
// missing temperatures (greenhouse.SensorDropout: day 3 14:00 to
// 14:59), both made by our own code; the report finds and names both.
//
// Pictures (-pictures DIR), drawn by examples/chart at 220 dots per
// inch with their legends beside the data: data.png (the record: output
// with its setpoint on the demo, and each input as recorded under its
// 15-sample moving average, which shows a dithered valve's slow part),
// ccf.png (prewhitened cross-correlation with 95 % bands), weights.png
// (impulse-response weights with +-2 standard errors), residual-acf.png
// (residual autocorrelation with bands), step.png (step responses in
// minutes with the dead time and settling time marked), fit.png
// (observed, drawn over the one-step-ahead fitted values, and the
// residuals), simulation.png (observed, drawn over the noise-free
// simulation from the inputs alone, the part a controller acts on, and
// their difference) and forecast.png (forecast with its interval, and
// the planned input). data.png and fit.png mark each outlier found with
// a ring on its sample, labelled in the legend with its kind and time,
// each event input of a spec (step(T), pulse(T)) with a dashed
// vertical line at its sample, and each gap of the output with a grey
// band labelled with its times; fit.png also draws the smoothed values
// over a gap with +-2 standard errors. With gaps, ccf.png and
// weights.png are those of the stretch the identification ran on, and
// residual-acf.png is of the residuals present.
//
// Progress goes to standard error; results to standard output.
//
// An identified model is an approximation valid near the operating
// conditions of the data it came from. A controller tuned on it must be
// commissioned under the site's safety procedures, with independent
// safety interlocks; defer to local codes and licensed practice.
package main
