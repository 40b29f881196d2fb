package identify

import (
	"math"
	"sort"

	"github.com/backshift/backshift/internal/sym"
	"github.com/backshift/backshift/tf"
)

// The series helpers of Candidates: differencing, constancy and ranges,
// with the same operations as package fit's, so that a series fit finds
// constant Candidates finds constant too.

// applyDiff returns D(B) x, D given by its coefficients dc, with zeros
// before index deg D.
func applyDiff(x, dc []float64) []float64 {
	out := make([]float64, len(x))
	for t := len(dc) - 1; t < len(x); t++ {
		s := 0.0
		for k, c := range dc {
			s += c * x[t-k]
		}
		out[t] = s
	}
	return out
}

// constantAfterDiff reports whether x differenced by dc (from index deg dc on)
// is constant, and its value: a spread within 1e-12 of the largest
// magnitude of x (rounding of the differencing) counts as constant.
func constantAfterDiff(x, dc []float64) (float64, bool) {
	if len(dc) == 0 {
		dc = []float64{1}
	}
	d := len(dc) - 1
	if len(x) <= d {
		return 0, false
	}
	z := applyDiff(x, dc)[d:]
	scale := 0.0
	for _, v := range x {
		scale = math.Max(scale, math.Abs(v))
	}
	lo, hi := z[0], z[0]
	for _, v := range z {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if hi-lo > 1e-12*scale {
		return 0, false
	}
	v := z[0]
	if math.Abs(v) <= 1e-12*scale {
		v = 0
	}
	return v, true
}

// diffText writes a differencing operator for messages, "" for none.
func diffText(dc []float64) string {
	if len(dc) <= 1 {
		return ""
	}
	return tf.FormatPoly(sym.FromCoeffs(dc))
}

// valueRange returns the smallest and largest value of x (0, 0 when empty).
func valueRange(x []float64) (lo, hi float64) {
	if len(x) == 0 {
		return 0, 0
	}
	lo, hi = x[0], x[0]
	for _, v := range x {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	return lo, hi
}

// sortedKeys returns the keys of m in order, so that the first error
// reported does not depend on map order.
func sortedKeys[V any](m map[string]V) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}
