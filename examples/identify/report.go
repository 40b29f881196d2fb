package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"strconv"

	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/tf"
)

// report prints the chosen model's estimates, diagnostics and path
// summary.
func report(ctx context.Context, est *tf.Estimate, ds *dataset, w io.Writer, pr *progress, out *Outcome) error {
	fmt.Fprintf(w, "\nChosen model, coefficients rounded to 4 digits:\n  %s\n", rounded(est.Model))
	fmt.Fprintf(w, "as a spec with the full estimates (parse it to reuse the model):\n  %s\n\n", est.Model)
	fmt.Fprintf(w, "Estimates (conditional least squares, %d residuals from index %d):\n", est.N, est.Conditioning.First)
	fmt.Fprintf(w, "  %-10s %12s %12s %8s\n", "name", "estimate", "std. error", "t")
	for _, p := range est.Params {
		fmt.Fprintf(w, "  %-10s %12.5g %12.3g %8.1f\n", p.Name, p.Value, p.SE, p.T)
	}
	fmt.Fprintf(w, "  residual variance %.4g (sd %.4g), AIC %.1f, BIC %.1f\n", est.Sigma2, math.Sqrt(est.Sigma2), est.AIC, est.BIC)
	for _, wn := range est.Warnings {
		fmt.Fprintf(w, "  warning: %s\n", wn.Message)
	}
	paths, err := modelinfo.Paths(est.Model, ds.interval)
	if err != nil {
		return err
	}
	out.Paths = paths
	fmt.Fprintf(w, "\nInput paths (times in %s):\n", ds.timeUnit())
	return modelinfo.Write(w, est.Model)
}

// diagnostics runs the model checks and prints them with verdicts.
func diagnostics(est *tf.Estimate, ds *dataset, w io.Writer) (*tf.Diagnostics, error) {
	d, err := tf.Check(est, ds.data, nil)
	if err != nil {
		return nil, err
	}
	verdict := func(pass bool) string {
		if pass {
			return "pass"
		}
		return "FAIL"
	}
	fmt.Fprintf(w, "\nDiagnostic checks (level %.2g):\n", d.Alpha)
	r := d.Residual
	fmt.Fprintf(w, "  residuals white (Ljung-Box, %d lags)       Q = %7.1f on %2d df, p = %.3f  %s\n", r.Lags, r.Q, r.DF, r.P, verdict(r.Pass))
	for _, c := range d.Cross {
		fmt.Fprintf(w, "  residuals vs prewhitened %-8s (%d lags) S = %7.1f on %2d df, p = %.3f  %s\n", c.Input, c.Lags, c.S, c.DF, c.P, verdict(c.Pass))
	}
	fmt.Fprintf(w, "  overall: %s\n", map[bool]string{true: "the model is adequate by every check", false: "at least one check fails: see above"}[d.Pass])
	return d, nil
}

// rounded returns a copy of m with every coefficient fixed at its value
// rounded to 4 significant digits, for reading.
func rounded(m tf.Model) tf.Model {
	c := m.Clone()
	fix := func(k *tf.Coef) {
		v, _ := strconv.ParseFloat(strconv.FormatFloat(k.Value, 'g', 4, 64), 64)
		*k = tf.Coef{Value: v}
	}
	if c.Const != nil {
		fix(c.Const)
	}
	for _, in := range c.Inputs {
		in.Num.Each(fix)
		in.Den.Each(fix)
	}
	if c.Noise != nil {
		c.Noise.MA.Each(fix)
		c.Noise.AR.Each(fix)
	}
	return c
}
