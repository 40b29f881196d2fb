package testutil

import (
	"math"
	"testing"
)

// TestHostileSeries: each byte pair decodes to the documented sample
// (worked by hand from the rule in the doc comment), the length stops at
// Max, and Down zero leaves the scaled-down case ordinary.
func TestHostileSeries(t *testing.T) {
	data := []byte{0, 1, 1, 1, 2, 1, 3, 1, 4, 1, 5, 9, 9, 16, 10, 16, 11, 248}
	got := HostileSeries(data, Hostile{Max: 20, Div: 8, Up: 10, Down: 0.5})
	want := []float64{math.NaN(), math.Inf(1), math.Inf(-1), 1e300, 1e-300, 1e-300, 20, 1, -1}
	if len(got) != len(want) {
		t.Fatalf("got %v, want %v", got, want)
	}
	for i := range want {
		if !(got[i] == want[i] || math.IsNaN(got[i]) && math.IsNaN(want[i])) {
			t.Errorf("sample %d: got %v, want %v", i, got[i], want[i])
		}
	}
	if got := HostileSeries(data, Hostile{Max: 3, Div: 8, Up: 10}); len(got) != 3 {
		t.Errorf("Max 3: got %d samples", len(got))
	}
	if got := HostileSeries([]byte{10, 16}, Hostile{Max: 3, Div: 8, Up: 10}); got[0] != 2 {
		t.Errorf("Down zero: got %v, want 2", got[0])
	}
}
