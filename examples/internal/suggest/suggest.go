// Package suggest finds the name a user likely meant when the one typed
// is not known (a misspelt config key, model or series name), for the
// "did you mean" hints of the example programs.
package suggest

import "strings"

// maxLen is the longest name compared (in bytes): a misspelt key or name
// is short, and the comparison costs the product of the two lengths.
const maxLen = 32

// Near reports whether a and b, ignoring case, differ by at most two
// single-byte edits (insertions, deletions or substitutions: the
// Levenshtein distance). Names longer than 32 bytes are never near.
func Near(a, b string) bool {
	a, b = strings.ToLower(a), strings.ToLower(b)
	if len(a) > maxLen || len(b) > maxLen {
		return false
	}
	return distance(a, b) <= 2
}

// DidYouMean returns "did you mean X?" for the first candidate X near
// name, else "".
func DidYouMean(name string, candidates ...string) string {
	for _, c := range candidates {
		if Near(name, c) {
			return "did you mean " + c + "?"
		}
	}
	return ""
}

// distance is the Levenshtein distance between a and b, counted in
// bytes.
func distance(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}
