package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// The values of -outliers.
const (
	outliersOff    = "off"    // no search
	outliersReport = "report" // search the chosen model's residuals and report (the default)
	outliersRefit  = "refit"  // also refit with the outliers as event inputs
)

// checkOutliersFlag refuses a value of -outliers other than off, report
// and refit ("" means report).
func checkOutliersFlag(v string) error {
	switch v {
	case "", outliersOff, outliersReport, outliersRefit:
		return nil
	}
	return fmt.Errorf("-outliers %s: want off (no search), report (search the residuals and report what is found) or refit (also refit with them as events)", clip(v))
}

// Outliers is what the search of the chosen model's residuals found,
// and the refit with the outliers as events when it was asked for.
type Outliers struct {
	// Report is the library's report (arma.Outliers on the residuals,
	// with the model's noise and differencing).
	Report *arma.OutlierReport
	// Found lists the outliers as the report prints them.
	Found []FoundOutlier
	// Refit is the model refitted with the outliers as event inputs
	// (-outliers refit and at least one outlier that can be an event),
	// nil otherwise; RefitChecks are its checks (nil when they could not
	// be run), RefitFailures the reasons it fails them.
	Refit         *fit.Estimate
	RefitChecks   *fit.Diagnostics
	RefitFailures []string
	// From and To are the first and the last sample searched (the
	// residuals present: the samples before the fit's first residual,
	// -skip and the model's start-up, are not searched).
	From, To int
	// Moved names the estimates that moved by more than one standard
	// error of the first fit in the refit.
	Moved []string
}

// FoundOutlier is one outlier in the report's words: its time as the
// record's time stamp (or "sample N" without a time column), its size's
// standard error (|Size / T|) and the notes on where it lies.
type FoundOutlier struct {
	arma.Outlier
	When  string
	SE    float64
	Notes []string
}

// findOutliers searches the residuals of est for outliers with the
// model's noise and differencing and the library's default settings
// (all four kinds, a family-wise false-detection rate of 5 %).
func findOutliers(est *fit.Estimate, ds *dataset) (*Outliers, error) {
	var noise arma.Noise
	if est.Model.Noise != nil {
		noise = *est.Model.Noise
	}
	rep, err := arma.Outliers(est.Resid, noise, est.Model.Diff, nil)
	if err != nil {
		return nil, fmt.Errorf("outlier search: %w", err)
	}
	res := &Outliers{Report: rep, From: -1, To: -1}
	for i, v := range est.Resid {
		if !math.IsNaN(v) {
			if res.From < 0 {
				res.From = i
			}
			res.To = i
		}
	}
	for _, o := range rep.Outliers {
		f := FoundOutlier{Outlier: o, When: ds.sampleTime(o.Index), SE: math.Abs(o.Size / o.T)}
		if o.AtStart {
			f.Notes = append(f.Notes, "near the start (rests on the fit's start-up)")
		}
		if o.AtEnd {
			f.Notes = append(f.Notes, "near the end (the kind is the likeliest, not a firm finding)")
		}
		if o.NearGap {
			f.Notes = append(f.Notes, "near a gap (rests on fewer residuals)")
		}
		res.Found = append(res.Found, f)
	}
	return res, nil
}

// writeOutliers prints the outliers found and the critical value used.
func writeOutliers(w io.Writer, res *Outliers, ds *dataset) {
	r := res.Report
	fmt.Fprintf(w, "\nOutliers in the residuals of the chosen model (|t| above %.2f: a %.0f %% chance of any false finding on a clean record, over %d tests):\n",
		r.Critical, 100*r.Rate, r.Tests)
	if res.From >= 0 {
		fmt.Fprintf(w, "  searched: samples %d to %d (%s to %s)", res.From, res.To, ds.sampleTime(res.From), ds.sampleTime(res.To))
		if res.From > 0 {
			fmt.Fprintf(w, "; the first %d %s (-skip and the model's start-up) have no residual and are not searched: a bad reading there goes unseen",
				res.From, plural(res.From, "sample", "samples"))
		}
		fmt.Fprintln(w)
	}
	if len(res.Found) == 0 {
		fmt.Fprintln(w, "  none found")
		return
	}
	unit := outputUnitWord(ds)
	fmt.Fprintf(w, "  %-25s  %8s  %-16s  %12s  %8s  %s\n", "time", "sample", "kind", "size", "t", "notes")
	for _, f := range res.Found {
		fmt.Fprintf(w, "  %-25s  %8d  %-16s  %12.4g  %8.1f  %s\n", f.When, f.Index, f.Kind, f.Size, f.T, strings.Join(f.Notes, "; "))
	}
	fmt.Fprintf(w, "  sizes in %s, standard errors %s; residual scale (robust) %.4g\n",
		unit, seList(res.Found), r.Sigma)
}

// seList lists the standard errors of the sizes.
func seList(fs []FoundOutlier) string {
	parts := make([]string, len(fs))
	for i, f := range fs {
		parts[i] = fmt.Sprintf("%.2g", f.SE)
	}
	return "(" + strings.Join(parts, ", ") + ")"
}

// refitOutliers refits est's model with the outliers found as event
// inputs (tf.Model.WithOutliers: an innovational outlier is a shock of
// the noise, not an input, and is left out), by the same method from the
// same first residual, and runs the checks on the refit.
func refitOutliers(ctx context.Context, est *fit.Estimate, ds *dataset, res *Outliers, pr *progress) error {
	m, skipped, err := est.Model.WithOutliers(res.Report.Outliers, res.Report.Decay)
	if err != nil {
		return fmt.Errorf("outlier refit: %w", err)
	}
	if len(skipped) == len(res.Report.Outliers) {
		return nil
	}
	pr.say("refitting with %d outliers as events", len(res.Report.Outliers)-len(skipped))
	// The refit is by the first fit's method and conditioning (for the
	// demo's dropout, the whole-record exact likelihood), so that the
	// comparison shows the outliers' effect and nothing else.
	c := est.Conditioning
	re, err := fit.Model(ctx, m, ds.data, &fit.Settings{IgnoreExtra: true, First: c.First, Method: est.Method,
		ZeroPreSample: c.ZeroPreSample, InputGaps: c.InputGaps, Start: c.Start})
	if err != nil {
		return fmt.Errorf("outlier refit: %w", err)
	}
	if re.Model.Interval.Value == 0 && ds.interval > 0 {
		re.Model.Interval = tf.Interval{Value: ds.interval, Unit: ds.unit}
	}
	res.Refit = re
	d, err := fit.Check(re, ds.data, nil)
	if err != nil {
		res.RefitFailures = []string{fmt.Sprintf("the diagnostic checks could not be run: %v", err)}
	} else {
		res.RefitChecks, res.RefitFailures = d, d.Failures
	}
	after := map[string]float64{}
	for _, p := range re.Params {
		after[p.Name] = p.Value
	}
	for _, p := range est.Params {
		if v, ok := after[p.Name]; ok && math.Abs(v-p.Value) > p.SE {
			res.Moved = append(res.Moved, fmt.Sprintf("%s %.4g -> %.4g (SE %.2g)", p.Name, p.Value, v, p.SE))
		}
	}
	return nil
}

// writeRefit prints the comparison of the first fit and the refit with
// the outliers as events, by the same method, and the refit's verdict.
func writeRefit(w io.Writer, est *fit.Estimate, res *Outliers, ds *dataset) {
	re := res.Refit
	if re == nil {
		fmt.Fprintln(w, "\nRefit with the outliers as events: nothing to refit (none found, or only innovational ones, which are shocks of the noise)")
		return
	}
	fmt.Fprintf(w, "\nRefit with the outliers as events (-outliers refit), by %s as the first fit:\n  %s\n", re.Method, rounded(re.Model))
	fmt.Fprintf(w, "  %-10s  %12s  %12s\n", "", "first fit", "refit")
	fmt.Fprintf(w, "  %-10s  %12.5g  %12.5g\n", "sigma^2", est.Sigma2, re.Sigma2)
	fmt.Fprintf(w, "  %-10s  %12.1f  %12.1f\n", "AIC", est.AIC, re.AIC)
	fmt.Fprintf(w, "  %-10s  %12.1f  %12.1f\n", "BIC", est.BIC, re.BIC)
	for _, p := range re.Params {
		if strings.HasPrefix(p.Name, "ao") || strings.HasPrefix(p.Name, "ls") || strings.HasPrefix(p.Name, "tc") {
			fmt.Fprintf(w, "  event %s: %.4g +- %.2g\n", p.Name, p.Value, p.SE)
		}
	}
	if len(res.Moved) == 0 {
		fmt.Fprintln(w, "  no estimate moved by more than one standard error of the first fit")
	} else {
		fmt.Fprintf(w, "  moved by more than one standard error: %s\n", strings.Join(res.Moved, "; "))
	}
	if res.RefitChecks != nil && res.RefitChecks.Pass {
		fmt.Fprintln(w, "  verdict of the refit: it passes its checks (-save saves the refit)")
		return
	}
	fmt.Fprintf(w, "  verdict of the refit: NOT ADEQUATE, it FAILS its checks: %s\n", strings.Join(res.RefitFailures, "; "))
	fmt.Fprintf(w, "    the structure was chosen on the record with the outliers in it, and they can bend it (a bad reading looks like\n")
	fmt.Fprintf(w, "    noise to the ranking); re-identify on the cleaned record: %s\n", cleanAdvice(res, ds))
}

// cleanAdvice says how to re-identify without the outliers: an
// additive outlier is one bad reading, and a blank output cell is read
// as missing and skipped by the exact likelihood; a shift stays in the
// record, and its event goes in a spec.
func cleanAdvice(res *Outliers, ds *dataset) string {
	var blank []string
	other := false
	for _, f := range res.Found {
		if f.Kind == arma.Additive {
			blank = append(blank, f.When)
		} else {
			other = true
		}
	}
	var parts []string
	if len(blank) > 0 {
		where := "blank the output cells at " + strings.Join(blank, ", ") + " in the file"
		if ds.builtin || ds.demoClock {
			// The built-in record's minute column is its sample index.
			where = "write the record with -write-data, blank the " + ds.output + " cells of minute " + sampleList(res) + " and read it with -data"
		}
		parts = append(parts, where+" (a blank output cell is read as missing, skipped exactly) and run again")
	}
	if other || len(blank) == 0 {
		parts = append(parts, "give a structure with -spec that holds the shifts as events (as in the refit's spec above)")
	}
	return strings.Join(parts, "; or ")
}

// sampleList lists the samples of the additive outliers found.
func sampleList(res *Outliers) string {
	var s []string
	for _, f := range res.Found {
		if f.Kind == arma.Additive {
			s = append(s, fmt.Sprint(f.Index))
		}
	}
	return strings.Join(s, ", ")
}

// sampleTime is the time of sample i as the record stamps it (a time
// stamp in the offset from UTC the file writes there), or "sample i"
// when the record has no time column.
func (ds *dataset) sampleTime(i int) string {
	switch {
	case ds.times == nil && ds.demoClock:
		// The built-in record starts at midnight of day 1.
		return fmt.Sprintf("day %d %02d:%02d", i/1440+1, i%1440/60, i%60)
	case ds.times == nil:
		return fmt.Sprintf("sample %d", i)
	}
	t := ds.times.t0 + float64(i)*ds.times.step
	if ds.times.calendar {
		return ds.times.wallClock(t)
	}
	return fmt.Sprintf("%.6g %s", t/ds.times.unitSeconds, ds.times.unit)
}

// searchOutliers searches the residuals of the chosen model for
// outliers unless o.Outliers is off (nil, nil then), printing nothing:
// the verdict, printed before the outliers, depends on what it finds.
func searchOutliers(o Options, est *fit.Estimate, ds *dataset, pr *progress) (*Outliers, error) {
	if o.Outliers == outliersOff {
		return nil, nil
	}
	pr.say("searching the residuals for outliers")
	return findOutliers(est, ds)
}

// outlierStep reports the outliers found by searchOutliers (res, or
// the error searchErr) and, on the demo record, how the planted bad
// reading and dropout were found; with refit it refits the model with
// them as events and prints the comparison.
func outlierStep(ctx context.Context, o Options, est *fit.Estimate, ds *dataset, res *Outliers, searchErr error, w io.Writer, pr *progress, out *Outcome) error {
	if o.Outliers == outliersOff {
		return nil
	}
	if searchErr != nil {
		// A model whose residuals cannot be searched (a non-invertible
		// noise MA) is reported as such; the rest of the report stands.
		fmt.Fprintf(w, "\nOutliers: the residuals could not be searched: %v\n", withoutOp(searchErr))
		return nil
	}
	out.Outliers = res
	writeOutliers(w, res, ds)
	writePlanted(w, est, ds, res)
	if o.Outliers != outliersRefit {
		return nil
	}
	if err := refitOutliers(ctx, est, ds, res, pr); err != nil {
		return err
	}
	writeRefit(w, est, res, ds)
	return nil
}

// writePlanted says, on the demo record, whether the planted bad
// reading and sensor dropout were found.
func writePlanted(w io.Writer, est *fit.Estimate, ds *dataset, res *Outliers) {
	if f := ds.fault; f != nil {
		found := "NOT found"
		for _, in := range est.Model.Inputs {
			if in.Event != nil && in.Event.Kind == tf.Pulse && in.Event.At.IsZero() && in.Event.Index == f.Sample {
				found = "modelled by the spec's event " + in.Event.String()
			}
		}
		for _, x := range res.Found {
			if x.Index == f.Sample {
				found = fmt.Sprintf("found: %s of %.3g +- %.2g", x.Kind, x.Size, x.SE)
			}
		}
		fmt.Fprintf(w, "  planted in the demo record: a bad reading of %+.3g %s at sample %d (%s): %s\n",
			f.Size, outputUnitWord(ds), f.Sample, ds.sampleTime(f.Sample), found)
	}
	if g := ds.dropout; g != nil {
		found := "NOT found"
		for _, og := range ds.gaps.Output {
			if og.First == g.Start && og.Len == g.Len {
				found = fmt.Sprintf("found: the gap of %d samples, %s to %s, skipped by the exact likelihood", og.Len, og.From, og.To)
			}
		}
		fmt.Fprintf(w, "  planted in the demo record: a sensor dropout of %d samples from sample %d (%s): %s\n",
			g.Len, g.Start, ds.sampleTime(g.Start), found)
	}
}

// outlierCaveat qualifies the verdict of a model that passes its checks
// when outliers were found in its residuals: the checks test the
// residuals as a whole, and a single reading far off can pass them while
// it pulls the estimates (on the demo record the bad reading halves the
// noise's MA coefficient). It returns "" when res found none. refit says
// whether -outliers refit is asked for (the advice then points to the
// refit below).
func outlierCaveat(res *Outliers, refit bool, ds *dataset) string {
	if res == nil || len(res.Found) == 0 {
		return ""
	}
	n := len(res.Found)
	var at []string
	for i, f := range res.Found {
		if i == 3 {
			at = append(at, fmt.Sprintf("%d more", n-3))
			break
		}
		at = append(at, fmt.Sprintf("%s, t %.1f", f.When, f.T))
	}
	advice := fmt.Sprintf("refit with %s as %s (-outliers refit), or check the record there", plural(n, "it", "them"), plural(n, "an event", "events"))
	if refit {
		advice = fmt.Sprintf("the refit below takes %s as %s", plural(n, "it", "them"), plural(n, "an event", "events"))
	}
	return fmt.Sprintf("the model passes its checks, but %d %s found in its residuals (%s; listed below): the estimates may be biased by %s; %s",
		n, plural(n, "outlier was", "outliers were"), strings.Join(at, "; "), plural(n, "it", "them"), advice)
}

// outputUnitWord is the output's unit in words: "degC" on the demo,
// "units of the output" otherwise.
func outputUnitWord(ds *dataset) string {
	if u := strings.Trim(outputUnit(ds), " ()"); u != "" {
		return u
	}
	return "units of the output"
}
