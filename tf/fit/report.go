package fit

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/backshift/backshift/tf"
)

// String returns a plain-text report of the fit for people: the fitted
// model as a spec (which package parse reads back, estimates as start
// values), the conditioning, a table of the coefficients with their
// standard errors and the ratio of each value to its standard error, the
// noise variance and information criteria, the correlations of the estimates,
// for each input its dead time, poles, zeros and steady-state gain, the
// warnings, and the soundness of the estimate (Estimate.Soundness): a
// faulty estimate is reported as not to be trusted with every reason; a
// sound one is not called adequate, which only the checks can say. Numbers are rounded for reading; the fields of Estimate
// hold full precision.
func (e *Estimate) String() string {
	if e == nil {
		return "no estimate (nil)\n"
	}
	var b strings.Builder
	w := e.writeSearch(&b)
	e.writeCriteria(&b)
	e.writeGaps(&b)
	e.writeCorrelations(&b, w)
	for _, in := range e.Model.Inputs {
		e.writeInput(&b, in)
	}
	e.writeVerdict(&b)
	return b.String()
}

// writeSearch writes the model, the record and the search, and the table
// of estimates; it returns the width of the name column.
func (e *Estimate) writeSearch(b *strings.Builder) int {
	n := e.N + e.Conditioning.First
	fmt.Fprintf(b, "Model of %s with coefficients estimated by %s\n", e.Model.Output, e.Method)
	fmt.Fprintf(b, "  as a spec:  %s\n", e.Model.String()) // full precision: the line reloads as the fitted model
	if e.Method == ExactML {
		e.writeLikelihoodRecord(b)
	} else {
		fmt.Fprintf(b, "  record:     %d samples; the sum of squares counts the %d residuals from index %d on\n", n, e.N, e.Conditioning.First)
	}
	status := "converged"
	if !e.Converged {
		status = "NOT converged"
	}
	fmt.Fprintf(b, "  search:     %s after %d iterations (%d evaluations, %d start points screened)\n",
		status, e.Iter, e.Evals, e.StartsTried)
	fmt.Fprintf(b, "              %s\n\n", e.Reason)
	w := len("coefficient")
	for _, p := range e.Params {
		w = max(w, len(p.Name))
	}
	fmt.Fprintf(b, "  %-*s  %12s  %14s  %8s\n", w, "coefficient", "value", "standard error", "value/se")
	for _, p := range e.Params {
		fmt.Fprintf(b, "  %-*s  %12s  %14s  %8s\n", w, p.Name, formatSig(p.Value, 5), formatSig(p.SE, 3), formatFixed(p.T, 2))
	}
	return w
}

// writeCriteria writes the noise variance, the log-likelihood and the
// information criteria.
func (e *Estimate) writeCriteria(b *strings.Builder) {
	k := len(e.Params)
	fmt.Fprintf(b, "\n  noise variance %s from %d residuals less %d coefficients (sum of squares %s / %d)\n",
		formatSig(e.Sigma2, 5), e.N, k, formatSig(e.SSQ, 6), e.N-k)
	kind := "conditional"
	if e.Method == ExactML {
		kind = "exact"
	}
	fmt.Fprintf(b, "  %s log-likelihood %s; information criteria AIC %s, BIC %s\n", kind, formatFixed(e.LogLik, 2), formatFixed(e.AIC, 2), formatFixed(e.BIC, 2))
}

// writeCorrelations writes the lower triangle of the correlations of the
// estimates (w the width of the name column).
func (e *Estimate) writeCorrelations(b *strings.Builder, w int) {
	if len(e.Params) > 1 {
		b.WriteString("\n  correlations of the estimates\n")
		corr := e.Corr()
		cw := 5
		for _, p := range e.Params[:len(e.Params)-1] {
			cw = max(cw, len(p.Name))
		}
		for i := 1; i < len(e.Params); i++ {
			fmt.Fprintf(b, "  %-*s", w, e.Params[i].Name)
			for j := 0; j < i; j++ {
				fmt.Fprintf(b, " %*s", cw, formatFixed(corr[i][j], 2))
			}
			b.WriteByte('\n')
		}
		fmt.Fprintf(b, "  %-*s", w, "")
		for j := 0; j < len(e.Params)-1; j++ {
			fmt.Fprintf(b, " %*s", cw, e.Params[j].Name)
		}
		b.WriteByte('\n')
	}
}

// writeInput writes the dead time, poles, zeros and gain of one input.
func (e *Estimate) writeInput(b *strings.Builder, in tf.Input) {
	unit := "samples"
	if in.Delay == 1 {
		unit = "sample"
	}
	fmt.Fprintf(b, "\n  input %s: dead time %d %s", in.Series, in.Delay, unit)
	if e.Model.Interval.Value > 0 {
		fmt.Fprintf(b, " (%s %s)", formatSig(float64(in.Delay)*e.Model.Interval.Value, 4), e.Model.Interval.Unit)
	}
	b.WriteByte('\n')
	poles := zRoots(in.Den.Coeffs())
	zeros := zRoots(in.Num.Coeffs())
	fmt.Fprintf(b, "    poles (z): %s\n", formatRoots(poles))
	fmt.Fprintf(b, "    zeros (z): %s\n", formatRoots(zeros))
	if r, err := in.Rational(); err == nil {
		if g, err := r.Gain(); err == nil {
			if in.Diff.IsOne() {
				fmt.Fprintf(b, "    steady-state gain: %s\n", formatSig(g, 4))
			} else {
				fmt.Fprintf(b, "    steady-state gain on the differenced input: %s\n", formatSig(g, 4))
			}
		} else {
			fmt.Fprintf(b, "    steady-state gain: none (%v)\n", err)
		}
	}
}

// writeVerdict writes the noise roots, the warnings and whether the
// estimate is to be trusted.
func (e *Estimate) writeVerdict(b *strings.Builder) {
	if e.Model.Noise != nil && !e.Model.Noise.IsWhite() {
		fmt.Fprintf(b, "\n  noise: AR roots (z) %s; MA roots (z) %s\n",
			formatRoots(zRoots(e.Model.Noise.AR.Coeffs())), formatRoots(zRoots(e.Model.Noise.MA.Coeffs())))
	}
	if len(e.Warnings) == 0 {
		b.WriteString("\n  warnings: none\n")
	} else {
		b.WriteString("\n  warnings:\n")
		for _, wr := range e.Warnings {
			fmt.Fprintf(b, "    - %s\n", wr.Message)
		}
	}
	if bad := e.Soundness(); len(bad) > 0 {
		b.WriteString("\n  estimate: NOT to be trusted, for control work or forecasts:\n")
		for _, f := range bad {
			fmt.Fprintf(b, "    - %s\n", f)
		}
	} else {
		b.WriteString("\n  estimate: no fault found in the estimate itself; whether the model is adequate is for the residual checks (Check)\n")
	}
}

// String returns a plain-text report of the checks with their verdicts;
// the first line gives the overall verdict (Pass), and when the model
// fails the last lines list every reason (Failures), the estimate's own
// faults first, so that a model whose checks pass but whose estimate is
// faulty is never reported as fine.
func (d *Diagnostics) String() string {
	if d == nil {
		return "no diagnostic checks (nil)\n"
	}
	var b strings.Builder
	verdict := func(ok bool) string {
		if ok {
			return "pass"
		}
		return "FAIL"
	}
	head := "all pass and the estimate is sound"
	if !d.Pass {
		head = "the model is NOT to be trusted (reasons at the end)"
	}
	fmt.Fprintf(&b, "Diagnostic checks at the %s level: %s\n", formatSig(d.Alpha, 3), head)
	r := d.Residual
	fmt.Fprintf(&b, "  residual autocorrelation, lags 1..%d: Ljung-Box Q = %s, df %d, p = %s  %s\n",
		r.Lags, formatFixed(r.Q, 2), r.DF, formatSig(r.P, 3), verdict(r.Pass))
	var big []string
	for k, v := range r.ACF {
		if math.Abs(v) > r.Band {
			big = append(big, fmt.Sprintf("lag %d (%s)", k+1, formatFixed(v, 3)))
		}
	}
	if len(big) > 0 {
		fmt.Fprintf(&b, "    outside -/+%s: %s\n", formatFixed(r.Band, 3), strings.Join(big, ", "))
	}
	for _, c := range d.Cross {
		fmt.Fprintf(&b, "  residuals vs prewhitened %s (AR(%d) filter), lags 0..%d: S = %s, %s x chi2(%s), p = %s  %s\n",
			c.Input, c.Prewhiten.Order(), c.Lags, formatFixed(c.S, 2), formatFixed(c.Scale, 3), formatFixed(c.EffDF, 1), formatSig(c.P, 3), verdict(c.Pass))
		big = big[:0]
		for k, v := range c.CCF {
			if math.Abs(v) > c.Band {
				big = append(big, fmt.Sprintf("lag %d (%s)", k, formatFixed(v, 3)))
			}
		}
		if len(big) > 0 {
			fmt.Fprintf(&b, "    outside -/+%s: %s\n", formatFixed(c.Band, 3), strings.Join(big, ", "))
		}
	}
	if len(d.Failures) > 0 {
		b.WriteString("  not to be trusted:\n")
		for _, f := range d.Failures {
			fmt.Fprintf(&b, "    - %s\n", f)
		}
	}
	return b.String()
}

// formatSig formats v with sig significant digits.
func formatSig(v float64, sig int) string {
	if math.IsNaN(v) {
		return "n/a"
	}
	return strconv.FormatFloat(v, 'g', sig, 64)
}

// formatFixed formats v with dec decimals.
func formatFixed(v float64, dec int) string {
	if math.IsNaN(v) {
		return "n/a"
	}
	return strconv.FormatFloat(v, 'f', dec, 64)
}

func formatRoots(zs []complex128) string {
	if len(zs) == 0 {
		return "none"
	}
	parts := make([]string, len(zs))
	for i, z := range zs {
		parts[i] = formatComplex(z)
	}
	return strings.Join(parts, ", ")
}
