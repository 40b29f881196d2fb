package main

import (
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

// TestChartDegenerate draws charts whose data or fixed ranges are empty,
// single-valued or not finite: each must still be written (as a PNG with
// default ranges) without hanging or panicking.
func TestChartDegenerate(t *testing.T) {
	nan := math.NaN()
	dir := t.TempDir()
	for i, c := range []*chart{
		newPlot("empty", "x", "y"),
		func() *chart {
			p := newPlot("all NaN", "x", "y")
			line(p, []float64{0, 1}, []float64{nan, nan}, colData, 1)
			return p
		}(),
		func() *chart {
			p := newPlot("one value", "x", "y")
			line(p, []float64{2, 2}, []float64{5, 5}, colData, 1)
			return p
		}(),
		func() *chart {
			p := newPlot("bad fixed range", "x", "y")
			line(p, []float64{0, 1}, []float64{0, 1}, colData, 1)
			p.setY(0, nan)
			p.setX(3, 3)
			return p
		}(),
	} {
		path := filepath.Join(dir, strconv.Itoa(i)+".png")
		if err := savePanels(path, []*chart{c}, 10, 6); err != nil {
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
