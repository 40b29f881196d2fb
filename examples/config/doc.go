// Command config keeps a site's process models in a JSON file whose
// fields are model specs, loads and validates it, and prints what each
// model says about the plant: gain, dead time, time constants, stability
// and step-response metrics, in the model's time unit.
//
//	go run ./examples/config                 # the built-in example, then a broken one
//	go run ./examples/config -file site.json
//
// Each "spec" field is a parse.Spec, which implements
// encoding.TextUnmarshaler, so encoding/json turns the text into a typed
// model while it decodes the file. Problems are reported with the file's
// own line and column, also for an error inside a spec string: the
// position the spec parser gives inside the string is mapped back to the
// file, so the caret points at the character to fix.
//
// Exit status: without -file the program shows the built-in config and
// then the problems found in the built-in broken one, and exits with 0
// when those problems are found as expected (1 if the broken config were
// accepted). With -file it exits with 1 when the file cannot be read or
// has any problem, printed on standard error.
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
