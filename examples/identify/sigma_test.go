package main

import (
	"math"
	"path/filepath"
	"strings"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/internal/testutil"
)

// TestSaveSigma: -save writes the noise SD a monitor
// should expect on clean data as the validity's "sigma", and the notes
// say which it is. On the demo record (one planted bad reading, found by
// the outlier search) it is the search's robust residual scale, near the
// demo's true innovation SD 0.03 (greenhouse.True.Sigma; within 0.029..
// 0.032, about 3 standard errors sqrt(1/(2 n)) = 0.9 % of a scale
// estimate from 5700 residuals, common practice) where the residual SD
// is inflated above 0.035; under -outliers refit the refit's residual
// SD; on the clean record, or without the search, the residual SD
// itself.
func TestSaveSigma(t *testing.T) {
	dir := t.TempDir()
	o := DefaultOptions()
	o.Spec, o.Horizon = greenhouse.Structure, 0
	o.Save = filepath.Join(dir, "first.json")
	res, _, err := run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	v := savedValidity(t, o.Save)
	sd := math.Sqrt(res.Estimate.Sigma2)
	if len(res.Outliers.Found) == 0 || v.Sigma != res.Outliers.Report.Sigma || v.Sigma < 0.029 || v.Sigma > 0.032 || sd < 0.035 {
		t.Errorf("outliers %d: saved sigma %v, robust scale %v, residual SD %v", len(res.Outliers.Found), v.Sigma, res.Outliers.Report.Sigma, sd)
	}
	testutil.CheckWords(t, "saved notes", savedNotes(t, o.Save),
		[]string{"the robust residual scale of the outlier search, not the residual SD", "which the 1 outlier found inflates"}, nil)

	o.Outliers, o.Save = outliersRefit, filepath.Join(dir, "refit.json")
	res, _, err = run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	v = savedValidity(t, o.Save)
	if re := res.Outliers.Refit; re == nil || v.Sigma != math.Sqrt(re.Sigma2) {
		t.Errorf("refit: saved sigma %v, want the refit's residual SD", v.Sigma)
	}
	testutil.CheckWords(t, "saved notes", savedNotes(t, o.Save), []string{"the residual SD of the refit with the outliers as events"}, nil)

	o.Outliers, o.cleanDemo, o.Save = outliersReport, true, filepath.Join(dir, "clean.json")
	res, _, err = run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	v = savedValidity(t, o.Save)
	if len(res.Outliers.Found) != 0 || v.Sigma != math.Sqrt(res.Estimate.Sigma2) {
		t.Errorf("clean record: %d outliers, saved sigma %v, residual SD %v", len(res.Outliers.Found), v.Sigma, math.Sqrt(res.Estimate.Sigma2))
	}
	if n := savedNotes(t, o.Save); !strings.Contains(n, ": the residual SD (no outliers found)") {
		t.Errorf("clean record notes %q", n)
	}

	// Without the search the residual SD is all there is, and the notes
	// say that an outlier would inflate it.
	o.Outliers, o.cleanDemo, o.Save = outliersOff, false, filepath.Join(dir, "off.json")
	res, _, err = run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	if v = savedValidity(t, o.Save); v.Sigma != math.Sqrt(res.Estimate.Sigma2) {
		t.Errorf("-outliers off: saved sigma %v, residual SD %v", v.Sigma, math.Sqrt(res.Estimate.Sigma2))
	}
	if n := savedNotes(t, o.Save); !strings.Contains(n, "no outlier search, -outliers off") {
		t.Errorf("-outliers off notes %q", n)
	}
}
