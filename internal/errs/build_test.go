package errs

import (
	"errors"
	"testing"
)

// The constructors are checked with the shapes, in TestShapes.

// Num writes the shortest text that reads back to the number
// (strconv 'g', -1: common practice for messages).
func TestNum(t *testing.T) {
	for v, want := range map[float64]string{0.1: "0.1", 1e-300: "1e-300", -2: "-2", 1.0 / 3: "0.3333333333333333"} {
		if got := Num(v); got != want {
			t.Errorf("Num(%v) = %q, want %q", v, got, want)
		}
	}
}

// OrderBound: zero gives the default, a negative bound order zero only,
// a positive one itself (the settings rule in the package doc).
func TestOrderBound(t *testing.T) {
	for _, tc := range []struct{ m, def, want int }{{0, 2, 2}, {0, 5, 5}, {-1, 2, 0}, {3, 2, 3}} {
		if got := OrderBound(tc.m, tc.def); got != tc.want {
			t.Errorf("OrderBound(%d, %d) = %d, want %d", tc.m, tc.def, got, tc.want)
		}
	}
}

// First reports the first failing check in the order written, and nil
// when every check passes.
func TestFirst(t *testing.T) {
	a, b := errors.New("a"), errors.New("b")
	if got := First(nil, a, b); got != a {
		t.Errorf("First(nil, a, b) = %v, want a", got)
	}
	if got := First(b, a); got != b {
		t.Errorf("First(b, a) = %v, want b", got)
	}
	if got := First(nil, nil); got != nil {
		t.Errorf("First(nil, nil) = %v, want nil", got)
	}
	if got := First(); got != nil {
		t.Errorf("First() = %v, want nil", got)
	}
}
