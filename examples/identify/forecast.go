package main

import (
	"fmt"
	"io"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/backshift/backshift/tf/fit"
)

// planStep is one change of a planned input: from sample From (counted
// from the end of the record) the input is Value.
type planStep struct {
	From  int
	Value float64
}

// parsePlan reads "0:55,60:75,120:60"; "hold" and "" give no steps
// (the last value holds).
func parsePlan(s string) ([]planStep, error) {
	var out []planStep
	if strings.TrimSpace(s) == "hold" {
		return nil, nil
	}
	for _, f := range strings.Split(s, ",") {
		f = strings.TrimSpace(f)
		if f == "" {
			continue
		}
		a, b, ok := strings.Cut(f, ":")
		from, err1 := strconv.Atoi(strings.TrimSpace(a))
		v, err2 := strconv.ParseFloat(strings.TrimSpace(b), 64)
		if !ok || err1 != nil || err2 != nil || from < 0 || math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("-plan %s: want from:value pairs such as 0:55,60:75 (from in samples after the record), or hold", clip(s))
		}
		out = append(out, planStep{from, v})
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].From < out[j].From })
	for i := 1; i < len(out); i++ {
		if out[i].From == out[i-1].From {
			return nil, fmt.Errorf("-plan %s: sample %d is given two values (%g and %g); give each step once",
				clip(s), out[i].From, out[i-1].Value, out[i].Value)
		}
	}
	return out, nil
}

// checkPlan refuses a -plan that the forecast would not use in full: a
// step at or after the horizon h (h = 0: no forecast at all). plan is
// the text given ("" and "hold" pass).
func checkPlan(text string, h, horizonFlag int) error {
	steps, err := parsePlan(text)
	if err != nil || len(steps) == 0 {
		return err
	}
	if h <= 0 {
		return fmt.Errorf("-plan %s: no forecast is made (-horizon 0), so the plan would not be used; drop -plan or give a horizon", clip(text))
	}
	if last := steps[len(steps)-1]; last.From >= h {
		how := fmt.Sprintf("-horizon %d", h)
		if horizonFlag == HorizonAuto {
			how = fmt.Sprintf("the automatic horizon: 180 samples, at most a quarter of the record, here %d", h)
		}
		return fmt.Errorf("-plan %s: the step at sample %d lies beyond the forecast horizon of %d %s (%s), so it would be dropped; "+
			"plan steps must start before sample %d, or give a longer -horizon", clip(text), last.From, h, plural(h, "sample", "samples"), how, h)
	}
	return nil
}

// schedule expands plan over h samples; before the first step the last
// observed value last holds.
func schedule(plan []planStep, h int, last float64) []float64 {
	u := make([]float64, h)
	v := last
	k := 0
	for j := range u {
		for k < len(plan) && plan[k].From <= j {
			v = plan[k].Value
			k++
		}
		u[j] = v
	}
	return u
}

// forecastResult is kept for the picture.
type forecastResult struct {
	f       *fit.Forecast
	planned string
	plan    []float64
	h       int
}

// forecast prints the forecast of the output over h samples for the
// planned schedule of the first input (o.Plan; the demo's plan on the
// built-in record when empty, else the last value held), the other
// inputs forecast from their own models. A plan that leaves the range of
// the input seen in the record is warned about, naming both ranges; a
// forecast from a model that fails its checks is headed as such.
func forecast(est *fit.Estimate, ds *dataset, o Options, h int, w io.Writer, out *Outcome) error {
	if h <= 0 {
		return nil
	}
	first := ds.inputs[0]
	x := ds.data[first]
	planText := o.Plan
	if planText == "" {
		planText = "hold"
		if ds.builtin && first == "valve" {
			planText = demoPlan
		}
	}
	plan, err := parsePlan(planText)
	if err != nil {
		return err
	}
	u := schedule(plan, h, x[len(x)-1])
	f, err := est.Forecast(ds.data, h, &fit.ForecastSettings{Future: map[string][]float64{first: u}})
	if err != nil {
		return fmt.Errorf("forecast: %w", err)
	}
	for j := range f.Mean {
		if !finite(f.Mean[j]) || !finite(f.Lower[j]) || !finite(f.Upper[j]) {
			fmt.Fprintf(w, "\nForecast of %s: not available (it does not stay finite %d samples ahead: the model is not fit to forecast with)\n", ds.output, j+1)
			return nil
		}
	}
	out.forecast = &forecastResult{f: f, planned: first, plan: u, h: h}
	unit := ds.timeUnit()
	dt := ds.step()
	what := planText
	if planText == "hold" {
		what = fmt.Sprintf("held at its last value %.4g", x[len(x)-1])
	}
	fmt.Fprintf(w, "\nForecast of %s for the planned %s (%s), %.0f %% intervals:\n", ds.output, first, what, 100*f.Level)
	if !out.Trusted {
		fmt.Fprintf(w, "  (from a model that fails its checks: not to be relied on)\n")
	}
	if s := out.Validity.Outside(first, slices.Min(u), slices.Max(u)); s != "" {
		out.Warnings = append(out.Warnings, s)
		fmt.Fprintf(w, "  WARNING: the planned %s\n", s)
	}
	var others []string
	for _, in := range f.Inputs {
		if !in.Known {
			others = append(others, in.Series)
		}
	}
	if len(others) > 0 {
		fmt.Fprintf(w, "  (%s forecast from its own ARMA model; its uncertainty is in the intervals)\n", strings.Join(others, ", "))
	}
	fmt.Fprintf(w, "  %8s  %10s  %10s  %21s\n", "ahead ("+unit+")", first, ds.output, "interval")
	stepEvery := max(1, h/12)
	for j := stepEvery - 1; j < h; j += stepEvery {
		fmt.Fprintf(w, "  %8g  %10.2f  %10.2f  [%8.2f, %8.2f]\n", float64(j+1)*dt, u[j], f.Mean[j], f.Lower[j], f.Upper[j])
	}
	return nil
}
