package main

import (
	"bytes"
	"net/http/httptest"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/tf/monitor"
)

// identifiedFile is the model examples/identify -save writes for its
// built-in record (the demo with its planted bad reading), made by
//
//	go run ./examples/identify -quiet -save examples/monitor/testdata/identified.json
//
// Its notes give the fit's residual SD 0.0356, inflated by the outlier;
// its validity's "sigma" is the outlier search's robust residual scale,
// 0.03034 (the demo's true innovation SD is 0.03, greenhouse.True.Sigma).
const identifiedFile = "testdata/identified.json"

// cleanAlarms runs the loop of identifiedFile, its sigma as the loader
// takes it from raw, over a clean 4-day stream of the same plant
// (greenhouse.Generate seed 11, the reproduction) with the
// default run length, and returns the variance alarms raised, downwards
// and upwards, and the loop's noise SD.
func cleanAlarms(t *testing.T, raw []byte) (down, up int, sigma float64) {
	t.Helper()
	specs, err := decodeConfig(raw, nil)
	if err != nil {
		t.Fatal(err)
	}
	var log bytes.Buffer
	svc, err := newService("test", specs, monitor.DefaultTargetARL, &log)
	if err != nil {
		t.Fatal(err)
	}
	ts := httptest.NewServer(svc.handler())
	defer func() { ts.Close(); svc.close() }()
	rec := greenhouse.Generate(greenhouse.Settings{Seed: 11})
	path := "/loops/" + url.PathEscape(specs[0].Name)
	old := loopPath
	loopPath = path
	defer func() { loopPath = old }()
	for _, a := range feedAll(t, ts, sampleLines(rec, 0, rec.Len(), nil, nil), 720) {
		if a.Kind == "variance" && a.Direction < 0 {
			down++
		} else if a.Kind == "variance" {
			up++
		}
	}
	return down, up, specs[0].Sigma
}

// TestSavedSigmaNoFalseAlarms: a model saved by
// identify from a record with an outlier, monitored on a clean stream of
// the same plant, must not see that stream as a fall in variance. Each
// test of tf/monitor has an in-control run length of
// monitor.DefaultTargetARL = 10080 samples, so over the 5760 samples the
// variance test's false alarms (down and up) number about 5760/10080 =
// 0.571 on average; at most 3 are allowed (a Poisson count of mean 0.57
// exceeds 3 with probability 0.28 %, scipy.stats.poisson(5760/10080).sf(3) =
// 0.00283; the stream is fixed, so the check is deterministic). With the
// notes' residual SD (the old reading, a file without "sigma") the same
// stream raised 10 "variance down" alarms (the count before
// the fix, reproduced here as the check that the test can fail).
func TestSavedSigmaNoFalseAlarms(t *testing.T) {
	raw, err := os.ReadFile(identifiedFile)
	if err != nil {
		t.Fatal(err)
	}
	down, up, sigma := cleanAlarms(t, raw)
	t.Logf("noise SD %.5g from the validity record: %d variance-down, %d variance-up alarms on the clean stream", sigma, down, up)
	if sigma < 0.029 || sigma > 0.032 {
		t.Errorf("noise SD %v, want the robust scale near the true 0.03 (0.029..0.032)", sigma)
	}
	if down+up > 3 {
		t.Errorf("%d variance alarms (%d down) on a clean stream, want at most 3", down+up, down)
	}
	// The same file without "sigma": the loader falls back on the notes.
	i := bytes.Index(raw, []byte(`,
        "sigma"`))
	if i < 0 {
		t.Fatal(`no "sigma" in the file`)
	}
	j := bytes.IndexByte(raw[i+2:], '\n')
	stripped := append(append([]byte{}, raw[:i]...), raw[i+2+j:]...)
	specs, err := decodeConfig(stripped, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(specs[0].SigmaNote, `noise SD from the notes' "residual SD"`) {
		t.Errorf("fallback on the notes without a note: %q", specs[0].SigmaNote)
	}
	down, _, sigma = cleanAlarms(t, stripped)
	t.Logf("noise SD %.5g from the notes: %d variance-down alarms", sigma, down)
	if down <= 3 {
		t.Errorf("the notes' inflated SD %v gave only %d variance-down alarms: the test would not catch the fault", sigma, down)
	}
}

// TestSigmaSource checks where a loop's noise SD comes from, as build
// prints it: the validity's "sigma"; -sigma over it; and, for a file
// without "sigma", the notes' residual SD with a line saying so.
func TestSigmaSource(t *testing.T) {
	raw, err := os.ReadFile(identifiedFile)
	if err != nil {
		t.Fatal(err)
	}
	i := bytes.Index(raw, []byte(`,
        "sigma"`))
	j := bytes.IndexByte(raw[i+2:], '\n')
	dir := t.TempDir()
	old := filepath.Join(dir, "old.json")
	if err := os.WriteFile(old, append(append([]byte{}, raw[:i]...), raw[i+2+j:]...), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		file   string
		sigmas map[string]float64
		want   string
		note   bool
	}{
		{identifiedFile, nil, "noise SD 0.03033874137811231;", false},
		{identifiedFile, map[string]float64{"temp (identified)": 0.05}, "noise SD 0.05;", false},
		{old, nil, "noise SD 0.0356;", true},
		{old, map[string]float64{"temp (identified)": 0.05}, "noise SD 0.05;", false},
	} {
		o := &options{config: c.file, sigmas: c.sigmas, from: map[string]streamStart{}, now: time.Now(), arl: monitor.DefaultTargetARL}
		var out bytes.Buffer
		svc, err := build(o, &out)
		if err != nil {
			t.Fatalf("%s %v: %v", c.file, c.sigmas, err)
		}
		svc.close()
		s := out.String()
		if !strings.Contains(s, c.want) || strings.Contains(s, `noise SD from the notes' "residual SD"`) != c.note {
			t.Errorf("%s %v: want %q, note %v:\n%s", c.file, c.sigmas, c.want, c.note, s)
		}
	}
}
