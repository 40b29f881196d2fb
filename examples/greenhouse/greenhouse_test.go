package greenhouse

import (
	"bytes"
	"math"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat"

	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/parse"
)

func TestGenerateDeterministic(t *testing.T) {
	a, b := Default(), Default()
	if a.Len() != 5760 {
		t.Fatalf("default record has %d samples, want 4 days = 5760", a.Len())
	}
	for _, name := range []string{Output, Valve, Outdoor, Setpoint, Minute} {
		x, _ := a.Series(name)
		y, _ := b.Series(name)
		if !slices.Equal(x, y) {
			t.Errorf("series %s differs between two runs with the same seed", name)
		}
	}
	c := Generate(Settings{Seed: 8})
	if slices.Equal(a.Temp, c.Temp) {
		t.Error("a different seed gave the same temperatures")
	}
}

func TestValveLimitsAndSaturation(t *testing.T) {
	d := Default()
	sat := 0
	for i, u := range d.Valve {
		if u < 0 || u > 100 || math.IsNaN(u) {
			t.Fatalf("valve[%d] = %v outside 0..100 %%", i, u)
		}
		if u == 100 {
			sat++
		}
	}
	// The morning setpoint rises on the cold days drive the valve fully
	// open for a while: the demo must show saturation.
	if sat == 0 {
		t.Error("valve never saturates at 100 %")
	}
}

// innovations rebuilds the innovations a_t from the record with the
// library's recursive filter kernel (not the generator's own loop): the
// input paths on deviations from the first sample (the record begins
// after a settled warm-up), then (1 - 0.8 B)/(1 + 0.3 B) on the noise,
// from sample 300 on with the mean removed (the noise carries the
// unknown start levels as a constant).
func innovations(d Data) []float64 {
	n := d.Len()
	lag := func(x []float64, k int) []float64 {
		out := make([]float64, n)
		copy(out[k:], x[:n-k])
		return out
	}
	dev := func(x []float64) []float64 {
		out := make([]float64, n)
		for i := range x {
			out[i] = x[i] - x[0]
		}
		return out
	}
	vp := make([]float64, n)
	filter.Run(vp, []float64{True.Valve.Omega}, []float64{1, -True.Valve.Delta}, lag(dev(d.Valve), True.Valve.Delay))
	op := make([]float64, n)
	filter.Run(op, []float64{True.Outdoor.Omega}, []float64{1, -True.Outdoor.Delta}, lag(dev(d.Outdoor), True.Outdoor.Delay))
	noise := make([]float64, n)
	for i := range noise {
		noise[i] = d.Temp[i] - vp[i] - op[i]
	}
	a := make([]float64, n)
	filter.Run(a, []float64{1, -True.Phi}, []float64{1, True.Theta}, noise)
	// 300 samples is over 15 time constants of the slowest path.
	a = a[300:]
	mean := stat.Mean(a, nil)
	for i := range a {
		a[i] -= mean
	}
	return a
}

// TestRecordFollowsTrueModel checks that the innovations are white with
// the true standard deviation.
func TestRecordFollowsTrueModel(t *testing.T) {
	a := innovations(Default())
	_, sd := stat.PopMeanStdDev(a, nil)
	// With 5460 samples the sample SD of Gaussian noise is within
	// 3*sigma/sqrt(2n) ~ 3 % of sigma (common practice: 3 standard errors).
	if math.Abs(sd/True.Sigma-1) > 0.03 {
		t.Errorf("innovation SD %.4f, want %.4f within 3 %%", sd, True.Sigma)
	}
	// Lag-1 autocorrelation of white noise: |r1| < 3/sqrt(n).
	r1 := 0.0
	for i := 1; i < len(a); i++ {
		r1 += a[i] * a[i-1]
	}
	r1 /= float64(len(a)) * sd * sd
	if math.Abs(r1) > 3/math.Sqrt(float64(len(a))) {
		t.Errorf("innovations not white: lag-1 autocorrelation %.3f", r1)
	}
}

// TestInnovationsAgainstScipy compares with the innovations that
// testdata/innovations.py recovers with scipy.signal.lfilter 1.10.1 from
// the record written as CSV (4 decimals).
func TestInnovationsAgainstScipy(t *testing.T) {
	var ref struct {
		N     int
		SD    float64
		R1    float64
		First []float64
	}
	testutil.ReadJSON(t, "examples/greenhouse/testdata/innovations.json", &ref)
	d := Default()
	if d.Len() != ref.N {
		t.Fatalf("record has %d samples, reference %d", d.Len(), ref.N)
	}
	a := innovations(d)
	// The CSV rounds to 4 decimals (errors up to 5e-5); the noise filter
	// amplifies them at most (1 + 0.8)/(1 - 0.3) ~ 2.6 times: 5e-4 is
	// a safe absolute bound per innovation.
	worst := 0.0
	for i, want := range ref.First {
		worst = math.Max(worst, math.Abs(a[i]-want))
		if math.Abs(a[i]-want) > 5e-4 {
			t.Errorf("a[%d] = %.6f, scipy %.6f", 300+i, a[i], want)
		}
	}
	t.Logf("largest difference of the first %d innovations from scipy's: %.2g", len(ref.First), worst)
	// Rounding adds variance ~ (2.6 * 5e-5)^2/3 ~ 6e-9 to 9e-4: 1e-3 relative.
	_, sd := stat.PopMeanStdDev(a, nil)
	if math.Abs(sd/ref.SD-1) > 1e-3 {
		t.Errorf("innovation SD %.6f, scipy %.6f", sd, ref.SD)
	}
	// Lag-1 autocorrelation, numpy's mean(a[1:]*a[:-1])/var(a) in the
	// script (population variance here too). The CSV's rounding moves
	// r1 by about 4e-5 (measured); 1e-3 absolute leaves room for that
	// while a wrong noise filter or a lag slip (r1 of order 0.1) fails.
	r1 := 0.0
	for i := 1; i < len(a); i++ {
		r1 += a[i] * a[i-1]
	}
	r1 /= float64(len(a)-1) * sd * sd
	t.Logf("lag-1 autocorrelation %.6g, scipy/numpy %.6g", r1, ref.R1)
	if math.Abs(r1-ref.R1) > 1e-3 {
		t.Errorf("lag-1 autocorrelation %.6f, scipy/numpy %.6f", r1, ref.R1)
	}
}

func TestWriteCSV(t *testing.T) {
	d := Generate(Settings{Days: 1})
	var buf bytes.Buffer
	if err := d.WriteCSV(&buf); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(buf.String()), "\n")
	if len(lines) != 1441 {
		t.Fatalf("%d lines, want header + 1440", len(lines))
	}
	if lines[0] != "minute,setpoint,valve,outdoor,temp" {
		t.Errorf("header %q", lines[0])
	}
}

func TestPathNumbers(t *testing.T) {
	// Gains and time constants quoted in the package documentation.
	if g := True.Valve.Gain(); math.Abs(g-0.2) > 1e-12 {
		t.Errorf("valve gain %v", g)
	}
	if g := True.Outdoor.Gain(); math.Abs(g-0.5) > 1e-12 {
		t.Errorf("outdoor gain %v", g)
	}
	if tc := True.Valve.TimeConstant(); math.Abs(tc-19.5) > 0.05 {
		t.Errorf("valve time constant %v min", tc)
	}
}

func TestTrueSpecIsTheTypedModel(t *testing.T) {
	m, err := parse.Model(TrueSpec)
	if err != nil {
		t.Fatal(err)
	}
	if !m.Equal(True.Model()) {
		t.Errorf("TrueSpec parses to\n%v\nbut the typed truth prints as\n%v", m, True.Model())
	}
}

// TestStructure checks that Structure is TrueSpec with its coefficients
// made free: the same output, inputs, dead times and orders, one free
// coefficient for each fixed one but the interval.
func TestStructure(t *testing.T) {
	free, err := parse.Model(Structure)
	if err != nil {
		t.Fatal(err)
	}
	fixed := parse.MustModel(TrueSpec)
	if free.Output != fixed.Output || len(free.Inputs) != len(fixed.Inputs) {
		t.Fatalf("Structure %v, TrueSpec %v", free, fixed)
	}
	for i, in := range free.Inputs {
		f := fixed.Inputs[i]
		if in.Series != f.Series || in.Delay != f.Delay || in.Num.Degree() != f.Num.Degree() || in.Den.Degree() != f.Den.Degree() {
			t.Errorf("input %d: %v, want the structure of %v", i, in, f)
		}
	}
	if n := len(free.Params()); n != 7 {
		t.Errorf("Structure has %d free coefficients, want 7 (c, w0, d1, v0, e1, t1, p1)", n)
	}
	d := Generate(Settings{Days: 1})
	for name, s := range d.ByName() {
		if want, ok := d.Series(name); !ok || &want[0] != &s[0] {
			t.Errorf("ByName()[%q] is not the record's series", name)
		}
	}
}
