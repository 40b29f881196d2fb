package main

import (
	"fmt"
	"image/color"
	"math"
	"path/filepath"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Colours used in every picture: data in dark grey, model in blue,
// bands and limits in red/orange, the truth (demo only) in green.
var (
	colData  = color.RGBA{R: 60, G: 60, B: 60, A: 255}
	colModel = color.RGBA{R: 31, G: 100, B: 190, A: 255}
	colBand  = color.RGBA{R: 205, G: 60, B: 40, A: 255}
	colTrue  = color.RGBA{R: 40, G: 150, B: 60, A: 255}
	colFill  = color.NRGBA{R: 31, G: 100, B: 190, A: 70}
	colSEs   = color.NRGBA{R: 205, G: 60, B: 40, A: 50}
	colMark  = color.RGBA{R: 230, G: 140, B: 20, A: 255}
)

// newPlot returns an empty chart with its title and axis labels.
func newPlot(title, x, y string) *chart {
	return &chart{Title: title, XLabel: x, YLabel: y}
}

// stems adds a stem plot (a vertical line from 0 and a dot per lag).
func stems(p *chart, x, y []float64, c color.Color) {
	p.add(&mark{kind: markStems, x: x, y: y, Color: c, Width: vg.Points(1.5),
		Glyph: draw.CircleGlyph{}, Radius: vg.Points(2)})
}

// dots adds a glyph per point.
func dots(p *chart, x, y []float64, c color.Color, g draw.GlyphDrawer, radius float64) *mark {
	return p.add(&mark{kind: markDots, x: x, y: y, Color: c, Glyph: g, Radius: vg.Points(radius)})
}

// hline adds a horizontal line at y from x0 to x1.
func hline(p *chart, y, x0, x1 float64, c color.Color, dashed bool) *mark {
	m := p.add(&mark{kind: markLine, x: []float64{x0, x1}, y: []float64{y, y}, Color: c, Width: vg.Points(1)})
	if dashed {
		m.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
	}
	return m
}

// vline adds a dashed vertical line at x from y0 to y1.
func vline(p *chart, x, y0, y1 float64, c color.Color) *mark {
	return p.add(&mark{kind: markLine, x: []float64{x, x}, y: []float64{y0, y1}, Color: c,
		Width: vg.Points(1.5), Dashes: []vg.Length{vg.Points(5), vg.Points(3)}})
}

// line adds a polyline of x, y (broken where a value is NaN).
func line(p *chart, x, y []float64, c color.Color, width float64) *mark {
	return p.add(&mark{kind: markLine, x: x, y: y, Color: c, Width: vg.Points(width)})
}

// band adds a filled area between lo and hi.
func band(p *chart, x, lo, hi []float64, c color.Color) *mark {
	px := make([]float64, 0, 2*len(x))
	py := make([]float64, 0, 2*len(x))
	for i := range x {
		px, py = append(px, x[i]), append(py, hi[i])
	}
	for i := len(x) - 1; i >= 0; i-- {
		px, py = append(px, x[i]), append(py, lo[i])
	}
	return p.add(&mark{kind: markFill, x: px, y: py, Color: c})
}

// picturePath returns dir/name.png.
func picturePath(dir, name string) string { return filepath.Join(dir, name+".png") }

// corrPanel is one panel of correlations against lag with a +-band.
type corrPanel struct {
	Title string
	Lags  []float64 // in time units
	R     []float64
	Band  float64 // half-width of the significance band
	// Mark, when >= 0 (time units), is a lag to mark (the dead time).
	Mark      float64
	MarkLabel string
	// LegendBottom puts the legend at the bottom right, below the
	// stems.
	LegendBottom bool
}

// plotCorrelations writes stacked correlation panels with their bands.
func plotCorrelations(path string, panels []corrPanel, xlabel, ylabel string) error {
	var ps []*chart
	for _, c := range panels {
		p := newPlot(c.Title, xlabel, ylabel)
		lo, hi := c.Lags[0], c.Lags[len(c.Lags)-1]
		hline(p, 0, lo, hi, color.Gray{Y: 120}, false)
		stems(p, c.Lags, c.R, colModel)
		l := hline(p, c.Band, lo, hi, colBand, true)
		hline(p, -c.Band, lo, hi, colBand, true)
		p.addLegend(fmt.Sprintf("95 %% band (+-%.3f)", c.Band), l)
		p.LegendTop = !c.LegendBottom
		ymin, ymax := minMax(c.R)
		ymin, ymax = math.Min(ymin, -c.Band), math.Max(ymax, c.Band)
		if c.LegendBottom {
			// Room below the stems for the legend.
			span := ymax - ymin
			p.setY(ymin-0.45*span, ymax+0.04*span)
		}
		if c.Mark >= 0 {
			p.addLegend(c.MarkLabel, vline(p, c.Mark, ymin, ymax, colMark))
		}
		ps = append(ps, p)
	}
	return savePanels(path, ps, 16, 7)
}

func minMax(x []float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range x {
		if math.IsNaN(v) {
			continue
		}
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	return lo, hi
}

// weightPanel is one panel of impulse-response weights with standard
// errors.
type weightPanel struct {
	Title  string
	Lags   []float64 // time units
	V, SE  []float64
	YLabel string
	// True, when not nil, are the true weights (demo data only).
	True []float64
}

// plotWeights writes stacked impulse-response weight panels: stems with
// +-2 SE limits around zero.
func plotWeights(path string, panels []weightPanel, xlabel string) error {
	var ps []*chart
	for _, w := range panels {
		p := newPlot(w.Title, xlabel, w.YLabel)
		lo, hi := w.Lags[0], w.Lags[len(w.Lags)-1]
		hline(p, 0, lo, hi, color.Gray{Y: 120}, false)
		up := make([]float64, len(w.SE))
		dn := make([]float64, len(w.SE))
		for i, s := range w.SE {
			up[i], dn[i] = 2*s, -2*s
		}
		p.addLegend("+-2 standard errors", band(p, w.Lags, dn, up, colSEs))
		stems(p, w.Lags, w.V, colModel)
		if w.True != nil {
			p.addLegend("true weights", dots(p, w.Lags, w.True, colTrue, draw.CrossGlyph{}, 3))
		}
		p.LegendTop = true
		ps = append(ps, p)
	}
	return savePanels(path, ps, 16, 7)
}

// stepPanel is one input's step response.
type stepPanel struct {
	Title    string
	T        []float64 // time units
	Y        []float64 // response to a unit step
	True     []float64 // demo only, or nil
	Final    float64   // the gain
	Settling float64   // time units, NaN if none
	DeadTime float64   // time units
	YLabel   string
	Unit     string // time unit for the legend
}

// plotSteps writes stacked step-response panels with the final value,
// the dead time and the settling time marked.
func plotSteps(path string, panels []stepPanel, xlabel string) error {
	var ps []*chart
	for _, s := range panels {
		p := newPlot(s.Title, xlabel, s.YLabel)
		lo, hi := s.T[0], s.T[len(s.T)-1]
		ymin, ymax := minMax(s.Y)
		ymin, ymax = math.Min(ymin, 0), math.Max(ymax, 0)
		if s.Final < 0 {
			ymin = math.Min(ymin, s.Final*1.05)
		} else {
			ymax = math.Max(ymax, s.Final*1.05)
		}
		p.addLegend(fmt.Sprintf("gain %.3g", s.Final), hline(p, s.Final, lo, hi, color.Gray{Y: 110}, true))
		p.addLegend("fitted model", line(p, s.T, s.Y, colModel, 2.5))
		if s.True != nil {
			// Drawn over the fitted curve, dotted, so both show where
			// they coincide.
			l := line(p, s.T, s.True, colTrue, 1.5)
			l.Dashes = []vg.Length{vg.Points(2), vg.Points(3)}
			p.addLegend("true model", l)
		}
		if !math.IsNaN(s.Settling) {
			p.addLegend(fmt.Sprintf("settled within 2 %% at %.0f %s", s.Settling, s.Unit),
				vline(p, s.Settling, ymin, ymax, colMark))
		}
		d := vline(p, s.DeadTime, ymin, ymax, colBand)
		d.Dashes = []vg.Length{vg.Points(1), vg.Points(2)}
		p.addLegend("dead time "+amount(s.DeadTime, s.Unit), d)
		p.LegendTop = s.Final < 0
		p.setY(ymin, ymax)
		ps = append(ps, p)
	}
	return savePanels(path, ps, 16, 7)
}

// plotFit writes observed against fitted (one-step-ahead) values: the
// whole record, a zoom on the last window with the observations as
// dots, and the residuals of the whole record.
func plotFit(path string, t, obs, fit []float64, window, first int, xlabel, ylabel string) error {
	whole := newPlot("Observed and fitted (one step ahead), whole record", xlabel, ylabel)
	whole.addLegend("observed", line(whole, t, obs, colData, 1.2))
	whole.addLegend("fitted", line(whole, t, fit, colModel, 0.6))
	n := len(t)
	k := max(0, n-window)
	zoom := newPlot("Last part of the record, zoomed", xlabel, ylabel)
	zoom.addLegend("observed", dots(zoom, t[k:], obs[k:], colData, draw.CircleGlyph{}, 1.6))
	zoom.addLegend("fitted", line(zoom, t[k:], fit[k:], colModel, 1.5))
	zoom.LegendTop = true
	res := newPlot(fmt.Sprintf("Residuals (observed - fitted), summed from sample %d on", first), xlabel, ylabel)
	r := make([]float64, n)
	for i := range r {
		r[i] = obs[i] - fit[i]
	}
	hline(res, 0, t[0], t[n-1], color.Gray{Y: 120}, false)
	line(res, t, r, colData, 0.5)
	return savePanels(path, []*chart{whole, zoom, res}, 18, 6.5)
}

// plotForecast writes the recent past, the forecast with its interval,
// and below it the planned input schedule.
func plotForecast(path string, tPast, yPast, tFut, yFut, lo, hi []float64, level float64,
	inputName string, tIn, uIn []float64, xlabel, ylabel, ulabel string) error {
	p := newPlot("Forecast of "+ylabel, xlabel, ylabel)
	b := band(p, tFut, lo, hi, colFill)
	p.addLegend("observed", line(p, tPast, yPast, colData, 1.2))
	p.addLegend("forecast", line(p, tFut, yFut, colModel, 2))
	p.addLegend(fmt.Sprintf("%.0f %% interval", 100*level), b)
	p.LegendLeft = true
	q := newPlot("Planned "+inputName, xlabel, ulabel)
	var tp, up, tf, uf []float64
	for i, t := range tIn {
		if t <= 0 {
			tp, up = append(tp, t), append(up, uIn[i])
		} else {
			tf, uf = append(tf, t), append(uf, uIn[i])
		}
	}
	q.addLegend("recorded", line(q, tp, up, color.Gray{Y: 150}, 0.7))
	q.addLegend("planned", line(q, tf, uf, colMark, 2.5))
	q.LegendLeft = true
	q.setX(p.xRange())
	return savePanels(path, []*chart{p, q}, 18, 7)
}

// seriesPanel is one panel of the record overview.
type seriesPanel struct {
	Title, YLabel string
	Lines         []namedLine
}

type namedLine struct {
	Name  string
	Y     []float64
	Color color.Color
	Width float64
}

// plotSeries writes the record overview: one panel per series group
// against time.
func plotSeries(path string, t []float64, panels []seriesPanel, xlabel string) error {
	var ps []*chart
	for _, sp := range panels {
		p := newPlot(sp.Title, xlabel, sp.YLabel)
		for _, nl := range sp.Lines {
			l := line(p, t, nl.Y, nl.Color, nl.Width)
			if len(sp.Lines) > 1 {
				p.addLegend(nl.Name, l)
			}
		}
		ps = append(ps, p)
	}
	return savePanels(path, ps, 18, 5.5)
}

// plotSimulation writes the observed output against the model's
// noise-free simulation from the inputs alone, and their difference (the
// model's estimate of the disturbance).
func plotSimulation(path string, t, obs, sim []float64, xlabel, ylabel string) error {
	p := newPlot("Observed and simulated from the inputs alone (no noise model)", xlabel, ylabel)
	p.addLegend("observed", line(p, t, obs, colData, 1))
	p.addLegend("simulated", line(p, t, sim, colModel, 1.3))
	q := newPlot("Difference: the disturbance the noise model describes", xlabel, ylabel)
	d := make([]float64, len(t))
	for i := range d {
		d[i] = obs[i] - sim[i]
	}
	hline(q, 0, t[0], t[len(t)-1], color.Gray{Y: 120}, false)
	line(q, t, d, colData, 0.6)
	return savePanels(path, []*chart{p, q}, 18, 6.5)
}
