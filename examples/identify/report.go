package main

import (
	"context"
	"fmt"
	"io"
	"strconv"

	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/tf"
)

// report prints the chosen model's estimates, diagnostics and path
// summary.
func report(ctx context.Context, est *tf.Estimate, ds *dataset, w io.Writer, pr *progress, out *Outcome) error {
	fmt.Fprintf(w, "\nChosen model, coefficients rounded to 4 digits:\n  %s\n\n", rounded(est.Model))
	// The library's report: the spec with the full estimates (parse it
	// to reuse the model), estimates with standard errors, correlations,
	// poles, zeros, gains and warnings.
	fmt.Fprint(w, est.String())
	paths, err := modelinfo.Paths(est.Model, ds.interval)
	if err != nil {
		return err
	}
	out.Paths = paths
	fmt.Fprintf(w, "\nInput paths for control work (times in %s):\n", ds.timeUnit())
	return modelinfo.Write(w, est.Model)
}

// diagnostics runs the model checks and prints them with verdicts.
func diagnostics(est *tf.Estimate, ds *dataset, w io.Writer) (*tf.Diagnostics, error) {
	d, err := tf.Check(est, ds.data, nil)
	if err != nil {
		return nil, err
	}
	fmt.Fprintf(w, "\n%s", d.String())
	if d.Pass {
		fmt.Fprintf(w, "  verdict: the model is adequate by every check\n")
	} else {
		fmt.Fprintf(w, "  verdict: at least one check fails: the model misses some structure (see above)\n")
	}
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
