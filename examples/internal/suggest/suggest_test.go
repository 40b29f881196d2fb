package suggest

import (
	"fmt"
	"strings"
	"testing"
)

// TestNear checks the edit distance on pairs worked by hand (the
// Levenshtein distance: kitten/sitting is 3, the textbook example) and
// the case and length rules.
func TestNear(t *testing.T) {
	for _, c := range []struct {
		a, b string
		dist int
		near bool
	}{
		{"kitten", "sitting", 3, false},
		{"valve", "vlave", 2, true},
		{"valve", "valve2", 1, true},
		{"", "abc", 3, false},
		{"spec", "sepc", 2, true},
		{"Valve", "VALVE", 4, true}, // the distance counts case; Near ignores it
	} {
		if d := distance(c.a, c.b); d != c.dist {
			t.Errorf("distance(%q, %q) = %d, want %d", c.a, c.b, d, c.dist)
		}
		if n := Near(c.a, c.b); n != c.near {
			t.Errorf("Near(%q, %q) = %v, want %v", c.a, c.b, n, c.near)
		}
	}
	long := strings.Repeat("a", 33)
	if Near(long, long+"b") {
		t.Error("names over 32 bytes are near")
	}
}

// TestDidYouMean checks the hint's wording and that the first near
// candidate wins.
func TestDidYouMean(t *testing.T) {
	if got := DidYouMean("vlave", "outdoor", "valve", "valves"); got != "did you mean valve?" {
		t.Errorf("got %q", got)
	}
	if got := DidYouMean("humidity", "outdoor", "valve"); got != "" {
		t.Errorf("got %q, want no hint", got)
	}
}

// ExampleDidYouMean shows the hint for a misspelt series name.
func ExampleDidYouMean() {
	fmt.Println(DidYouMean("outdor", "valve", "outdoor"))
	// Output: did you mean outdoor?
}
