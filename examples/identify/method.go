package main

import (
	"context"
	"fmt"
	"io"

	"github.com/backshift/backshift/tf/fit"
)

// The values of -method.
const (
	methodLeastSquares = "least-squares" // conditional least squares (the default)
	methodExact        = "exact"         // exact maximum likelihood (the Kalman filter)
)

// checkMethodFlag refuses a value of -method other than least-squares
// and exact ("" means least-squares).
func checkMethodFlag(v string) error {
	switch v {
	case "", methodLeastSquares, methodExact:
		return nil
	}
	return fmt.Errorf("-method %s: want least-squares (conditional least squares, the default) or exact (exact maximum likelihood)", clip(v))
}

// fitMethod is the fit.Settings method of a -method value.
func fitMethod(v string) fit.Method {
	if v == methodExact {
		return fit.ExactML
	}
	return fit.LeastSquares
}

// refitExact refits the chosen model est by exact maximum likelihood
// from its least-squares estimates (identification ranks candidates by
// least squares, which is cheaper and agrees with the likelihood on a
// long record), summing from the same first residual, and says so in w.
// When the output has gaps, est was fitted to the longest gap-free
// stretch and the refit is of the whole record.
func refitExact(ctx context.Context, est *fit.Estimate, ds *dataset, w io.Writer, pr *progress) (*fit.Estimate, error) {
	pr.say("refitting the chosen model by exact maximum likelihood")
	ml, err := fit.Model(ctx, est.Model, ds.data, ds.fitSettings(est.Conditioning.First, fit.ExactML))
	if err != nil {
		return nil, fmt.Errorf("the exact-likelihood refit of the chosen model: %w", err)
	}
	why := "-method exact"
	if len(ds.gaps.Output) > 0 {
		why = "the output has gaps: see above"
	}
	fmt.Fprintf(w, "\nThe chosen model refitted to the whole record by exact maximum likelihood (%s), from its least-squares estimates:\n", why)
	fmt.Fprintf(w, "  log-likelihood %.1f (least squares, conditional: %.1f); sigma^2 %.6g (least squares: %.6g)\n", ml.LogLik, est.LogLik, ml.Sigma2, est.Sigma2)
	if len(ds.gaps.Output) > 0 {
		fmt.Fprintf(w, "  (the least-squares figures are of the gap-free stretch, the exact likelihood's of the whole record: they do not compare)\n")
	}
	return ml, nil
}
