package testutil

import (
	"fmt"
	"testing"
)

// TestVariance: the population variance of 1, 2, 3, 4 is 1.25
// (numpy.var([1, 2, 3, 4]) = 1.25, divisor n), exact in float64.
func TestVariance(t *testing.T) {
	if got := Variance([]float64{1, 2, 3, 4}); got != 1.25 {
		t.Errorf("got %v, want 1.25", got)
	}
}

// recorder keeps the messages a helper reports instead of failing.
type recorder struct {
	testing.TB
	msgs []string
}

func (r *recorder) Helper() {}
func (r *recorder) Errorf(format string, args ...any) {
	r.msgs = append(r.msgs, fmt.Sprintf(format, args...))
}

// TestCheckWords: a missing wanted word and a present unwanted word are
// each reported once, naming the case; a message that satisfies both
// lists is not reported.
func TestCheckWords(t *testing.T) {
	r := &recorder{TB: t}
	CheckWords(r, "case", "series \"y\" is short", []string{"short", "rescale"}, []string{"NaN", "series"})
	want := []string{`case: "series \"y\" is short" lacks "rescale"`, `case: "series \"y\" is short" holds "series"`}
	if len(r.msgs) != 2 || r.msgs[0] != want[0] || r.msgs[1] != want[1] {
		t.Errorf("got %q, want %q", r.msgs, want)
	}
	r.msgs = nil
	CheckWords(r, "ok", "series is short", []string{"short"}, []string{"NaN"})
	if len(r.msgs) != 0 {
		t.Errorf("satisfied lists reported %q", r.msgs)
	}
}

// Panics tells a function that panics from one that returns.
func TestPanics(t *testing.T) {
	if !Panics(func() { panic("boom") }) || Panics(func() {}) {
		t.Error("Panics does not tell a panic from a return")
	}
}
