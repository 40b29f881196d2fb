package main

import (
	"fmt"
	"strconv"
	"unicode/utf8"
)

// maxQuoted is the longest text quoted whole in a message; longer text
// is cut to its first maxQuoted characters and a note of its length.
const maxQuoted = 40

// clip quotes s for a message, cut to maxQuoted characters.
func clip(s string) string {
	if utf8.RuneCountInString(s) <= maxQuoted {
		return strconv.Quote(s)
	}
	r := []rune(s)
	return fmt.Sprintf("%s... (%d bytes)", strconv.Quote(string(r[:maxQuoted])), len(s))
}

// plural returns one when n is 1, else many.
func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// ivText writes an interval for a message.
func ivText(v float64, unit string) string { return strconv.FormatFloat(v, 'g', 6, 64) + " " + unit }
