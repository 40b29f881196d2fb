package fit

import (
	"fmt"
	"strings"
)

// writeLikelihoodRecord writes the record line of an ExactML estimate:
// the samples in the likelihood, the missing ones, and the method of
// the standard errors.
func (e *Estimate) writeLikelihoodRecord(b *strings.Builder) {
	n := len(e.Resid)
	fmt.Fprintf(b, "  record:     %d samples; the exact likelihood counts the %d observed samples from index %d on (%d output samples missing)\n",
		n, e.N, e.Conditioning.First, len(e.Missing))
	fmt.Fprintf(b, "  standard errors: from the observed information, the central-difference Hessian of the log-likelihood (steps of 0.1 standard error or less along the axes the Gauss-Newton information makes uncorrelated)\n")
}

// writeGaps writes the smoothed missing outputs (at most ten) and the
// filled input gaps.
func (e *Estimate) writeGaps(b *strings.Builder) {
	if len(e.Missing) > 0 {
		fmt.Fprintf(b, "\n  missing output samples (%d), smoothed estimate and standard error:\n", len(e.Missing))
		for i, mv := range e.Missing {
			if i == 10 {
				fmt.Fprintf(b, "    ... %d more (Estimate.Missing)\n", len(e.Missing)-10)
				break
			}
			fmt.Fprintf(b, "    %6d  %12s  %10s\n", mv.Index, formatSig(mv.Value, 6), formatSig(mv.SE, 3))
		}
	}
	if len(e.Filled) > 0 {
		b.WriteString("\n  input gaps filled (Settings.InputGaps):\n")
		for _, f := range e.Filled {
			unit := "samples"
			if f.Len == 1 {
				unit = "sample"
			}
			fmt.Fprintf(b, "    %s: %d %s from index %d, %s\n", f.Series, f.Len, unit, f.Index, f.Rule)
		}
	}
}
