package main

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"time"

	"github.com/backshift/backshift/examples/internal/cmdline"
	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// entry is one model of a site's model library (the file of
// examples/config, which examples/identify -save writes): each model is
// one loop.
type entry struct{ modelinfo.Saved[parse.Spec] }

// loopSpec is what the service needs to run one loop: its name, its
// model with every coefficient held, and the standard deviation of the
// model's innovations.
type loopSpec struct {
	Name  string
	Model tf.Model
	Sigma float64
	// SigmaNote is a line printed at start about where Sigma came from
	// when it is the notes' fallback (empty otherwise).
	SigmaNote string
	// Live is the model the predictor runs: Model with its events placed
	// on the live stream (entry.placeEvents), or the zero Model when it
	// is Model itself. Events says where each event falls, one line each.
	Live   tf.Model
	Events []string
}

// stampKey is the key of a sample line that holds its time stamp; no
// series may have that name.
const stampKey = "stamp"

// residualSD finds the noise standard deviation in the notes that
// examples/identify -save writes ("...; residual SD 0.02966; ...").
var residualSD = regexp.MustCompile(`residual SD ([0-9.eE+-]+)`)

// readConfig reads and checks the config file name; sigmas holds the
// noise standard deviations given on the command line, by loop name, and
// from where the loops' live streams start (-from), now the clock at
// start (see placeEvents).
func readConfig(name string, sigmas map[string]float64, from map[string]streamStart, now time.Time) ([]loopSpec, error) {
	raw, err := cmdline.ReadConfig(name)
	if err != nil {
		return nil, fmt.Errorf("-config %s: %w", name, err)
	}
	loops, err := decodeConfigAt(raw, sigmas, from, now)
	if err != nil {
		return nil, fmt.Errorf("-config %s: %w", name, err)
	}
	return loops, nil
}

// decodeConfig decodes a config and turns its models into loops. Unknown
// keys are refused, as examples/config refuses them (a misspelt key would
// otherwise be dropped silently); examples/config -file gives the
// positioned check of a file. Events are placed with no -from, by the
// clock now.
func decodeConfig(raw []byte, sigmas map[string]float64) ([]loopSpec, error) {
	return decodeConfigAt(raw, sigmas, nil, time.Now())
}

// decodeConfigAt is decodeConfig with the -from of the loops, by name,
// and the clock at start.
func decodeConfigAt(raw []byte, sigmas map[string]float64, from map[string]streamStart, now time.Time) ([]loopSpec, error) {
	c, err := modelinfo.DecodeLibrary[parse.Spec](bytes.TrimPrefix(raw, []byte{0xef, 0xbb, 0xbf}))
	if err != nil {
		return nil, fmt.Errorf("not a model config (run examples/config -file on it for the position): %w", err)
	}
	if len(c.Models) == 0 {
		return nil, errors.New(`the file lists no models; it holds {"site": ..., "models": [{"name": ..., "spec": ...}]} as examples/identify -save writes it`)
	}
	var loops []loopSpec
	seen := map[string]bool{}
	for i, saved := range c.Models {
		e := entry{saved}
		l, err := e.loop(sigmas)
		if err == nil {
			var f *streamStart
			if s, ok := from[e.Name]; ok {
				f = &s
			}
			l.Live, l.Events, err = e.placeEvents(f, now)
		}
		if err != nil {
			return nil, fmt.Errorf("model %d (%q): %w", i+1, e.Name, err)
		}
		if seen[l.Name] {
			return nil, fmt.Errorf("model %d: the name %q is used twice; loops are named by their models", i+1, l.Name)
		}
		seen[l.Name] = true
		loops = append(loops, l)
	}
	for name := range sigmas {
		if !seen[name] {
			return nil, &UsageError{fmt.Errorf("-sigma names %q, which is not a model of the config (%s)", name, names(loops))}
		}
	}
	for name := range from {
		if !seen[name] {
			return nil, &UsageError{fmt.Errorf("-from names %q, which is not a model of the config (%s)", name, names(loops))}
		}
	}
	return loops, nil
}

// loop checks one model entry and returns its loop.
func (e entry) loop(sigmas map[string]float64) (loopSpec, error) {
	m := e.Spec.Model
	switch {
	case strings.TrimSpace(e.Name) == "":
		return loopSpec{}, errors.New(`it has no "name"; loops are named by their models`)
	case m.Output == "":
		return loopSpec{}, errors.New(`it has no "spec"`)
	case len(free(m)) > 0:
		return loopSpec{}, fmt.Errorf("its spec has free coefficients (%s); the service runs models with every coefficient held, as examples/identify -save writes them", strings.Join(free(m), ", "))
	case e.Failed():
		return loopSpec{}, errors.New("it was saved with a failed verdict (-save-untrusted); a model that fails its checks is no base for alarms: identify it again")
	}
	for _, s := range append([]string{m.Output}, inputNames(m)...) {
		if s == stampKey {
			return loopSpec{}, fmt.Errorf("a series is named %q, the key of a sample's time stamp; rename the series", stampKey)
		}
	}
	sd, ok := sigmas[e.Name]
	note := ""
	if !ok && e.Validity != nil && e.Validity.Sigma != 0 {
		sd, ok = e.Validity.Sigma, true
	}
	if !ok && e.Validity != nil {
		// Saved by examples/identify before the validity record held the
		// noise SD; a model written by hand (no validity record) states
		// its residual SD in its notes on its author's word.
		note = "noise SD from the notes' \"residual SD\": the model's validity record has no \"sigma\" (saved before examples/identify wrote it); that SD is inflated if the record had outliers, which shows as false \"variance down\" alarms: save the model again, or give -sigma"
	}
	if !ok {
		mm := residualSD.FindStringSubmatch(e.Notes)
		if mm == nil {
			return loopSpec{}, fmt.Errorf(`no noise standard deviation: give it with -sigma '%s=SD' (the fit's residual SD, in %s units)`, e.Name, m.Output)
		}
		var err error
		if sd, err = strconv.ParseFloat(mm[1], 64); err != nil {
			return loopSpec{}, fmt.Errorf("the notes' residual SD %q is not a number", mm[1])
		}
	}
	if !(sd > 0) || math.IsInf(sd, 0) {
		return loopSpec{}, fmt.Errorf("the noise standard deviation %g is not a positive finite number", sd)
	}
	return loopSpec{Name: e.Name, Model: m, Sigma: sd, SigmaNote: note}, nil
}

// free lists the names of m's free coefficients.
func free(m tf.Model) []string {
	var out []string
	for _, c := range m.Params() {
		if c.Free {
			out = append(out, c.Name)
		}
	}
	return out
}

// inputNames returns the model's input series, each once.
func inputNames(m tf.Model) []string {
	var out []string
	for _, in := range m.Inputs {
		if !contains(out, in.Series) {
			out = append(out, in.Series)
		}
	}
	return out
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// names lists the loops' names, quoted.
func names(loops []loopSpec) string {
	q := make([]string, len(loops))
	for i, l := range loops {
		q[i] = strconv.Quote(l.Name)
	}
	return strings.Join(q, ", ")
}
