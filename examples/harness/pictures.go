package main

import (
	"fmt"
	"image/color"
	"math"
	"math/cmplx"
	"path/filepath"

	"github.com/backshift/backshift/examples/chart"
	"github.com/backshift/backshift/tf"
	"gonum.org/v1/plot/vg/draw"
)

// The pictures -pictures draws, in its folder.
const (
	signalPicture      = "test-signal.png"
	stepPicture        = "step-responses.png"
	sensitivityPicture = "sensitivity.png"
)

// ruleColours holds a line colour and a translucent band colour per
// rule, in the order of tuningRules; the test signal is drawn in the
// first.
var ruleColours = []struct{ line, band color.Color }{
	{color.RGBA{R: 31, G: 100, B: 190, A: 255}, color.NRGBA{R: 31, G: 100, B: 190, A: 60}},
	{color.RGBA{R: 205, G: 60, B: 40, A: 255}, color.NRGBA{R: 205, G: 60, B: 40, A: 60}},
}

// edgeColour marks band edges and peaks.
var edgeColour = color.Gray{Y: 110}

// drawPictures draws the loop's three pictures into dir: the test signal
// and its spectrum, the closed-loop step responses with their bands over
// the drawn plants, and the sensitivity magnitude with its peak.
func drawPictures(dir string, wk *walk) error {
	if err := signalChart(filepath.Join(dir, signalPicture), wk.Test); err != nil {
		return err
	}
	if err := stepChart(filepath.Join(dir, stepPicture), wk.Rules); err != nil {
		return err
	}
	return sensitivityChart(filepath.Join(dir, sensitivityPicture), wk.Rules)
}

// signalChart draws the valve's test signal over the test and its
// periodogram (decibels against log10 of the frequency), with the band
// it excites marked.
func signalChart(path string, t *plantTest) error {
	p := t.Plan
	x := make([]float64, len(p.Signal))
	for k := range x {
		x[k] = float64(k) * p.Sample
	}
	sig := chart.New("Test signal of the valve", "time (min)", "valve (%)")
	sig.Line(x, p.Signal, ruleColours[0].line, 0.8)
	spec := chart.New("Its spectrum (periodogram of the moves about 50 %)", "frequency (log10 rad/min)", "power (dB)")
	top := 0.0
	for _, v := range p.Power[1:] {
		top = max(top, v)
	}
	// Line 0 holds the mean only; the lines between the harmonics of the
	// sequence's period carry rounding noise alone (below 1e-12 of the
	// top line), and are left out.
	var f, db []float64
	for k := 1; k < len(p.Frequency); k++ {
		if p.Power[k] > 1e-12*top {
			f, db = append(f, math.Log10(p.Frequency[k])), append(db, 10*math.Log10(p.Power[k]))
		}
	}
	if len(f) > 0 {
		spec.SetX(math.Log10(p.BandLow)-0.2, f[len(f)-1])
	}
	spec.Legend("periodogram", spec.Dots(f, db, ruleColours[0].line, draw.CircleGlyph{}, 1.2))
	lo, hi := spec.YRange()
	spec.Legend("band excited", spec.VLine(math.Log10(p.BandLow), lo, hi, edgeColour).Dashed(4, 3))
	spec.VLine(math.Log10(p.BandHigh), lo, hi, edgeColour).Dashed(4, 3)
	return chart.Save(path, []*chart.Chart{sig, spec}, 18, 6)
}

// stepChart draws each rule's set-point and load step responses on the
// identified model, with the band between the lowest and highest
// quantile of the responses over the drawn plants, and dashed the
// responses of the worst case (the case of the highest |S| peak).
func stepChart(path string, rules []*tuned) error {
	sp := chart.New("Set-point step of 1 degC: temperature", "time (min)", "temp (degC)")
	ld := chart.New("Load step of 1 % valve: temperature", "time (min)", "temp (degC)")
	for i, r := range rules {
		c, lv := ruleColours[i%len(ruleColours)], r.Robust.Levels
		band := fmt.Sprintf("%s, %g-%g %% of drawn plants", r.Tuning.Rule, 100*lv[0], 100*lv[len(lv)-1])
		for _, pan := range []struct {
			c *chart.Chart
			y []float64
			q [][]float64
		}{{sp, r.Nominal.Setpoint.Output, r.Robust.SetpointBand}, {ld, r.Nominal.Load.Output, r.Robust.LoadBand}} {
			t := minutes(len(pan.y), r.Tuning.Interval)
			pan.c.Legend(band, pan.c.Band(t, pan.q[0], pan.q[len(pan.q)-1], c.band))
			pan.c.Legend(string(r.Tuning.Rule)+" on the model", pan.c.Line(t, pan.y, c.line, 1.4))
		}
		if k := r.Worst.SensitivityPeak.Case; k >= 0 {
			wc := r.Worst.Cases[k]
			label := fmt.Sprintf("%s, worst case (gain x%.3g, dead time %+d)", r.Tuning.Rule, wc.GainFactor, wc.DelayChange)
			t := minutes(len(wc.Loop.Setpoint.Output), r.Tuning.Interval)
			sp.Legend(label, sp.Line(t, wc.Loop.Setpoint.Output, c.line, 0.8).Dashed(4, 3))
			ld.Line(minutes(len(wc.Loop.Load.Output), r.Tuning.Interval), wc.Loop.Load.Output, c.line, 0.8).Dashed(4, 3)
		}
	}
	return chart.Save(path, []*chart.Chart{sp, ld}, 18, 7)
}

// sensitivityChart draws |S| = 1/|1 + C P| of each rule's loop on the
// identified model against log10 of the frequency, with its peak Ms.
func sensitivityChart(path string, rules []*tuned) error {
	c := chart.New("Sensitivity magnitude |S| on the identified model", "frequency (log10 rad/min)", "|S|")
	for i, r := range rules {
		col := ruleColours[i%len(ruleColours)].line
		iv := r.Tuning.Interval.Value
		w, mag, err := sensitivity(r.Tuning.Controller, r.Plant)
		if err != nil {
			return err
		}
		x := make([]float64, len(w))
		for k := range w {
			x[k] = math.Log10(w[k] / iv)
		}
		c.Legend(string(r.Tuning.Rule), c.Line(x, mag, col, 1.4))
		peak := []float64{math.Log10(r.Nominal.SensitivityPeakAt / iv)}
		c.Legend(fmt.Sprintf("%s peak Ms %.2f", r.Tuning.Rule, r.Nominal.SensitivityPeak),
			c.Dots(peak, []float64{r.Nominal.SensitivityPeak}, col, draw.CircleGlyph{}, 3))
	}
	lo, hi := c.XRange()
	c.HLine(1, lo, hi, edgeColour).Dashed(4, 3)
	return chart.Save(path, []*chart.Chart{c}, 18, 8)
}

// sensitivity returns |S| = 1/|1 + C P| on 400 frequencies spaced
// evenly in log10 from 10^-3 to pi rad/sample.
func sensitivity(c, p tf.Rational) (w, mag []float64, err error) {
	l, err := c.Times(p)
	if err != nil {
		return nil, nil, err
	}
	const n = 400
	w = make([]float64, n)
	for k := range w {
		w[k] = math.Pow(10, -3+float64(k)*(math.Log10(math.Pi)+3)/(n-1))
	}
	mag = make([]float64, n)
	for k, v := range l.Freq(w) {
		mag[k] = 1 / cmplx.Abs(1+v)
	}
	return w, mag, nil
}

// minutes returns the times (min) of n samples at the interval iv.
func minutes(n int, iv tf.Interval) []float64 {
	t := make([]float64, n)
	for k := range t {
		t[k] = float64(k) * iv.Value
	}
	return t
}
