package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/backshift/backshift/examples/internal/cmdline"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// Options are the command-line settings of one run.
type Options struct {
	// Data is a CSV file; empty means the built-in greenhouse record.
	Data string
	// Sep is the field separator of the CSV file (0 for a comma).
	Sep rune
	// Time names the time column of the CSV file: "" for automatic (the
	// first column, when its first cell is a timestamp or a date, or its
	// name is a time name such as "time", "minute" or "time (s)" over
	// numbers), "none" for no time column. TimeUnit is the unit of a
	// numeric time column ("s", "min", "h", "d"; "" for the unit its
	// name announces, else seconds).
	Time     string
	TimeUnit string
	// Gaps is what to do where the time column shows missing rows or
	// uneven steps: "" refuses the record with an error naming the
	// lines; "hold:N" and "linear:N" fill gaps of up to N missing
	// samples by holding the last value or on a straight line;
	// "longest" fits only the longest evenly spaced stretch.
	Gaps string
	// Output and Inputs name the columns of the output and the inputs.
	// With Spec the spec names them and these are not read; the command
	// line refuses -output or -inputs that disagree with the spec.
	Output string
	Inputs []string
	// Spec, when not empty, is a model to fit instead of identifying one.
	Spec string
	// Interval is the sample interval (Value in Unit); zero means the
	// spec's, or the time column's, or 1 min for the built-in data. When
	// more than one of them is given they must agree.
	Interval float64
	Unit     string
	// Pictures is a folder to write PNG pictures to; empty for none.
	Pictures string
	// Save writes the fitted model as a one-model JSON config (the format
	// of examples/config) to this file, with the record of the data it
	// was fitted to; empty for none. A model that fails its checks is
	// not saved unless SaveUntrusted is set, and then its record says
	// so.
	Save          string
	SaveUntrusted bool
	// WriteData writes the built-in record as CSV to this file and stops.
	WriteData string
	// Horizon is the forecast horizon in samples: 0 for no forecast,
	// HorizonAuto for 180 samples but at most a quarter of the record.
	Horizon int
	// Plan is the planned schedule of the first input as
	// "from:value,..." (samples from the end of the record), or "hold"
	// to hold its last value. Empty means the demo's plan on the
	// built-in record, and hold for a file. A sample given twice, or a
	// step at or beyond the forecast horizon (which would be dropped),
	// is refused.
	Plan string
	// Skip is the number of samples at the start of the record left out
	// of the sums of squares: the input filters start from zero
	// pre-sample values, and with inputs far from zero (a valve at 60 %)
	// the start-up transient would otherwise be read as noise. -1 means
	// automatic: 5 % of the record, at most 500; other negative values
	// are refused.
	Skip int
	// Quiet suppresses progress messages.
	Quiet bool
	// Outliers says what to do about outliers in the chosen model's
	// residuals: "off" no search; "report" (or "") search them
	// (arma.Outliers with the model's noise) and report each; "refit"
	// also refit the model with them as event inputs, print the
	// comparison, and save the refit with -save.
	Outliers string

	// Method is -method: least-squares (conditional least squares, the
	// default) or exact (exact maximum likelihood; with identification,
	// the chosen model is refitted by it). A record whose output has
	// gaps is fitted by exact whatever Method says (Gaps.Switched).
	Method string

	// cleanDemo uses the built-in record without its planted bad
	// reading and sensor dropout (for tests).
	cleanDemo bool
}

// HorizonAuto asks for the default forecast horizon: 180 samples, at
// most a quarter of the record.
const HorizonAuto = -1

// demoPlan is the valve schedule forecast on the built-in record: 65 %
// for an hour, 85 % for an hour, then 70 %.
const demoPlan = "0:65,60:85,120:70"

// DefaultOptions are the settings of a plain `go run ./examples/identify`.
func DefaultOptions() Options {
	return Options{Output: "temp", Inputs: []string{"valve", "outdoor"}, Horizon: HorizonAuto, Skip: -1}
}

// usage is printed by -h above the flags.
const usage = `identify finds a transfer-function-noise model of a process from a record
of its output and inputs (a CSV file, or the built-in greenhouse demo),
checks it, and prints its gains, dead times and time constants with a
forecast. Results go to standard output, progress to standard error.

Examples:
  go run ./examples/identify                      # the built-in greenhouse demo
  go run ./examples/identify -data plant.csv -output temp -inputs valve,outdoor -gaps linear:5
  go run ./examples/identify -outliers refit       # also refit with the outliers found as events

Exit status: 0 the model passed its checks, 1 the run failed, 2 a command
line that cannot be read, 3 the report was printed but its verdict is NOT
ADEQUATE (the model fails its checks; -save then saves nothing).

Flags:
`

func main() { os.Exit(cli(os.Args[1:], os.Stdout, os.Stderr)) }

// Exit statuses of the program (documented in -h).
const (
	exitOK          = 0
	exitFailed      = 1 // the run failed (a file, a setting, a fit)
	exitUsage       = 2 // the command line cannot be read
	exitNotAdequate = 3 // the report was printed, and its verdict is NOT ADEQUATE
)

// cli runs the program with the command-line arguments args and returns
// its exit status: 0 done with an adequate model, 1 a failed run, 2 a
// bad command line, 3 a report whose model is NOT ADEQUATE (printed in
// full, so that scripts notice; a -save refused for that reason also
// ends with 3).
//
// Over 60 lines: the list of flags, one line each.
func cli(args []string, stdout, stderr io.Writer) int {
	o := DefaultOptions()
	var inputs, interval, sep string
	fs := flag.NewFlagSet("identify", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.StringVar(&o.Data, "data", "", "CSV file with a header line of column names (default: the built-in greenhouse record)")
	fs.StringVar(&sep, "sep", ",", "field separator of the CSV file: a character such as ';', or tab")
	fs.StringVar(&o.Time, "time", "", "time column of the CSV file (default: the first column, when it holds timestamps or dates, or numbers under a name such as time or minute); none: no time column")
	fs.StringVar(&o.TimeUnit, "time-unit", "", "unit of a numeric time column: s, min, h or d (default: the unit its name says, else s)")
	fs.StringVar(&o.Gaps, "gaps", "", "remedy for missing rows in the time column: hold:N or linear:N fill gaps of up to N samples, longest fits the longest evenly spaced stretch (default: refuse)")
	fs.StringVar(&o.Output, "output", o.Output, "column of the output series (with -spec: the spec's; a different one is refused)")
	fs.StringVar(&inputs, "inputs", strings.Join(o.Inputs, ","), "comma-separated columns of the input series (with -spec: the spec's; different ones are refused)")
	fs.StringVar(&o.Spec, "spec", "", "fit this model spec instead of identifying one")
	fs.StringVar(&interval, "interval", "", "sample interval with a unit, e.g. 1min, 10s, 0.5h (default: the spec's, the time column's, or 1min for the built-in data)")
	fs.StringVar(&o.Pictures, "pictures", "", "write PNG pictures to this folder")
	fs.StringVar(&o.Save, "save", "", "write the fitted model with the record of its data as a JSON config (the format of examples/config) to this file")
	fs.BoolVar(&o.SaveUntrusted, "save-untrusted", false, "with -save: save the model even when it fails its checks, marked as untrusted")
	fs.StringVar(&o.WriteData, "write-data", "", "write the built-in greenhouse record as CSV to this file and exit")
	fs.IntVar(&o.Horizon, "horizon", o.Horizon, "forecast horizon in samples (0: no forecast; -1: 180, at most a quarter of the record)")
	fs.StringVar(&o.Plan, "plan", "", "planned first input after the record, as from:value pairs (samples from the end, each sample once, all before the -horizon), or hold (default: the demo plan "+demoPlan+" on the built-in record, hold for a file)")
	fs.IntVar(&o.Skip, "skip", o.Skip, "samples at the start left out of the fit while the input filters start up (-1: 5 % of the record, at most 500; other negative values are refused)")
	fs.StringVar(&o.Outliers, "outliers", outliersReport, "outliers in the residuals of the chosen model: off (no search), report (search and report them), refit (also refit with them as events, compare, and -save the refit)")
	fs.StringVar(&o.Method, "method", methodLeastSquares, "estimation method: least-squares (conditional least squares) or exact (exact maximum likelihood by the Kalman filter; candidates are still ranked by least squares and the chosen one is refitted); a record whose output has gaps is always fitted by exact, and the report says so")
	fs.BoolVar(&o.Quiet, "quiet", false, "no progress messages on standard error")
	if status, stop := cmdline.Parse(fs, usage, args); stop {
		return status
	}
	if fs.NArg() > 0 {
		a := fs.Arg(0)
		hint := ""
		if strings.HasSuffix(strings.ToLower(a), ".csv") || strings.HasSuffix(strings.ToLower(a), ".txt") {
			hint = fmt.Sprintf(": to read a file, use -data %s", a)
		}
		fmt.Fprintf(stderr, "identify: unexpected argument %s (flags come before it and every setting is a flag)%s; -h lists the flags\n", clip(a), hint)
		return 2
	}
	o.Inputs = splitList(inputs)
	set := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { set[f.Name] = true })
	if err := specFlags(o, set["output"], set["inputs"]); err != nil {
		fmt.Fprintln(stderr, "identify:", err)
		return 2
	}
	if interval != "" {
		v, u, err := parseInterval(interval)
		if err != nil {
			fmt.Fprintln(stderr, "identify:", err)
			return 2
		}
		o.Interval, o.Unit = v, u
	}
	r, err := parseSep(sep)
	if err != nil {
		fmt.Fprintln(stderr, "identify:", err)
		return 2
	}
	o.Sep = r
	out, err := Run(context.Background(), o, stdout, stderr)
	var se *SaveError
	var ue *UsageError
	switch {
	case errors.As(err, &ue):
		fmt.Fprintln(stderr, "identify:", err)
		return exitUsage
	case errors.As(err, &se):
		fmt.Fprintln(stderr, "identify:", err)
		return exitNotAdequate
	case err != nil:
		fmt.Fprintln(stderr, "identify:", err)
		return exitFailed
	case out != nil && out.Estimate != nil && !out.Trusted:
		fmt.Fprintln(stderr, "identify: verdict NOT ADEQUATE (exit status 3): the model fails its checks; see the report")
		return exitNotAdequate
	}
	return exitOK
}

// specFlags refuses -output or -inputs given with -spec when they
// disagree with the spec: the spec names the output and the inputs, and
// a flag that says otherwise would be ignored. Flags that agree (the
// same output; the same inputs, in any order) pass. A spec that does not
// parse is left to Run to report.
func specFlags(o Options, outputSet, inputsSet bool) error {
	if o.Spec == "" || !(outputSet || inputsSet) {
		return nil
	}
	m, err := parse.Model(o.Spec)
	if err != nil {
		return nil
	}
	if outputSet && o.Output != m.Output {
		return fmt.Errorf("-output %s disagrees with the spec, whose output is %s: with -spec the output and inputs are taken from the spec; drop -output, or fit the spec written for %s",
			clip(o.Output), m.Output, clip(o.Output))
	}
	var names []string
	for _, in := range m.Inputs {
		names = append(names, in.Series)
	}
	if inputsSet {
		a, b := slices.Clone(o.Inputs), slices.Clone(names)
		slices.Sort(a)
		slices.Sort(b)
		if !slices.Equal(a, b) {
			return fmt.Errorf("-inputs %s disagrees with the spec, whose inputs are %s: with -spec the output and inputs are taken from the spec; drop -inputs, or write the spec with the inputs you mean",
				clip(strings.Join(o.Inputs, ",")), strings.Join(names, ","))
		}
	}
	return nil
}

// parseSep reads -sep: one character other than a quote or a line end,
// or "tab".
func parseSep(s string) (rune, error) {
	if s == "tab" || s == `\t` {
		return '\t', nil
	}
	r, size := utf8.DecodeRuneInString(s)
	if size == 0 || size != len(s) || r == '"' || r == '\r' || r == '\n' || r == utf8.RuneError {
		return 0, fmt.Errorf("-sep %s: want one character such as ';' or '|', or tab", clip(s))
	}
	return r, nil
}

func splitList(s string) []string {
	var out []string
	for _, f := range strings.Split(s, ",") {
		if f = strings.TrimSpace(f); f != "" {
			out = append(out, f)
		}
	}
	return out
}

// parseInterval reads "1min", "10 s", "0.5h", "1d", "1mo".
func parseInterval(s string) (float64, string, error) {
	s = strings.TrimSpace(s)
	i := strings.IndexFunc(s, func(r rune) bool { return r >= 'a' && r <= 'z' })
	if i <= 0 {
		return 0, "", fmt.Errorf("-interval %q: want a number and a unit (s, min, h, d, wk, or the calendar units mo, qtr, yr), e.g. 1min", s)
	}
	v, err := strconv.ParseFloat(strings.TrimSpace(s[:i]), 64)
	u := s[i:]
	if err != nil || !(v > 0) || !tf.ValidUnit(u) {
		return 0, "", fmt.Errorf("-interval %q: want a positive number and a unit (s, min, h, d, wk, or the calendar units mo, qtr, yr), e.g. 1min", s)
	}
	return v, u, nil
}

// progress prints timed progress lines to standard error.
type progress struct {
	w     io.Writer
	start time.Time
}

func (p *progress) say(format string, args ...any) {
	if p.w == nil {
		return
	}
	fmt.Fprintf(p.w, "[%5.1fs] %s\n", time.Since(p.start).Seconds(), fmt.Sprintf(format, args...))
}

// ticker prints msg with the elapsed time every second until the
// returned stop function is called, for steps that report no progress of
// their own.
func (p *progress) ticker(msg string) (stop func()) {
	if p.w == nil {
		return func() {}
	}
	done := make(chan struct{})
	finished := make(chan struct{})
	go func() {
		defer close(finished)
		t := time.NewTicker(time.Second)
		defer t.Stop()
		for {
			select {
			case <-done:
				return
			case <-t.C:
				p.say("%s ...", msg)
			}
		}
	}()
	return func() {
		close(done)
		<-finished
	}
}
