package main

import (
	"context"
	"errors"
	"fmt"
	"io"
)

// walk is the loop a control engineer walks from a plant test to a
// commissioned controller, as the default run does it on the greenhouse
// demo: test, model, tunings.
type walk struct {
	Test  *plantTest
	Model *identified
	// Rules holds one tuning per rule of tuningRules, in that order
	// (none when the model failed its checks).
	Rules []*tuned
}

// walkLoop designs the valve's test signal, simulates the test on the
// plant spec with noise of innovation SD sd, fits structure to the record
// and checks it, then tunes by every rule of tuningRules and checks each
// tuning's robustness. When the model fails its checks it returns the
// walk so far with a *CheckError.
func walkLoop(ctx context.Context, spec, structure string, sd float64) (*walk, error) {
	test, err := runTest(spec, sd, testSeed)
	if err != nil {
		return nil, err
	}
	wk := &walk{Test: test}
	if wk.Model, err = identifyModel(ctx, structure, test.Data); err != nil {
		return wk, err
	}
	for _, r := range tuningRules {
		t, err := tuneRule(ctx, wk.Model, r)
		if err != nil {
			return wk, fmt.Errorf("harness: tuning by %s: %w", r, err)
		}
		wk.Rules = append(wk.Rules, t)
	}
	return wk, nil
}

// runLoop runs the loop on the plant pl (the greenhouse demo) and prints
// its report, draws its pictures when asked, then runs the controller
// tests of each tuning on the plant itself.
func runLoop(w io.Writer, pl *plant, o options) error {
	structure := o.structure
	if structure == "" {
		structure = testStructure
	}
	wk, err := walkLoop(context.Background(), pl.spec, structure, o.noise)
	if wk != nil {
		writeTest(w, wk.Test)
	}
	if wk != nil && wk.Model != nil {
		writeModel(w, wk.Model)
	}
	var ce *CheckError
	if errors.As(err, &ce) {
		fmt.Fprintf(w, "  tuning stopped: a controller tuned on a model that fails its checks would rest on a wrong model\n\n%s", caution)
	}
	if err != nil {
		return err
	}
	for _, t := range wk.Rules {
		writeTuning(w, t)
	}
	if o.pictures != "" {
		if err := drawPictures(o.pictures, wk); err != nil {
			return &FlagError{Flag: "pictures", Value: o.pictures, Msg: "cannot draw the pictures", Err: err}
		}
	}
	fmt.Fprintf(w, "controller tests of each tuning on the plant itself (noise-free and noisy runs)\n")
	writePlant(w, pl, o)
	for _, t := range wk.Rules {
		fmt.Fprintf(w, "\n%s tuning (settings from a model: commission them on the plant under the site's safety procedures,\n"+
			"with independent interlocks, deferring to local codes and licensed practice)\n", t.PI.Name)
		pl.pi = t.PI
		if err := runScenarios(w, pl, o.noise); err != nil {
			return err
		}
	}
	fmt.Fprint(w, "\n"+caution)
	return nil
}
