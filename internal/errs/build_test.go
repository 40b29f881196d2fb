package errs

import (
	"errors"
	"strings"
	"testing"
)

// The constructors build the shapes with Op empty and the kind they
// are documented to match (wording: the library's own).
func TestConstructors(t *testing.T) {
	for _, tc := range []struct {
		name string
		err  error
		kind error
		want string
	}{
		{"Series", Series("y", ErrShort, 3, 10, "to fit"), ErrShort, `series "y": 3 samples, at least 10 needed (to fit)`},
		{"Model", Model("input \"x\"", "it is unstable"), ErrModel, `input "x": it is unstable`},
		{"Setting", Setting("Settings.Tol", "-1", "must be zero or positive"), ErrSetting, `Settings.Tol = -1: must be zero or positive`},
		{"UnknownInput", UnknownInput("Settings.InputDiff", "vlave", []string{"valve", "feed"}), ErrName,
			`named in Settings.InputDiff, it is not an input (the inputs are "valve", "feed"); check the spelling`},
		{"UnknownInput none", UnknownInput("Settings.InputDiff", "x", nil), ErrName, "(there are no inputs)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if !errors.Is(tc.err, tc.kind) {
				t.Errorf("%v does not match %v", tc.err, tc.kind)
			}
			if msg := tc.err.Error(); !strings.Contains(msg, tc.want) {
				t.Errorf("message %q lacks %q", msg, tc.want)
			}
		})
	}
}

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
