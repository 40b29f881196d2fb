package main

import (
	"slices"
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
