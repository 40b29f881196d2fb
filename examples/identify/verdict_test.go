package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf/fit"
)

// savedNotes returns the notes of the one model saved in path.
func savedNotes(t *testing.T, path string) string {
	t.Helper()
	var cfg struct {
		Models []struct {
			Notes string `json:"notes"`
		} `json:"models"`
	}
	raw, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(raw, &cfg); err != nil {
		t.Fatal(err)
	}
	if len(cfg.Models) != 1 {
		t.Fatalf("%s holds %d models", path, len(cfg.Models))
	}
	return cfg.Models[0].Notes
}

// TestOutlierQualifiesVerdict: the true structure fitted to
// the demo record passes its checks with the planted bad reading in
// the record (t about 45 in its residuals), so the verdict does not call
// it adequate without qualification: it says that one outlier was found
// and may bias the estimates, with the advice; the saved model's notes
// say the same (its verdict stays "passed": the checks passed). On the
// clean record the verdict is unqualified.
func TestOutlierQualifiesVerdict(t *testing.T) {
	o := DefaultOptions()
	o.Spec, o.Horizon = greenhouse.Structure, 0
	o.Save = filepath.Join(t.TempDir(), "first.json")
	res, out, err := run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	if !res.Trusted || len(res.Outliers.Found) == 0 {
		t.Fatalf("want a model that passes its checks with an outlier found: trusted %v, %+v", res.Trusted, res.Outliers.Found)
	}
	testutil.CheckWords(t, "verdict", out,
		[]string{"verdict: the model passes its checks, but 1 outlier was found in its residuals (day 2 09:20, t ", "the estimates may be biased by it", "-outliers refit"},
		[]string{"adequate by every check"})
	if v := savedValidity(t, o.Save); v.Verdict != "passed" || len(v.Cautions) != 1 || !strings.Contains(v.Cautions[0], "1 outlier was found") {
		t.Errorf("saved verdict %q with cautions %q, want passed with the outlier's caution", v.Verdict, v.Cautions)
	}
	testutil.CheckWords(t, "saved notes", savedNotes(t, o.Save),
		[]string{"1 outlier was found", "biased", "by exact maximum likelihood"}, []string{"listed below"}) // the demo's dropout asks for it

	o.cleanDemo, o.Save = true, ""
	res, out, err = run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	if res.Caveat != "" || !strings.Contains(out, "verdict: the model is adequate by every check") {
		t.Errorf("clean record: caveat %q\n%s", res.Caveat, out)
	}
}

// TestRefitSameMethod: with -method exact -outliers refit
// the refit is by exact likelihood as the first fit (so that the
// comparison of sigma^2, AIC and BIC shows the outliers' effect, not a
// change of method), the report says which method, and -save writes the
// refit with its method in the notes.
func TestRefitSameMethod(t *testing.T) {
	o := DefaultOptions()
	o.Spec, o.Horizon, o.Method, o.Outliers = greenhouse.Structure, 0, methodExact, outliersRefit
	o.Save = filepath.Join(t.TempDir(), "refit.json")
	res, out, err := run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	re := res.Outliers.Refit
	if re == nil {
		t.Fatalf("no refit:\n%s", out)
	}
	if res.Estimate.Method != fit.ExactML || re.Method != fit.ExactML {
		t.Errorf("first fit by %v, refit by %v: want both exact", res.Estimate.Method, re.Method)
	}
	testutil.CheckWords(t, "refit", out, []string{"(-outliers refit), by exact maximum likelihood as the first fit",
		"the refit below takes it as an event", "verdict of the refit: it passes its checks"}, nil)
	testutil.CheckWords(t, "saved notes", savedNotes(t, o.Save),
		[]string{"by exact maximum likelihood", "refitted with the 1 outlier found in the first fit's residuals as an event"}, nil)
}

// TestRefitFailsAdvice: on the demo (the usage text's own example,
// -outliers refit), the structure identified with the bad reading in
// the record (AR(2) noise) fails its checks once the reading is an
// event; the report says so in the refit's verdict and advises
// re-identifying on the cleaned record. The advice is followed: the
// record written by -write-data with the temp cell of minute 2000
// blanked identifies a model that passes its checks with no outlier.
func TestRefitFailsAdvice(t *testing.T) {
	o := DefaultOptions()
	o.Horizon, o.Outliers = 0, outliersRefit
	res, out, err := run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	if res.Outliers.Refit == nil || res.Outliers.RefitChecks == nil || res.Outliers.RefitChecks.Pass {
		t.Skipf("the refit passes its checks on this record: nothing to advise\n%s", out)
	}
	testutil.CheckWords(t, "refit fails", out, []string{"verdict of the refit: NOT ADEQUATE, it FAILS its checks",
		"re-identify on the cleaned record", "-write-data", "blank the temp cells of minute 2000"}, nil)

	dir := t.TempDir()
	o = DefaultOptions()
	o.WriteData = filepath.Join(dir, "demo.csv")
	if _, _, err := run(t, o); err != nil {
		t.Fatal(err)
	}
	raw, err := os.ReadFile(o.WriteData)
	if err != nil {
		t.Fatal(err)
	}
	ls := strings.Split(string(raw), "\n")
	row := ls[1+greenhouse.Spike.Sample] // the header, then minute 0, 1, ...
	if !strings.HasPrefix(row, "2000,") {
		t.Fatalf("row of minute 2000 is %q", row)
	}
	ls[1+greenhouse.Spike.Sample] = row[:strings.LastIndex(row, ",")+1] // temp is the last column
	clean := testutil.WriteFile(t, "clean.csv", strings.Join(ls, "\n"))
	o = DefaultOptions()
	o.Data, o.Horizon = clean, 0
	res, out, err = run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	if !res.Trusted || len(res.Outliers.Found) != 0 || res.Caveat != "" {
		t.Errorf("the cleaned record: trusted %v, outliers %+v\n%s", res.Trusted, res.Outliers.Found, out)
	}
}

// TestOutlierSearchRange: the report says which samples
// the outlier search covered and that the first ones (-skip, here 300)
// are not searched.
func TestOutlierSearchRange(t *testing.T) {
	o := DefaultOptions()
	o.Spec, o.Horizon, o.cleanDemo, o.Skip = greenhouse.Structure, 0, true, 300
	res, out, err := run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	if res.Outliers.From != 300 || res.Outliers.To != 5759 {
		t.Errorf("searched %d to %d, want 300 to 5759 (-skip 300, 5760 samples)", res.Outliers.From, res.Outliers.To)
	}
	testutil.CheckWords(t, "search range", out, []string{"searched: samples 300 to 5759 (day 1 05:00 to day 4 23:59); the first 300 samples (-skip and the model's start-up) have no residual and are not searched"}, nil)
}

// TestColumnDidYouMean: a misspelt column gets a
// did-you-mean (examples/internal/suggest: at most two edits) beside the
// list of columns, in a file and in the built-in record; a name near
// nothing gets none.
func TestColumnDidYouMean(t *testing.T) {
	path := testutil.WriteFile(t, "gh.csv", ghCSV(t))
	for _, c := range []struct {
		data, output string
		inputs       []string
		want         string
	}{
		{path, "temp", []string{"valv", "outdoor"}, `-inputs names column "valv", but ` + path + ` has no such column; its columns: minute, setpoint, valve, outdoor, temp: did you mean valve?`},
		{path, "tmp", []string{"valve"}, "did you mean temp?"},
		{"", "temp", []string{"outdor"}, `the built-in record has no series "outdor" (it has temp, valve, outdoor, setpoint): did you mean outdoor?`},
		{path, "humidity", []string{"valve"}, "its columns: minute, setpoint, valve, outdoor, temp"},
	} {
		o := DefaultOptions()
		o.Data, o.Output, o.Inputs = c.data, c.output, c.inputs
		_, _, err := run(t, o)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s %v: got %v, want %q", c.output, c.inputs, err, c.want)
		}
		if c.output == "humidity" && err != nil && strings.Contains(err.Error(), "did you mean") {
			t.Errorf("humidity: %v", err)
		}
	}
}
