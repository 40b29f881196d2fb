// Command config keeps a site's process models in a JSON file whose
// fields are model specs, loads and validates it, and prints what each
// model says about the plant: gain, dead time, time constants, stability
// and step-response metrics, in the model's time unit, with the record
// of the data each model was fitted to and the caution below.
//
//	go run ./examples/config                      # the built-in configs, then a broken one
//	go run ./examples/config -file fitted.json    # a model saved by examples/identify -save
//
// A config is one JSON object:
//
//	{"site": "Greenhouse 3",
//	 "models": [{"name": "air temperature", "notes": "...",
//	             "spec": "temp = 0.01 / (1 - 0.95 B) B^3 valve + a; every 1 min",
//	             "validity": {"samples": 5760, "interval": "1 min",
//	                          "ranges": {"temp": [14.7, 22.3], "valve": [28.1, 100]},
//	                          "verdict": "passed"}}]}
//
// Each "spec" field is a parse.Spec, which implements
// encoding.TextUnmarshaler, so encoding/json turns the text into a typed
// model while it decodes the file. Problems are reported with the file's
// own line and column, also for an error inside a spec string: the
// position the spec parser gives inside the string is mapped back to the
// file (through escapes, surrogate pairs and bytes that are not UTF-8,
// decoded as encoding/json decodes them), so the caret points at the
// character to fix. Keys are matched exactly: a key in another case
// ("Spec"), a misspelt key or a key given twice in one object is a
// problem at that key, because encoding/json would take the first
// silently, ignore the second or let the last win. A UTF-8 byte order
// mark at the start of the file is skipped; an empty file is reported as
// empty, with an example of what a config holds.
//
// The "validity" object is optional: examples/identify -save writes it
// (modelinfo.Validity: the record's sample count and interval, the range
// of each series, the verdict of the checks, the failures, whether the
// save was forced, and "sigma", the noise SD to expect on clean data,
// which examples/monitor takes: a positive number when present). A model without one is printed with "its range
// of validity is unknown"; a series of the spec without a recorded range
// is named, except an event input (step(T), pulse(T)), a 0/1 indicator
// of a known intervention, which is shown as the event at its record
// sample or time. One whose verdict is "failed" is flagged in
// capitals beside the model, in the heading and on standard error. The
// record is checked against its spec: the interval must agree with the
// spec's every clause, the ranges must name series of the spec, each
// [smallest, largest].
//
// Exit status: without -file the program shows the built-in configs and
// then the problems found in the built-in broken one, and exits with 0
// when those problems are found as expected (1 if the broken config were
// accepted). With -file it exits with 1 when the file cannot be read or
// has any problem, printed on standard error, and with 0 when it loads
// (also when a model in it failed its checks: that is printed, not an
// error of the file). A command line with arguments other than flags
// exits with 2.
//
// Conventions: polynomials in the backshift operator B with signs as
// written; poles are reported in the z-plane (z = 1/root in B), and a
// path is stable when every pole lies strictly inside the unit circle.
// Gains are steady-state gains in output units per input unit; times are
// in the spec's interval unit.
//
// A model in a config is an approximation valid near the operating
// conditions of the data it was identified from; controllers designed on
// it must be commissioned under the site's safety procedures, with
// independent safety interlocks; defer to local codes and licensed
// practice.
package main
