package tf

import (
	"fmt"
	"strings"
)

// StructureLabel describes the structure of m in a few words, the one
// spelling the library and its examples use for a structure: per input
// its dead time b and the degrees r of its denominator and s of its
// numerator, as "valve (b=3, r=1, s=0)", then the noise orders as
// "noise ARMA(p, q)" (white noise is "noise ARMA(0, 0)"; a model without
// a noise term says "no noise term"), separated by ", ".
func StructureLabel(m Model) string {
	var parts []string
	for _, in := range m.Inputs {
		parts = append(parts, fmt.Sprintf("%s (b=%d, r=%d, s=%d)", in.Series, in.Delay, in.Den.Degree(), in.Num.Degree()))
	}
	noise := "no noise term"
	if m.Noise != nil {
		noise = fmt.Sprintf("noise ARMA(%d, %d)", m.Noise.AR.Degree(), m.Noise.MA.Degree())
	}
	return strings.Join(append(parts, noise), ", ")
}
