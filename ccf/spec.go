package ccf

import (
	"math"
	"strconv"
	"strings"
)

// termText writes the input term B^b omega(B)/delta(B) x with free
// coefficients named prefix+"w0".. (omega, plus signs) and prefix+"d1"..
// (delta, minus signs), and returns it with the names in written order
// and their start values.
func termText(input, prefix string, b int, num, den []float64) (string, []string, map[string]float64) {
	starts := map[string]float64{}
	var names []string
	var sb strings.Builder
	wname := func(k int) string { return prefix + "w" + strconv.Itoa(k) }
	dname := func(k int) string { return prefix + "d" + strconv.Itoa(k) }
	if len(num) == 1 {
		sb.WriteString(wname(0))
	} else {
		sb.WriteString("(")
		for k := range num {
			if k > 0 {
				sb.WriteString(" + ")
			}
			sb.WriteString(wname(k))
			sb.WriteString(bPower(k))
		}
		sb.WriteString(")")
	}
	for k, v := range num {
		names = append(names, wname(k))
		starts[wname(k)] = v
	}
	if len(den) > 1 {
		sb.WriteString(" / (1")
		for k := 1; k < len(den); k++ {
			sb.WriteString(" - ")
			sb.WriteString(dname(k))
			sb.WriteString(bPower(k))
			names = append(names, dname(k))
			starts[dname(k)] = -den[k]
		}
		sb.WriteString(")")
	}
	if b > 0 {
		sb.WriteString(" " + strings.TrimPrefix(bPower(b), " "))
	}
	sb.WriteString(" " + input)
	return sb.String(), names, starts
}

// bPower returns " B^k" (" B" for k = 1, "" for k = 0).
func bPower(k int) string {
	switch k {
	case 0:
		return ""
	case 1:
		return " B"
	}
	return " B^" + strconv.Itoa(k)
}

// Spec returns a whole model spec with this candidate as its only input
// term,
//
//	output = Term + noise where w0 ~ ..., d1 ~ ...
//
// with the start values rounded to 6 significant digits. noise is the
// noise term as spec text; empty means "a" (white noise). Use Term and
// Starts to assemble models with several inputs.
func (c Candidate) Spec(output, noise string) string {
	if noise == "" {
		noise = "a"
	}
	var sb strings.Builder
	sb.WriteString(output)
	sb.WriteString(" = ")
	sb.WriteString(c.Term)
	sb.WriteString(" + ")
	sb.WriteString(noise)
	sb.WriteString(StartClause(c.Names, c.Starts))
	return sb.String()
}

// StartClause returns " where n1 ~ v1, n2 ~ v2" for the given names in
// order, with values from starts rounded to 6 significant digits, or ""
// when no name has a start. A name missing from starts, or whose start is
// NaN or infinite, is left out of the clause, so that the parser's default
// applies to it (free, starting at 0) instead of a made-up value.
func StartClause(names []string, starts map[string]float64) string {
	var sb strings.Builder
	for _, n := range names {
		v, ok := starts[n]
		if !ok || math.IsNaN(v) || math.IsInf(v, 0) {
			continue
		}
		if sb.Len() == 0 {
			sb.WriteString(" where ")
		} else {
			sb.WriteString(", ")
		}
		sb.WriteString(n)
		sb.WriteString(" ~ ")
		sb.WriteString(strconv.FormatFloat(v, 'g', 6, 64))
	}
	return sb.String()
}

// diffText writes a differencing polynomial of fixed numbers, "(1 - B)",
// "(1 - B^12)", "(1 - 2 B + B^2)".
func diffText(c []float64) string {
	var sb strings.Builder
	sb.WriteString("(")
	sb.WriteString(strconv.FormatFloat(c[0], 'g', -1, 64))
	for k := 1; k < len(c); k++ {
		v := c[k]
		if v == 0 {
			continue
		}
		if v < 0 {
			sb.WriteString(" - ")
			v = -v
		} else {
			sb.WriteString(" + ")
		}
		if v != 1 {
			sb.WriteString(strconv.FormatFloat(v, 'g', -1, 64) + " ")
		}
		sb.WriteString(strings.TrimPrefix(bPower(k), " "))
	}
	sb.WriteString(")")
	return sb.String()
}
