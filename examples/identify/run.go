package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"maps"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/examples/internal/suggest"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
	"github.com/backshift/backshift/tf/record"
)

// Outcome is what one run found, for tests and for callers that embed
// the program.
type Outcome struct {
	// Estimate is the chosen (or the given spec's) fitted model.
	Estimate *fit.Estimate
	// Paths summarises each input path of the fitted model.
	Paths []modelinfo.Path
	// Recovery compares each path with the truth (built-in data only).
	Recovery []Recovery
	// Pictures lists the files written.
	Pictures []string
	// Simulation is the chosen model's noise-free simulation from the
	// inputs alone, and how well it follows the output.
	Simulation *Simulation
	// Diagnostics are the checks of the chosen model (nil when they
	// could not be run: then the model is not trusted).
	Diagnostics *fit.Diagnostics
	// Caveat qualifies the verdict of a model that passes its checks
	// when outliers were found in its residuals (outlierCaveat; "" when
	// none were, or the model fails its checks); a saved model's notes
	// carry it.
	Caveat string
	// Trusted reports that the model passed every check
	// (Diagnostics.Pass): only then does the report offer it for control
	// work.
	Trusted bool
	// Record says what was done with the record before the fit: the
	// time column read, gaps filled or the stretch kept.
	Record []string
	// Warnings are the warnings printed with the results (a plan that
	// leaves the range of the record, ...).
	Warnings []string
	// Validity is the record of the data the model was fitted to, as
	// -save writes it.
	Validity *modelinfo.Validity
	// Saved is the file the model was saved to ("" for none).
	Saved string
	// Outliers is what the search of the residuals found, with the
	// refit when -outliers refit asked for it (nil with -outliers off).
	Outliers *Outliers
	// Gaps is the gaps report: the output's missing samples, how they
	// were handled and what the model says about them.
	Gaps *Gaps
	// Elapsed is the wall time of the run.
	Elapsed time.Duration

	forecast *forecastResult
}

// Recovery compares an identified input path with the true one.
type Recovery struct {
	Input                string
	TrueDelay, Delay     int
	TrueGain, Gain       float64
	TrueTau, Tau         float64 // minutes; NaN when the fitted path has no real pole
	GainErr              float64 // relative
	DelayExact, GainIn10 bool
}

// dataset is the record being worked on.
type dataset struct {
	name     string
	data     map[string][]float64
	output   string
	inputs   []string
	interval float64 // in unit; 0 when only samples are known
	unit     string
	builtin  bool
	n        int
	// notes say what was done to the record (time column, gaps).
	notes []string
	// fromSpec is true when the spec names the series.
	fromSpec bool
	// times is the clock of the record's time column (nil without
	// one); demoClock marks the built-in record, which starts at
	// midnight of day 1 and is stamped as day and time of day.
	times     *sampleClock
	demoClock bool
	// fault is the bad reading planted in the built-in record and
	// dropout its hour of missing outputs (nil for the clean record or a
	// file).
	fault   *greenhouse.Fault
	dropout *greenhouse.Dropout
	// gaps are the output's gaps and how the run handles them.
	gaps *Gaps
}

// sampleClock gives the time stamp of a sample: t0 + i step seconds,
// since 1970 when calendar, else in unit (unitSeconds long).
type sampleClock struct {
	t0, step    float64
	calendar    bool
	unit        string
	unitSeconds float64
	// rows and offsets are the time of each row of a calendar column
	// and the offset from UTC it was written with (record.Record's
	// Times and Offsets); zoned reports that the file writes offsets.
	// A time is shown in the offset of the row at or before it, as the
	// file writes it.
	rows    []float64
	offsets []int
	zoned   bool
}

// recordClock is the clock of rec's samples after the gap remedy: the
// first sample's time is the first row's, or, when only the longest
// evenly spaced stretch was kept, that stretch's first row's (found as
// record.Read finds it: split at the breaks, ties to the later one).
func recordClock(rec *record.Record, rem record.Remedy) *sampleClock {
	if len(rec.Times) == 0 {
		return nil
	}
	from := 0
	if rem.Kind == "longest" {
		best, start := -1, 0
		for i := 0; i <= len(rec.Breaks); i++ {
			end := len(rec.Times)
			if i < len(rec.Breaks) {
				end = rec.Breaks[i].Row
			}
			if end-start >= best {
				best, from = end-start, start
			}
			if i < len(rec.Breaks) {
				start = rec.Breaks[i].Row
			}
		}
	}
	c := &sampleClock{t0: rec.Times[from], step: rec.Median, calendar: rec.Calendar, unit: rec.TimeUnit, unitSeconds: 1,
		rows: rec.Times, offsets: rec.Offsets, zoned: rec.Zoned}
	if sec, ok := record.Seconds(rec.Interval.Unit); ok {
		c.step = rec.Interval.Value * sec
	}
	if sec, ok := record.Seconds(c.unit); ok && c.unit != "" {
		c.unitSeconds = sec
	} else {
		c.unit = "s"
	}
	return c
}

// minSamples is the fewest samples a record may have: below it nothing
// can be fitted at all (a model has at least a gain and a noise
// variance, and the checks need a few lags). A model worth trusting
// needs far more; the checks say when there are too few. Our choice.
const minSamples = 10

// SaveError reports that -save refused a model that fails its checks.
// Failures lists the checks it fails (the report prints them).
type SaveError struct {
	Path     string
	Failures []string
}

// Error names the file and the flag that forces the save, in one short
// line: the failures are in the report, under the verdict, and in
// Failures.
func (e *SaveError) Error() string {
	return fmt.Sprintf("-save %s: not saved: the model fails its checks (listed in the report); -save-untrusted saves it marked as untrusted", e.Path)
}

// Run does the whole job described in the package documentation and
// writes results to stdout and progress to stderr (nil for none). A
// model that fails its checks is reported as such, and with o.Save the
// run ends in a *SaveError unless o.SaveUntrusted is set; the Outcome is
// returned with it.
//
// Over 60 lines: the job's steps in the order the report prints them,
// each a call.
func Run(ctx context.Context, o Options, stdout, stderr io.Writer) (*Outcome, error) {
	start := time.Now()
	pr := &progress{w: stderr, start: start}
	if o.Quiet {
		pr.w = nil
	}
	if o.WriteData != "" {
		return &Outcome{}, writeBuiltin(o.WriteData, stdout)
	}
	rem, err := checkOptions(o)
	if err != nil {
		return nil, &UsageError{Err: err}
	}
	ds, horizon, skip, err := loadRecord(o, rem, stdout, pr)
	if err != nil {
		return nil, err
	}
	est, err := fitRecord(ctx, o, ds, skip, stdout, pr)
	if err != nil {
		return nil, err
	}
	if est.Model.Interval.Value == 0 && ds.interval > 0 {
		est.Model.Interval = tf.Interval{Value: ds.interval, Unit: ds.unit}
	}
	// The checks come first: what the report offers depends on them.
	out, failures := checkModel(est, ds, pr)
	if err := report(ctx, est, ds, stdout, pr, out); err != nil {
		return nil, err
	}
	gapResults(ds.gaps, est)
	out.Gaps = ds.gaps
	writeGapResults(stdout, ds.gaps, ds)
	if out.Simulation, err = simulate(est, ds, skip, stdout); err != nil {
		return nil, err
	}
	found, searchErr := searchOutliers(o, est, ds, pr)
	if out.Trusted {
		out.Caveat = outlierCaveat(found, o.Outliers == outliersRefit, ds)
	}
	writeDiagnostics(stdout, out.Diagnostics, failures, out.Caveat)
	if err := outlierStep(ctx, o, est, ds, found, searchErr, stdout, pr, out); err != nil {
		return nil, err
	}
	if err := forecast(est, ds, o, horizon, stdout, out); err != nil {
		return nil, err
	}
	if ds.builtin {
		out.Recovery = recovery(out.Paths)
		writeRecovery(stdout, out.Recovery)
		if out.Trusted {
			fmt.Fprintf(stdout, "\nTo test a controller on the identified model:\n  go run ./examples/harness -noise %.3g -spec '%s'\n",
				math.Sqrt(est.Sigma2), rounded(est.Model))
		}
	}
	fmt.Fprint(stdout, "\n"+caution)
	if o.Pictures != "" {
		if err := writePictures(o.Pictures, est, ds, out, stdout, pr); err != nil {
			return nil, err
		}
	}
	out.Elapsed = time.Since(start)
	if o.Save != "" {
		if r := out.Outliers; o.Outliers == outliersRefit && r != nil && r.Refit != nil {
			// -outliers refit saves the refit, judged by its own checks.
			est, failures = r.Refit, r.RefitFailures
			out.Validity = validity(est, ds, r.RefitChecks != nil && r.RefitChecks.Pass, failures)
		}
		if err := save(o, est, ds, out, failures, stdout); err != nil {
			return out, err
		}
	}
	pr.say("done in %.1f s", out.Elapsed.Seconds())
	return out, nil
}

// fitRecord fits the spec of o to ds, or identifies a model, by the
// method o asks for. A record whose output has gaps is identified on
// its longest gap-free stretch and fitted whole by exact likelihood
// (gaps.go), whatever the method; the report says so first.
func fitRecord(ctx context.Context, o Options, ds *dataset, skip int, stdout io.Writer, pr *progress) (*fit.Estimate, error) {
	ds.gaps = findGaps(o, ds)
	method := o.Method
	if len(ds.gaps.Output) > 0 {
		method = methodExact
	}
	writeGapPlan(stdout, ds.gaps, ds, o.Spec != "")
	if o.Spec != "" {
		return fitSpec(ctx, o.Spec, ds, skip, fitMethod(method), pr)
	}
	from, to := ds.gaps.StretchFrom, ds.gaps.StretchTo
	if to-from < minSamples {
		return nil, fmt.Errorf("the longest stretch of the record without a missing sample has %d samples (%d to %d): too short to identify a model on (at least %d; a model worth trusting needs hundreds); give the structure with -spec, which is fitted to the whole record by exact likelihood",
			to-from, from, max(from, to-1), minSamples)
	}
	if skip >= (to-from)/2 {
		skip = (to - from) / 20 // the stretch is much shorter than the record
	}
	est, cands, err := identifyBest(ctx, ds.stretch(from, to), skip, stdout, pr)
	switch {
	case err != nil:
		return nil, err
	case len(ds.gaps.Output) > 0:
		return chooseWhole(ctx, cands, ds, stdout, pr)
	case method == methodExact:
		return refitExact(ctx, est, ds, stdout, pr)
	}
	return est, nil
}

// checkOptions checks the settings that need no data, so that a
// mistyped flag does not wait for the fit and a save to a missing folder
// does not fail after the whole report. It returns the gap remedy of
// o.Gaps.
func checkOptions(o Options) (record.Remedy, error) {
	if o.Pictures != "" {
		// The folder is made now, so that one that cannot be made stops
		// the run before the fit rather than after the report.
		if err := os.MkdirAll(o.Pictures, 0o755); err != nil {
			return record.Remedy{}, fmt.Errorf("-pictures %s: the folder cannot be made (%v)", o.Pictures, err)
		}
	}
	if o.Save != "" {
		if err := checkSavePath(o.Save); err != nil {
			return record.Remedy{}, err
		}
	}
	if o.SaveUntrusted && o.Save == "" {
		return record.Remedy{}, errors.New("-save-untrusted is given without -save: name the file to save to")
	}
	if err := checkOutliersFlag(o.Outliers); err != nil {
		return record.Remedy{}, err
	}
	if err := checkMethodFlag(o.Method); err != nil {
		return record.Remedy{}, err
	}
	rem, err := record.ParseRemedy(o.Gaps)
	if err != nil {
		return rem, fmt.Errorf("-gaps %s: want hold:N or linear:N (fill gaps of up to N missing samples, N at least 1) or longest (fit the longest evenly spaced stretch)", clip(o.Gaps))
	}
	if _, ok := record.Seconds(o.TimeUnit); o.TimeUnit != "" && !ok {
		return rem, fmt.Errorf("-time-unit %s: want s, min, h or d", clip(o.TimeUnit))
	}
	if o.Data == "" && (o.Time != "" || o.TimeUnit != "" || o.Gaps != "") {
		return rem, errors.New("-time, -time-unit and -gaps are about a CSV file: give one with -data")
	}
	if _, err := parsePlan(o.Plan); err != nil {
		return rem, err
	}
	if o.Skip < -1 {
		return rem, fmt.Errorf("-skip %d: want a number of samples, 0 or more, or -1 (automatic: 5 %% of the record, at most 500)", o.Skip)
	}
	if o.Horizon < HorizonAuto {
		return rem, fmt.Errorf("-horizon %d: want 0 (no forecast), a number of samples, or -1 (automatic)", o.Horizon)
	}
	return rem, nil
}

// loadRecord loads the record, checks the forecast horizon and plan and
// the samples to skip against its length, and says what was read. It
// returns the record, the forecast horizon and the samples left out of
// the fit (both resolved from their automatic settings).
func loadRecord(o Options, rem record.Remedy, stdout io.Writer, pr *progress) (ds *dataset, horizon, skip int, err error) {
	ds, err = load(o, rem)
	if err != nil {
		return nil, 0, 0, err
	}
	horizon = o.Horizon
	if horizon == HorizonAuto {
		horizon = min(180, ds.n/4)
	}
	if horizon > ds.n {
		return nil, 0, 0, fmt.Errorf("-horizon %d: want 0 (no forecast) to %d samples (the record's length; a forecast beyond it says nothing the data supports)", o.Horizon, ds.n)
	}
	if err := checkPlan(o.Plan, horizon, o.Horizon); err != nil {
		return nil, 0, 0, &UsageError{Err: err}
	}
	pr.say("data: %s, %d samples of %s from %v", ds.name, ds.n, ds.output, ds.inputs)
	fmt.Fprintf(stdout, "Data: %s: %d samples, output %s, inputs %v, interval %s\n", ds.name, ds.n, ds.output, ds.inputs, intervalText(ds))
	for _, n := range ds.notes {
		fmt.Fprintf(stdout, "  %s\n", n)
	}
	skip = o.Skip
	if skip < 0 {
		skip = min(ds.n/20, 500)
	}
	if skip >= ds.n {
		return nil, 0, 0, fmt.Errorf("-skip %d: want fewer samples than the record's %d (-1: automatic)", o.Skip, ds.n)
	}
	return ds, horizon, skip, nil
}

// checkModel runs the diagnostic checks of est and starts the Outcome
// with them and the validity record. It returns the reasons the model
// fails its checks (a check that cannot be run is one; the report goes
// on, for a model that cannot be trusted).
func checkModel(est *fit.Estimate, ds *dataset, pr *progress) (*Outcome, []string) {
	out := &Outcome{Estimate: est, Record: ds.notes}
	pr.say("checking the model")
	var failures []string
	d, err := fit.Check(est, ds.data, nil)
	if err != nil {
		failures = []string{fmt.Sprintf("the diagnostic checks could not be run: %v", err)}
	} else {
		out.Diagnostics, out.Trusted, failures = d, d.Pass, d.Failures
	}
	out.Validity = validity(est, ds, out.Trusted, failures)
	return out, failures
}

// writePictures writes the pictures into dir and lists them, and those
// not drawn with the reason, on stdout.
func writePictures(dir string, est *fit.Estimate, ds *dataset, out *Outcome, stdout io.Writer, pr *progress) error {
	pr.say("writing pictures to %s", dir)
	files, skipped, err := pictures(dir, est, ds, out)
	if err != nil {
		return fmt.Errorf("-pictures %s: %w", dir, err)
	}
	out.Pictures = files
	fmt.Fprintf(stdout, "\nPictures written to %s:\n", dir)
	for _, f := range files {
		fmt.Fprintf(stdout, "  %s\n", f)
	}
	for _, s := range skipped {
		fmt.Fprintf(stdout, "  (%s)\n", s)
	}
	return nil
}

// save writes the fitted model with its validity record to o.Save, or
// refuses with a *SaveError when it fails its checks and
// o.SaveUntrusted is not set (said once, by the error; the report lists
// the failures).
func save(o Options, est *fit.Estimate, ds *dataset, out *Outcome, failures []string, stdout io.Writer) error {
	trusted := out.Validity.Verdict == modelinfo.VerdictPassed
	if !trusted && !o.SaveUntrusted {
		return &SaveError{Path: o.Save, Failures: failures}
	}
	out.Validity.Forced = !trusted
	sd, sdNote := noiseSD(est, out.Outliers)
	out.Validity.Sigma = sd
	extra := []string{sdNote}
	if r := out.Outliers; r != nil && est == r.Refit {
		n := len(r.Found)
		extra = append(extra, fmt.Sprintf("refitted with the %d %s found in the first fit's residuals as %s, by %s as the first fit",
			n, plural(n, "outlier", "outliers"), plural(n, "an event", "events"), est.Method))
	} else if out.Caveat != "" {
		caveat := strings.Replace(out.Caveat, "; listed below)", ")", 1)
		extra = append(extra, "verdict: "+caveat)
		out.Validity.Cautions = append(out.Validity.Cautions, caveat)
	}
	if err := saveConfig(o.Save, est, ds, out.Validity, extra...); err != nil {
		return fmt.Errorf("-save: %w", err)
	}
	out.Saved = o.Save
	if trusted {
		fmt.Fprintf(stdout, "\nFitted model saved to %s (go run ./examples/config -file %s)\n", o.Save, o.Save)
	} else {
		fmt.Fprintf(stdout, "\nFitted model saved to %s MARKED AS UNTRUSTED (-save-untrusted): it fails its checks; do not use it for control work\n", o.Save)
	}
	return nil
}

// noiseSD returns the noise SD a monitor of the saved model should
// expect on clean data (Validity.Sigma) and a note saying which it is:
// the residual SD of est, or, when the outlier search of est's residuals
// found outliers, its robust residual scale (arma.OutlierReport.Sigma,
// which the outliers do not inflate, where they do inflate the residual
// SD: one bad reading of 45 SDs in 5760 samples adds 45^2/5760 = 35 % to
// the variance); under -outliers refit (est the refit, the outliers as
// events) the refit's residual SD.
func noiseSD(est *fit.Estimate, res *Outliers) (float64, string) {
	sd := math.Sqrt(est.Sigma2)
	switch {
	case res != nil && est == res.Refit:
		return sd, fmt.Sprintf("noise SD %.4g: the residual SD of the refit with the outliers as events", sd)
	case res != nil && len(res.Found) > 0 && res.Report != nil && res.Report.Sigma > 0:
		n := len(res.Found)
		return res.Report.Sigma, fmt.Sprintf("noise SD %.4g: the robust residual scale of the outlier search, not the residual SD %.4g, which the %d %s found %s",
			res.Report.Sigma, sd, n, plural(n, "outlier", "outliers"), plural(n, "inflates", "inflate"))
	}
	if res == nil {
		return sd, fmt.Sprintf("noise SD %.4g: the residual SD (no outlier search, -outliers off: an outlier in the record would inflate it)", sd)
	}
	return sd, fmt.Sprintf("noise SD %.4g: the residual SD (no outliers found)", sd)
}

// checkSavePath reports a -save file whose folder does not exist or is
// not a folder, before any work is done.
func checkSavePath(path string) error {
	dir := filepath.Dir(path)
	fi, err := os.Stat(dir)
	switch {
	case err != nil && errors.Is(err, fs.ErrNotExist):
		return fmt.Errorf("-save %s: the folder %s does not exist (create it first)", path, dir)
	case err != nil:
		return fmt.Errorf("-save %s: %w", path, err)
	case !fi.IsDir():
		return fmt.Errorf("-save %s: %s is not a folder", path, dir)
	}
	if fi, err := os.Stat(path); err == nil && fi.IsDir() {
		return fmt.Errorf("-save %s: that is a folder; name a file in it", path)
	}
	return nil
}

func writeBuiltin(path string, stdout io.Writer) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	if err := greenhouse.Default().WriteCSV(f); err != nil {
		f.Close()
		return err
	}
	if err := f.Close(); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "wrote %s: %d samples at 1 min of %s, %s, %s, %s\n", path, greenhouse.Default().Len(),
		greenhouse.Setpoint, greenhouse.Valve, greenhouse.Outdoor, greenhouse.Output)
	return nil
}

// load reads the record named by o, mending the gaps of its time column
// as rem says. With a spec, the output and inputs are the spec's series.
func load(o Options, rem record.Remedy) (*dataset, error) {
	ds := &dataset{output: o.Output, inputs: o.Inputs, interval: o.Interval, unit: o.Unit}
	if err := ds.names(o); err != nil {
		return nil, err
	}
	if o.Data == "" {
		if err := ds.loadBuiltin(o.cleanDemo); err != nil {
			return nil, err
		}
	} else if err := loadFile(o, rem, ds); err != nil {
		return nil, err
	}
	ds.n = len(ds.data[ds.output])
	if ds.unit == "" {
		ds.unit = "samples"
	}
	return ds, nil
}

// names sets the output and inputs to read, the spec's when o has one
// (with its interval, which must agree with -interval), and refuses no
// inputs, an input named twice or the output named as an input.
func (ds *dataset) names(o Options) error {
	if o.Spec != "" {
		m, err := parse.Model(o.Spec)
		if err != nil {
			return fmt.Errorf("the spec does not parse:\n%w", err)
		}
		ds.fromSpec = true
		ds.output, ds.inputs = m.Output, nil
		for _, in := range m.Inputs {
			if in.Event != nil {
				continue // an event builds its own indicator: no column to read
			}
			ds.inputs = append(ds.inputs, in.Series)
		}
		specIv := m.Interval
		if ds.interval > 0 && specIv.Value > 0 && !sameInterval(ds.interval, ds.unit, specIv.Value, specIv.Unit, 1e-9) {
			return fmt.Errorf("-interval %s and the spec's every %s disagree: give one interval, or the same in both",
				ivText(ds.interval, ds.unit), ivText(specIv.Value, specIv.Unit))
		}
		if ds.interval == 0 && specIv.Value > 0 {
			ds.interval, ds.unit = specIv.Value, specIv.Unit
		}
	}
	if len(ds.inputs) == 0 {
		return errors.New("no input columns named (-inputs)")
	}
	if o.Spec == "" {
		seen := map[string]bool{ds.output: true}
		for _, in := range ds.inputs {
			if seen[in] {
				if in == ds.output {
					return fmt.Errorf("-inputs names %q, the output (-output): a series cannot drive itself", in)
				}
				return fmt.Errorf("-inputs names %q twice", in)
			}
			seen[in] = true
		}
	}
	return nil
}

// loadBuiltin takes the named series from the built-in greenhouse
// record, whose interval (1 min) any interval given must agree with.
func (ds *dataset) loadBuiltin(clean bool) error {
	g := greenhouse.Default()
	ds.name = "built-in greenhouse record (4 days, PI control with a test signal)"
	ds.demoClock = true
	if !clean {
		// The demo plants one bad reading of the logged temperature, for
		// the outlier search to find.
		f := greenhouse.Spike
		var err error
		if g, err = g.WithFault(f); err != nil {
			return err
		}
		ds.fault = &f
		// And an hour of missing temperatures (a sensor dropout), which
		// the exact likelihood skips.
		g2 := greenhouse.SensorDropout
		if g, err = g.WithDropout(g2); err != nil {
			return err
		}
		ds.dropout = &g2
		ds.name = "built-in greenhouse record (4 days, PI control with a test signal, one bad temperature reading, an hour of missing temperatures)"
	}
	ds.data = map[string][]float64{}
	for _, n := range append([]string{ds.output}, ds.inputs...) {
		s, ok := g.Series(n)
		if !ok || n == greenhouse.Minute {
			names := []string{greenhouse.Output, greenhouse.Valve, greenhouse.Outdoor, greenhouse.Setpoint}
			if hint := didYouMean(n, names, nil); hint != "" {
				return fmt.Errorf("the built-in record has no series %q (it has %s): %s", n, strings.Join(names, ", "), hint)
			}
			return fmt.Errorf("the built-in record has no series %q (it has %s)", n, strings.Join(names, ", "))
		}
		ds.data[n] = s
	}
	if ds.interval == 0 {
		ds.interval, ds.unit = greenhouse.Interval, "min"
	} else if !sameInterval(ds.interval, ds.unit, greenhouse.Interval, "min", 1e-9) {
		return fmt.Errorf("the built-in record is sampled every 1 min, but the interval given is %s", ivText(ds.interval, ds.unit))
	}
	// The truth is known for the demo's own output and inputs.
	ds.builtin = ds.output == greenhouse.Output
	for _, in := range ds.inputs {
		ds.builtin = ds.builtin && (in == greenhouse.Valve || in == greenhouse.Outdoor)
	}
	return nil
}

// flagNames are the words record.Read's messages use for its settings:
// this program's flags.
// "Missing" maps to nothing: the program reads the output's missing
// cells by itself and offers no flag for the inputs'.
var flagNames = map[string]string{"Gaps": "-gaps", "Time": "-time", "TimeUnit": "-time-unit", "Sep": "-sep", "Interval": "-interval", "Missing": ""}

// inputMissing returns the program's message for a missing cell of an
// input column found by the reader (err), or nil for any other error:
// an input gap cannot be skipped as an output gap is, and the message
// says what can be done.
func inputMissing(err error, ds *dataset) error {
	var le *record.LineError
	if !errors.As(err, &le) || le.Column == ds.output || !slices.Contains(ds.inputs, le.Column) ||
		!strings.HasPrefix(le.Problem, "the cell is empty") && !strings.HasPrefix(le.Problem, "the cell says") {
		return nil
	}
	cell, _, _ := strings.Cut(le.Problem, ":")
	return fmt.Errorf("%s:%d: column %s (an input): %s, a missing input sample: the transfer filters need every past input value, "+
		"so an input gap cannot be skipped as a gap in the output (%s) is; fill it in the file, or delete the row and let "+
		"-gaps hold:N or -gaps linear:N fill it from the time column (the report then lists the fill)", le.File, le.Line, clip(le.Column), cell, ds.output)
}

// loadFile reads the CSV file of o into ds with record.Read: the named
// columns, checked against the time column and mended as rem says.
//
// Over 60 lines: the reading of a user's file in the order its report
// prints what was done (columns, time column, gaps, missing readings).
func loadFile(o Options, rem record.Remedy, ds *dataset) error {
	cols := append([]string{ds.output}, ds.inputs...)
	// The output's missing cells (a sensor dropout) are read as NaN, for
	// the exact likelihood to skip; an input's are refused (inputMissing).
	set := &record.Settings{Sep: o.Sep, Series: cols, Time: o.Time, TimeUnit: o.TimeUnit, Gaps: rem, Names: flagNames,
		Missing: []string{ds.output}}
	if ds.interval > 0 {
		set.Interval = tf.Interval{Value: ds.interval, Unit: ds.unit}
		if o.Interval == 0 {
			set.Names = maps.Clone(flagNames)
			set.Names["Interval"] = "the spec's every"
		}
	}
	flagOf := func(col string) string {
		switch {
		case ds.fromSpec:
			return "the spec"
		case col == ds.output:
			return "-output"
		}
		return "-inputs"
	}
	if o.Time == "" {
		if col := timeColumnNamed(o, cols); col != "" {
			return fmt.Errorf("%s names column %s, but that is the file's time column (read as the time of each row); "+
				"to read it as a series give -time none (the rows are then taken as evenly spaced), or name another column", flagOf(col), clip(col))
		}
	}
	rec, err := record.ReadFile(o.Data, set)
	var se *record.SeriesError
	if errors.As(err, &se) && se.Kind == record.ErrName {
		if hint := didYouMean(se.Series, headerFields(o), append([]string{o.Time, ds.output}, ds.inputs...)); hint != "" {
			return fmt.Errorf("%s names column %s, but %s: %s", flagOf(se.Series), clip(se.Series), se.Detail, hint)
		}
		return fmt.Errorf("%s names column %s, but %s", flagOf(se.Series), clip(se.Series), se.Detail)
	}
	if err := inputMissing(err, ds); err != nil {
		return err
	}
	if err != nil {
		// The reader's messages name this program's flags (flagNames);
		// the library function that found the fault is no help here.
		return withoutOp(err)
	}
	ds.name = o.Data
	if rec.Rows() < minSamples {
		return fmt.Errorf("%s has %d data %s: too short a record to fit a model to (at least %d samples; a model worth trusting needs hundreds)",
			rec.File, rec.Rows(), plural(rec.Rows(), "line", "lines"), minSamples)
	}
	ds.data = rec.Series
	ds.notes = append(ds.notes, rec.Notes...)
	if rec.TimeColumn == "" {
		return checkSeries(rec.File, cols, ds)
	}
	ds.interval, ds.unit = rec.Interval.Value, rec.Interval.Unit
	ds.times = recordClock(rec, rem)
	if n := rec.Len(); n < minSamples {
		return fmt.Errorf("%s: the record left after -gaps %s has %d samples: too short to fit a model to (at least %d)", rec.File, o.Gaps, n, minSamples)
	}
	return checkSeries(rec.File, cols, ds)
}

// didYouMean returns "did you mean X?" (or "X or Y?" when several are as
// near) for the columns near the misspelt name (suggest.Near), leaving
// out those named already (used: the time column and the series), or
// "" when none is near.
func didYouMean(name string, columns, used []string) string {
	var near []string
	for _, c := range columns {
		if c != "" && !slices.Contains(used, c) && suggest.Near(name, c) {
			near = append(near, c)
		}
	}
	if len(near) == 0 {
		return ""
	}
	return "did you mean " + strings.Join(near, " or ") + "?"
}

// timeColumnNamed returns the column of cols that the file's automatic
// time column would be (its first column, when record.Read takes it as
// times) had it not been named as a series, or "". record.Read reads a
// named first column as a series silently; the user most likely meant
// the series beside it. The file is read once more without that column
// (any gaps accepted: only the column's detection matters here).
func timeColumnNamed(o Options, cols []string) string {
	first := headerFields(o)
	if len(first) == 0 || !slices.Contains(cols, first[0]) {
		return ""
	}
	var rest []string
	for _, c := range cols {
		if c != first[0] && slices.Contains(first, c) {
			rest = append(rest, c)
		}
	}
	if len(rest) == 0 {
		return ""
	}
	rem, _ := record.ParseRemedy("longest")
	rec, err := record.ReadFile(o.Data, &record.Settings{Sep: o.Sep, Series: rest, TimeUnit: o.TimeUnit, Gaps: rem})
	if err == nil && rec.TimeColumn == first[0] {
		return first[0]
	}
	return ""
}

// headerFields returns the first line of the file o.Data split at the
// separator, or nil when it cannot be read.
func headerFields(o Options) []string {
	f, err := os.Open(o.Data)
	if err != nil {
		return nil
	}
	defer f.Close()
	buf := make([]byte, 64<<10)
	n, _ := io.ReadFull(f, buf)
	line, _, _ := strings.Cut(strings.TrimPrefix(string(buf[:n]), "\ufeff"), "\n")
	line = strings.TrimRight(line, "\r")
	sep := o.Sep
	if sep == 0 {
		sep = ','
	}
	fields := strings.Split(line, string(sep))
	for i, f := range fields {
		fields[i] = strings.Trim(strings.TrimSpace(f), `"`)
	}
	return fields
}

// sepName writes a separator as -sep takes it.
func sepName(r rune) string {
	if r == '\t' {
		return "tab"
	}
	return strconv.QuoteRune(r)
}

// checkSeries refuses a constant column, naming it.
func checkSeries(file string, cols []string, ds *dataset) error {
	for i, c := range cols {
		v := ds.data[c]
		lo, hi, ok := presentRange(v)
		if !ok {
			return fmt.Errorf("column %s of %s (the output) has no reading at all: every cell is missing", clip(c), file)
		}
		if lo == hi {
			role := "the output"
			fix := "there is nothing to explain; check that it is the right column"
			if i > 0 {
				role = "input"
				fix = "it shows no effect on the output to identify; leave it out of -inputs"
				if ds.fromSpec {
					fix = "it shows no effect on the output to identify; leave it out of the spec"
				}
			}
			return fmt.Errorf("column %s of %s (%s) is constant: every sample is %s; %s", clip(c), file, role, strconv.FormatFloat(lo, 'g', -1, 64), fix)
		}
	}
	return nil
}

// presentRange returns the least and the largest of the samples of v
// that are not missing (NaN), and false when every one is.
func presentRange(v []float64) (lo, hi float64, ok bool) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, x := range v {
		if !math.IsNaN(x) {
			lo, hi, ok = math.Min(lo, x), math.Max(hi, x), true
		}
	}
	if !ok {
		return math.NaN(), math.NaN(), false
	}
	return lo, hi, true
}

// sameInterval reports whether a in unit ua and b in unit ub are the
// same length of time, to a relative tolerance tol.
func sameInterval(a float64, ua string, b float64, ub string, tol float64) bool {
	sa, _ := record.Seconds(ua)
	sb, _ := record.Seconds(ub)
	x, y := a*sa, b*sb
	return math.Abs(x-y) <= tol*math.Max(x, y)
}

// validity is the record of the data est was fitted to.
func validity(est *fit.Estimate, ds *dataset, pass bool, failures []string) *modelinfo.Validity {
	v := &modelinfo.Validity{Samples: ds.n, Ranges: map[string][2]float64{}, Verdict: modelinfo.VerdictPassed}
	if iv := est.Model.Interval; iv.Value > 0 {
		v.Interval = ivText(iv.Value, iv.Unit)
	}
	for _, c := range append([]string{ds.output}, ds.inputs...) {
		lo, hi, _ := presentRange(ds.data[c])
		v.Ranges[c] = [2]float64{lo, hi}
	}
	if !pass {
		v.Verdict = modelinfo.VerdictFailed
		v.Failures = slices.Clone(failures)
	}
	return v
}

func intervalText(ds *dataset) string {
	if ds.interval == 0 {
		return "not given (times in samples)"
	}
	return fmt.Sprintf("%g %s", ds.interval, ds.unit)
}

// timeUnit is the unit times are printed in.
func (ds *dataset) timeUnit() string {
	if ds.interval == 0 {
		return "samples"
	}
	return ds.unit
}

// step returns the sample interval in time units (1 when none).
func (ds *dataset) step() float64 {
	if ds.interval == 0 {
		return 1
	}
	return ds.interval
}

// fitSpec parses spec and fits it by method.
func fitSpec(ctx context.Context, spec string, ds *dataset, skip int, method fit.Method, pr *progress) (*fit.Estimate, error) {
	m, err := parse.Model(spec)
	if err != nil {
		return nil, fmt.Errorf("the spec does not parse:\n%w", err)
	}
	if m.Interval.Value == 0 && ds.interval > 0 {
		m.Interval = tf.Interval{Value: ds.interval, Unit: ds.unit}
	}
	if err := checkTimedEvents(m, ds); err != nil {
		return nil, err
	}
	pr.say("fitting %s", m)
	est, err := fit.Model(ctx, m, ds.data, ds.fitSettings(skip, method))
	if err != nil {
		return nil, err
	}
	pr.say("fitted in %d iterations (%s)", est.Iter, est.Reason)
	return est, nil
}

// recovery compares the fitted paths with the greenhouse truth.
func recovery(paths []modelinfo.Path) []Recovery {
	var out []Recovery
	for _, p := range paths {
		var tp greenhouse.Path
		switch p.Input {
		case greenhouse.Valve:
			tp = greenhouse.True.Valve
		case greenhouse.Outdoor:
			tp = greenhouse.True.Outdoor
		default:
			continue
		}
		r := Recovery{Input: p.Input, TrueDelay: tp.Delay, Delay: p.DeadTime, TrueGain: tp.Gain(), Gain: p.Gain,
			TrueTau: tp.TimeConstant(), Tau: math.NaN()}
		for _, md := range p.Modes {
			if md.Kind == tf.ModeReal {
				r.Tau = math.Max(nanToZero(r.Tau), md.TimeConstant.Time)
			}
		}
		r.GainErr = (r.Gain - r.TrueGain) / r.TrueGain
		r.DelayExact = r.Delay == r.TrueDelay
		r.GainIn10 = math.Abs(r.GainErr) <= 0.10
		out = append(out, r)
	}
	return out
}

func nanToZero(x float64) float64 {
	if math.IsNaN(x) {
		return 0
	}
	return x
}

func writeRecovery(w io.Writer, rs []Recovery) {
	ok := func(b bool) string {
		if b {
			return "ok"
		}
		return "MISSED"
	}
	fmt.Fprintf(w, "\nHow close the identified model is to the true one (the demo data's generator):\n")
	fmt.Fprintf(w, "  %-8s  %-19s  %-33s  %s\n", "", "dead time (min)", "gain (degC per % or per degC)", "time constant (min)")
	fmt.Fprintf(w, "  %-8s  %4s %5s %-8s  %6s %6s %8s %-9s  %5s %6s\n", "input", "true", "found", "", "true", "found", "error", "", "true", "found")
	for _, r := range rs {
		fmt.Fprintf(w, "  %-8s  %4d %5d %-8s  %6.3f %6.3f %+7.1f%% %-9s  %5.1f %6.1f\n", r.Input, r.TrueDelay, r.Delay, ok(r.DelayExact),
			r.TrueGain, r.Gain, 100*r.GainErr, ok(r.GainIn10)+" (10%)", r.TrueTau, r.Tau)
	}
}

// Simulation is the noise-free run of a fitted model from the recorded
// inputs, started at the steady state of their first samples.
type Simulation struct {
	Y []float64
	// RMS is the root-mean-square difference from the output and
	// Explained the share of the output's variance it accounts for,
	// 1 - var(y - sim)/var(y), both from the first summed residual on,
	// over the output samples present (a gap is left out).
	RMS, Explained float64
	// From is the first sample compared.
	From int
}

// simulate runs the fitted model without noise from the inputs and
// prints how well it follows the output: the test that matters for
// control, since a controller sees the deterministic part.
func simulate(est *fit.Estimate, ds *dataset, skip int, w io.Writer) (*Simulation, error) {
	m := est.Model.Clone()
	m.Noise = nil
	y, err := m.Simulate(ds.data, &tf.SimSettings{Start: ds.start()})
	if err != nil {
		// An unstable or otherwise failed model: the report goes on
		// without the simulation.
		fmt.Fprintf(w, "\nSimulation from the inputs alone: not available (%v)\n", err)
		return nil, nil
	}
	obs := ds.data[ds.output]
	from := max(skip, est.Conditioning.First)
	var sd, sy, my float64
	k := 0
	for t := from; t < len(obs); t++ {
		if !math.IsNaN(obs[t]) { // a missing output is left out
			my += obs[t]
			k++
		}
	}
	my /= float64(k)
	for t := from; t < len(obs); t++ {
		if math.IsNaN(obs[t]) {
			continue
		}
		d := obs[t] - y[t]
		sd += d * d
		sy += (obs[t] - my) * (obs[t] - my)
	}
	s := &Simulation{Y: y, RMS: math.Sqrt(sd / float64(k)), Explained: 1 - sd/sy, From: from}
	if math.IsNaN(s.RMS) || math.IsInf(s.RMS, 0) {
		fmt.Fprintf(w, "\nSimulation from the inputs alone (noise-free, from sample %d): it does not stay finite (the model is not stable)\n", from)
		return nil, nil
	}
	fmt.Fprintf(w, "\nSimulation from the inputs alone (noise-free, from sample %d): RMS error %.3g, %s\n", from, s.RMS, explained(s.Explained))
	return s, nil
}

// explained says what share of the output's variance a simulation
// accounts for. A share at or below zero (the simulation strays further
// from the output than the output's own mean does) is said in words, not
// printed as a negative percentage; so is one that cannot be computed.
func explained(e float64) string {
	switch {
	case math.IsNaN(e) || math.IsInf(e, 0):
		return "share of the output variance explained not available"
	case e <= 0:
		return "none of the output variance explained (the simulation strays further from the output than the output's own mean)"
	}
	return fmt.Sprintf("%.1f %% of the output variance explained", 100*e)
}

// caution follows the report: what the identified model is good for.
const caution = `Caution: the identified model is an approximation, valid near the operating
conditions of this record. Commission any controller tuned on it under the
site's safety procedures, with independent safety interlocks; defer to local
codes and licensed practice.
`

// withoutOp clears the library function's name from the reader's errors,
// whose messages already speak of this program's flags and file.
func withoutOp(err error) error {
	var a *record.SettingError
	if errors.As(err, &a) {
		a.Op = ""
	}
	var b *record.SeriesError
	if errors.As(err, &b) {
		b.Op = ""
	}
	var c *record.SampleError
	if errors.As(err, &c) {
		c.Op = ""
	}
	return err
}

// UsageError is a setting of the command line that Run refuses (a bad
// value, a flag that would be ignored): the program exits with 2 for it,
// as for a flag it cannot read.
type UsageError struct{ Err error }

// Error returns the refusal, which names the flag.
func (e *UsageError) Error() string { return e.Err.Error() }

// Unwrap returns the refusal.
func (e *UsageError) Unwrap() error { return e.Err }
