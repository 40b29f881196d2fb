package main

import (
	"context"
	"fmt"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// The structure fitted to the test record: the greenhouse's
// (greenhouse.Structure, every coefficient free) with the record's
// interval. The structure is known (the valve acts through a first-order
// lag after the pipes' dead time, the outdoor temperature through the
// walls, ARMA(1,1) weather noise, as earlier identification of the house
// found), so fit.Model estimates it directly; identify.Candidates, which
// fits and ranks many structures, is the tool for a plant whose
// structure is not known (examples/identify).
const testStructure = greenhouse.Structure + "; every 1 min"

// identified is the model fitted to the test record and its checks.
type identified struct {
	// Structure is the structure fitted, as a spec.
	Structure string
	Est       *fit.Estimate
	Checks    *fit.Diagnostics
	// Plant is the estimated valve path (tf.Model.Path: the whole path to
	// temp), the plant the tuning works on.
	Plant tf.Rational
}

// identifyModel fits structure to the test record and checks the
// estimate on it (fit.Check). A model that fails a check is returned with
// its checks and a *CheckError that lists the reasons: the tuning stops
// there.
func identifyModel(ctx context.Context, structure string, data map[string][]float64) (*identified, error) {
	m, err := parse.Model(structure)
	if err != nil {
		return nil, err
	}
	est, err := fit.Model(ctx, m, data, nil)
	if err != nil {
		return nil, fmt.Errorf("harness: fitting %s to the test record: %w", tf.StructureLabel(m), err)
	}
	d, err := fit.Check(est, data, nil)
	if err != nil {
		return nil, fmt.Errorf("harness: checking the fitted model: %w", err)
	}
	id := &identified{Structure: structure, Est: est, Checks: d}
	for _, in := range est.Model.Inputs {
		if in.Series == valveName {
			// The whole path from the valve to temp (differencing
			// included), the plant a controller sees.
			if id.Plant, err = est.Model.Path(valveName); err != nil {
				return nil, err
			}
		}
	}
	if !d.Pass {
		return id, &CheckError{Failures: d.Failures}
	}
	return id, nil
}

// CheckError is a fitted model that failed its checks (fit.Check): no
// controller is tuned on it. Failures lists the reasons in words.
type CheckError struct {
	Failures []string
}

// Error lists the reasons.
func (e *CheckError) Error() string {
	s := "harness: the identified model is not adequate, so no controller is tuned on it"
	for i, f := range e.Failures {
		sep := "; "
		if i == 0 {
			sep = ": "
		}
		s += sep + f
	}
	return s
}
