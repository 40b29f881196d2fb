package gaps

import (
	"math"
	"strconv"
)

// Runs returns the runs of NaN samples of x, oldest first, each as a
// half-open range [start, end) of indices: x[start:end] is all NaN, and
// the samples just before start and at end (when inside x) are not.
// A series without a NaN gives nil. x is not modified; Runs is safe for
// concurrent use.
func Runs(x []float64) [][2]int {
	var out [][2]int
	for t := 0; t < len(x); t++ {
		if !math.IsNaN(x[t]) {
			continue
		}
		s := t
		for t < len(x) && math.IsNaN(x[t]) {
			t++
		}
		out = append(out, [2]int{s, t})
	}
	return out
}

// Span writes the run r = [start, end) for a message: "40" for a single
// sample, "12..15 (4 samples)" for more (the last index inclusive).
func Span(r [2]int) string {
	if r[1]-r[0] == 1 {
		return strconv.Itoa(r[0])
	}
	return strconv.Itoa(r[0]) + ".." + strconv.Itoa(r[1]-1) + " (" + strconv.Itoa(r[1]-r[0]) + " samples)"
}
