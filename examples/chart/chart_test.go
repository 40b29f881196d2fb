package chart

import (
	"image/color"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"testing"
)

// TestTicks checks the axis ticks: round values 1, 2 or 5 times a power
// of ten apart inside the range, labelled with the decimals the spacing
// needs (expected values worked by hand).
func TestTicks(t *testing.T) {
	for _, tc := range []struct {
		lo, hi float64
		want   []string
	}{
		{0, 5760, []string{"0", "1000", "2000", "3000", "4000", "5000"}},
		{-0.031, 0.028, []string{"-0.03", "-0.02", "-0.01", "0.00", "0.01", "0.02"}},
		{0, 0.21, []string{"0.00", "0.05", "0.10", "0.15", "0.20"}},
		{-360, 180, []string{"-300", "-200", "-100", "0", "100"}},
		{15.2, 16.8, []string{"15.2", "15.4", "15.6", "15.8", "16.0", "16.2", "16.4", "16.6", "16.8"}},
	} {
		_, got := ticks(tc.lo, tc.hi)
		if !slices.Equal(got, tc.want) {
			t.Errorf("ticks(%g, %g) = %q, want %q", tc.lo, tc.hi, got, tc.want)
		}
	}
}

// TestDegenerate draws charts whose data or fixed ranges are empty,
// single-valued or not finite: each must still be written (as a PNG with
// default ranges) without hanging or panicking.
func TestDegenerate(t *testing.T) {
	nan := math.NaN()
	dir := t.TempDir()
	for i, c := range []*Chart{
		New("empty", "x", "y"),
		func() *Chart {
			p := New("all NaN", "x", "y")
			p.Legend("nothing", p.Line([]float64{0, 1}, []float64{nan, nan}, color.Black, 1))
			return p
		}(),
		func() *Chart {
			p := New("one value", "x", "y")
			p.Line([]float64{2, 2}, []float64{5, 5}, color.Black, 1)
			return p
		}(),
		func() *Chart {
			p := New("bad fixed range", "x", "y")
			p.Line([]float64{0, 1}, []float64{0, 1}, color.Black, 1)
			p.SetY(0, nan)
			p.SetX(3, 3)
			return p
		}(),
	} {
		path := filepath.Join(dir, strconv.Itoa(i)+".png")
		if err := Save(path, []*Chart{c}, 10, 6); err != nil {
			t.Errorf("%s: %v", c.Title, err)
			continue
		}
		f, err := os.Open(path)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := png.Decode(f); err != nil {
			t.Errorf("%s: %v", c.Title, err)
		}
		f.Close()
	}
}

// TestMovingAverage checks the centred average at the ends (fewer
// samples) and across a NaN (left out); expected values worked by hand.
func TestMovingAverage(t *testing.T) {
	nan := math.NaN()
	got := MovingAverage([]float64{1, 2, nan, 4, 5}, 3)
	want := []float64{1.5, 1.5, 3, 4.5, 4.5}
	for i := range want {
		if math.Abs(got[i]-want[i]) > 1e-12 {
			t.Fatalf("MovingAverage = %v, want %v", got, want)
		}
	}
	if got := MovingAverage([]float64{nan}, 5); !math.IsNaN(got[0]) {
		t.Errorf("MovingAverage of NaN alone = %v, want NaN", got)
	}
}

// TestLegendBeside checks that a legend takes room right of the data
// area in every panel of a picture, so that the data areas line up and
// no legend covers data.
func TestLegendBeside(t *testing.T) {
	a, b := New("a", "x", "y"), New("b", "x", "y")
	a.Legend("a long legend label", a.Line([]float64{0, 1}, []float64{0, 1}, color.Black, 1))
	if a.legendWidth() <= b.legendWidth() || b.legendWidth() != 0 {
		t.Errorf("legend widths %v and %v: want a positive width for the chart with a legend, 0 without", a.legendWidth(), b.legendWidth())
	}
}
