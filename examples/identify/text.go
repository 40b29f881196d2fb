package main

import "strconv"

// clip quotes a flag's value or a series name the user typed for a
// message. Text from a file is quoted by tf/record, which cuts a damaged
// cell short.
func clip(s string) string { return strconv.Quote(s) }

// plural returns one when n is 1, else many.
func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// ivText writes an interval for a message.
func ivText(v float64, unit string) string { return strconv.FormatFloat(v, 'g', 6, 64) + " " + unit }
