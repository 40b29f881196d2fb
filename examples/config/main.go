package main

import (
	_ "embed"
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"strconv"
	"strings"

	"github.com/backshift/backshift/examples/internal/cmdline"
	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/tf"
)

//go:embed greenhouse.json
var builtin []byte

//go:embed fitted.json
var fitted []byte

//go:embed broken.json
var broken []byte

// caution is printed with every loaded config.
const caution = `Caution: an identified model is an approximation, valid near the operating
conditions of the record it was fitted to. Commission any controller tuned on
it under the site's safety procedures, with independent safety interlocks;
defer to local codes and licensed practice.`

// usage is printed by -h above the flags.
const usage = `config loads a site's library of process models (a JSON file whose "spec"
fields are model specs), checks every entry with positions in the file, and
prints what each model says about the plant: gain, dead time, time constants,
stability, step response, and the record of the data it was fitted to.

Examples:
  go run ./examples/config                      # the built-in configs, then a broken one
  go run ./examples/config -file fitted.json    # a model saved by examples/identify -save

Flags:
`

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

// run is the program with its arguments and outputs; it returns the exit
// status: 0 when done, 1 for a file that cannot be read or has problems,
// 2 for a command line that is wrong.
func run(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("config", flag.ContinueOnError)
	fs.SetOutput(stderr)
	file := fs.String("file", "", "config file to load (default: the built-in greenhouse.json and fitted.json, then the built-in broken.json)")
	if status, stop := cmdline.Parse(fs, usage, args); stop {
		return status
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "config takes no arguments besides its flags, and got %q; to load a file write -file %s (see -h)\n",
			strings.Join(fs.Args(), " "), fs.Arg(0))
		return 2
	}
	var err error
	if *file != "" {
		err = showFile(stdout, stderr, *file)
	} else {
		err = demo(stdout, stderr)
	}
	if err != nil {
		fmt.Fprintln(stderr, err)
		return 1
	}
	return 0
}

// showFile reads, loads and prints one config file.
func showFile(stdout, stderr io.Writer, name string) error {
	raw, err := cmdline.ReadConfig(name)
	var pe *fs.PathError
	switch {
	case errors.As(err, &pe):
		return fmt.Errorf("-file: %w", err)
	case err != nil:
		return fmt.Errorf("-file %s: %w", name, err)
	}
	return show(stdout, stderr, name, raw)
}

// demo loads the built-in configs and prints them, then shows how a
// broken config is reported.
func demo(stdout, stderr io.Writer) error {
	if err := show(stdout, stderr, "greenhouse.json", builtin); err != nil {
		return err
	}
	fmt.Fprintln(stdout)
	if err := show(stdout, stderr, "fitted.json", fitted); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "\nA config with mistakes (broken.json) is rejected with positions in the file:\n\n")
	_, err := Load("broken.json", broken)
	if err == nil {
		return fmt.Errorf("broken.json was accepted")
	}
	fmt.Fprintln(stdout, err)
	return nil
}

// show loads, validates and prints one config: each model's summary and
// validity record, then the caution. A model saved with a failed verdict
// is flagged beside it, in the heading and on stderr.
func show(stdout, stderr io.Writer, name string, raw []byte) error {
	c, err := Load(name, raw)
	if err != nil {
		return err
	}
	plural := "s"
	if len(c.Models) == 1 {
		plural = ""
	}
	var failed []string
	for _, e := range c.Models {
		if e.Failed() {
			failed = append(failed, fmt.Sprintf("%q", e.Name))
		}
	}
	site := c.Site
	if site == "" {
		site = "(no site named)"
	}
	fmt.Fprintf(stdout, "%s: %s, %d model%s, every spec valid\n", name, site, len(c.Models), plural)
	if len(failed) > 0 {
		msg := fmt.Sprintf("WARNING: %s FAILED its checks when it was saved; do not use it for control work", strings.Join(failed, ", "))
		fmt.Fprintln(stdout, msg)
		fmt.Fprintf(stderr, "%s: %s\n", name, msg)
	}
	for _, e := range c.Models {
		fmt.Fprintf(stdout, "\n%s\n", e.Name)
		if e.Failed() {
			fmt.Fprintf(stdout, "  !!! THIS MODEL FAILED ITS CHECKS WHEN IT WAS SAVED (verdict \"failed\"): it is not fit for\n  !!! control work; identify it again from a better record\n")
		}
		if e.Notes != "" {
			fmt.Fprintf(stdout, "  (%s)\n", e.Notes)
		}
		fmt.Fprintf(stdout, "  spec: %s\n", e.Spec)
		if err := modelinfo.Write(stdout, e.Spec.Model); err != nil {
			return fmt.Errorf("%s: model %q: %w", name, e.Name, err)
		}
		fmt.Fprintf(stdout, "  range of validity:\n")
		e.Validity.Write(stdout, "    ")
		if e.Validity != nil {
			for _, s := range append([]string{e.Spec.Model.Output}, inputNames(e)...) {
				if ev := eventOf(e, s); ev != nil {
					fmt.Fprintf(stdout, "      %s: %s\n", s, eventLine(*ev))
				} else if _, ok := e.Validity.Ranges[s]; !ok {
					fmt.Fprintf(stdout, "      %s: no range recorded; its range of validity is unknown\n", s)
				}
			}
		}
	}
	fmt.Fprintf(stdout, "\n%s\n", caution)
	return nil
}

func inputNames(e Entry) []string {
	var out []string
	for _, in := range e.Spec.Model.Inputs {
		out = append(out, in.Series)
	}
	return out
}

// eventOf returns the event of the input series s of e, or nil when s is
// not an event input.
func eventOf(e Entry, s string) *tf.Event {
	for _, in := range e.Spec.Model.Inputs {
		if in.Series == s && in.Event != nil {
			return in.Event
		}
	}
	return nil
}

// eventLine says what an event input is: a 0/1 indicator of a known
// intervention, which has no range of values to record.
func eventLine(ev tf.Event) string {
	at := "sample " + strconv.Itoa(ev.Index) + " of the record"
	if !ev.At.IsZero() {
		at = tf.FormatEventTime(ev.At)
	}
	return "an event (a known intervention: a " + ev.Kind.String() + " at " + at + "), a 0/1 indicator with no range to record"
}
