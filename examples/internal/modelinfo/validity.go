package modelinfo

import (
	"fmt"
	"io"
	"sort"
	"strconv"
)

// Validity is what a saved model carries about the record it was fitted
// to, so that whoever loads it later knows where it may be trusted. It is
// the "validity" object of a model of a Library, the config file that
// examples/identify writes and examples/config, examples/harness and
// examples/monitor read.
type Validity struct {
	// Samples is the number of samples of the record.
	Samples int `json:"samples"`
	// Interval is the sample interval as written in the spec ("1 min").
	Interval string `json:"interval,omitempty"`
	// Start is the time of the record's first sample as an event's time
	// is written ("2026-03-28T12:00", tf.FormatEventTime), when the record
	// has a time column, else empty. With Samples and Interval it places
	// the record on the clock, so that a service running the model knows
	// where its live stream sits against the model's events.
	Start string `json:"start,omitempty"`
	// Ranges holds the smallest and largest value of each series of the
	// record (the output and every input), by series name.
	Ranges map[string][2]float64 `json:"ranges"`
	// Verdict is "passed" when the fit converged and every check passed,
	// and "failed" otherwise.
	Verdict string `json:"verdict"`
	// Failures lists why the verdict is "failed" (empty when it passed).
	Failures []string `json:"failures,omitempty"`
	// Forced reports that the model was saved despite a failed verdict,
	// on the user's explicit request.
	Forced bool `json:"forced,omitempty"`
	// Cautions qualify a verdict that passed: what the checks do not
	// cover but the run found, such as outliers in the residuals that may
	// bias the estimates (empty when there is nothing to add).
	Cautions []string `json:"cautions,omitempty"`
	// Sigma is the standard deviation of the model's innovations (its
	// one-step prediction errors) to expect on clean data, in output
	// units: the noise SD a monitor of the model should assume.
	// examples/identify -save writes the fit's residual SD, or, when it
	// found outliers in the residuals, the robust residual scale of the
	// outlier search (which the outliers do not inflate), or under
	// -outliers refit the refit's residual SD; its notes say which. 0
	// (absent) in a file saved before the field existed: a reader then
	// falls back on the notes' "residual SD" and says so.
	Sigma float64 `json:"sigma,omitempty"`
}

// Verdicts of a Validity record.
const (
	VerdictPassed = "passed"
	VerdictFailed = "failed"
)

// Outside returns, for a series of the record, a sentence saying that
// the values lo..hi leave the range seen in the record, or "" when they
// stay inside it (or the record has no range for the series).
func (v *Validity) Outside(series string, lo, hi float64) string {
	if v == nil {
		return ""
	}
	r, ok := v.Ranges[series]
	if !ok || (lo >= r[0] && hi <= r[1]) {
		return ""
	}
	return fmt.Sprintf("%s runs over %s..%s, outside the range %s..%s seen in the record the model was fitted to; the model is an extrapolation there",
		series, num(lo), num(hi), num(r[0]), num(r[1]))
}

// Write prints the record in a few lines, each indented by indent.
func (v *Validity) Write(w io.Writer, indent string) {
	if v == nil {
		fmt.Fprintf(w, "%sno record of the data this model was fitted to: its range of validity is unknown\n", indent)
		return
	}
	fmt.Fprintf(w, "%sfitted to %d samples", indent, v.Samples)
	if v.Interval != "" {
		fmt.Fprintf(w, " every %s", v.Interval)
	}
	if v.Start != "" {
		fmt.Fprintf(w, " from %s", v.Start)
	}
	fmt.Fprintln(w)
	names := make([]string, 0, len(v.Ranges))
	for k := range v.Ranges {
		names = append(names, k)
	}
	sort.Strings(names)
	for _, k := range names {
		r := v.Ranges[k]
		fmt.Fprintf(w, "%s  %s seen from %s to %s\n", indent, k, num(r[0]), num(r[1]))
	}
	if v.Sigma > 0 {
		fmt.Fprintf(w, "%snoise SD to expect on clean data: %s\n", indent, num(v.Sigma))
	}
	switch {
	case v.Verdict == VerdictPassed:
		fmt.Fprintf(w, "%sverdict when saved: passed every check\n", indent)
		for _, c := range v.Cautions {
			fmt.Fprintf(w, "%s  but: %s\n", indent, c)
		}
	default:
		fmt.Fprintf(w, "%sverdict when saved: %s\n", indent, v.Verdict)
		for _, f := range v.Failures {
			fmt.Fprintf(w, "%s  - %s\n", indent, f)
		}
		if v.Forced {
			fmt.Fprintf(w, "%sSAVED DESPITE THE FAILED CHECKS on request: do not use it for control work\n", indent)
		}
	}
}

func num(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
