package main

import (
	"errors"
	"fmt"
	"image/color"
	"math"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/examples/chart"
	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/tf/fit"
	"gonum.org/v1/plot/vg/draw"
)

// palette holds the colours of every picture: data in dark grey, model
// in blue, bands and limits in red and orange, the truth (demo only) in
// green.
var palette = struct {
	data, raw, axis, model, under, band, truth, fill, errors, mark, gap color.Color
}{
	data:   color.RGBA{R: 60, G: 60, B: 60, A: 255},
	raw:    color.RGBA{R: 175, G: 175, B: 175, A: 255}, // a raw input under its moving average
	axis:   color.Gray{Y: 120},                         // the zero line, a final value
	model:  color.RGBA{R: 31, G: 100, B: 190, A: 255},
	under:  color.RGBA{R: 130, G: 175, B: 235, A: 255}, // a model line drawn wide under the observed one
	band:   color.RGBA{R: 205, G: 60, B: 40, A: 255},
	truth:  color.RGBA{R: 40, G: 150, B: 60, A: 255},
	fill:   color.NRGBA{R: 31, G: 100, B: 190, A: 70}, // a forecast interval
	errors: color.NRGBA{R: 205, G: 60, B: 40, A: 50},  // +-2 standard errors
	mark:   color.RGBA{R: 230, G: 140, B: 20, A: 255},
	gap:    color.NRGBA{R: 120, G: 120, B: 120, A: 70}, // missing output samples
}

// smoothing is the number of samples averaged in the moving average
// drawn over each input: a quarter of an hour on the demo, whose valve
// carries a test signal that changes every minute and, drawn raw, fills
// a solid band.
const smoothing = 15

// inputTrace draws an input as recorded, thin and light, with its
// moving average over smoothing samples on top.
func inputTrace(c *chart.Chart, t, x []float64) {
	c.Legend("as recorded", c.Line(t, x, palette.raw, 0.5))
	c.Legend(fmt.Sprintf("%d-sample mean", smoothing), c.Line(t, chart.MovingAverage(x, smoothing), palette.model, 1.2))
}

// recordPicture draws the record: the output (with its setpoint on the
// demo) and each input against time.
func recordPicture(path string, ds *dataset, mk *marks) error {
	y := ds.data[ds.output]
	t := times(len(y), 0, ds.step())
	xlabel := "time (" + ds.timeUnit() + ")"
	out := chart.New("Output: "+ds.output, xlabel, ds.output+outputUnit(ds))
	l := out.Line(t, y, palette.data, 0.8)
	if sp, ok := ds.setpoint(); ds.builtin && ok {
		out.Legend(ds.output, l)
		out.Legend("setpoint", out.Line(t, sp, palette.band, 1.2))
	}
	mk.draw(out, t, y)
	panels := []*chart.Chart{out}
	for _, name := range ds.inputs {
		in := chart.New("Input: "+name, xlabel, inputUnit(ds, name))
		inputTrace(in, t, ds.data[name])
		panels = append(panels, in)
	}
	return chart.Save(path, panels, 18, 5.5)
}

// correlationChart returns a panel of correlations r against lags as
// stems, with the band of +-band drawn dashed.
func correlationChart(title, xlabel, ylabel string, lags, r []float64, band float64) *chart.Chart {
	c := chart.New(title, xlabel, ylabel)
	lo, hi := lags[0], lags[len(lags)-1]
	c.HLine(0, lo, hi, palette.axis)
	c.Legend("correlation", c.Stems(lags, r, palette.model))
	c.Legend(fmt.Sprintf("95 %% band (+-%.3f)", band), c.HLine(band, lo, hi, palette.band).Dashed(4, 3))
	c.HLine(-band, lo, hi, palette.band).Dashed(4, 3)
	return c
}

// correlationPicture draws each input's prewhitened cross-correlation
// with the output, from lag -10 on, with its 95 % band and the fitted
// dead time marked.
func correlationPicture(path string, ds *dataset, pw []prewhitened, est *fit.Estimate) error {
	dt, unit := ds.step(), ds.timeUnit()
	var panels []*chart.Chart
	for _, p := range pw {
		var lags, r []float64
		last := len(p.Weights.V) - 1
		for k := -min(10, last); k <= last; k++ {
			lags = append(lags, float64(k)*dt)
			r = append(r, p.Corr.At(k))
		}
		c := correlationChart(fmt.Sprintf("Prewhitened cross-correlation, %s leading %s", p.Input, ds.output),
			"lag ("+unit+"), positive: input leads output", "cross-correlation", lags, r, p.Corr.Band(0.95))
		for _, in := range est.Model.Inputs {
			if in.Series == p.Input {
				lo, hi := c.YRange()
				c.SetY(lo, hi)
				b := float64(in.Delay) * dt
				c.Legend("fitted dead time "+amount(b, unit), c.VLine(b, lo, hi, palette.mark).Dashed(5, 3))
			}
		}
		panels = append(panels, c)
	}
	return chart.Save(path, panels, 18, 7)
}

// weightsPicture draws each input's impulse-response weights as stems
// within their +-2 standard errors (and the true weights on the demo).
func weightsPicture(path string, ds *dataset, pw []prewhitened, _ *fit.Estimate) error {
	var panels []*chart.Chart
	for _, p := range pw {
		v, se := p.Weights.V, p.Weights.SE
		lags := times(len(v), 0, ds.step())
		c := chart.New(fmt.Sprintf("Impulse-response weights, %s -> %s", p.Input, ds.output),
			"lag ("+ds.timeUnit()+")", ds.output+" per unit "+p.Input)
		c.HLine(0, lags[0], lags[len(lags)-1], palette.axis)
		up, dn := make([]float64, len(se)), make([]float64, len(se))
		for i, s := range se {
			up[i], dn[i] = 2*s, -2*s
		}
		c.Legend("+-2 standard errors", c.Band(lags, dn, up, palette.errors))
		c.Legend("estimated weights", c.Stems(lags, v, palette.model))
		if ds.builtin {
			c.YLabel = greenhouseUnits(p.Input)
			c.Legend("true weights", c.Dots(lags, truePath(p.Input).Impulse(len(v)), palette.truth, draw.CrossGlyph{}, 3))
		}
		panels = append(panels, c)
	}
	return chart.Save(path, panels, 18, 7)
}

// residualPicture draws the autocorrelation of the residuals with its
// 95 % band (the residuals present: where the output is missing there
// is none, and the stretches either side are joined, as the checks join
// them).
func residualPicture(path string, ds *dataset, est *fit.Estimate) error {
	// The residuals present, a gap closed up, as fit.Check treats them.
	var r []float64
	for _, v := range est.Resid[est.Conditioning.First:] {
		if !math.IsNaN(v) {
			r = append(r, v)
		}
	}
	lag := pictureLag(len(r))
	acf, err := arma.ACF(r, lag)
	if err != nil {
		return err
	}
	c := correlationChart("Autocorrelation of the residuals", "lag ("+ds.timeUnit()+")", "autocorrelation",
		times(lag, 1, ds.step()), acf.R[1:lag+1], 1.96*acf.White)
	return chart.Save(path, []*chart.Chart{c}, 18, 7)
}

// stepPicture draws the step response of every path that has one, with
// its gain, dead time and settling time marked (and the true response on
// the demo).
func stepPicture(path string, ds *dataset, paths []modelinfo.Path) error {
	dt, unit := ds.step(), ds.timeUnit()
	var panels []*chart.Chart
	for _, p := range paths {
		if p.Err != nil {
			continue
		}
		n := int(math.Ceil(1.3*p.Step.Settle.Samples)) + 2
		t := times(n, 0, dt)
		c := chart.New(fmt.Sprintf("Step response of %s to a unit step in %s", ds.output, p.Input),
			"time after the step ("+unit+")", ds.output+" per unit "+p.Input)
		c.Legend(fmt.Sprintf("gain %.3g", p.Gain), c.HLine(p.Gain, t[0], t[n-1], palette.axis).Dashed(4, 3))
		c.Legend("fitted model", c.Line(t, p.Rational.Step(n), palette.model, 2.5))
		if ds.builtin {
			// Drawn over the fitted curve, dotted, so both show where
			// they coincide.
			c.YLabel = greenhouseUnits(p.Input)
			c.Legend("true model", c.Line(t, truePath(p.Input).Step(n), palette.truth, 1.5).Dashed(2, 3))
		}
		lo, hi := c.YRange()
		lo, hi = math.Min(lo, 0), math.Max(hi, 0)
		c.SetY(lo, hi)
		if s := p.Step.Settle.Samples * dt; !math.IsNaN(s) {
			c.Legend(fmt.Sprintf("settled within 2 %% at %.0f %s", s, unit), c.VLine(s, lo, hi, palette.mark).Dashed(5, 3))
		}
		d := float64(p.DeadTime) * dt
		c.Legend("dead time "+amount(d, unit), c.VLine(d, lo, hi, palette.band).Dashed(1, 2))
		panels = append(panels, c)
	}
	if len(panels) == 0 {
		return errors.New("no input path has a step response (see the report)")
	}
	return chart.Save(path, panels, 18, 7)
}

// overlay returns a panel of a model's values m under the observed ones
// y: the model drawn wide and light, the observed thin and dark on top,
// so that the model shows where the two part.
func overlay(title, xlabel, ylabel, model string, t, y, m []float64) *chart.Chart {
	c := chart.New(title, xlabel, ylabel)
	c.Legend(model, c.Line(t, m, palette.under, 2.2))
	c.Legend("observed", c.Line(t, y, palette.data, 0.5))
	return c
}

// difference returns a panel of y - m against t with a zero line.
func difference(title, xlabel, ylabel string, t, y, m []float64) *chart.Chart {
	c := chart.New(title, xlabel, ylabel)
	d := make([]float64, len(t))
	for i := range d {
		d[i] = y[i] - m[i]
	}
	c.HLine(0, t[0], t[len(t)-1], palette.axis)
	c.Line(t, d, palette.data, 0.5)
	return c
}

// fitPicture draws the observed output against its one-step-ahead
// fitted values: the whole record, a zoom on its last three hours (in
// minutes; samples on a record without an interval) with the
// observations as dots, and the residuals of the whole record.
func fitPicture(path string, ds *dataset, est *fit.Estimate, mk *marks) error {
	dt := ds.step()
	y := ds.data[ds.output]
	n := len(y)
	t := times(n, 0, dt)
	fitted := make([]float64, n)
	for i := range y {
		fitted[i] = y[i] - est.Resid[i] // NaN before the first residual
	}
	xlabel, ylabel := "time ("+ds.timeUnit()+")", ds.output+outputUnit(ds)
	whole := overlay("Observed and fitted (one step ahead), whole record", xlabel, ylabel, "fitted", t, y, fitted)
	mk.draw(whole, t, y)
	smoothedTrace(whole, t, est)
	k := max(0, n-int(180/dt))
	zoom := chart.New("Last part of the record, zoomed", xlabel, ylabel)
	zoom.Legend("observed", zoom.Dots(t[k:], y[k:], palette.data, draw.CircleGlyph{}, 1.6))
	zoom.Legend("fitted", zoom.Line(t[k:], fitted[k:], palette.model, 1.5))
	res := difference(fmt.Sprintf("Residuals (observed - fitted), summed from sample %d on", est.Conditioning.First),
		xlabel, ylabel, t, y, fitted)
	return chart.Save(path, []*chart.Chart{whole, zoom, res}, 18, 6.5)
}

// simulationPicture draws the observed output against the model's
// noise-free simulation from the inputs alone, from the first summed
// residual on (before it the simulation is still starting up), and
// their difference (the model's estimate of the disturbance).
func simulationPicture(path string, ds *dataset, sim *Simulation) error {
	from := sim.From
	y := ds.data[ds.output][from:]
	t := times(len(y), from, ds.step())
	xlabel, ylabel := "time ("+ds.timeUnit()+")", ds.output+outputUnit(ds)
	p := overlay("Observed and simulated from the inputs alone (no noise model)", xlabel, ylabel, "simulated", t, y, sim.Y[from:])
	q := difference("Difference: the disturbance the noise model describes", xlabel, ylabel, t, y, sim.Y[from:])
	return chart.Save(path, []*chart.Chart{p, q}, 18, 6.5)
}

// forecastPicture draws the last part of the record (twice the horizon),
// the forecast with its interval and, below, the planned input after
// the recorded one.
func forecastPicture(path string, ds *dataset, fr *forecastResult) error {
	dt, f := ds.step(), fr.f
	y, x := ds.data[ds.output], ds.data[fr.planned]
	n := len(y)
	past := min(n, 2*fr.h)
	tp := times(past, 1-past, dt)
	tf := times(fr.h, 1, dt)
	xlabel := "time from the end of the record (" + ds.timeUnit() + ")"
	p := chart.New("Forecast of "+ds.output+outputUnit(ds), xlabel, ds.output+outputUnit(ds))
	b := p.Band(tf, f.Lower, f.Upper, palette.fill)
	p.Legend("observed", p.Line(tp, y[n-past:], palette.data, 1.2))
	p.Legend("forecast", p.Line(tf, f.Mean, palette.model, 2))
	p.Legend(fmt.Sprintf("%.0f %% interval", 100*f.Level), b)
	q := chart.New("Planned "+fr.planned, xlabel, inputUnit(ds, fr.planned))
	inputTrace(q, tp, x[n-past:])
	q.Legend("planned", q.Line(tf, fr.plan[:fr.h], palette.mark, 2.5))
	q.SetX(p.XRange())
	return chart.Save(path, []*chart.Chart{p, q}, 18, 7)
}

// smoothedTrace draws the smoothed estimates of the missing outputs
// (Estimate.Missing) with +-2 standard errors, where there are any.
func smoothedTrace(c *chart.Chart, t []float64, est *fit.Estimate) {
	if len(est.Missing) == 0 {
		return
	}
	n := len(t)
	v, lo, hi := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range v {
		v[i], lo[i], hi[i] = math.NaN(), math.NaN(), math.NaN()
	}
	for _, mv := range est.Missing {
		if mv.Index >= 0 && mv.Index < n {
			v[mv.Index], lo[mv.Index], hi[mv.Index] = mv.Value, mv.Value-2*mv.SE, mv.Value+2*mv.SE
		}
	}
	// One band per gap: a band over NaN would join the gaps.
	for i := 0; i < n; {
		if math.IsNaN(v[i]) {
			i++
			continue
		}
		j := i
		for j < n && !math.IsNaN(v[j]) {
			j++
		}
		b := c.Band(t[i:j], lo[i:j], hi[i:j], palette.errors)
		if i == est.Missing[0].Index {
			c.Legend("smoothed +-2 standard errors (missing samples)", b)
		}
		i = j
	}
	c.Legend("smoothed (missing samples)", c.Line(t, v, palette.mark, 1.5))
}
