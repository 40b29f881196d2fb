package main

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/fit"
)

// checkPlantedDropout checks that res and its report name the demo's
// planted sensor dropout (greenhouse.SensorDropout): one gap with its
// first and last sample, times and length, handled by the exact
// likelihood, with smoothed values whose standard errors are positive
// and finite.
func checkPlantedDropout(t *testing.T, res *Outcome, out string) {
	t.Helper()
	g := greenhouse.SensorDropout
	if res.Gaps == nil || len(res.Gaps.Output) != 1 {
		t.Fatalf("gaps %+v, want the one planted", res.Gaps)
	}
	og := res.Gaps.Output[0]
	if og.First != g.Start || og.Last != g.Start+g.Len-1 || og.Len != g.Len || og.From != "day 3 14:00" || og.To != "day 3 14:59" || og.Duration != "60 min" {
		t.Errorf("gap %+v, want samples %d to %d (day 3 14:00 to 14:59, 60 min)", og, g.Start, g.Start+g.Len-1)
	}
	if !(og.SELo > 0 && og.SEHi >= og.SELo && og.SEHi < 1) {
		t.Errorf("smoothed standard errors %v to %v", og.SELo, og.SEHi)
	}
	if res.Estimate.Method != fit.ExactML || !res.Gaps.Switched || res.Gaps.StretchFrom != 0 || res.Gaps.StretchTo != g.Start {
		t.Errorf("method %v, switched %v, stretch %d..%d", res.Estimate.Method, res.Gaps.Switched, res.Gaps.StretchFrom, res.Gaps.StretchTo)
	}
	t.Logf("gap %s to %s: smoothed %.3f to %.3f degC, SE %.3f to %.3f", og.From, og.To, og.ValueLo, og.ValueHi, og.SELo, og.SEHi)
	// The whole record decides among the stretch's best noise orders:
	// the chosen refit is one that passes its checks.
	chosen := false
	for _, w := range res.Gaps.Whole {
		t.Logf("whole-record refit: stretch BIC %.1f, whole BIC %.1f, pass %v: %s", w.StretchBIC, w.BIC, w.Pass, w.Structure)
		chosen = chosen || w.est == res.Estimate && w.Pass
	}
	if len(res.Gaps.Whole) < 2 || !chosen {
		t.Errorf("whole-record refits %+v: want at least two, the chosen one passing its checks", res.Gaps.Whole)
	}
	for _, want := range []string{
		"Gaps in the output temp: 60 missing samples in 1 gap",
		"day 3 14:00            to day 3 14:59             samples 3720 to 3779: 60 samples, 60 min",
		"runs on the longest gap-free stretch,\n    samples 0 to 3719",
		"fitted to the whole record by exact maximum likelihood",
		"method: exact likelihood, not least squares",
		"Missing outputs, smoothed by the fitted model",
		"planted in the demo record: a sensor dropout of 60 samples from sample 3720 (day 3 14:00): found: the gap of 60 samples, day 3 14:00 to day 3 14:59",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q", want)
		}
	}
}

// TestDropoutFigures fits the true structure by exact likelihood to the
// demo record with its bad reading, with and without the hour of
// missing temperatures, and compares with the truth and with the
// readings the dropout hid. The hour is 1 % of the record, so the
// estimates may move by a small fraction of a standard error only
// (tolerance: 0.5 SE; the information lost is about 1 %, common
// practice); the smoothed values' errors against the hidden readings
// are those of the fixed-interval smoother (Durbin & Koopman 2012, sec.
// 4.4: mean zero, variance SE^2), so about 95 % lie within 2 SE (at
// least 80 % asked of 60 correlated samples) and none beyond 4 SE. The
// truth is logged beside them, not tested: the bad reading, left in
// both fits, pulls the MA coefficient t1 from 0.3 to about 0.1 in both
// (the outlier search finds it; -outliers refit models it).
func TestDropoutFigures(t *testing.T) {
	m, err := parse.Model(greenhouse.Structure)
	if err != nil {
		t.Fatal(err)
	}
	spiked, err := greenhouse.Default().WithFault(greenhouse.Spike)
	if err != nil {
		t.Fatal(err)
	}
	holed, err := spiked.WithDropout(greenhouse.SensorDropout)
	if err != nil {
		t.Fatal(err)
	}
	set := &fit.Settings{IgnoreExtra: true, First: 288, Method: fit.ExactML}
	whole, err := fit.Model(context.Background(), m, spiked.ByName(), set)
	if err != nil {
		t.Fatal(err)
	}
	gap, err := fit.Model(context.Background(), m, holed.ByName(), set)
	if err != nil {
		t.Fatal(err)
	}
	truth := map[string]float64{"c": greenhouse.True.Const, "w0": greenhouse.True.Valve.Omega, "d1": greenhouse.True.Valve.Delta,
		"v0": greenhouse.True.Outdoor.Omega, "e1": greenhouse.True.Outdoor.Delta, "t1": greenhouse.True.Theta, "p1": greenhouse.True.Phi}
	for i, p := range gap.Params {
		q := whole.Params[i]
		t.Logf("%-3s true %9.5f  without the gap %9.5f +- %.2g  with it %9.5f +- %.2g  (moved %.2f SE)",
			p.Name, truth[p.Name], q.Value, q.SE, p.Value, p.SE, (p.Value-q.Value)/q.SE)
		if !(math.Abs(p.Value-q.Value) <= 0.5*q.SE) {
			t.Errorf("%s: %v with the gap, %v without (SE %v): moved more than 0.5 SE", p.Name, p.Value, q.Value, q.SE)
		}
	}
	if len(gap.Missing) != greenhouse.SensorDropout.Len {
		t.Fatalf("%d smoothed values, want %d", len(gap.Missing), greenhouse.SensorDropout.Len)
	}
	in2, lo, hi := 0, math.Inf(1), 0.0
	for _, mv := range gap.Missing {
		z := math.Abs(mv.Value-spiked.Temp[mv.Index]) / mv.SE
		lo, hi = math.Min(lo, mv.SE), math.Max(hi, mv.SE)
		if z <= 2 {
			in2++
		}
		if z > 4 {
			t.Errorf("sample %d: smoothed %.4f, hidden reading %.4f, %.1f SE apart", mv.Index, mv.Value, spiked.Temp[mv.Index], z)
		}
	}
	t.Logf("smoothed values over the gap: SE %.3f to %.3f degC; %d of %d within 2 SE of the hidden readings", lo, hi, in2, len(gap.Missing))
	if in2 < 48 {
		t.Errorf("only %d of %d smoothed values within 2 SE of the hidden readings", in2, len(gap.Missing))
	}
}

// messyCSV writes a logger's file: RFC 3339 time stamps every minute,
// the greenhouse record with the temperature missing for 40 minutes
// from row 3000 (blank cells, one NA and one NaN), a bad reading of +1.5
// degC at row 1200 and the temperature stuck at one value for 30
// minutes from row 4500; inputBlank also blanks one valve cell.
func messyCSV(t *testing.T, inputBlank bool) string {
	t.Helper()
	d := greenhouse.Default()
	t0 := time.Date(2026, 3, 2, 0, 0, 0, 0, time.UTC)
	var b strings.Builder
	b.WriteString("time,valve,outdoor,temp\n")
	for i := range d.Temp {
		temp := fmt.Sprintf("%.4f", d.Temp[i])
		switch {
		case i == 1200:
			temp = fmt.Sprintf("%.4f", d.Temp[i]+1.5)
		case i == 3010:
			temp = "NA"
		case i == 3020:
			temp = "NaN"
		case i >= 3000 && i < 3040:
			temp = ""
		case i >= 4500 && i < 4530:
			temp = fmt.Sprintf("%.4f", d.Temp[4500])
		}
		valve := fmt.Sprintf("%.4f", d.Valve[i])
		if inputBlank && i == 2500 {
			valve = ""
		}
		fmt.Fprintf(&b, "%s,%s,%.4f,%s\n", t0.Add(time.Duration(i)*time.Minute).Format(time.RFC3339), valve, d.Outdoor[i], temp)
	}
	path := filepath.Join(t.TempDir(), "logger.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestMessyLoggerFile runs the command line on a logger's file with an
// output dropout, a bad reading and a stuck stretch: the dropout is read
// as missing and reported with its time stamps, the model fitted by exact
// likelihood, the bad reading found and the stuck stretch named (the
// verdict is then NOT ADEQUATE: a stuck sensor must be repaired or cut
// first); the same file with one blank
// valve cell is refused, naming the line, the column and the remedies.
func TestMessyLoggerFile(t *testing.T) {
	path := messyCSV(t, false)
	var stdout, stderr strings.Builder
	status := cli([]string{"-quiet", "-data", path, "-output", "temp", "-inputs", "valve,outdoor", "-horizon", "0"}, &stdout, &stderr)
	out := stdout.String()
	// The stuck stretch makes the model NOT ADEQUATE (fit.Screen names
	// it): exit status 3, with the whole report printed.
	if status != exitNotAdequate {
		t.Fatalf("exit %d, want %d: %s\n%s", status, exitNotAdequate, stderr.String(), out)
	}
	for _, want := range []string{
		`column "temp": 40 missing cells read as NaN (1 run): lines 3002 to 3041`,
		"Gaps in the output temp: 40 missing samples in 1 gap",
		// The file writes its times in UTC ("Z"), and so does the report.
		"2026-03-04 02:00:00Z   to 2026-03-04 02:39:00Z    samples 3000 to 3039: 40 samples, 40 min",
		"samples 0 to 2999 (2026-03-02 00:00:00Z to 2026-03-04 01:59:00Z, 3000 samples",
		"2026-03-02 20:00:00Z           1200  additive ",
		`holds the value 15.769 for 30 samples, 4500..4529`,
		"Model of temp with coefficients estimated by exact maximum likelihood",
		"Missing outputs, smoothed by the fitted model",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q", want)
		}
	}
	if t.Failed() {
		t.Logf("report:\n%s", out)
	}
	stdout.Reset()
	stderr.Reset()
	path = messyCSV(t, true)
	status = cli([]string{"-quiet", "-data", path, "-output", "temp", "-inputs", "valve,outdoor"}, &stdout, &stderr)
	msg := stderr.String()
	if status != exitFailed {
		t.Fatalf("input blank: exit %d, want %d: %s", status, exitFailed, msg)
	}
	for _, want := range []string{path + `:2502: column "valve" (an input): the cell is empty, a missing input sample`, "cannot be skipped as a gap in the output (temp) is", "-gaps hold:N"} {
		if !strings.Contains(msg, want) {
			t.Errorf("input blank: message lacks %q:\n%s", want, msg)
		}
	}
}

// TestOutlierNextToGap plants a bad reading two samples before the
// demo's dropout and checks that the search of the exact-likelihood
// residuals finds it and notes that it lies near a gap (arma.Outliers
// marks one within 5 samples of a missing residual: its size rests on
// fewer residuals than its kind needs).
func TestOutlierNextToGap(t *testing.T) {
	g := greenhouse.SensorDropout
	d, err := greenhouse.Default().WithDropout(g)
	if err != nil {
		t.Fatal(err)
	}
	if d, err = d.WithFault(greenhouse.Fault{Sample: g.Start - 2, Size: 1}); err != nil {
		t.Fatal(err)
	}
	m, err := parse.Model(greenhouse.Structure)
	if err != nil {
		t.Fatal(err)
	}
	est, err := fit.Model(context.Background(), m, d.ByName(), &fit.Settings{IgnoreExtra: true, First: 288, Method: fit.ExactML})
	if err != nil {
		t.Fatal(err)
	}
	res, err := findOutliers(est, &dataset{demoClock: true})
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range res.Found {
		if f.Index == g.Start-2 {
			t.Logf("found %s of %.3f +- %.3f at %s, notes %q", f.Kind, f.Size, f.SE, f.When, f.Notes)
			if !f.NearGap || !strings.Contains(strings.Join(f.Notes, "; "), "near a gap") {
				t.Errorf("the outlier 2 samples before the gap is not noted as near it: %+v", f)
			}
			return
		}
	}
	t.Errorf("the bad reading 2 samples before the gap was not found: %+v", res.Found)
}

// TestExactAskedWithGaps checks that with -method exact a record with
// gaps is handled the same way without the note of a switched method.
func TestExactAskedWithGaps(t *testing.T) {
	o := DefaultOptions()
	o.Method, o.Horizon, o.Outliers = methodExact, 0, outliersOff
	res, out, err := run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	if res.Gaps.Switched || strings.Contains(out, "not least squares") || res.Estimate.Method != fit.ExactML || len(res.Gaps.Whole) == 0 {
		t.Errorf("switched %v, method %v, %d whole-record refits:\n%s", res.Gaps.Switched, res.Estimate.Method, len(res.Gaps.Whole), out)
	}
}
