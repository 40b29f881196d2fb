// Command monitor is a small HTTP service (net/http only) that runs the
// models of a site's loops beside the plant: it takes each loop's
// samples as JSON lines, predicts its output one step and k steps ahead
// with intervals, watches its one-step prediction errors for drift, and
// shows its state.
//
//	go run ./examples/monitor                                  # the built-in greenhouse loop
//	go run ./examples/monitor -config fitted.json -state DIR -restore
//	go run ./examples/monitor -config fitted.json -from 'temp (identified)=1600'  # a replay from record sample 1600
//	go run ./examples/monitor -track DIR                        # re-estimation pictures, no serving
//
// # Loops
//
// The config is a model library in the format of examples/config (the
// file examples/identify -save writes): each model is one loop, named by
// the model's "name", its spec with every coefficient held. The noise
// standard deviation of a loop is -sigma 'name=SD' when given, else the
// "sigma" of the model's validity record (what identify -save writes as
// the SD to expect on clean data: the robust residual scale when the fit
// found outliers, which inflate the residual SD), else, for a file saved
// before that field, the "residual SD" of its notes ("residual SD
// 0.02966", four significant digits: a relative rounding below 5e-5, far
// below the estimate's own sampling error of about 1/sqrt(2 n), 1 % for
// n = 5760), with a line at start saying so, since that SD is inflated
// when the record had outliers and then gives false "variance down"
// alarms. A model saved with a failed verdict is refused.
//
// Each loop has a predictor (tf/predict) and a monitor (tf/monitor). The
// monitor is given each one-step error divided by its standard error,
// which is standard normal while the plant behaves as its model (also for
// the first output after a gap, whose error spans the gap). It starts
// watching once the predictor's start-up transient has faded: the
// predictor takes the inputs as held before the first sample, and the
// plant was not, so the first errors carry a transient that decays with
// the slowest pole of the input paths; the monitor waits the samples in
// which it falls to 1e-3 of its start (135 samples for the greenhouse's
// pole 0.95; "watching" in the state). A restored loop watches at once. Its
// correlation test watches each input at its dead time b and at b + 1
// (at least 1: lag 0 alarms falsely under feedback). -arl sets the
// in-control average run length of each of its three tests (default
// 10080 samples, a week at one sample a minute); with three tests the
// loop alarms falsely about three times as often.
//
// # Events
//
// A model's event (step(T), pulse(T): a known intervention such as a
// level shift the fit found) is placed in the record the model was
// fitted to, by record sample or time; the service places it on the live
// stream before it builds the loop's predictor, and prints where each
// falls ("event step(1500): before the live stream ...: the step is on
// throughout"; also "events" in the loop's state). By default the stream
// starts right after the fit's record (at record sample "samples" of the
// validity record identify -save writes), so every event the fit found
// has happened: a step is on throughout (its path starts at its steady
// state) and a pulse is over (its term is left out). -from 'loop=POS'
// says where the stream starts instead: POS the record sample of its
// first sample (a replay of part of the record) or that sample's time;
// an event after it comes on at its live sample, counted at the model's
// sample interval, one sample line each. A validity record with the
// time of the record's first sample ("start") places every event exactly
// and takes -from in either form. Without it, a timed event without
// -from is taken as past when the model carries its validity record and
// the time is before the service's clock; an event the service cannot
// place (an index event without a validity record, a timed one after the
// clock, a record sample where a time is needed or the reverse) is
// refused at start, naming -from.
// The "stamp" of a sample line is an integer in the caller's unit and
// places nothing.
//
// # Routes
//
//	GET  /                         the loops, the routes and the caution
//	GET  /caution                  the caution, in words
//	GET  /state                    every loop's state
//	GET  /loops/{loop}             one loop: samples, missing outputs, last prediction,
//	                               statistics and thresholds, alarms, dropped alarms
//	POST /loops/{loop}/samples     JSON lines, one sample each
//	GET  /loops/{loop}/predict?steps=K      the next K outputs, inputs held
//	POST /loops/{loop}/predict     {"steps": K, "plan": {"valve": [60, 60, 70]}}
//
// A sample line is a JSON object with a number for every input, the
// output's value (null, or no key, when it is missing) and optionally an
// integer "stamp" in the caller's time unit (without one, the sample's
// index):
//
//	{"stamp": 1700000000, "valve": 55.2, "outdoor": 3.1, "temp": 19.84}
//
// A request's lines are taken in order up to the first bad one, which is
// answered with status 400 and a JSON error naming the loop, the line,
// the field and the fix ({"loop": ..., "line": 7, "field": "valve",
// "error": ..., "taken": 6}); the lines before it are taken. An unknown
// loop is 404, a body over 64 MiB 413, a prediction asked before the
// loop has settled 409. Requests for one loop take turns; loops run in
// parallel.
//
// Alarms are kept with the loop's state (the latest 100) and written to
// standard output, one line each, by a goroutine per loop fed through
// the monitor's channel, which never blocks the samples: when it is full
// the alarm is counted as dropped ("alarms_dropped").
//
// # Restart
//
// With -state DIR, each loop's state (the predictor's and the monitor's
// snapshots, the counts and the kept alarms) is written to DIR on
// shutdown, one file per loop; with -restore it is read back at start,
// so that predictions carry on exactly as before the restart. A snapshot
// of another model, or of a monitor with another -arl, is refused by
// name (exit status 1).
//
// # Re-estimation pictures (-track)
//
// With -track DIR the program serves nothing. It shows how the recursive
// estimator of tf/online follows a change of the plant: it takes the
// built-in greenhouse record (-days long, default 4 days, one sample a
// minute) and raises the valve gain by 20 % (0.2 to 0.24 degC per %)
// from the middle sample on. The change is simulated by this program in
// closed loop on the record's own weather, setpoints, test signal and
// noise: the valve path with the new gain, and the greenhouse's PI
// controller answering it (the valve settles about 1/1.2 lower and the
// temperature stays at its setpoint). It then fits the scenario's
// structure to the first half (fit.Model) and runs the estimator from
// that fit over the whole record at forgetting 0.995 (the estimator's
// default, a memory of about 200 samples). The estimator re-estimates
// the input paths (w0, d1, v0, e1) and holds the level c and the noise
// model (t1, p1) at the batch fit: with them free, the noise AR
// coefficient drifts to the unit circle on this record and the level
// with it, and the gain is confounded with the level.
//
// It prints each coefficient's recursive estimate and SE just before the
// change beside the batch fit's, the largest distance between them (in
// the recursive SE and in the batch SE), and the number of samples after
// the change until the valve path's steady-state gain (omega(1)/delta(1)
// of the current model, tf.Rational.Gain) first comes within 5 % of the
// new gain. It writes two PNG pictures into DIR: coefficients.png, each
// re-estimated coefficient over time with its +-2 SE band, the batch fit
// and the true value before and after the change; gain.png, the gain
// over time against its true value and the batch fit's.
//
// The default 4-day record measured: distance 0.47 recursive SE (1.26
// batch SEs), the gain within 5 % of the new after 614 samples (about
// three memory lengths); on 2 days 0.80 SE and 106 samples, on 3 days
// 1137 samples. The delay varies with how much the valve moves after the
// change: the steady-state gain shows mostly in the responses to large,
// slow valve moves such as those after the setpoint steps (06:00 and
// 20:00), little in the fast test signal; on the 4-day record the gain
// estimate stalls near 0.204 through the night until the morning step.
// Three memory lengths, 3/(1 - lambda), is a rule for a well excited
// input, not a guarantee for any record. A re-estimated model is an
// approximation fitted to recent data: review it before it retunes a
// controller or moves an alarm (the program prints this).
//
// Exit status: 0 after a clean stop, 1 when the config, a snapshot or the
// address cannot be used, 2 for a command line that is wrong.
//
// # Caution
//
// An alarm is advice to an operator, not an interlock: it says that the
// errors no longer look like the model's, with a known rate of false
// alarms, and it may come late or not at all for a change the tests are
// not made for. Protect the plant with independent interlocks under the
// site's safety procedures, deferring to local codes and licensed
// practice. An identified model is an approximation of the plant. The
// program prints this at start and serves it with every state and
// prediction.
package main
