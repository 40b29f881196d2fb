package ccf

import (
	"fmt"
	"math"
	"strings"
)

// String returns a plain-text summary for people: the weights with their
// t-ratios (marked * when beyond the 95 % normal quantile), the dead time,
// the corner method's pick and the ranked forms with their scores. Numbers
// are rounded for reading; use the fields for full precision. A nil
// Identification prints as "<nil ccf.Identification>".
func (id *Identification) String() string {
	if id == nil {
		return "<nil ccf.Identification>"
	}
	var sb strings.Builder
	fmt.Fprintf(&sb, "input %s: dead time %d samples", id.Input, id.DeadTime)
	if id.Offset != 0 {
		fmt.Fprintf(&sb, " (weights measured from the negative-lag level %.4g)", id.Offset)
	}
	sb.WriteString("\n")
	if w := id.Weights; w != nil {
		sb.WriteString("  lag    weight   t-ratio\n")
		z := normalQuantile(0.975)
		for k := range w.V {
			t := (w.V[k] - id.Offset) / w.SE[k]
			mark := ""
			if math.Abs(t) > z {
				mark = " *"
			}
			fmt.Fprintf(&sb, "  %3d  %8.4g  %7.2f%s\n", k, w.V[k], t, mark)
		}
		if len(w.Feedback) > 0 {
			fmt.Fprintf(&sb, "  significant at negative lags %v: feedback or an input not white after prewhitening\n", w.Feedback)
		}
	}
	if id.CornerR >= 0 {
		fmt.Fprintf(&sb, "  corner method: r = %d, s = %d\n", id.CornerR, id.CornerS)
	}
	sb.WriteString("  rank  structure        score    shape\n")
	for i, c := range id.Forms {
		mark := ""
		if c.Corner {
			mark = "  (corner)"
		}
		if c.Redundant {
			mark += "  (zero-pole pair cancels)"
		}
		if c.TooSlow {
			mark += "  (pole too slow for the lags)"
		}
		fmt.Fprintf(&sb, "  %4d  %-15s  %7.2f  %s%s\n", i+1, c, c.Score, c.Pattern, mark)
	}
	return sb.String()
}
