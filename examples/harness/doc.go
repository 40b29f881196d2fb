// Command harness walks the loop a control engineer walks from a plant
// test to a tuned controller, and unit-tests a controller against a
// known discrete model, as a template for testing your own controller
// before it meets the real process.
//
// The process is the greenhouse of the demo (air temperature driven by
// the heating valve and the outdoor temperature), given as a spec string
// and simulated sample by sample with seeded ARMA noise.
//
//	go run ./examples/harness
//	go run ./examples/harness -pictures pics
//	go run ./examples/harness -noise 0.03 -spec 'temp = 5.97 + 0.009989 / (1 - 0.9502 B) B^3 valve + ...; every 1 min'
//	go run ./examples/harness -config fitted.json -model 'temp (identified)'
//
// # The loop
//
// The default run (neither -spec nor -config) takes these steps, one
// file each:
//
//   - plantest.go: design a test signal for the valve with
//     testsignal.Design from what the engineer expects (a time constant of
//     about 20 min, a dead time of about 3 min), moving the valve +-5 %
//     about 50 % within a day: a maximum-length binary sequence of 4
//     stages with a 27 min clock, 3 periods. Simulate the test on the
//     plant spec with seeded noise (-noise; the test needs some), the
//     outdoor temperature following the demo's weather.
//   - identify.go: fit the greenhouse's known structure to the record
//     with fit.Model and check it with fit.Check. The structure is known
//     (the house's physics and earlier identification), so one fit gives
//     the estimate and its covariance; identify.Candidates, which fits
//     and ranks many structures, is for a plant whose structure is not
//     known (examples/identify). A model that fails a check stops the
//     loop with the reasons: no controller is tuned on it.
//   - tune.go: tune a PI for the identified valve path by SIMC (Skogestad
//     2003) and by IMC / lambda tuning (Rivera, Morari & Skogestad 1986)
//     with control.Tune; close each on the model (control.Analyze: margins,
//     peak |S|); draw 1000 plants from the estimate's covariance
//     (control.ModelDraw, seeded) and close each (control.Robust: the
//     fraction stable, quantiles of every figure, bands of the step
//     responses); and close it on the worst case of a gain up to 30 %
//     higher and one more sample of dead time (control.CheckWorstCase).
//   - report.go: print the report: the test signal's clock period, length
//     and band, the identified model and its checks, each rule's settings
//     with form and units, nominal margins and |S| peak, robustness and
//     worst case, each tuning followed by the caution.
//   - walk.go: then run the controller tests below with each tuning on the
//     plant itself.
//   - pictures.go (with -pictures DIR): the test signal and its
//     periodogram with the band it excites, the closed-loop step
//     responses with their bands over the drawn plants and the worst case,
//     and |S| with its peak, as PNG files (examples/chart).
//
// The tests (tune_test.go) check the robustness figures against the loop
// closed by hand on the same drawn plants, not one nominal run.
//
// # The controller tests
//
// A PI controller in position form with output limits and
// back-calculation anti-windup (tracking time Ti; see pi.go) closes the
// loop, acting once a sample. Two scenarios run, six hours
// each: a setpoint step (16 -> 20 degC at minute 60) and a disturbance
// step (a cold front: outdoor temperature down by 8 degC at minute 60).
// The program prints settling time, overshoot, steady-state error and
// peak deviation; harness_test.go asserts them, and that file is the
// part to copy: replace the PI with your controller and the spec with
// your identified model. The default run tests the two tunings of the
// loop on the plant spec; with -spec the PI is the hand tuning (Kc 8
// %/degC, Ti 20 min) on the model given, such as the one
// examples/identify prints for the demo record; with -config on a model
// read from a config file that examples/identify -save wrote.
//
// # Times
//
// Every time is in minutes of real time, from the spec's sample
// interval: the scenarios' lengths and steps, the PI's sample time
// (its integral time is 20 min whatever the interval), and the printed
// settling times. A spec sampled every 10 s runs each scenario in 2160
// samples. Settling is measured from the first sample at or after the
// step; it is 0 when the temperature never leaves the band, and "not
// reached within the run" when it is outside the band at the end. The
// steady-state error is the mean error over the last quarter of the
// run; when the temperature still swings over that quarter by more than
// the band's full width (peak to peak over 0.4 degC for the +-0.2 degC
// band: it fits in no band of that width), the loop does not settle, no
// steady-state error is printed, and the summary says the tuning is
// unsuitable for the plant.
//
// # Noise
//
// Each scenario runs twice. The response figures (settling, overshoot,
// steady-state error, peak deviation, recovery) come from the run
// without noise, so that they judge the controller and not one noise
// draw, nor the number of samples (the last exit from a noise band comes
// later the more samples a run has). The run with the plant's noise
// (-noise, the SD of the innovations) reports the first entry into the
// band and the share of time outside it afterwards, with a band of three
// standard deviations of the noise term (from its psi weights), at least
// 0.2 degC. A noisy run that diverges when the noise-free one did not is
// blamed on the noise.
//
// # What plant it runs
//
// The scenarios are written for the greenhouse, so the spec must have
// the output temp (degC, not differenced: every scenario starts from a
// steady state), an input valve (%), optionally an input outdoor (degC)
// and no other input (it would be held at 0: a misspelt name is refused
// with the likely fix; an event term, step(T) or pulse(T), a known
// intervention in the fit's record, is left out of the plant and the
// summary says so), every coefficient a number or held with
// "where name = value" (a free coefficient has no known value), and a
// sample interval "every ..." from 0.1 s to 2 min. The longest is a tenth
// of the PI's integral time (common practice: sample a PI loop at least
// ten times per integral time); the shortest keeps a scenario at 216 000
// samples. The valve path must raise the temperature (a positive
// steady-state gain when it is stable), and the scenarios' starting
// points must need a valve opening within 0..100 %. Without an outdoor
// input the disturbance scenario is not run, and the summary says so.
//
// # Models from a config file
//
// With -config the plant is the model entry of the file named by -model
// (the only one, when the file holds one). When the entry carries the
// record of the data it was fitted to (its "validity" object), the
// summary prints the record and warns whenever a scenario takes the
// valve, the outdoor temperature or temp outside the ranges seen in it:
// the model is an extrapolation there. A model whose verdict was
// "failed" when it was saved is refused, unless -use-failed-model asks
// for it; the summary then says that its figures prove nothing.
//
// # Caution
//
// A model identified from data is an approximation valid near the
// operating conditions of that data. A controller and a tuning that pass
// these tests must still be commissioned on the plant itself under the
// site's safety procedures, with independent safety interlocks; defer to
// local codes and licensed practice. The program says so after every
// tuning it prints and at the end of its summary.
package main
