package main

import (
	"bytes"
	"context"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
)

// The planted change is the plant's own: before it the record is the
// generator's; after it the controller's integral action holds the
// temperature, so the valve settles at 1/1.2 of its logged opening
// (0.24 u' = 0.2 u, the steady-state gains of greenhouse.True's valve
// path before and after; algebra, common practice). Measured over the
// last half day of a 2-day record: valve ratio 0.8341 (1/1.2 = 0.8333),
// temperature 0.006 degC above the logged one. Asserted within 1 % (the
// dither and the weather move the means by a few tenths of a per cent)
// and 0.05 degC (the noise SD 0.03 degC is averaged over 720 samples;
// what remains is the controller's slow settling).
func TestPlantedRecord(t *testing.T) {
	d, at := plantedRecord(2)
	o := greenhouse.Generate(greenhouse.Settings{Days: 2})
	n := d.Len()
	if at != n/2 {
		t.Fatalf("change at %d, want %d", at, n/2)
	}
	for i := 0; i < at; i++ {
		if d.Temp[i] != o.Temp[i] || d.Valve[i] != o.Valve[i] {
			t.Fatalf("sample %d before the change differs from the generator's", i)
		}
	}
	mean := func(x []float64) float64 {
		s := 0.0
		for _, v := range x[n-720:] {
			s += v
		}
		return s / 720
	}
	ratio := mean(d.Valve) / mean(o.Valve)
	dT := mean(d.Temp) - mean(o.Temp)
	t.Logf("last half day: valve ratio %.4f, temperature %+.4f degC", ratio, dT)
	if want := 1 / (1 + trackChange); math.Abs(ratio/want-1) > 0.01 {
		t.Errorf("valve settles at %.4f of its logged opening, want %.4f within 1 %%", ratio, want)
	}
	if math.Abs(dT) > 0.05 {
		t.Errorf("temperature moved by %.3f degC, want within 0.05 (the controller holds it)", dT)
	}
}

// figure reads the number after the text before in out.
func figure(t *testing.T, out, before string) float64 {
	t.Helper()
	m := regexp.MustCompile(regexp.QuoteMeta(before) + ` ([0-9.]+)`).FindStringSubmatch(out)
	if m == nil {
		t.Fatalf("the output lacks %q:\n%s", before, out)
	}
	v, err := strconv.ParseFloat(m[1], 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// -track on a 2-day record (2880 samples, the change at 1440) prints
// the figures, writes the pictures and the caution. Measured: before the
// change the recursive estimates lie at most 0.80 of their SE (1.62 of
// the batch fit's SEs) from the batch fit, the gain estimate at 0.1974
// (true 0.2); after it the gain estimate comes within 5 % of the new
// gain after 106 samples.
//
// Bounds: the distance at most 3 recursive SEs (with forgetting the
// estimate averages about 1/(1 - lambda) samples, so it scatters about
// the batch fit by about its own SE; 3 SEs for the largest of four is a
// two-sided normal tail of 0.27 % each, scipy.stats.norm.sf(3) =
// 0.00135, about 1 % for four); the gain before the change within 5 %
// of the old gain, outside the band of the new one; the delay at most
// three memory lengths, 3/(1 - lambda) = 600 samples. The old samples'
// weight after k samples is lambda^k, below a quarter (where a weighted
// mean of the old and new gains is within 5 % of the new, the change
// being 20 %) for k >= ln 4/(1 - lambda) = 277 (Ljung & Soderstrom
// 1983, ch. 5, the memory of exponential forgetting; from memory); the
// rest of the bound is room for the wait for excitation: the
// steady-state gain shows mostly in large, slow valve moves (the
// setpoint steps), so the delay varies with the record (614 samples on
// the default 4-day record, 1137 on 3 days: the bound holds for this
// record, not for any).
func TestTrack(t *testing.T) {
	dir := t.TempDir()
	var out, errOut bytes.Buffer
	if st := run(context.Background(), []string{"-track", dir, "-days", "2"}, &out, &errOut); st != 0 {
		t.Fatalf("exit status %d: %s", st, errOut.String())
	}
	s := out.String()
	t.Log(s)
	t.Run("distance", func(t *testing.T) {
		if d := figure(t, s, "distance to the batch fit: at most"); !(d <= 3) {
			t.Errorf("largest distance %g recursive SEs, want <= 3", d)
		}
	})
	t.Run("gain before", func(t *testing.T) {
		g0 := greenhouse.True.Valve.Gain()
		if g := figure(t, s, "valve gain recursive"); math.Abs(g/g0-1) > trackWithin {
			t.Errorf("gain before the change %g, want within 5 %% of %g", g, g0)
		}
	})
	t.Run("delay", func(t *testing.T) {
		limit := 3 / (1 - trackForgetting)
		if d := figure(t, s, "of the new gain 0.24 after"); !(d >= 1 && d <= limit) {
			t.Errorf("within 5 %% of the new gain after %g samples, want 1 to %g", d, limit)
		}
	})
	t.Run("files", func(t *testing.T) {
		for _, name := range []string{"coefficients.png", "gain.png"} {
			f, err := os.Open(filepath.Join(dir, name))
			if err != nil {
				t.Fatal(err)
			}
			cfg, err := png.DecodeConfig(f)
			f.Close()
			if err != nil || cfg.Width < 500 || cfg.Height < 300 {
				t.Errorf("%s: %v, %d x %d pixels", name, err, cfg.Width, cfg.Height)
			}
		}
	})
	t.Run("caution", func(t *testing.T) {
		for _, want := range []string{"Review it before it retunes a controller", "independent\ninterlocks", "forgetting 0.995\n(the estimator's default"} {
			if !strings.Contains(s, want) {
				t.Errorf("the output lacks %q", want)
			}
		}
	})
}

// Command lines -track refuses exit with 2 and name the flag.
func TestBadInputTrack(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "file")
	os.WriteFile(file, []byte("x"), 0o600)
	for _, c := range []struct {
		args []string
		msg  string
	}{
		{[]string{"-track", filepath.Join(dir, "none")}, "-track " + filepath.Join(dir, "none") + ": not a folder (create it first)"},
		{[]string{"-track", file}, "not a folder"},
		{[]string{"-days", "2"}, "-days is given without -track"},
		{[]string{"-track", dir, "-days", "31"}, "-days 31: the -track record must be 1 to 30 days long"},
		{[]string{"-track", dir, "-days", "-1"}, "-days -1: the -track record must be 1 to 30 days long"},
		{[]string{"-track", dir, "-days", "two"}, `invalid value "two" for flag -days`},
		{[]string{"-track", dir, "-restore", "-state", dir}, "-track runs the built-in greenhouse scenario and serves nothing"},
		{[]string{"-track", dir, "-config", file}, "leave out -config, -state and -restore"},
	} {
		var out, errOut bytes.Buffer
		st := run(context.Background(), c.args, &out, &errOut)
		if st != 2 || !strings.Contains(errOut.String(), c.msg) {
			t.Errorf("%q: status %d, %q; want 2, %q", c.args, st, errOut.String(), c.msg)
		}
	}
	var errOut bytes.Buffer
	o, _, stop := parseFlags([]string{"-days", "2"}, &errOut)
	if !stop || o != nil {
		t.Errorf("-days without -track: parsed as %+v", o)
	}
	err := (&options{days: 2, arl: 10080}).check(nil)
	if _, ok := err.(*UsageError); !ok {
		t.Errorf("-days without -track: %T %v, want a *UsageError", err, err)
	}
}
