package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
	"github.com/backshift/backshift/tf/identify"
)

// OutputGap is one stretch of missing (NaN) output samples and what the
// fitted model says about it.
type OutputGap struct {
	// First and Last are the first and the last missing sample, Len
	// their number; From and To their time stamps (the record's clock,
	// the demo's day and time, or "sample N" without a time column),
	// Duration the length in time ("60 min"; in samples without an
	// interval).
	First, Last, Len int
	From, To         string
	Duration         string
	// Smoothed values of the missing samples by the fitted model
	// (Estimate.Missing, fixed-interval smoother): the range of the
	// values and of their standard errors (NaN before the fit, or when
	// the fit did not give them).
	ValueLo, ValueHi, SELo, SEHi float64
}

// Gaps is the gaps report of a run: the output's gaps, how the run
// handled them, and the input gaps the fit filled.
type Gaps struct {
	// Output lists the output's gaps in time order (nil for a record
	// without one).
	Output []OutputGap
	// Missing is the number of missing output samples.
	Missing int
	// StretchFrom and StretchTo are the samples [from, to) the
	// identification ran on: the longest gap-free stretch (0 and the
	// record's length without a gap, or with -spec, which identifies
	// nothing).
	StretchFrom, StretchTo int
	// Switched reports that the run fitted by exact likelihood although
	// -method asked for least squares (or left the default): least
	// squares needs every output sample.
	Switched bool
	// Whole lists the candidates refitted to the whole record by exact
	// likelihood, the chosen one among them (see chooseWhole); nil with
	// -spec or without a gap.
	Whole []WholeFit
	// Filled lists the input gaps the fit filled (Estimate.Filled; the
	// program asks for no fill, so it stays empty unless a library
	// caller's settings add one).
	Filled []fit.InputFill
}

// findGaps returns the gaps of the output of ds and the stretch to
// identify on. With gaps, a method other than exact is switched to
// exact (Switched): conditional least squares cannot run through a
// missing output, and filling the gap would invent the readings the
// sensor did not give; the exact likelihood skips them exactly. The
// switch is said in the report rather than refused, so that a record
// with a dropout gives its model with the default flags.
func findGaps(o Options, ds *dataset) *Gaps {
	y := ds.data[ds.output]
	g := &Gaps{StretchTo: len(y)}
	for _, r := range identify.Gaps(y) {
		s, t := r[0], r[1]
		og := OutputGap{First: s, Last: t - 1, Len: t - s, From: ds.sampleTime(s), To: ds.sampleTime(t - 1),
			Duration: amount(float64(t-s)*ds.step(), ds.timeUnit()),
			ValueLo:  math.NaN(), ValueHi: math.NaN(), SELo: math.NaN(), SEHi: math.NaN()}
		g.Output = append(g.Output, og)
		g.Missing += og.Len
	}
	if len(g.Output) == 0 {
		return g
	}
	if o.Spec == "" {
		g.StretchFrom, g.StretchTo = identify.GapFree(ds.data, append([]string{ds.output}, ds.inputs...)...)
	}
	g.Switched = o.Method != methodExact
	return g
}

// stretch returns ds cut to the samples [from, to) (the slices are
// ds's own, not copied), for the identification.
func (ds *dataset) stretch(from, to int) *dataset {
	c := *ds
	c.data = make(map[string][]float64, len(ds.data))
	for k, v := range ds.data {
		c.data[k] = v[from:to]
	}
	c.n = to - from
	return &c
}

// writeGapPlan prints the output's gaps and how the run will handle
// them, before the fit.
func writeGapPlan(w io.Writer, g *Gaps, ds *dataset, spec bool) {
	if len(g.Output) == 0 {
		return
	}
	fmt.Fprintf(w, "\nGaps in the output %s: %d missing %s in %d %s (%.1f %% of the record):\n", ds.output, g.Missing,
		plural(g.Missing, "sample", "samples"), len(g.Output), plural(len(g.Output), "gap", "gaps"), 100*float64(g.Missing)/float64(ds.n))
	for i, og := range g.Output {
		if i == shownGaps {
			fmt.Fprintf(w, "  ... and %d more gaps\n", len(g.Output)-shownGaps)
			break
		}
		fmt.Fprintf(w, "  %-22s to %-22s  samples %d to %d: %d %s, %s\n", og.From, og.To, og.First, og.Last, og.Len, plural(og.Len, "sample", "samples"), og.Duration)
	}
	if !spec {
		n := g.StretchTo - g.StretchFrom
		fmt.Fprintf(w, "  identification (prewhitening, cross-correlation, least-squares ranking of the candidates) runs on the longest gap-free stretch,\n")
		fmt.Fprintf(w, "    samples %d to %d (%s to %s, %d samples, %.0f %% of the record): its steps need consecutive samples\n",
			g.StretchFrom, g.StretchTo-1, ds.sampleTime(g.StretchFrom), ds.sampleTime(g.StretchTo-1), n, 100*float64(n)/float64(ds.n))
	}
	fmt.Fprintf(w, "  the %s model is fitted to the whole record by exact maximum likelihood: its Kalman filter skips the missing samples exactly\n",
		map[bool]string{true: "given", false: "chosen"}[spec])
	fmt.Fprintf(w, "    (no value is invented for them; the residuals there are missing, and the checks and the outlier search use the others)\n")
	if g.Switched {
		fmt.Fprintf(w, "  method: exact likelihood, not least squares (-method least-squares, the default): least squares needs every output\n")
		fmt.Fprintf(w, "    sample, and filling the gap first would fit invented readings as if measured\n")
	}
}

// shownGaps is the number of gaps listed one by one.
const shownGaps = 10

// gapResults fills each gap's smoothed values from est.Missing and the
// input fills from est.Filled.
func gapResults(g *Gaps, est *fit.Estimate) {
	g.Filled = est.Filled
	byIndex := make(map[int]fit.MissingValue, len(est.Missing))
	for _, mv := range est.Missing {
		byIndex[mv.Index] = mv
	}
	for i := range g.Output {
		og := &g.Output[i]
		for t := og.First; t <= og.Last; t++ {
			mv, ok := byIndex[t]
			if !ok || !finite(mv.Value) {
				continue
			}
			og.ValueLo, og.ValueHi = nanMin(og.ValueLo, mv.Value), nanMax(og.ValueHi, mv.Value)
			og.SELo, og.SEHi = nanMin(og.SELo, mv.SE), nanMax(og.SEHi, mv.SE)
		}
	}
}

// nanMin and nanMax are math.Min and math.Max with NaN as "none yet".
func nanMin(a, b float64) float64 {
	if math.IsNaN(a) {
		return b
	}
	return math.Min(a, b)
}

func nanMax(a, b float64) float64 {
	if math.IsNaN(a) {
		return b
	}
	return math.Max(a, b)
}

// writeGapResults prints what the fitted model says about each gap (the
// smoothed values and their standard errors) and the input gaps filled.
func writeGapResults(w io.Writer, g *Gaps, ds *dataset) {
	if len(g.Output) == 0 && len(g.Filled) == 0 {
		return
	}
	unit := outputUnitWord(ds)
	if len(g.Output) > 0 {
		fmt.Fprintf(w, "\nMissing outputs, smoothed by the fitted model (Estimate.Missing; estimates, not readings, and not used in any fit or check):\n")
		for i, og := range g.Output {
			if i == shownGaps {
				fmt.Fprintf(w, "  ... and %d more gaps\n", len(g.Output)-shownGaps)
				break
			}
			if math.IsNaN(og.ValueLo) {
				fmt.Fprintf(w, "  %s to %s: no smoothed values (the fit gave none)\n", og.From, og.To)
				continue
			}
			fmt.Fprintf(w, "  %s to %s (%s): %.4g to %.4g %s, standard error %.2g to %.2g (largest far from the readings either side)\n",
				og.From, og.To, og.Duration, og.ValueLo, og.ValueHi, unit, og.SELo, og.SEHi)
		}
	}
	for _, f := range g.Filled {
		fmt.Fprintf(w, "  input %s: %d %s from %s filled (%s)\n", f.Series, f.Len, plural(f.Len, "sample", "samples"), ds.sampleTime(f.Index), f.Rule)
	}
}

// gapNote is the sentence the saved model's notes carry about the
// output's gaps ("" without one).
func (g *Gaps) gapNote() string {
	if len(g.Output) == 0 {
		return ""
	}
	var parts []string
	for i, og := range g.Output {
		if i == 3 {
			parts = append(parts, fmt.Sprintf("%d more", len(g.Output)-3))
			break
		}
		parts = append(parts, fmt.Sprintf("%s to %s", og.From, og.To))
	}
	return fmt.Sprintf("%d output samples missing (%s), skipped by the exact likelihood", g.Missing, strings.Join(parts, ", "))
}

// WholeFit is one candidate, ranked on the gap-free stretch, refitted
// to the whole record by exact likelihood.
type WholeFit struct {
	Structure  string
	StretchBIC float64 // least squares on the stretch
	BIC        float64 // exact likelihood on the whole record
	Pass       bool    // the refit passes its checks
	Err        error   // the refit or its checks failed to run
	est        *fit.Estimate
}

// wholeTries is the number of candidates refitted to the whole record:
// the best-ranked of each noise order, at most three. The stretch holds
// less evidence about the noise than the whole record (on the demo, a
// stretch of 3720 samples ranks an AR(1) noise first, whose residuals
// over the whole record fail the Ljung-Box check, while the AR(2)
// noise ranked below it passes), so the noise order is decided by the
// whole record's exact likelihood among the stretch's best; the dead
// times and orders of the inputs are the stretch's. Three keeps the
// extra cost to three exact fits; our choice.
const wholeTries = 3

// chooseWhole refits the best-ranked candidate of each noise order (at
// most wholeTries) to the whole record by exact likelihood, checks each,
// and returns the one with the least whole-record BIC among those that
// pass their checks (among all, when none does), printing the
// comparison.
func chooseWhole(ctx context.Context, cands []identify.Candidate, ds *dataset, w io.Writer, pr *progress) (*fit.Estimate, error) {
	seen := map[string]bool{}
	var tries []WholeFit
	for _, c := range cands {
		if c.Estimate == nil || c.Err != nil {
			continue
		}
		key := noiseOrder(c.Structure)
		if seen[key] {
			continue
		}
		seen[key] = true
		pr.say("refitting %s to the whole record by exact likelihood", tf.StructureLabel(c.Structure))
		wf := WholeFit{Structure: tf.StructureLabel(c.Structure), StretchBIC: c.Estimate.BIC, BIC: math.NaN()}
		wf.est, wf.Err = fit.Model(ctx, c.Estimate.Model, ds.data, ds.fitSettings(c.Estimate.Conditioning.First, fit.ExactML))
		if wf.Err == nil {
			wf.BIC = wf.est.BIC
			var d *fit.Diagnostics
			if d, wf.Err = fit.Check(wf.est, ds.data, nil); wf.Err == nil {
				wf.Pass = d.Pass
			}
		}
		tries = append(tries, wf)
		if len(tries) == wholeTries {
			break
		}
	}
	ds.gaps.Whole = tries
	best := -1
	for i, t := range tries {
		if t.est == nil {
			continue
		}
		if best < 0 || t.Pass && !tries[best].Pass || t.Pass == tries[best].Pass && t.BIC < tries[best].BIC {
			best = i
		}
	}
	if best < 0 {
		return nil, fmt.Errorf("the exact-likelihood fit of the best candidates to the whole record: %w", tries[0].Err)
	}
	fmt.Fprintf(w, "\nThe best candidate of each noise order refitted to the whole record by exact maximum likelihood (the output has gaps;\n")
	fmt.Fprintf(w, "the stretch holds less evidence about the noise than the whole record, so the whole record decides among them):\n")
	fmt.Fprintf(w, "  %12s  %12s  %-6s  %s\n", "stretch BIC", "whole BIC", "checks", "structure")
	for i, t := range tries {
		checks := map[bool]string{true: "pass", false: "FAIL"}[t.Pass]
		if t.Err != nil {
			checks = "n/a"
		}
		mark := ""
		if i == best {
			mark = "  <- chosen"
		}
		fmt.Fprintf(w, "  %12.1f  %12.1f  %-6s  %s%s\n", t.StretchBIC, t.BIC, checks, t.Structure, mark)
	}
	fmt.Fprintf(w, "  (the least-squares BIC is of the stretch and the exact one of the whole record: they compare only within a column)\n")
	return tries[best].est, nil
}

// noiseOrder is the noise part of m's structure, "ARMA(p, q)".
func noiseOrder(m tf.Model) string {
	if m.Noise == nil {
		return "none"
	}
	return fmt.Sprintf("ARMA(%d, %d)", m.Noise.AR.Degree(), m.Noise.MA.Degree())
}
