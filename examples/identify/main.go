package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"time"
)

// Options are the command-line settings of one run.
type Options struct {
	// Data is a CSV file; empty means the built-in greenhouse record.
	Data string
	// Output and Inputs name the columns of the output and the inputs
	// (ignored with Spec: the spec names them).
	Output string
	Inputs []string
	// Spec, when not empty, is a model to fit instead of identifying one.
	Spec string
	// Interval is the sample interval (Value in Unit); zero means the
	// demo's 1 min for built-in data and the spec's, or samples, for a
	// file.
	Interval float64
	Unit     string
	// Pictures is a folder to write PNG pictures to; empty for none.
	Pictures string
	// Save writes the fitted model as a one-model JSON config (the format
	// of examples/config) to this file; empty for none.
	Save string
	// WriteData writes the built-in record as CSV to this file and stops.
	WriteData string
	// Horizon is the forecast horizon in samples; Plan the planned
	// schedule of the first input as "from:value,..." (samples from the
	// end of the record); empty holds the last value.
	Horizon int
	Plan    string
	// Skip is the number of samples at the start of the record left out
	// of the sums of squares: the input filters start from zero
	// pre-sample values, and with inputs far from zero (a valve at 60 %)
	// the start-up transient would otherwise be read as noise. A
	// negative value means automatic: 5 % of the record, at most 500.
	Skip int
	// Quiet suppresses progress messages.
	Quiet bool
}

// DefaultOptions are the settings of a plain `go run ./examples/identify`.
func DefaultOptions() Options {
	return Options{Output: "temp", Inputs: []string{"valve", "outdoor"}, Horizon: 180, Plan: "0:65,60:85,120:70", Skip: -1}
}

func main() {
	o := DefaultOptions()
	var inputs, interval string
	flag.StringVar(&o.Data, "data", "", "CSV file with a header line (default: the built-in greenhouse record)")
	flag.StringVar(&o.Output, "output", o.Output, "column of the output series")
	flag.StringVar(&inputs, "inputs", strings.Join(o.Inputs, ","), "comma-separated columns of the input series")
	flag.StringVar(&o.Spec, "spec", "", "fit this model spec instead of identifying one")
	flag.StringVar(&interval, "interval", "", "sample interval with a unit, e.g. 1min, 10s, 0.5h (default: 1min for the built-in data)")
	flag.StringVar(&o.Pictures, "pictures", "", "write PNG pictures to this folder")
	flag.StringVar(&o.Save, "save", "", "write the fitted model as a JSON config (the format of examples/config) to this file")
	flag.StringVar(&o.WriteData, "write-data", "", "write the built-in greenhouse record as CSV to this file and exit")
	flag.IntVar(&o.Horizon, "horizon", o.Horizon, "forecast horizon in samples (0: no forecast)")
	flag.StringVar(&o.Plan, "plan", o.Plan, "planned first input after the record, as from:value pairs (samples from the end)")
	flag.IntVar(&o.Skip, "skip", o.Skip, "samples at the start left out of the fit while the input filters start up (-1: 5 % of the record, at most 500)")
	flag.BoolVar(&o.Quiet, "quiet", false, "no progress messages on standard error")
	flag.Parse()
	o.Inputs = splitList(inputs)
	if interval != "" {
		v, u, err := parseInterval(interval)
		if err != nil {
			fmt.Fprintln(os.Stderr, "identify:", err)
			os.Exit(2)
		}
		o.Interval, o.Unit = v, u
	}
	if _, err := Run(context.Background(), o, os.Stdout, os.Stderr); err != nil {
		fmt.Fprintln(os.Stderr, "identify:", err)
		os.Exit(1)
	}
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

// parseInterval reads "1min", "10 s", "0.5h", "1d".
func parseInterval(s string) (float64, string, error) {
	s = strings.TrimSpace(s)
	i := strings.IndexFunc(s, func(r rune) bool { return r >= 'a' && r <= 'z' })
	if i <= 0 {
		return 0, "", fmt.Errorf("-interval %q: want a number and a unit (s, min, h, d), e.g. 1min", s)
	}
	v, err := strconv.ParseFloat(strings.TrimSpace(s[:i]), 64)
	u := s[i:]
	if err != nil || !(v > 0) || (u != "s" && u != "min" && u != "h" && u != "d") {
		return 0, "", fmt.Errorf("-interval %q: want a positive number and a unit (s, min, h, d), e.g. 1min", s)
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
