package main

import (
	"context"
	"fmt"
	"io"

	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
	"github.com/backshift/backshift/tf/identify"
)

// identifyBest runs the one-call identification, prints the ranked
// candidates and returns the best one's estimate, and the candidates.
func identifyBest(ctx context.Context, ds *dataset, skip int, w io.Writer, pr *progress) (*fit.Estimate, []identify.Candidate, error) {
	pr.say("identifying: prewhitening %d inputs, impulse-response weights, (b, r, s) forms, noise orders, fitting the candidates concurrently", len(ds.inputs))
	set := identifySettings(skip)
	stop := pr.ticker("still identifying")
	cands, err := identify.Candidates(ctx, ds.output, ds.inputs, ds.data, set)
	stop()
	if err != nil {
		return nil, nil, fmt.Errorf("identification: %w", err)
	}
	pr.say("fitted %d candidate models", len(cands))
	fmt.Fprintf(w, "\nCandidate models, best first (ranked by BIC; checks at the 5 %% level; %d fitted):\n", len(cands))
	fmt.Fprintf(w, "  %4s  %10s  %10s  %6s  %-6s  %s\n", "rank", "BIC", "AIC", "params", "checks", "structure")
	for i, c := range cands {
		if i == shownCandidates && len(cands) > shownCandidates+1 {
			last := cands[len(cands)-1]
			fmt.Fprintf(w, "  ... %d more, down to BIC %.1f\n", len(cands)-shownCandidates, last.Score)
			break
		}
		if c.Err != nil {
			fmt.Fprintf(w, "  %4d  %10s  %10s  %6s  %-6s  %s (fit failed: %v)\n", c.Rank, "-", "-", "-", "-", tf.StructureLabel(c.Structure), c.Err)
			continue
		}
		e := c.Estimate
		checks := "n/a"
		if c.Diagnostics != nil {
			checks = map[bool]string{true: "pass", false: "FAIL"}[c.Diagnostics.Pass]
		}
		fmt.Fprintf(w, "  %4d  %10.1f  %10.1f  %6d  %-6s  %s\n", c.Rank, e.BIC, e.AIC, len(e.Params), checks, tf.StructureLabel(c.Structure))
	}
	if cands[0].Estimate == nil {
		return nil, nil, fmt.Errorf("identification: no candidate could be fitted")
	}
	if d := cands[0].Diagnostics; d != nil && !d.Pass {
		// The best by BIC fails: say whether a lower-ranked one passes.
		note := "  note: the best by BIC fails its checks, and so does every other candidate"
		for _, c := range cands[1:] {
			if c.Err == nil && c.Diagnostics != nil && c.Diagnostics.Pass {
				note = fmt.Sprintf("  note: the best by BIC fails its checks; the best that passes them is rank %d: %s", c.Rank, tf.StructureLabel(c.Structure))
				break
			}
		}
		fmt.Fprintln(w, note)
	}
	return cands[0].Estimate, cands, nil
}

// shownCandidates is the number of candidates listed.
const shownCandidates = 10

// identifySettings are the settings of the one-call identification: six
// (b, r, s) forms per input and every combination with the two best
// noise orders, about 70 fits (a few seconds on two cores), so that the
// simplest adequate form is among them; residuals summed from skip.
func identifySettings(skip int) *identify.Settings {
	return &identify.Settings{Forms: 6, MaxCandidates: 72, Fit: &fit.Settings{First: skip}}
}
