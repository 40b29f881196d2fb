package main

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/parse"
)

// TestMainOutput runs the program as a user would and checks its summary.
func TestMainOutput(t *testing.T) {
	testutil.CheckWords(t, "summary", defaultRunOutput(t), []string{"sampled every 1 min", "settling to +-0.2 degC", "overshoot", "peak deviation",
		"steady-state error      +0.00 degC", "Commission the tuning on the plant itself under the site's safety procedures",
		"independent safety interlocks", "local codes and licensed practice"}, nil)
}

// TestOtherPlant runs the program on a model as examples/identify prints
// it (the greenhouse identified from the demo record, rounded), and
// refuses an unstable one.
func TestOtherPlant(t *testing.T) {
	var buf bytes.Buffer
	spec := "temp = 5.97 + 0.009989 / (1 - 0.9502 B) B^3 valve + 0.04907 / (1 - 0.9021 B) B outdoor + (1 + 0.3037 B) / (1 - 0.7926 B) a; every 1 min"
	if err := runWith(&buf, options{spec: spec, noise: NoiseSD}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(buf.String(), "plant: "+spec) {
		t.Errorf("summary does not name the plant:\n%s", buf.String())
	}
	// An unstable valve path (pole 1.5, or 1.05 with a constant that
	// would put the valve at -50 %): the plant has no steady state to
	// start from and a fixed PI test on it says nothing, so the spec is
	// refused with a *PlantError that names the path, the pole outside
	// the unit circle and that reason, before any scenario (and before
	// the check of the valve's starting point).
	for _, c := range []struct{ spec, pole string }{
		{"temp = 16 + 0.01 / (1 - 1.5 B) B^3 valve + a; every 1 min", "|z| = 1.5"},
		{"temp = 6 + 0.01 / (1 - 1.05 B) B^3 valve + a; every 1 min", "|z| = 1.05"},
	} {
		buf.Reset()
		err := runWith(&buf, options{spec: c.spec, noise: NoiseSD})
		var pe *PlantError
		if !errors.As(err, &pe) || pe.Part != "valve path" || !strings.Contains(err.Error(), "unstable (a pole outside the unit circle, "+c.pole+")") ||
			!strings.Contains(err.Error(), "not meaningful") || strings.Contains(err.Error(), "-50 %") || buf.Len() != 0 {
			t.Errorf("unstable plant %s: error %v, summary:\n%s", c.spec, err, buf.String())
		}
	}
}

// TestSecondsInterval runs a plant sampled every 10 s and checks that
// the summary's settling time is in minutes of real time, not one minute
// a sample.
//
// The expected time is computed by hand, independently of tf.System,
// Run and Measure: the noise-free plant temp = 6 + 0.01/(1 - 0.95 B) B^3
// valve is the difference equation v_k = 0.95 v_{k-1} + 0.01 u_{k-3},
// temp_k = 6 + v_k, at rest at v = 0.2 * 50 = 10 (16 degC with the valve
// at 50 %); the PI, written in velocity form, with Ts = 10 s = 1/6 min; the
// setpoint steps to 20 at 60 min, sample 60*6 = 360; the settling time
// is (the last sample outside 20 +- 0.2, plus one, minus 360) samples of
// 10 s, divided by 6 for minutes.
func TestSecondsInterval(t *testing.T) {
	const spec = "temp = 6 + 0.01 / (1 - 0.95 B) B^3 valve; every 10 s"
	var buf bytes.Buffer
	if err := runWith(&buf, options{spec: spec, noise: 0}); err != nil {
		t.Fatal(err)
	}
	const n, k0, ts = 360 * 6, 60 * 6, 1.0 / 6 // samples, step sample, min per sample
	u, uPrev := [3]float64{50, 50, 50}, 50.0   // u_{k-3..k-1}, the PI's output
	v, y, ePrev := 10.0, 16.0, math.NaN()
	last := -1
	for k := range n {
		sp := 16.0
		if k >= k0 {
			sp = 20
		}
		e := sp - y
		if math.IsNaN(ePrev) {
			ePrev = e
		}
		uPrev = min(max(uPrev+8*((e-ePrev)+ts/20*e), 0), 100)
		ePrev = e
		v = 0.95*v + 0.01*u[0]
		u = [3]float64{u[1], u[2], uPrev}
		y = 6 + v
		if k >= k0 && math.Abs(y-20) > 0.2 {
			last = k
		}
	}
	want := float64(last+1-k0) * 10 / 60
	if last < k0 || last >= n-1 {
		t.Fatalf("the hand-computed loop does not settle within the run (last sample outside the band %d)", last)
	}
	line := fmt.Sprintf("settling to +-0.2 degC  %5.1f min\n", want)
	if !strings.Contains(buf.String(), line) {
		t.Errorf("summary lacks %q (by hand: %d samples of 10 s):\n%s", line, last+1-k0, buf.String())
	}
	if !strings.Contains(buf.String(), "sampled every 10 s") || !strings.Contains(buf.String(), "outdoor step 4 -> -4 degC: not run, the plant has no input outdoor") {
		t.Errorf("summary:\n%s", buf.String())
	}
}

// TestBadPlantOrFlags checks that every wrong flag value and every plant
// the scenarios cannot run is refused before anything is printed, with
// a message naming the flag, the part of the spec and the likely fix.
// Its length is the table of cases.
func TestBadPlantOrFlags(t *testing.T) {
	const valve = "0.01 / (1 - 0.95 B) B^3 valve"
	for _, c := range []struct {
		name string
		o    options
		want string
	}{
		{"negative noise", options{spec: PlantSpec, noise: -1}, "harness: -noise -1: the noise standard deviation must be a finite number >= 0 (degC)"},
		{"NaN noise", options{spec: PlantSpec, noise: math.NaN()}, "harness: -noise NaN: the noise standard deviation must be a finite number >= 0"},
		{"infinite noise", options{spec: PlantSpec, noise: math.Inf(1)}, "harness: -noise +Inf:"},
		{"noise without a noise term", options{spec: "temp = 6 + " + valve + "; every 1 min", noise: NoiseSD, noiseSet: true},
			"harness: -noise 0.03: the runs with noise need the plant's noise term, and the plant has none; end the spec with + a (or a stationary ARMA term), or run with -noise 0"},
		{"noise of a noise model without steady state", options{spec: "temp = 6 + " + valve + " + 1 / (1 - B) a; every 1 min", noise: NoiseSD, noiseSet: true},
			"harness: -noise 0.03: the runs with noise need the plant's noise term, and its noise cannot be drawn from a steady state (a burn-in needs a stationary noise model"},
		// With -noise not given the model is blamed, not the flag.
		{"default noise without a noise term", options{spec: "temp = 6 + " + valve + "; every 1 min", noise: NoiseSD},
			"harness: -spec: noise term: the plant has none, and the runs with the plant's noise (by default SD 0.03 degC) need one that is stationary; " +
				"give the model a stationary noise term (+ a, or an ARMA term with its roots outside the unit circle), or run without noise: -noise 0"},
		{"default noise of a noise model without steady state", options{spec: "temp = 6 + " + valve + " + 1 / (1 - B) a; every 1 min", noise: NoiseSD},
			"harness: -spec: noise term: its noise cannot be drawn from a steady state (a burn-in needs a stationary noise model, and phi(B) has a root on or inside the unit circle), and the runs"},
		{"spec syntax", options{spec: "temp 0.01 B^3 valve + a", noise: NoiseSD}, "harness: -spec: 1:6:"},
		{"no interval", options{spec: "temp = 6 + " + valve + " + a", noise: NoiseSD},
			"harness: -spec: sample interval: the spec has none, and the harness needs it to run the scenarios in minutes; " +
				"end the spec with the interval of the record the model came from, such as \"; every 1 min\" or \"; every 10 s\""},
		{"calendar interval", options{spec: "temp = 6 + " + valve + " + a; every 1 mo", noise: NoiseSD},
			"harness: -spec: sample interval: every 1 mo is not an interval the harness can use: a calendar interval (months, quarters, years) has no fixed length"},
		{"interval too long", options{spec: "temp = 6 + " + valve + " + a; every 1 h", noise: NoiseSD},
			"harness: -spec: sample interval: every 1 h is outside 0.1 s .. 2 min, the intervals the harness runs"},
		{"interval too short", options{spec: "temp = 6 + " + valve + " + a; every 0.01 s", noise: NoiseSD},
			"every 0.01 s is outside 0.1 s .. 2 min"},
		{"misspelt input", options{spec: "temp = 6 + 0.01 / (1 - 0.95 B) B^3 vlave + a; every 1 min", noise: NoiseSD},
			"harness: -spec: input vlave (at 1:12): the harness drives only valve (%) and outdoor (degC), and would hold any other input at 0; did you mean valve?"},
		{"input in another case", options{spec: "temp = 6 + " + valve + " + 0.05 B Outdoor + a; every 1 min", noise: NoiseSD},
			"input Outdoor (at 1:44): the harness drives only valve (%) and outdoor (degC), and would hold any other input at 0; did you mean outdoor?"},
		{"extra input", options{spec: "temp = 6 + " + valve + " + 0.3 B vent + a; every 1 min", noise: NoiseSD},
			"input vent (at 1:44): the harness drives only valve (%) and outdoor (degC), and would hold any other input at 0; rename it to one of those, or remove its term"},
		{"no valve", options{spec: "temp = 0.2 B^3 outdoor + a; every 1 min", noise: NoiseSD},
			"harness: -spec: input valve: the plant spec has no input named valve"},
		{"free coefficients", options{spec: "temp = 6 + w0 / (1 - d1 B) B^3 valve + a; every 1 min", noise: NoiseSD},
			"harness: -spec: coefficient w0 (at 1:12): is free (to be estimated), so the plant has no known value for it; " +
				"write its number, or hold it with \"where w0 = <value>\""},
		{"free coefficient with a start value", options{spec: "temp = 6 + 0.01 / (1 - d1 B) B^3 valve + a; every 1 min where d1 ~ 0.95", noise: NoiseSD},
			"coefficient d1 (at 1:24): is free (to be estimated)"},
		{"differenced output", options{spec: "(1 - B) temp = 0.01 B^3 valve + a; every 1 min", noise: NoiseSD},
			"harness: -spec: output temp: is differenced ((1 - B) temp): the plant integrates, so it has no steady state at a fixed valve"},
		{"output of another name", options{spec: "air = 6 + " + valve + " + a; every 1 min", noise: NoiseSD},
			"harness: -spec: output air: the scenarios are written for the greenhouse air temperature, named temp (degC); rename the output to temp if it is that temperature"},
		{"output misspelt", options{spec: "tmp = 6 + " + valve + " + a; every 1 min", noise: NoiseSD},
			"output tmp: the scenarios are written for the greenhouse air temperature, named temp (degC); did you mean temp?"},
		{"valve gain negative", options{spec: "temp = 30 + (-0.01) / (1 - 0.95 B) B^3 valve + a; every 1 min", noise: NoiseSD},
			"harness: -spec: valve path (at 1:13): has a steady-state gain of -0.2 degC per %: the PI under test is direct acting"},
		{"valve differenced", options{spec: "temp = 16 + 0.01 B ((1 - B) valve) + a; every 1 min", noise: NoiseSD},
			"valve path (at 1:13): has a steady-state gain of 0 degC per %"},
		{"valve integrating", options{spec: "temp = 16 + 0.01 / (1 - B) B^3 valve + a; every 1 min", noise: NoiseSD},
			"valve path (at 1:13): has no steady-state gain (a pole at z = 1: it integrates)"},
		{"start out of reach", options{spec: "temp = 0.001 / (1 - 0.95 B) B^3 valve + a; every 1 min", noise: NoiseSD},
			"harness: -spec: valve path: scenario \"setpoint step 16 -> 20 degC\" starts at 16 degC with 2 degC outside, " +
				"which by the plant's gains (constant 0, valve 0.02 degC/%, outdoor 0) needs the valve at 800 %, outside its 0..100 % travel"},
		{"spec and config", options{spec: PlantSpec, specSet: true, config: "x.json", noise: NoiseSD},
			"harness: -spec: give the plant either with -spec or with -config, not both"},
		{"model without config", options{spec: PlantSpec, model: "air", noise: NoiseSD},
			"harness: -model \"air\": names a model of a config file; give the file with -config too"},
		{"forcing without config", options{spec: PlantSpec, useFailed: true, noise: NoiseSD},
			"harness: -use-failed-model: applies to a model loaded with -config (a -spec carries no verdict)"},
	} {
		var buf bytes.Buffer
		err := runWith(&buf, c.o)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error\n%v\nwant one containing\n%s", c.name, err, c.want)
		}
		var fe *FlagError
		if err != nil && !errors.As(err, &fe) {
			t.Errorf("%s: error %T is not a *FlagError", c.name, err)
		}
		if buf.Len() != 0 {
			t.Errorf("%s: printed %q before failing", c.name, buf.String())
		}
	}
	// The plant's problems are *PlantErrors under the flag's error, and a
	// spec that does not parse keeps parse's positioned error.
	err := runWith(&bytes.Buffer{}, options{spec: "temp = 6 + 0.01 B^3 vlave + a; every 1 min", noise: NoiseSD})
	var pe *PlantError
	if !errors.As(err, &pe) || pe.Part != "input vlave" || pe.Pos.Column != 12 {
		t.Errorf("misspelt input: %#v", err)
	}
	err = runWith(&bytes.Buffer{}, options{spec: "temp 0.01 B^3 valve + a", noise: NoiseSD})
	var perr *parse.Error
	if !errors.As(err, &perr) {
		t.Errorf("syntax error: %#v is not a *parse.Error", err)
	}
	// A noise-free plant runs with -noise 0.
	if err := runWith(&bytes.Buffer{}, options{spec: "temp = 6 + " + valve + "; every 1 min", noise: 0}); err != nil {
		t.Errorf("noise-free plant with -noise 0: %v", err)
	}
}

// TestCommandLine runs the program's command line: -h describes the
// program with examples, and a positional argument or an unknown flag is
// refused with exit status 2.
func TestCommandLine(t *testing.T) {
	var out, errb bytes.Buffer
	if code := cli([]string{"-h"}, &out, &errb); code != 0 || out.Len() != 0 {
		t.Errorf("-h: exit %d, stdout %q", code, out.String())
	}
	testutil.CheckWords(t, "-h", errb.String(), []string{"harness tests a PI controller in closed loop against a simulated plant", "Examples:\n  go run ./examples/harness\n",
		"go run ./examples/harness -config fitted.json -model", "-use-failed-model", "-spec string"}, nil)
	errb.Reset()
	if code := cli([]string{"tank.csv"}, &out, &errb); code != 2 || out.Len() != 0 ||
		!strings.Contains(errb.String(), "harness: unexpected argument \"tank.csv\": the harness takes flags only; give a plant with -spec '...' or -config FILE (see -h)") {
		t.Errorf("positional argument: exit %d, stdout %q, stderr %q", code, out.String(), errb.String())
	}
	errb.Reset()
	if code := cli([]string{"-noise", "-1"}, &out, &errb); code != 1 || !strings.Contains(errb.String(), "harness: -noise -1:") {
		t.Errorf("negative noise: exit %d, stderr %q", code, errb.String())
	}
	errb.Reset()
	if code := cli([]string{"-nosie", "0"}, &out, &errb); code != 2 || !strings.Contains(errb.String(), "flag provided but not defined: -nosie") {
		t.Errorf("unknown flag: exit %d, stderr %q", code, errb.String())
	}
	// -spec together with -config is noticed even when -spec repeats
	// the default.
	errb.Reset()
	if code := cli([]string{"-spec", PlantSpec, "-config", "x.json"}, &out, &errb); code != 1 || !strings.Contains(errb.String(), "not both") {
		t.Errorf("-spec with -config: exit %d, stderr %q", code, errb.String())
	}
}

// writeConfig writes a config file holding the given model entries
// (JSON objects) and returns its path.
func writeConfig(t *testing.T, entries ...string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "site.json")
	body := `{"site": "test house", "models": [` + strings.Join(entries, ",\n") + "]}\n"
	if err := os.WriteFile(path, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// entry returns a model entry of a config with the plant spec and a
// validity record (JSON, or "" for none).
func entry(name, validity string) string {
	s := fmt.Sprintf(`{"name": %q, "spec": %q`, name, PlantSpec)
	if validity != "" {
		s += `, "validity": ` + validity
	}
	return s + "}"
}

// TestConfigPlant loads the plant from a config file: the validity
// record is printed, values outside its ranges are warned about, a
// failed model is refused unless forced, and a file or model that is not
// there says so.
// Its length is the cases in turn on one config file, then a table of
// files and models that are wrong.
func TestConfigPlant(t *testing.T) {
	// The record saw the outdoor temperature from 0 to 5 degC; the cold
	// front takes it from 4 to -4 degC (DisturbanceStep), so the warning
	// names -4..4 against 0..5. The valve range 40..60 is left by both
	// scenarios (the PI drives the valve past 60 % after the setpoint
	// rise: at 20 degC with 2 degC outside the plant needs
	// (20 - 6 - 0.5*2)/0.2 = 65 %, by PlantSpec's gains).
	passed := `{"samples": 5760, "interval": "1 min", "ranges": {"temp": [14, 22], "valve": [40, 60], "outdoor": [0, 5]}, "verdict": "passed"}`
	path := writeConfig(t, entry("air temperature", passed), entry("air, no record", ""))
	var buf bytes.Buffer
	if err := runWith(&buf, options{spec: PlantSpec, config: path, model: "air temperature", noise: NoiseSD}); err != nil {
		t.Fatal(err)
	}
	testutil.CheckWords(t, "summary", buf.String(), []string{
		"  model \"air temperature\" of " + path + "\n  fitted to 5760 samples every 1 min\n",
		"verdict when saved: passed every check",
		"WARNING: valve runs over ", "outside the range 40..60 seen in the record the model was fitted to; the model is an extrapolation there",
		"WARNING: outdoor runs over -4..4, outside the range 0..5 seen in the record",
		"defer to local codes and licensed practice",
	}, []string{"WARNING: temp", "failed its checks"})
	buf.Reset()
	if err := runWith(&buf, options{config: path, model: "air, no record", noise: NoiseSD}); err != nil ||
		!strings.Contains(buf.String(), "no record of the data this model was fitted to: its range of validity is unknown") {
		t.Errorf("model without a record: %v\n%s", err, buf.String())
	}

	failed := `{"samples": 20, "interval": "1 min", "ranges": {"valve": [0, 100], "outdoor": [-10, 10]}, "verdict": "failed", "failures": ["the fit did not converge"], "forced": true}`
	fpath := writeConfig(t, entry("air", failed))
	err := runWith(&buf, options{config: fpath, noise: NoiseSD})
	if err == nil || err.Error() != "harness: -config "+fpath+": model \"air\": the model failed its checks when it was saved (the fit did not converge), "+
		"so a controller that passes on it proves nothing; identify it again, or run on it anyway with -use-failed-model" {
		t.Errorf("failed model: %v", err)
	}
	buf.Reset()
	if err := runWith(&buf, options{config: fpath, noise: NoiseSD, useFailed: true}); err != nil ||
		!strings.Contains(buf.String(), "SAVED DESPITE THE FAILED CHECKS") ||
		!strings.Contains(buf.String(), "WARNING: run on a model that failed its checks (-use-failed-model): these figures prove nothing about the plant") {
		t.Errorf("forced failed model: %v\n%s", err, buf.String())
	}

	// A failed model whose noise term is not stationary (as a fit that
	// did not converge can save): the verdict is said first, and once
	// forced, the noise term is blamed, not the -noise flag the user did
	// not give; no package prefix shows.
	bad := fmt.Sprintf(`{"name": "air", "spec": %q, "validity": %s}`,
		"temp = 6 + 0.2 B^3 valve + 0.5 B outdoor + 1 / (1 - 1.0 B) a; every 1 min", failed)
	bpath := writeConfig(t, bad)
	err = runWith(&buf, options{config: bpath, noise: NoiseSD})
	if err == nil || !strings.HasPrefix(err.Error(), "harness: -config "+bpath+": model \"air\": the model failed its checks when it was saved (the fit did not converge)") {
		t.Errorf("failed model with a non-stationary noise term: %v", err)
	}
	err = runWith(&buf, options{config: bpath, noise: NoiseSD, useFailed: true})
	if err == nil || !strings.HasPrefix(err.Error(), "harness: -config "+bpath+": model \"air\": noise term: its noise cannot be drawn from a steady state") ||
		strings.Contains(err.Error(), "tf:") || strings.Contains(err.Error(), "plant:") || strings.Contains(err.Error(), "-noise 0.03") {
		t.Errorf("forced failed model with a non-stationary noise term: %v", err)
	}

	missing := filepath.Join(t.TempDir(), "none.json")
	for _, c := range []struct {
		name, path, model, want string
	}{
		{"missing file", missing, "", "harness: -config " + missing + ": open " + missing + ": no such file or directory"},
		{"folder", filepath.Dir(missing), "", "harness: -config " + filepath.Dir(missing) + ": a folder, not a config file"},
		{"several models, none picked", path, "", "the file holds 2 models; pick one with -model (\"air temperature\", \"air, no record\")"},
		{"misspelt model", path, "air temprature", "no model named \"air temprature\"; did you mean air temperature? (the file holds \"air temperature\", \"air, no record\")"},
		{"empty file", emptyFile(t), "", "the file is empty; it should hold {\"site\": ..., \"models\": [...]}"},
		{"JSON syntax", rawFile(t, "{\n  \"site\": \"x\",\n  \"models\": [}\n"), "", "3:14: not valid JSON"},
		{"unknown key", rawFile(t, `{"site": "x", "models": [{"name": "a", "spec": "temp = 1 valve", "validty": {}}]}`), "", `not a model config: json: unknown field "validty"`},
		{"no models", writeConfig(t), "", "the file holds no models"},
		{"unknown verdict", writeConfig(t, entry("a", `{"samples": 9, "ranges": {}, "verdict": "ok"}`)), "", `its validity record has verdict "ok", neither "passed" nor "failed"`},
		{"intervals disagree", writeConfig(t, entry("a", `{"samples": 9, "interval": "10 s", "ranges": {}, "verdict": "passed"}`)), "",
			"its validity record says the data was sampled every 10 s but its spec says every 1 min; the two must agree"},
		{"plant the harness cannot run", rawFile(t, `{"site": "x", "models": [{"name": "tank", "spec": "(1 - B) level = 0.02 B pump + a; every 10 s"}]}`), "",
			"model \"tank\": output level: the scenarios are written for the greenhouse air temperature"},
	} {
		buf.Reset()
		err := runWith(&buf, options{spec: PlantSpec, config: c.path, model: c.model, noise: NoiseSD})
		var fe *FlagError
		if err == nil || !strings.Contains(err.Error(), c.want) || !errors.As(err, &fe) || fe.Flag != "config" {
			t.Errorf("%s: error %v, want a -config error containing %q", c.name, err, c.want)
		}
		if buf.Len() != 0 {
			t.Errorf("%s: printed %q before failing", c.name, buf.String())
		}
	}
}

// rawFile writes body to a file and returns its path.
func rawFile(t *testing.T, body string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "raw.json")
	if err := os.WriteFile(path, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// emptyFile returns the path of a file holding only white space.
func emptyFile(t *testing.T) string { return rawFile(t, " \n") }

// TestNoiseReport checks the noisy half of the summary: the band is
// three standard deviations of the noise term, at least
// PlantSettleBand; -noise 0 prints no noisy figures; a noise the loop
// cannot take is blamed on the noise, not the plant; a band as wide as
// the step is called out.
//
// The noise term of PlantSpec, (1 + 0.3 B)/(1 - 0.8 B) a, has psi
// weights 1, 1.1 * 0.8^(k-1), so its variance is sd^2 (1 + 1.21/(1 -
// 0.64)) = 4.3611 sd^2 (the variance of a linear process, Box, Jenkins,
// Reinsel & Ljung 2015, sec. 3.1; by hand): 3 SD is 0.18789 at sd 0.03
// (below 0.2, so the band is 0.2) and 0.62650 at sd 0.1. The tolerance
// 1e-9 covers the psi weights left out of the sum (below 1e-8 each).
func TestNoiseReport(t *testing.T) {
	p, err := NewProcess(PlantSpec, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ sd, want float64 }{{0, 0.2}, {0.03, 0.2}, {0.1, 0.3 * math.Sqrt(1+1.21/0.36)}} {
		if got := p.noiseBand(c.sd); math.Abs(got-c.want) > 1e-9 {
			t.Errorf("noise band at sd %v: %v, want %v", c.sd, got, c.want)
		}
	}
	var buf bytes.Buffer
	if err := runWith(&buf, options{spec: PlantSpec, noise: 0}); err != nil || strings.Contains(buf.String(), "with the plant's noise") {
		t.Errorf("-noise 0: %v\n%s", err, buf.String())
	}
	buf.Reset()
	if err := runWith(&buf, options{spec: PlantSpec, noise: 0.1}); err != nil ||
		!strings.Contains(buf.String(), "with the plant's noise (innovations SD 0.1 degC, seed 1), band +-0.63 degC:\n    first within the band") {
		t.Errorf("-noise 0.1: %v\n%s", err, buf.String())
	}
	buf.Reset()
	if err := runWith(&buf, options{spec: PlantSpec, noise: 5}); err != nil ||
		!strings.Contains(buf.String(), "(the band is as wide as the 4 degC step: these figures say little)") {
		t.Errorf("-noise 5: %v\n%s", err, buf.String())
	}
	buf.Reset()
	err = runWith(&buf, options{spec: PlantSpec, noise: 1e300})
	if err == nil || err.Error() != "harness: setpoint step 16 -> 20 degC: the closed loop diverged with noise" ||
		!strings.Contains(buf.String(), "the noise-free run did not: the noise asked with -noise is more than this loop can take") ||
		!strings.Contains(buf.String(), "licensed practice") {
		t.Errorf("-noise 1e300: %v\n%s", err, buf.String())
	}
	// The fraction outside the band and the first entry, on a series
	// with known answers (by hand).
	y := []float64{17, 19.9, 20.5, 20.1, 19.7}
	if k := firstWithin(y, 20, 0.2); k != 1 {
		t.Errorf("first within: %d, want 1", k)
	}
	if f := fractionOutside(y[1:], 20, 0.2); f != 0.5 {
		t.Errorf("outside: %v, want 0.5 (20.5 and 19.7 of 4)", f)
	}
	if k := firstWithin(y, 30, 0.2); k != -1 || timeText(entryTime(k, 1), 1) != "  not reached within the run" {
		t.Errorf("never within: %d, %q", k, timeText(entryTime(k, 1), 1))
	}
}

// TestLimitCycle runs a plant the tuning does not suit: a static valve
// gain of 0.2 degC/% with no lag makes the PI's loop gain 8*0.2 = 1.6 per
// sample (>1: the proportional action alone overcorrects each sample, by
// hand), so the loop swings between the valve's limits. The summary
// prints no steady-state error (the mean over a swing is no steady
// state), states the rule, and calls the tuning unsuitable.
func TestLimitCycle(t *testing.T) {
	var buf bytes.Buffer
	if err := runWith(&buf, options{spec: "temp = 6 + 0.2 valve + 0.5 outdoor + a; every 1 min", noise: 0}); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	testutil.CheckWords(t, "summary", out, []string{
		"steady-state error      none: the loop does not settle (over the last quarter of the run",
		"the temperature still swings over", "wider than the +-0.2 degC band)",
		"WARNING: the tuning (Kc 8.0 %/degC, Ti 20 min) is unsuitable for this plant: the loop oscillates",
		"retune (a lower Kc\n  or a longer Ti) before trying it on the plant",
	}, []string{"steady-state error      +", "steady-state error      -"})
	buf.Reset()
	if err := runWith(&buf, options{spec: PlantSpec, noise: 0}); err != nil || strings.Contains(buf.String(), "unsuitable") {
		t.Errorf("the demo plant settles: %v\n%s", err, buf.String())
	}
}
