package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// report prints the chosen model's estimates and path summary. The
// summary is offered for control work only when the model passed every
// check (out.Trusted); otherwise it is headed with the reason not to use
// it.
func report(ctx context.Context, est *fit.Estimate, ds *dataset, w io.Writer, pr *progress, out *Outcome) error {
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
	if out.Trusted {
		fmt.Fprintf(w, "\nInput paths for control work (times in %s):\n", ds.timeUnit())
	} else {
		fmt.Fprintf(w, "\nInput paths of this model (times in %s), NOT for control work: the model fails its checks (the verdict below says which):\n", ds.timeUnit())
	}
	if err := modelinfo.Write(w, est.Model); err != nil {
		return err
	}
	writeUncertainty(w, est, ds, paths)
	return nil
}

// writeDiagnostics prints the checks and the verdict, which names every
// reason a failed model must not be used.
// A model that passes them with outliers in its residuals gets the
// qualified verdict caveat (outlierCaveat) instead of "adequate".
func writeDiagnostics(w io.Writer, d *fit.Diagnostics, failures []string, caveat string) {
	if d == nil {
		fmt.Fprintf(w, "\nDiagnostic checks: not run\n  verdict: NOT ADEQUATE, do not use this model for control work: %s\n", strings.Join(failures, "; "))
		return
	}
	fmt.Fprintf(w, "\n%s", d.String())
	if d.Pass && caveat != "" {
		fmt.Fprintf(w, "  verdict: %s\n", caveat)
		return
	}
	if d.Pass {
		fmt.Fprintf(w, "  verdict: the model is adequate by every check\n")
		return
	}
	fmt.Fprintf(w, "  verdict: NOT ADEQUATE, do not use this model for control work: %d %s, listed above under \"not to be trusted\"\n",
		len(d.Failures), plural(len(d.Failures), "reason", "reasons"))
}

// rounded returns a copy of m with every coefficient fixed at its value
// rounded to 4 significant digits, for reading.
func rounded(m tf.Model) tf.Model { return fixed(m, 4) }

// fixed returns a copy of m with every coefficient fixed (a number, not a
// parameter) at its value rounded to digits significant digits (-1 for
// full precision).
func fixed(m tf.Model, digits int) tf.Model {
	return mapCoefs(m, func(k *tf.Coef) {
		v, _ := strconv.ParseFloat(strconv.FormatFloat(k.Value, 'g', digits, 64), 64)
		*k = tf.Coef{Value: v}
	})
}

// mapCoefs returns a copy of m with fn applied to each of its
// coefficients: the constant, the numerator and denominator of every
// input path, and the noise model's MA and AR polynomials (the
// differencing operators are fixed by the spec and left alone).
func mapCoefs(m tf.Model, fn func(*tf.Coef)) tf.Model {
	c := m.Clone()
	if c.Const != nil {
		fn(c.Const)
	}
	for _, in := range c.Inputs {
		in.Num.Each(fn)
		in.Den.Each(fn)
	}
	if c.Noise != nil {
		c.Noise.MA.Each(fn)
		c.Noise.AR.Each(fn)
	}
	return c
}

// saveConfig writes the fitted model, every coefficient fixed at its
// estimate, as a one-model config in the format of examples/config, with
// v, the record of the data it was fitted to, as its "validity", and in
// its notes what was done to the record (time column, gaps).
//
// extra are more notes: the verdict's caveat, the refit (see save).
func saveConfig(path string, est *fit.Estimate, ds *dataset, v *modelinfo.Validity, extra ...string) error {
	lib := modelinfo.Library[parse.Spec]{Site: ds.name, Models: []modelinfo.Saved[parse.Spec]{{
		Name:     ds.output + " (identified)",
		Notes:    strings.Join(append(saveNotes(est, ds), extra...), "; "),
		Spec:     parse.Spec{Model: fixed(est.Model, -1)},
		Validity: v,
	}}}
	return lib.WriteFile(path)
}

// saveNotes are the notes of a saved model: what it was fitted to, what
// was done to the record, and its output's gaps.
func saveNotes(est *fit.Estimate, ds *dataset) []string {
	notes := append([]string{fmt.Sprintf("fitted by examples/identify to %d samples by %s; residual SD %.4g", ds.n, est.Method, math.Sqrt(est.Sigma2))}, ds.notes...)
	if ds.gaps != nil {
		if n := ds.gaps.gapNote(); n != "" {
			notes = append(notes, n)
		}
	}
	return notes
}
