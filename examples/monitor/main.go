package main

import (
	"context"
	_ "embed"
	"errors"
	"flag"
	"fmt"
	"io"
	"net"
	"net/http"
	"os"
	"os/signal"
	"strconv"
	"strings"
	"syscall"
	"time"

	"github.com/backshift/backshift/examples/internal/cmdline"
	"github.com/backshift/backshift/tf/monitor"
)

//go:embed greenhouse.json
var builtin []byte

// caution is printed at start and served with every state and prediction.
const caution = `Caution: an alarm is advice to an operator, not an interlock. It says that the
one-step prediction errors no longer look like the model's, with a known rate
of false alarms; it may come late, or not at all, for a change the tests are not
made for. Protect the plant with independent interlocks under the site's safety
procedures, deferring to local codes and licensed practice. An identified model
is an approximation of the plant, valid near the conditions it was fitted in.`

// alarmCaution is the short form, served beside the alarms.
const alarmCaution = "an alarm is advice to an operator, not an interlock"

const usage = `monitor serves predictions and drift alarms for the loops of a model config
(the format of examples/config; examples/identify -save writes one). Each model
is one loop: POST its samples as JSON lines, GET its predictions with intervals,
its state and its alarms. Stop it with Ctrl-C (SIGINT) or SIGTERM: with -state
it then writes each loop's state there, and -restore carries on from it.
With -track DIR it serves nothing: it re-estimates the built-in greenhouse
model recursively over a record with a planted change of the valve gain, prints
how closely and how fast the estimates follow, and draws their trajectories
into DIR.

Examples:
  go run ./examples/monitor                                   # the built-in greenhouse loop
  go run ./examples/monitor -config fitted.json -state /var/lib/monitor -restore
  go run ./examples/monitor -config fitted.json -from 'temp (identified)=1600'   # a replay from record sample 1600
  go run ./examples/monitor -track /tmp/track                 # pictures of re-estimation
  curl -X POST --data-binary @samples.jsonl localhost:8080/loops/air%20temperature/samples

Flags:
`

// UsageError is a command line the program refuses: it exits with 2.
type UsageError struct{ Err error }

// Error returns the refusal, which names the flag.
func (e *UsageError) Error() string { return e.Err.Error() }

// Unwrap returns the refusal.
func (e *UsageError) Unwrap() error { return e.Err }

// options are the command line's settings.
type options struct {
	config, addr, state string
	restore             bool
	track               string // folder of the -track pictures; "" serves
	days                int    // record length of -track, 0 the default
	arl                 float64
	sigmas              map[string]float64
	from                map[string]streamStart // -from, by loop name
	now                 time.Time              // the clock at start, for placing timed events
}

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	os.Exit(run(ctx, os.Args[1:], os.Stdout, os.Stderr))
}

// run is the program: it serves until ctx is done and returns the exit
// status: 0 after a clean stop, 1 when the config, a snapshot or the
// address cannot be used, 2 for a command line that is wrong.
func run(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	o, status, stop := parseFlags(args, stderr)
	if stop {
		return status
	}
	if o.track != "" {
		if err := runTrack(ctx, o, stdout); err != nil {
			fmt.Fprintln(stderr, "monitor:", err)
			return 1
		}
		return 0
	}
	svc, err := build(o, stdout)
	if err != nil {
		fmt.Fprintln(stderr, "monitor:", err)
		if errors.As(err, new(*UsageError)) {
			return 2
		}
		return 1
	}
	ln, err := net.Listen("tcp", o.addr)
	if err != nil {
		svc.close()
		fmt.Fprintln(stderr, "monitor: -addr:", err)
		return 1
	}
	fmt.Fprintf(stdout, "listening on http://%s (GET / lists the routes)\n", ln.Addr())
	hs := &http.Server{Handler: svc.handler(), ReadHeaderTimeout: 10 * time.Second}
	served := make(chan error, 1)
	go func() { served <- hs.Serve(ln) }()
	code := 0
	select {
	case <-ctx.Done():
		sctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
		hs.Shutdown(sctx) // waits for the requests that run
		cancel()
	case err := <-served:
		fmt.Fprintln(stderr, "monitor:", err)
		code = 1
	}
	svc.close()
	if o.state != "" {
		if err := svc.save(o.state); err != nil {
			fmt.Fprintln(stderr, "monitor: -state:", err)
			return 1
		}
		fmt.Fprintf(stdout, "saved the state of %d loops in %s\n", len(svc.loops), o.state)
	}
	return code
}

// parseFlags reads the command line.
func parseFlags(args []string, stderr io.Writer) (*options, int, bool) {
	o := &options{sigmas: map[string]float64{}, from: map[string]streamStart{}, now: time.Now()}
	fs := flag.NewFlagSet("monitor", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.StringVar(&o.config, "config", "", "model config `file` in the format of examples/config (default: the built-in greenhouse loop)")
	fs.StringVar(&o.addr, "addr", "127.0.0.1:8080", "`host:port` to serve on")
	fs.StringVar(&o.state, "state", "", "`folder` where each loop's state is written on shutdown")
	fs.BoolVar(&o.restore, "restore", false, "carry on from the states in the -state folder at start")
	fs.Float64Var(&o.arl, "arl", monitor.DefaultTargetARL, "in-control average run length of each test, in `samples` (the mean time between its false alarms)")
	fs.Func("sigma", "noise standard deviation of a loop, `name=SD` (repeat for several loops; default: the \"sigma\" of the model's validity record, as examples/identify -save writes it, or for an older file the \"residual SD\" in its notes)", func(v string) error {
		name, sd, ok := strings.Cut(v, "=")
		f, err := strconv.ParseFloat(strings.TrimSpace(sd), 64)
		if !ok || name == "" || err != nil {
			return fmt.Errorf("write the loop's name, '=' and a number, as in -sigma 'air temperature=0.03'")
		}
		o.sigmas[name] = f
		return nil
	})
	fs.Func("from", "where a loop's live stream starts against the record its model was fitted to, `name=POS`: the record sample of the first live sample, or its time (2026-03-30T08:00); it places the model's events (step, pulse) on the stream (default: right after the fit's record, so that its events have happened)", func(v string) error {
		name, pos, ok := strings.Cut(v, "=")
		if !ok || name == "" {
			return fmt.Errorf("write the loop's name, '=' and a record sample or a time, as in -from 'temp (identified)=2000'")
		}
		s, err := parseStreamStart(pos)
		if err != nil {
			return err
		}
		o.from[name] = s
		return nil
	})
	fs.StringVar(&o.track, "track", "", "instead of serving, re-estimate the built-in greenhouse model over a record with a planted valve gain change and write pictures of the estimates into `folder`")
	fs.IntVar(&o.days, "days", 0, fmt.Sprintf("record length of -track in `days` of 1440 samples, 1 to %d (default %d)", maxTrackDays, trackDays))
	if status, stop := cmdline.Parse(fs, usage, args); stop {
		return nil, status, true
	}
	if err := o.check(fs.Args()); err != nil {
		fmt.Fprintln(stderr, "monitor:", err)
		return nil, 2, true
	}
	return o, 0, false
}

// check refuses settings that cannot work together.
func (o *options) check(rest []string) error {
	switch {
	case len(rest) > 0:
		return &UsageError{fmt.Errorf("monitor takes no arguments besides its flags, and got %q; a config is given with -config FILE (see -h)", strings.Join(rest, " "))}
	case o.restore && o.state == "":
		return &UsageError{errors.New("-restore is given without -state: name the folder that holds the states")}
	case o.days != 0 && o.track == "":
		return &UsageError{errors.New("-days is given without -track: it sets the length of the -track record")}
	case o.track != "" && len(o.from) > 0:
		return &UsageError{errors.New("-from places a served loop's events on its live stream; -track serves nothing: leave it out")}
	case o.track != "" && (o.config != "" || o.state != "" || o.restore):
		return &UsageError{errors.New("-track runs the built-in greenhouse scenario and serves nothing: leave out -config, -state and -restore")}
	case o.track != "" && (o.days < 0 || o.days > maxTrackDays):
		return &UsageError{fmt.Errorf("-days %d: the -track record must be 1 to %d days long", o.days, maxTrackDays)}
	case o.arl < monitor.MinTargetARL || o.arl > monitor.MaxTargetARL:
		return &UsageError{fmt.Errorf("-arl %g: the run length must lie in [%d, %g] samples", o.arl, monitor.MinTargetARL, float64(monitor.MaxTargetARL))}
	}
	for _, f := range []struct{ flag, dir string }{{"-state", o.state}, {"-track", o.track}} {
		if f.dir == "" {
			continue
		}
		if st, err := os.Stat(f.dir); err != nil || !st.IsDir() {
			return &UsageError{fmt.Errorf("%s %s: not a folder (create it first)", f.flag, f.dir)}
		}
	}
	return nil
}

// build loads the config and builds the service, restoring its state
// when asked; it prints the caution and the loops.
func build(o *options, stdout io.Writer) (*service, error) {
	var specs []loopSpec
	var err error
	site := "built-in greenhouse loop"
	if o.config == "" {
		specs, err = decodeConfigAt(builtin, o.sigmas, o.from, o.now)
	} else {
		site = o.config
		specs, err = readConfig(o.config, o.sigmas, o.from, o.now)
	}
	if err != nil {
		return nil, err
	}
	svc, err := newService(site, specs, o.arl, stdout)
	if err != nil {
		return nil, err
	}
	fmt.Fprintf(stdout, "%s\n\n", caution)
	for _, l := range svc.loops {
		fmt.Fprintf(stdout, "loop %q: %s (noise SD %g; inputs in the order %s)\n", l.spec.Name, l.spec.Model, l.spec.Sigma, quoted(l.inputs))
		if l.spec.SigmaNote != "" {
			fmt.Fprintf(stdout, "  %s\n", l.spec.SigmaNote)
		}
		for _, e := range l.spec.Events {
			fmt.Fprintf(stdout, "  event %s\n", e)
		}
	}
	if o.restore {
		n, err := svc.restore(o.state)
		if err != nil {
			svc.close()
			return nil, err
		}
		fmt.Fprintf(stdout, "restored the state of %d of %d loops from %s\n", n, len(svc.loops), o.state)
	}
	return svc, nil
}
