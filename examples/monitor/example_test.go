package main

import (
	"context"
	"fmt"
	"log"
	"os"
	"path/filepath"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/fit"
	"github.com/backshift/backshift/tf/fleet"
	"github.com/backshift/backshift/tf/monitor"
	"github.com/backshift/backshift/tf/online"
	"github.com/backshift/backshift/tf/predict"
)

// day is a day of the demo scenario in samples (one a minute).
const day = 1440

// fitFirstDays returns the demo scenario, the record of its first three
// days and the README's model fitted to them: the set-up of the examples
// below, which run on the fourth day.
func fitFirstDays() (greenhouse.Data, map[string][]float64, *fit.Estimate) {
	d := greenhouse.Default()
	hist := map[string][]float64{"temp": d.Temp[:3*day], "valve": d.Valve[:3*day], "outdoor": d.Outdoor[:3*day]}
	m := parse.MustModel("temp = c + w0 / (1 - d1 B) B^3 valve + v0 / (1 - e1 B) B outdoor + (1 + t1 B) / (1 - p1 B) a; every 1 min")
	est, err := fit.Model(context.Background(), m, hist, &fit.Settings{First: 300})
	if err != nil {
		log.Fatal(err)
	}
	return d, hist, est
}

// Example is the code of the README's section "In a running service"
// (README.md): the model of the README's ten
// lines, fitted to the greenhouse's first three days, runs beside the
// plant on the fourth: it predicts each minute's temperature, watches
// the errors for drift, looks an hour ahead for a planned valve move and
// stores its state for a restart (the fit that sets it up is
// fitFirstDays). It is longer than 60 lines because it holds the
// README's block whole.
func Example() {
	d, hist, est := fitFirstDays()
	recent := map[string][]float64{} // the last six hours of the record
	for k, v := range hist {
		recent[k] = v[len(v)-360:]
	}
	state := filepath.Join(os.TempDir(), "backshift-example-temp.state")
	os.Remove(state)
	plan := make([]float64, 60)
	for i := range plan {
		plan[i] = 70 // % valve for the next hour
	}

	// README: begin
	p, err := predict.New(est.Held(), est.Sigma2, &predict.Settings{
		First: est.Conditioning.First, ZeroPreSample: est.Conditioning.ZeroPreSample})
	if err != nil {
		log.Fatal(err)
	}
	if snap, err := os.ReadFile(state); err == nil && p.UnmarshalBinary(snap) == nil {
		// carried on from the stored state
	} else if err := p.Warm(recent); err != nil { // several time constants of history
		log.Fatal(err)
	}
	// The monitor takes standardised errors (Error/SE: also right after
	// a gap) and watches valve at lags 3 and 4, outdoor at 1 and 2.
	alarms := make(chan monitor.Alarm, 16) // read by your alarm handler
	mon, err := monitor.New(&monitor.Settings{Lags: [][]int{{3, 4}, {1, 2}}, Alarms: alarms})
	if err != nil {
		log.Fatal(err)
	}
	var s predict.Step
	for t := 3 * day; t < 4*day; t++ { // each minute: the new sample
		x := []float64{d.Valve[t], d.Outdoor[t]} // in the order of p.Inputs()
		if s, err = p.Update(x, d.Temp[t]); err != nil {
			log.Print(err) // a bad sample is refused and the state left as it was
			continue
		}
		if _, err := mon.Update(int64(t), s.Error/s.SE, x); err != nil {
			log.Print(err)
		}
	}
	fmt.Printf("now %.2f degC (95 %% interval %.2f to %.2f)\n", s.Mean, s.Lower, s.Upper)
	ahead := make([]predict.Point, 60) // the next hour for the planned valve, outdoor held
	if err := p.Forecast(ahead, [][]float64{plan, nil}); err != nil {
		log.Print(err)
	}
	fmt.Printf("in 1 h: %.1f degC (95 %% interval %.1f to %.1f)\n", ahead[59].Mean, ahead[59].Lower, ahead[59].Upper)
	snap, _ := p.MarshalBinary() // every few minutes, and before shutting down
	if err := os.WriteFile(state, snap, 0o600); err != nil {
		log.Print(err)
	}
	// README: end

	fmt.Printf("alarms on the fourth day: %d (none expected: about %.1f false ones a day at the default run length)\n",
		len(alarms), 3*float64(day)/monitor.DefaultTargetARL)
	os.Remove(state)
	// Output:
	// now 15.89 degC (95 % interval 15.83 to 15.95)
	// in 1 h: 17.0 degC (95 % interval 16.9 to 17.1)
	// alarms on the fourth day: 0 (none expected: about 0.4 false ones a day at the default run length)
}

// Example_fleet fits one model per loop for many loops on a bounded pool
// (package tf/fleet): here three greenhouses, each its own simulated
// record, on two workers. The results come in loop order whatever the
// pool size.
func Example_fleet() {
	spec := parse.MustModel("temp = c + w0 / (1 - d1 B) B^3 valve + v0 / (1 - e1 B) B outdoor + (1 + t1 B) / (1 - p1 B) a; every 1 min")
	// README fleet: begin
	job := func(ctx context.Context, loop int) (*fit.Estimate, error) {
		d := greenhouse.Generate(greenhouse.Settings{Days: 2, Seed: uint64(loop) + 1}) // your loop's record
		return fit.Model(ctx, spec, d.ByName(), &fit.Settings{First: 300})
	}
	res, err := fleet.Run(context.Background(), 3, job, &fleet.Settings{Workers: 2})
	if err != nil {
		log.Fatal(err)
	}
	for i, r := range res {
		if r.Err != nil {
			fmt.Printf("loop %d: %v\n", i, r.Err)
			continue
		}
		w0, _ := r.Value.Param("w0")
		d1, _ := r.Value.Param("d1")
		fmt.Printf("loop %d: valve gain %.2f degC/%%\n", i, w0.Value/(1-d1.Value))
	}
	// README fleet: end

	// Output:
	// loop 0: valve gain 0.20 degC/%
	// loop 1: valve gain 0.20 degC/%
	// loop 2: valve gain 0.20 degC/%
}

// Example_online keeps the fitted model current on the fourth day by
// recursive estimation (package tf/online), as the README's section
// shows.
func Example_online() {
	d, _, est := fitFirstDays()
	// README online: begin
	rec, err := online.New(est.Model, &online.Settings{Forgetting: 0.995}) // memory about 200 samples
	if err != nil {
		log.Fatal(err)
	}
	for t := 3 * day; t < 4*day; t++ { // your stream, the inputs in the order of rec.Inputs()
		if err := rec.Update([]float64{d.Valve[t], d.Outdoor[t]}, d.Temp[t]); err != nil {
			log.Print(err)
		}
	}
	ps := rec.Params(nil) // estimates with standard errors
	// README online: end

	batch, _ := est.Param("d1")
	for _, p := range ps {
		if p.Name == "d1" {
			fmt.Printf("d1 = %.4f (SE %.1g) on day 4; the batch fit of days 1-3: %.4f\n", p.Value, p.SE, batch.Value)
		}
	}
	// Output:
	// d1 = 0.9501 (SE 0.001) on day 4; the batch fit of days 1-3: 0.9502
}
