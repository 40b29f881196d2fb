package gaps

import (
	"math"
	"slices"
	"testing"
)

// TestRuns checks the runs against lists written by hand: none, one at
// each end, single samples, the whole series, and that x is left alone.
func TestRuns(t *testing.T) {
	nan := math.NaN()
	for _, c := range []struct {
		x    []float64
		want [][2]int
	}{
		{nil, nil},
		{[]float64{1, 2, 3}, nil},
		{[]float64{nan}, [][2]int{{0, 1}}},
		{[]float64{nan, nan, 1, 2, nan, 3, nan, nan, nan}, [][2]int{{0, 2}, {4, 5}, {6, 9}}},
		{[]float64{1, nan, 2, nan, 3}, [][2]int{{1, 2}, {3, 4}}},
		{[]float64{math.Inf(1), nan, 0}, [][2]int{{1, 2}}}, // an infinity is a value, not a gap
	} {
		in := slices.Clone(c.x)
		got := Runs(c.x)
		if !slices.Equal(got, c.want) {
			t.Errorf("Runs(%v) = %v, want %v", c.x, got, c.want)
		}
		for i := range in {
			if math.Float64bits(in[i]) != math.Float64bits(c.x[i]) {
				t.Errorf("Runs modified x[%d]", i)
			}
		}
	}
}

// TestSpan checks the wording: one sample is its index alone, never
// "(1 samples)".
func TestSpan(t *testing.T) {
	for _, c := range []struct {
		r    [2]int
		want string
	}{
		{[2]int{0, 1}, "0"},
		{[2]int{12, 16}, "12..15 (4 samples)"},
		{[2]int{7, 9}, "7..8 (2 samples)"},
	} {
		if got := Span(c.r); got != c.want {
			t.Errorf("Span(%v) = %q, want %q", c.r, got, c.want)
		}
	}
}
