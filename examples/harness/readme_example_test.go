package main

import (
	"context"
	"fmt"
	"io"
	"os"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/control"
	"github.com/backshift/backshift/tf/fit"
	"github.com/backshift/backshift/tf/testsignal"
)

// Example_fromModelToController runs the code of the README's section
// "From model to controller" (README.md, between the from-model
// markers; its block is the function fromModelToController, kept equal by
// TestReadmeSection) and checks what it prints: design a plant test,
// fit the model to its record, tune a PI, close the loop on the model,
// over the model's uncertainty and over a named worst case.
func Example_fromModelToController() {
	if err := fromModelToController(context.Background(), os.Stdout); err != nil {
		fmt.Println(err)
	}
	// Output:
	// SIMC tuning, closed-loop time 3 min, on the model 0.1997 e^{-2.5 s}/(19.68 s + 1) (times in min)
	// PI (series): Kc = 17.92, Ti = 19.68 (times in min)
	// discrete controller (backward difference): u = (18.8336 - 17.923 B) / (1 - B) e
	// peak sensitivity Ms = 1.54 on the model
	// Caution: an identified model is an approximation. Commission this controller on the plant under the site's safety procedures, with independent interlocks, deferring to local codes and licensed practice.
	// stable true, gain margin 3.3, Ms 1.54, set point settles in 10 min
	// 100 % of 1000 drawn plants stable, Ms 5-95 %: 1.53 to 1.55
	// worst case: 0 of 10 unstable, Ms up to 2.45
}

// fromModelToController is the block of README.md's section. It is one
// function of over 60 lines because the README tells the loop as one
// story, top to bottom.
func fromModelToController(ctx context.Context, w io.Writer) error {
	// A day's test of the valve: +-5 % about 50 %, for a time constant of
	// about 20 min and a dead time of about 3 min, sampled every minute.
	plan, err := testsignal.Design(testsignal.DesignSettings{
		TimeConstant: 20, DeadTime: 3, Sample: 1, Level: 50, Amplitude: 5, Budget: 1440})
	if err != nil {
		return err
	}
	// Simulated here; on site, the record logged during the test.
	plantModel := parse.MustModel("temp = 6 + 0.01 / (1 - 0.95 B) B^3 valve + (1 + 0.3 B) / (1 - 0.8 B) a; every 1 min")
	temp, err := plantModel.Simulate(map[string][]float64{"valve": plan.Signal}, &tf.SimSettings{Seed1: 1, Sigma: 0.03})
	if err != nil {
		return err
	}
	data := map[string][]float64{"temp": temp, "valve": plan.Signal}

	// Fit the structure and check it: tune only on a model that passes.
	structure := parse.MustModel("temp = c + w0 / (1 - d1 B) B^3 valve + (1 + t1 B) / (1 - p1 B) a; every 1 min")
	est, err := fit.Model(ctx, structure, data, nil)
	if err != nil {
		return err
	}
	if checks, err := fit.Check(est, data, nil); err != nil || !checks.Pass {
		return fmt.Errorf("no tuning on this model: %v %v", err, checks)
	}

	plant, err := est.Model.Path("valve") // the whole path, valve -> temperature
	if err != nil {
		return err
	}
	iv := est.Model.Interval // 1 min
	t, err := control.Tune(plant, iv, control.TuneSettings{Rule: control.SIMC})
	if err != nil {
		return err
	}
	fmt.Fprintln(w, t) // settings, form, units, Ms, caution

	ls := control.LoopSettings{Interval: iv, Horizon: 120} // 2 h
	loop, err := control.Analyze(t.Controller, plant, ls)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "stable %v, gain margin %.1f, Ms %.2f, set point settles in %.0f min\n",
		loop.Stable, loop.Margins.GainMargin, loop.SensitivityPeak, loop.Setpoint.Figures.Settle.Time)

	names := make([]string, len(est.Params))
	for i, p := range est.Params {
		names[i] = p.Name
	}
	draw, err := control.ModelDraw(est.Model, "valve", names, est.Cov)
	if err != nil {
		return err
	}
	r, err := control.Robust(ctx, t.Controller, draw, control.RobustSettings{Draws: 1000, Seed: 1, Loop: ls})
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "%.0f %% of 1000 drawn plants stable, Ms 5-95 %%: %.2f to %.2f\n",
		100*r.FractionStable, r.SensitivityPeak.Values[0], r.SensitivityPeak.Values[2])

	// 30 % more gain, one more sample of dead time.
	worst, err := control.CheckWorstCase(t.Controller, plant, control.WorstCaseSettings{GainAbove: 0.3, DelayAbove: 1})
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "worst case: %d of %d unstable, Ms up to %.2f\n", worst.Unstable, len(worst.Cases), worst.SensitivityPeak.Value)
	return nil
}
