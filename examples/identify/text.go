package main

import (
	"math"
	"strconv"
)

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

// amount writes a duration v in unit for people: "1 sample" and "3
// samples" when the unit is samples (no interval known), else "2.5 min".
func amount(v float64, unit string) string {
	if unit == "samples" && v == 1 {
		return "1 sample"
	}
	return strconv.FormatFloat(v, 'g', -1, 64) + " " + unit
}

// ivText writes an interval for a message.
func ivText(v float64, unit string) string { return strconv.FormatFloat(v, 'g', 6, 64) + " " + unit }

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
