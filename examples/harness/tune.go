package main

import (
	"context"
	"fmt"

	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/control"
)

// tuningRules are the two published rules the loop tunes by, each a PI
// with its default closed-loop time: SIMC (Skogestad 2003, tc equal to
// the effective dead time, "tight control") and IMC / lambda tuning
// (Rivera, Morari & Skogestad 1986, lambda 1.7 times the dead time),
// both on the half-rule model of the identified valve path, the dead
// time counted with the sampling's half sample (control.Tune's doc).
var tuningRules = []control.Rule{control.SIMC, control.IMC}

// The robustness checks of each tuning.
const (
	// robustDraws plants are drawn from the estimate's covariance, with
	// the source seeded by robustSeed.
	robustDraws = 1000
	robustSeed  = 1
	// loopHorizon is the length of the closed-loop step responses, in
	// samples of the model (2 hours at 1 min).
	loopHorizon = 120
	// The worst case: the true gain up to 30 % above the model's, the
	// true dead time up to one sample longer.
	worstGainAbove  = 0.3
	worstDelayAbove = 1
)

// tuned is one rule's controller and its checks on the identified model.
type tuned struct {
	Tuning control.Tuning
	// Plant is the identified valve path the tuning is for.
	Plant tf.Rational
	// PI is the tuning as the harness's PI runs it (within its limits,
	// the backward-difference discretisation of the parallel PI that
	// Tune returns).
	PI PITuning
	// Nominal is the loop on the identified valve path.
	Nominal control.Loop
	// Robust is the loop over plants drawn from the estimate's
	// covariance, Worst over the named gain and dead-time errors.
	Robust control.Robustness
	Worst  control.WorstCase
}

// tuneRule tunes a PI for the identified valve path by rule r and checks
// it: the loop on the model, over robustDraws plants drawn from the
// estimate's covariance (control.ModelDraw, seeded) and over the worst
// case of worstGainAbove and worstDelayAbove.
func tuneRule(ctx context.Context, id *identified, r control.Rule) (*tuned, error) {
	iv := id.Est.Model.Interval
	t, err := control.Tune(id.Plant, iv, control.TuneSettings{Rule: r})
	if err != nil {
		return nil, err
	}
	if t.PID.Derivative != 0 || (t.Method != "" && t.Method != control.BackwardDifference) {
		return nil, fmt.Errorf("harness: %s gave %s by %s; the harness's PI runs a backward-difference PI only", r, t.PID, t.Method)
	}
	loop := control.LoopSettings{Interval: iv, Horizon: loopHorizon}
	out := &tuned{Tuning: t, Plant: id.Plant, PI: PITuning{Name: string(r), Kc: t.PID.Gain, Ti: t.PID.Integral}}
	if out.Nominal, err = control.Analyze(t.Controller, id.Plant, loop); err != nil {
		return nil, err
	}
	names := make([]string, len(id.Est.Params))
	for i, p := range id.Est.Params {
		names[i] = p.Name
	}
	draw, err := control.ModelDraw(id.Est.Model, valveName, names, id.Est.Cov)
	if err != nil {
		return nil, err
	}
	rs := control.RobustSettings{Draws: robustDraws, Seed: robustSeed, Loop: loop}
	if out.Robust, err = control.Robust(ctx, t.Controller, draw, rs); err != nil {
		return nil, err
	}
	ws := control.WorstCaseSettings{GainAbove: worstGainAbove, DelayAbove: worstDelayAbove, Loop: loop}
	if out.Worst, err = control.CheckWorstCase(t.Controller, id.Plant, ws); err != nil {
		return nil, err
	}
	return out, nil
}
