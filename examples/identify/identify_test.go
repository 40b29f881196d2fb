package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/identify"
)

// runDefault runs the program as `go run ./examples/identify -pictures
// DIR` does.
func runDefault(t *testing.T, pictures string) (*Outcome, string) {
	t.Helper()
	o := DefaultOptions()
	o.Pictures = pictures
	var out bytes.Buffer
	res, err := Run(context.Background(), o, &out, nil)
	if err != nil {
		t.Fatal(err)
	}
	return res, out.String()
}

// TestDemoRecoversTheTruth is the check: on the built-in
// greenhouse record the identified model has the true dead times exactly
// and gains within 10 % of the true ones (greenhouse.True), though the
// record carries a planted bad reading (greenhouse.Spike) and an hour of
// missing temperatures (greenhouse.SensorDropout), which the report
// names; the model is then fitted by exact likelihood.
func TestDemoRecoversTheTruth(t *testing.T) {
	dir := t.TempDir()
	res, out := runDefault(t, dir)
	if len(res.Recovery) != 2 {
		t.Fatalf("recovery table has %d rows, want 2:\n%s", len(res.Recovery), out)
	}
	for _, r := range res.Recovery {
		t.Logf("%s: dead time %d (true %d), gain %.4f (true %.4f, %+.1f %%), time constant %.1f min (true %.1f)",
			r.Input, r.Delay, r.TrueDelay, r.Gain, r.TrueGain, 100*r.GainErr, r.Tau, r.TrueTau)
		if r.Delay != r.TrueDelay {
			t.Errorf("%s: dead time %d min, true %d", r.Input, r.Delay, r.TrueDelay)
		}
		if math.Abs(r.GainErr) > 0.10 {
			t.Errorf("%s: gain %.4f, true %.4f (%+.1f %%, want within 10 %%)", r.Input, r.Gain, r.TrueGain, 100*r.GainErr)
		}
	}
	// The demo record carries one planted bad reading; the report names it.
	checkPlantedSpike(t, res, out)
	checkPlantedDropout(t, res, out)
	for _, want := range []string{"Candidate models, best first", "Model of temp with coefficients estimated by exact maximum likelihood", "coefficient", "standard error", "value/se", "noise variance", "Diagnostic checks", "verdict:", "time constant", "Forecast of temp", "How close the identified model is", "independent safety interlocks", "licensed practice",
		"verdict: the model passes its checks, but 1 outlier was found in its residuals (day 2 09:20", "Input paths for control work", "To test a controller on the identified model",
		"Forecast of temp for the planned valve (0:65,60:85,120:70)"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q", want)
		}
	}
	// Every picture is a readable PNG large enough for print (18 cm at
	// 220 dots per inch is 1,559 pixels wide).
	want := []string{"data", "ccf", "weights", "residual-acf", "step", "fit", "simulation", "forecast"}
	if len(res.Pictures) != len(want) {
		t.Fatalf("pictures %v, want %v", res.Pictures, want)
	}
	for i, name := range want {
		if filepath.Base(res.Pictures[i]) != name+".png" {
			t.Errorf("picture %d is %s, want %s.png", i, res.Pictures[i], name)
		}
		img := testutil.ReadPNG(t, res.Pictures[i])
		if b := img.Bounds(); b.Dx() < 1500 || b.Dy() < 500 {
			t.Errorf("%s is only %dx%d pixels", name, b.Dx(), b.Dy())
		}
	}
}

// TestRecoveryOtherSeeds checks that the demo's design (test signal,
// controller tuning, weather) makes the truth identifiable, not just the
// record of the default seed: for two other seeds the best candidate
// has the true structure, dead times and gains within 2 % (the 0.2-0.5 %
// errors seen are 1-3 standard errors of the estimates).
func TestRecoveryOtherSeeds(t *testing.T) {
	if testing.Short() {
		t.Skip("two identifications")
	}
	for seed := uint64(1); seed <= 2; seed++ {
		g := greenhouse.Generate(greenhouse.Settings{Seed: seed})
		data := g.ByName()
		cands, err := identify.Candidates(context.Background(), "temp", []string{"valve", "outdoor"}, data, identifySettings(g.Len()/20))
		if err != nil {
			t.Fatal(err)
		}
		m := cands[0].Estimate.Model
		for i, want := range []greenhouse.Path{greenhouse.True.Valve, greenhouse.True.Outdoor} {
			in := m.Inputs[i]
			r, err := in.Rational()
			if err != nil {
				t.Fatal(err)
			}
			gain, err := r.Gain()
			if err != nil {
				t.Fatal(err)
			}
			if in.Series != want.Series || in.Delay != want.Delay || in.Den.Degree() != 1 || in.Num.Degree() != 0 ||
				math.Abs(gain/want.Gain()-1) > 0.02 {
				t.Errorf("seed %d: %s b=%d r=%d s=%d gain %.4f, want b=%d r=1 s=0 gain %.3f", seed, in.Series, in.Delay,
					in.Den.Degree(), in.Num.Degree(), gain, want.Delay, want.Gain())
			}
		}
		if p, q := m.Noise.AR.Degree(), m.Noise.MA.Degree(); p != 1 || q != 1 {
			t.Errorf("seed %d: noise ARMA(%d, %d), want ARMA(1, 1)", seed, p, q)
		}
	}
}

// TestSpecAndCSV writes the built-in record as CSV, reads it back with
// the file flags and fits the true structure given as a spec.
// Its length is one run checked through its report and its saved
// record.
func TestSpecAndCSV(t *testing.T) {
	path := filepath.Join(t.TempDir(), "greenhouse.csv")
	var buf bytes.Buffer
	if _, err := Run(context.Background(), Options{WriteData: path}, &buf, nil); err != nil {
		t.Fatal(err)
	}
	o := DefaultOptions()
	o.Data = path
	o.Interval, o.Unit = 1, "min"
	o.Spec = greenhouse.Structure
	o.Save = filepath.Join(t.TempDir(), "fitted.json")
	buf.Reset()
	var progress bytes.Buffer
	res, err := Run(context.Background(), o, &buf, &progress)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(progress.String(), "fitting temp = c + w0") || !strings.Contains(progress.String(), "done in") {
		t.Errorf("progress on stderr:\n%s", progress.String())
	}
	if res.Recovery != nil {
		t.Error("a CSV file has no known truth, but a recovery table was made")
	}
	// The saved config holds the fitted model with every coefficient
	// fixed at its estimate, exactly (shortest round-trip decimals).
	raw, err := os.ReadFile(o.Save)
	if err != nil {
		t.Fatal(err)
	}
	var cfg struct {
		Models []struct {
			Spec parse.Spec `json:"spec"`
		} `json:"models"`
	}
	if err := json.Unmarshal(raw, &cfg); err != nil {
		t.Fatal(err)
	}
	if len(cfg.Models) != 1 || !cfg.Models[0].Spec.Model.Equal(fixed(res.Estimate.Model, -1)) {
		t.Errorf("saved config %s does not hold the fitted model %v", raw, res.Estimate.Model)
	}
	// The CSV holds 4 decimals, so the fit matches the true gains
	// closely but not exactly (0.2 and 0.5, greenhouse.True).
	for i, g := range []float64{0.2, 0.5} {
		if p := res.Paths[i]; math.Abs(p.Gain/g-1) > 0.05 || p.DeadTime != []int{3, 1}[i] {
			t.Errorf("path %s: gain %.4f dead time %d", p.Input, p.Gain, p.DeadTime)
		}
	}
	// The saved record of the data: all 5760 samples at 1 min, the
	// ranges of the three series, passed and not forced.
	v := savedValidity(t, o.Save)
	g := greenhouse.Default()
	if v.Samples != 5760 || v.Interval != "1 min" || v.Verdict != "passed" || v.Forced || len(v.Failures) != 0 || len(v.Ranges) != 3 {
		t.Errorf("saved validity %+v", v)
	}
	// The CSV holds 4 decimals: the ranges agree with the record to
	// 5e-5 (half a unit of the last decimal).
	for name, s := range g.ByName() {
		r := v.Ranges[name]
		if math.Abs(r[0]-slices.Min(s)) > 5e-5 || math.Abs(r[1]-slices.Max(s)) > 5e-5 {
			t.Errorf("range of %s %v, record %v..%v", name, r, slices.Min(s), slices.Max(s))
		}
	}
	if !strings.Contains(buf.String(), "interval 1 min") {
		t.Errorf("interval not reported:\n%s", buf.String())
	}
}

func TestBadSpecIsReported(t *testing.T) {
	o := DefaultOptions()
	o.Spec = "temp = w0 / (2 - d1 B) B^3 valve + a"
	_, err := Run(context.Background(), o, &bytes.Buffer{}, nil)
	if err == nil || !strings.Contains(err.Error(), "1:13: the constant term of the denominator must be 1") {
		t.Errorf("error %v", err)
	}
}

func TestPlanAndInterval(t *testing.T) {
	p, err := parsePlan("60:75, 0:55")
	if err != nil {
		t.Fatal(err)
	}
	u := schedule(p, 62, 40)
	if u[0] != 55 || u[59] != 55 || u[60] != 75 || u[61] != 75 {
		t.Errorf("schedule %v", u)
	}
	if u := schedule(nil, 3, 40); u[2] != 40 {
		t.Errorf("empty plan should hold the last value: %v", u)
	}
	for _, bad := range []string{"x", "1:", "-1:5"} {
		if _, err := parsePlan(bad); err == nil {
			t.Errorf("plan %q accepted", bad)
		}
	}
	for in, want := range map[string]float64{"1min": 1, "10 s": 10, "0.5h": 0.5} {
		if v, _, err := parseInterval(in); err != nil || v != want {
			t.Errorf("%q: %v %v", in, v, err)
		}
	}
	for _, bad := range []string{"min", "1 minute", "-1s", "0s"} {
		if _, _, err := parseInterval(bad); err == nil {
			t.Errorf("interval %q accepted", bad)
		}
	}
}

// refusedBeforeFit runs the program quietly with the options o (the
// case named label) and checks that it stops with an error containing
// want before the fit starts.
func refusedBeforeFit(t *testing.T, label string, o Options, want string) {
	t.Helper()
	o.Quiet = true
	var out bytes.Buffer
	_, err := Run(context.Background(), o, &out, nil)
	if err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("%s: error %v, want it to contain %q", label, err, want)
	}
	if strings.Contains(out.String(), "Candidate models") {
		t.Errorf("%s: the fit ran before the flags were checked", label)
	}
}

// TestBadForecastFlags: a horizon beyond the record (at 10^11 it would
// ask for more memory than a machine has), a negative one and a plan
// with a non-number or NaN are reported before the fit starts.
func TestBadForecastFlags(t *testing.T) {
	for _, c := range []struct {
		horizon int
		plan    string
		want    string
	}{
		{100_000_000_000, "0:65", "horizon 100000000000: want 0 (no forecast) to 5760 samples"},
		{-5, "0:65", "horizon -5"},
		{180, "0:abc", `plan "0:abc"`},
		{180, "0:NaN", `plan "0:NaN"`},
	} {
		o := DefaultOptions()
		o.Horizon, o.Plan = c.horizon, c.plan
		refusedBeforeFit(t, fmt.Sprintf("horizon %d plan %q", c.horizon, c.plan), o, c.want)
	}
}

// TestBadSeriesFlags checks that an output listed among the inputs, an
// input listed twice and a -skip that leaves nothing to fit are
// reported before the fit starts, naming the flag.
func TestBadSeriesFlags(t *testing.T) {
	for _, c := range []struct {
		inputs []string
		skip   int
		want   string
	}{
		{[]string{"valve", "temp"}, -1, `-inputs names "temp", the output (-output)`},
		{[]string{"valve", "valve"}, -1, `-inputs names "valve" twice`},
		{[]string{"valve"}, 5760, "-skip 5760: want fewer samples than the record's 5760"},
	} {
		o := DefaultOptions()
		o.Inputs, o.Skip = c.inputs, c.skip
		refusedBeforeFit(t, fmt.Sprintf("inputs %v skip %d", c.inputs, c.skip), o, c.want)
	}
}
