package main

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/backshift/backshift/tf/control"
)

// tuningCaution ends every tuning's block of the report: settings from
// a model are a starting point, not a commissioned controller.
const tuningCaution = "  caution: an identified model is an approximation; commission these settings on the plant under the site's\n" +
	"  safety procedures, with independent interlocks, deferring to local codes and licensed practice\n"

// writeTest writes the test signal's figures: its kind, clock period,
// length and the band it excites, and how the record was simulated.
func writeTest(w io.Writer, t *plantTest) {
	p := t.Plan
	n := float64(len(p.Signal)) * p.Sample
	period := n / float64(p.Periods)
	fmt.Fprintf(w, "plant test of the valve (testsignal.Design from an expected time constant of %g min and dead time of %g min)\n",
		testTimeConstant, testDeadTime)
	fmt.Fprintf(w, "  signal     maximum-length binary sequence, %d stages, valve %g +- %g %%\n", p.Stages, testLevel, testAmplitude)
	fmt.Fprintf(w, "  clock      %g min; period %g min, %d periods: %g min of the %g min allowed\n", p.Clock, period, p.Periods, n, testBudget)
	fmt.Fprintf(w, "  band       %.3g .. %.3g rad/min (periods of %.0f .. %.0f min)\n", p.BandLow, p.BandHigh, 2*math.Pi/p.BandHigh, 2*math.Pi/p.BandLow)
	for _, s := range p.Warnings {
		fmt.Fprintf(w, "  WARNING: %s\n", s)
	}
	fmt.Fprintf(w, "  record     simulated on the plant spec with noise SD %g degC (seed %d), outdoor from the demo's weather\n\n", t.NoiseSD, t.Seed)
}

// writeModel writes the identified model, its valve path and the verdict
// of its checks, with the reasons when it failed.
func writeModel(w io.Writer, id *identified) {
	e := id.Est
	fmt.Fprintf(w, "identified model (fit.Model on the known structure; identify.Candidates is for an unknown one)\n")
	fmt.Fprintf(w, "  %s\n", id.Structure)
	line := ""
	for i, p := range e.Params {
		line += fmt.Sprintf("  %-3s %-20s", p.Name, fmt.Sprintf("%.4g +- %.2g", p.Value, p.SE))
		if i%3 == 2 || i == len(e.Params)-1 {
			fmt.Fprintln(w, strings.TrimRight(line, " "))
			line = ""
		}
	}
	iv := e.Model.Interval
	if fo, err := id.Plant.AsFOPDT(iv.Value); err == nil {
		fmt.Fprintf(w, "  valve path: gain %.4g degC/%%, time constant %.3g %s, dead time %d samples (%g %s)\n",
			fo.Gain, fo.TimeConstant, iv.Unit, id.Plant.Delay(), float64(id.Plant.Delay())*iv.Value, iv.Unit)
	}
	d := id.Checks
	if d.Pass {
		fmt.Fprintf(w, "  checks (fit.Check, %g level): adequate\n    residuals white (Ljung-Box p = %.2g)", d.Alpha, d.Residual.P)
		for _, c := range d.Cross {
			fmt.Fprintf(w, "; uncorrelated with %s (p = %.2g)", c.Input, c.P)
		}
		fmt.Fprint(w, "\n\n")
		return
	}
	fmt.Fprintf(w, "  checks (fit.Check, %g level): NOT adequate\n", d.Alpha)
	for _, f := range d.Failures {
		fmt.Fprintf(w, "    - %s\n", f)
	}
}

// writeTuning writes one rule's settings with their form and units, the
// nominal loop's margins and |S| peak, the robustness over the drawn
// plants and the worst case, then the caution.
func writeTuning(w io.Writer, t *tuned) {
	tu, lp := t.Tuning, t.Nominal
	fmt.Fprintf(w, "%s tuning, closed-loop time %.3g min, on the model %s (times in min)\n", tu.Rule, tu.ClosedLoopTime, tu.Model)
	fmt.Fprintf(w, "  settings   PI, %s form (for a PI the same as the other): Kc = %.4g %%/degC, Ti = %.4g min;\n"+
		"             discrete by backward difference every %s\n", formName(tu.PID.Form), tu.PID.Gain, tu.PID.Integral, tu.Interval)
	fmt.Fprintf(w, "  nominal    gain margin %.2f, phase margin %.0f deg, delay margin %.2g min, Ms %.2f at %.3g rad/min\n",
		lp.Margins.GainMargin, degrees(lp.Margins.PhaseMargin), lp.DelayMargin.Time, lp.SensitivityPeak, lp.SensitivityPeakAt/tu.Interval.Value)
	r := t.Robust
	fmt.Fprintf(w, "  drawn      %d plants from the estimate's covariance (seed %d): %.1f %% stable\n", r.Draws, robustSeed, 100*r.FractionStable)
	fmt.Fprintf(w, "             quantiles %s: Ms %s, gain margin %s, phase margin %s deg, overshoot %s %%\n",
		levels(r.Levels), spread(r.SensitivityPeak, 1, "%.2f"), spread(r.GainMargin, 1, "%.2f"),
		spread(r.PhaseMargin, 180/math.Pi, "%.0f"), spread(r.Overshoot, 100, "%.0f"))
	wc := t.Worst
	fmt.Fprintf(w, "  worst case gain up to %.0f %% higher, dead time up to %d sample longer: %d of %d cases unstable",
		100*worstGainAbove, worstDelayAbove, wc.Unstable, len(wc.Cases))
	if c := wc.SensitivityPeak.Case; c >= 0 {
		k := wc.Cases[c]
		fmt.Fprintf(w, ", Ms up to %.2f (gain x%.3g, dead time %+d)", wc.SensitivityPeak.Value, k.GainFactor, k.DelayChange)
	}
	fmt.Fprint(w, "\n"+tuningCaution+"\n")
}

// formName names a PID form, the empty one being parallel.
func formName(f control.Form) string {
	if f == "" {
		return string(control.Parallel)
	}
	return string(f)
}

// degrees converts radians to degrees.
func degrees(rad float64) float64 { return rad * 180 / math.Pi }

// levels formats quantile levels as percentages, "5/50/95 %".
func levels(l []float64) string {
	s := make([]string, len(l))
	for i, v := range l {
		s[i] = fmt.Sprintf("%g", 100*v)
	}
	return strings.Join(s, "/") + " %"
}

// spread formats a spread's quantiles scaled by k with format f, joined
// by slashes.
func spread(sp control.Spread, k float64, f string) string {
	s := make([]string, len(sp.Values))
	for i, v := range sp.Values {
		s[i] = fmt.Sprintf(f, k*v)
	}
	return strings.Join(s, "/")
}
