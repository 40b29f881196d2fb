package main

import (
	"fmt"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
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

// newPlot returns a plot with title and axis labels in a readable size
// and a light grid.
func newPlot(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font.Size = 13
	p.X.Label.Text = x
	p.Y.Label.Text = y
	p.X.Label.TextStyle.Font.Size = 11
	p.Y.Label.TextStyle.Font.Size = 11
	p.X.Tick.Label.Font.Size = 10
	p.Y.Tick.Label.Font.Size = 10
	p.Legend.TextStyle.Font.Size = 10
	p.Legend.Top = true
	p.X.Tick.Marker = plainTicks{}
	p.Y.Tick.Marker = plainTicks{}
	g := plotter.NewGrid()
	g.Vertical.Color = color.Gray{Y: 225}
	g.Horizontal.Color = color.Gray{Y: 225}
	p.Add(g)
	return p
}

// plainTicks are gonum's default ticks labelled in the shortest form
// (2500, not 2500.00).
type plainTicks struct{}

// Ticks returns the default ticks with plain labels.
func (plainTicks) Ticks(lo, hi float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(lo, hi)
	for i := range ts {
		if ts[i].Label != "" {
			ts[i].Label = strconv.FormatFloat(ts[i].Value, 'g', 10, 64)
		}
	}
	return ts
}

// stems adds a stem plot (a vertical line from 0 and a dot per lag).
func stems(p *plot.Plot, x, y []float64, c color.Color) error {
	for i := range x {
		l, err := plotter.NewLine(plotter.XYs{{X: x[i], Y: 0}, {X: x[i], Y: y[i]}})
		if err != nil {
			return err
		}
		l.Color = c
		l.Width = vg.Points(1.5)
		p.Add(l)
	}
	s, err := plotter.NewScatter(xys(x, y))
	if err != nil {
		return err
	}
	s.GlyphStyle.Color = c
	s.GlyphStyle.Radius = vg.Points(2)
	s.GlyphStyle.Shape = draw.CircleGlyph{}
	p.Add(s)
	return nil
}

// hline adds a horizontal line at y from x0 to x1.
func hline(p *plot.Plot, y, x0, x1 float64, c color.Color, dashed bool) (*plotter.Line, error) {
	l, err := plotter.NewLine(plotter.XYs{{X: x0, Y: y}, {X: x1, Y: y}})
	if err != nil {
		return nil, err
	}
	l.Color = c
	l.Width = vg.Points(1)
	if dashed {
		l.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
	}
	p.Add(l)
	return l, nil
}

// vline adds a vertical line at x from y0 to y1.
func vline(p *plot.Plot, x, y0, y1 float64, c color.Color) (*plotter.Line, error) {
	l, err := plotter.NewLine(plotter.XYs{{X: x, Y: y0}, {X: x, Y: y1}})
	if err != nil {
		return nil, err
	}
	l.Color = c
	l.Width = vg.Points(1.5)
	l.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
	p.Add(l)
	return l, nil
}

// line adds a polyline of x, y (NaN samples break nothing: they are
// skipped).
func line(p *plot.Plot, x, y []float64, c color.Color, width float64) (*plotter.Line, error) {
	l, err := plotter.NewLine(xys(x, y))
	if err != nil {
		return nil, err
	}
	l.Color = c
	l.Width = vg.Points(width)
	p.Add(l)
	return l, nil
}

// band adds a filled area between lo and hi.
func band(p *plot.Plot, x, lo, hi []float64, c color.Color) (*plotter.Polygon, error) {
	pts := make(plotter.XYs, 0, 2*len(x))
	for i := range x {
		pts = append(pts, plotter.XY{X: x[i], Y: hi[i]})
	}
	for i := len(x) - 1; i >= 0; i-- {
		pts = append(pts, plotter.XY{X: x[i], Y: lo[i]})
	}
	poly, err := plotter.NewPolygon(pts)
	if err != nil {
		return nil, err
	}
	poly.Color = c
	poly.LineStyle.Width = 0
	p.Add(poly)
	return poly, nil
}

func xys(x, y []float64) plotter.XYs {
	pts := make(plotter.XYs, 0, len(x))
	for i := range x {
		if math.IsNaN(y[i]) || math.IsInf(y[i], 0) {
			continue
		}
		pts = append(pts, plotter.XY{X: x[i], Y: y[i]})
	}
	return pts
}

// savePanels writes the plots stacked vertically into one PNG of the
// given width and height per panel (in cm).
func savePanels(path string, panels []*plot.Plot, wcm, hcm float64) error {
	w := vg.Length(wcm) * vg.Centimeter
	h := vg.Length(hcm) * vg.Centimeter * vg.Length(len(panels))
	img := vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(110))
	dc := draw.New(img)
	// White background.
	dc.SetColor(color.White)
	dc.Fill(dc.Rectangle.Path())
	tiles := draw.Tiles{Rows: len(panels), Cols: 1, PadTop: vg.Points(4), PadBottom: vg.Points(4),
		PadLeft: vg.Points(4), PadRight: vg.Points(10), PadY: vg.Points(12)}
	grid := make([][]*plot.Plot, len(panels))
	for i, p := range panels {
		grid[i] = []*plot.Plot{p}
	}
	canvases := plot.Align(grid, tiles, dc)
	for i, p := range panels {
		p.Draw(canvases[i][0])
	}
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	if _, err := (vgimg.PngCanvas{Canvas: img}).WriteTo(f); err != nil {
		f.Close()
		return err
	}
	return f.Close()
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
	// LegendBottom puts the legend at the bottom right.
	LegendBottom bool
}

// plotCorrelations writes stacked correlation panels with their bands.
func plotCorrelations(path string, panels []corrPanel, xlabel, ylabel string) error {
	var ps []*plot.Plot
	for _, c := range panels {
		p := newPlot(c.Title, xlabel, ylabel)
		lo, hi := c.Lags[0], c.Lags[len(c.Lags)-1]
		if _, err := hline(p, 0, lo, hi, color.Gray{Y: 120}, false); err != nil {
			return err
		}
		if err := stems(p, c.Lags, c.R, colModel); err != nil {
			return err
		}
		l, err := hline(p, c.Band, lo, hi, colBand, true)
		if err != nil {
			return err
		}
		if _, err := hline(p, -c.Band, lo, hi, colBand, true); err != nil {
			return err
		}
		p.Legend.Add(fmt.Sprintf("95 %% band (+-%.3f)", c.Band), l)
		p.Legend.Top = !c.LegendBottom
		if c.Mark >= 0 {
			ymin, ymax := minMax(c.R)
			ymin, ymax = math.Min(ymin, -c.Band), math.Max(ymax, c.Band)
			v, err := vline(p, c.Mark, ymin, ymax, colMark)
			if err != nil {
				return err
			}
			p.Legend.Add(c.MarkLabel, v)
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
	var ps []*plot.Plot
	for _, w := range panels {
		p := newPlot(w.Title, xlabel, w.YLabel)
		lo, hi := w.Lags[0], w.Lags[len(w.Lags)-1]
		if _, err := hline(p, 0, lo, hi, color.Gray{Y: 120}, false); err != nil {
			return err
		}
		up := make([]float64, len(w.SE))
		dn := make([]float64, len(w.SE))
		for i, s := range w.SE {
			up[i], dn[i] = 2*s, -2*s
		}
		b, err := band(p, w.Lags, dn, up, colSEs)
		if err != nil {
			return err
		}
		p.Legend.Add("+-2 standard errors", b)
		if err := stems(p, w.Lags, w.V, colModel); err != nil {
			return err
		}
		if w.True != nil {
			s, err := plotter.NewScatter(xys(w.Lags, w.True))
			if err != nil {
				return err
			}
			s.GlyphStyle.Color = colTrue
			s.GlyphStyle.Shape = draw.CrossGlyph{}
			s.GlyphStyle.Radius = vg.Points(3)
			p.Add(s)
			p.Legend.Add("true weights", s)
		}
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
	var ps []*plot.Plot
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
		fl, err := hline(p, s.Final, lo, hi, color.Gray{Y: 110}, true)
		if err != nil {
			return err
		}
		p.Legend.Add(fmt.Sprintf("gain %.3g", s.Final), fl)
		l, err := line(p, s.T, s.Y, colModel, 2.5)
		if err != nil {
			return err
		}
		p.Legend.Add("fitted model", l)
		if s.True != nil {
			// Drawn over the fitted curve, dotted, so both show where
			// they coincide.
			l, err := line(p, s.T, s.True, colTrue, 1.5)
			if err != nil {
				return err
			}
			l.Dashes = []vg.Length{vg.Points(2), vg.Points(3)}
			p.Legend.Add("true model", l)
		}
		if !math.IsNaN(s.Settling) {
			v, err := vline(p, s.Settling, ymin, ymax, colMark)
			if err != nil {
				return err
			}
			p.Legend.Add(fmt.Sprintf("settled within 2 %% at %.0f %s", s.Settling, s.Unit), v)
		}
		d, err := vline(p, s.DeadTime, ymin, ymax, colBand)
		if err != nil {
			return err
		}
		d.Dashes = []vg.Length{vg.Points(1), vg.Points(2)}
		p.Legend.Add(fmt.Sprintf("dead time %g %s", s.DeadTime, s.Unit), d)
		p.Legend.Top = s.Final < 0
		p.Legend.Left = false
		p.Y.Min, p.Y.Max = ymin, ymax
		ps = append(ps, p)
	}
	return savePanels(path, ps, 16, 7)
}

// plotFit writes observed against fitted (one-step-ahead) values: the
// whole record, a zoom on the last window with the observations as
// dots, and the residuals of the whole record.
func plotFit(path string, t, obs, fit []float64, window, first int, xlabel, ylabel string) error {
	whole := newPlot("Observed and fitted (one step ahead), whole record", xlabel, ylabel)
	lo, err := line(whole, t, obs, colData, 1.2)
	if err != nil {
		return err
	}
	lf, err := line(whole, t, fit, colModel, 0.6)
	if err != nil {
		return err
	}
	whole.Legend.Add("observed", lo)
	whole.Legend.Add("fitted", lf)
	whole.Legend.Top = false
	n := len(t)
	k := max(0, n-window)
	zoom := newPlot("Last part of the record, zoomed", xlabel, ylabel)
	sc, err := plotter.NewScatter(xys(t[k:], obs[k:]))
	if err != nil {
		return err
	}
	sc.GlyphStyle.Color = colData
	sc.GlyphStyle.Radius = vg.Points(1.6)
	sc.GlyphStyle.Shape = draw.CircleGlyph{}
	zoom.Add(sc)
	if lf, err = line(zoom, t[k:], fit[k:], colModel, 1.5); err != nil {
		return err
	}
	zoom.Legend.Add("observed", sc)
	zoom.Legend.Add("fitted", lf)
	res := newPlot(fmt.Sprintf("Residuals (observed - fitted), summed from sample %d on", first), xlabel, ylabel)
	r := make([]float64, n)
	for i := range r {
		r[i] = obs[i] - fit[i]
	}
	if _, err := hline(res, 0, t[0], t[n-1], color.Gray{Y: 120}, false); err != nil {
		return err
	}
	if _, err := line(res, t, r, colData, 0.5); err != nil {
		return err
	}
	return savePanels(path, []*plot.Plot{whole, zoom, res}, 18, 6.5)
}

// plotForecast writes the recent past, the forecast with its interval,
// and below it the planned input schedule.
func plotForecast(path string, tPast, yPast, tFut, yFut, lo, hi []float64, level float64,
	inputName string, tIn, uIn []float64, xlabel, ylabel, ulabel string) error {
	p := newPlot("Forecast of "+ylabel, xlabel, ylabel)
	b, err := band(p, tFut, lo, hi, colFill)
	if err != nil {
		return err
	}
	l1, err := line(p, tPast, yPast, colData, 1.2)
	if err != nil {
		return err
	}
	l2, err := line(p, tFut, yFut, colModel, 2)
	if err != nil {
		return err
	}
	p.Legend.Add("observed", l1)
	p.Legend.Add("forecast", l2)
	p.Legend.Add(fmt.Sprintf("%.0f %% interval", 100*level), b)
	p.Legend.Left = true
	p.Legend.Top = false
	q := newPlot("Planned "+inputName, xlabel, ulabel)
	var tp, up, tf, uf []float64
	for i, t := range tIn {
		if t <= 0 {
			tp, up = append(tp, t), append(up, uIn[i])
		} else {
			tf, uf = append(tf, t), append(uf, uIn[i])
		}
	}
	l4, err := line(q, tp, up, color.Gray{Y: 150}, 0.7)
	if err != nil {
		return err
	}
	l3, err := line(q, tf, uf, colMark, 2.5)
	if err != nil {
		return err
	}
	q.Legend.Add("recorded", l4)
	q.Legend.Add("planned", l3)
	q.Legend.Left = true
	q.Legend.Top = false
	q.X.Min, q.X.Max = p.X.Min, p.X.Max
	return savePanels(path, []*plot.Plot{p, q}, 18, 7)
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
	var ps []*plot.Plot
	for _, sp := range panels {
		p := newPlot(sp.Title, xlabel, sp.YLabel)
		for _, nl := range sp.Lines {
			l, err := line(p, t, nl.Y, nl.Color, nl.Width)
			if err != nil {
				return err
			}
			if len(sp.Lines) > 1 {
				p.Legend.Add(nl.Name, l)
			}
		}
		p.Legend.Top = false
		ps = append(ps, p)
	}
	return savePanels(path, ps, 18, 5.5)
}

// plotSimulation writes the observed output against the model's
// noise-free simulation from the inputs alone, and their difference (the
// model's estimate of the disturbance).
func plotSimulation(path string, t, obs, sim []float64, xlabel, ylabel string) error {
	p := newPlot("Observed and simulated from the inputs alone (no noise model)", xlabel, ylabel)
	lo, err := line(p, t, obs, colData, 1)
	if err != nil {
		return err
	}
	ls, err := line(p, t, sim, colModel, 1.3)
	if err != nil {
		return err
	}
	p.Legend.Add("observed", lo)
	p.Legend.Add("simulated", ls)
	p.Legend.Top = false
	q := newPlot("Difference: the disturbance the noise model describes", xlabel, ylabel)
	d := make([]float64, len(t))
	for i := range d {
		d[i] = obs[i] - sim[i]
	}
	if _, err := hline(q, 0, t[0], t[len(t)-1], color.Gray{Y: 120}, false); err != nil {
		return err
	}
	if _, err := line(q, t, d, colData, 0.6); err != nil {
		return err
	}
	return savePanels(path, []*plot.Plot{p, q}, 18, 6.5)
}
