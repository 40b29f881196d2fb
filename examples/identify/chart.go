package main

import (
	"image/color"
	"math"
	"os"
	"strconv"
	"sync"

	xfont "golang.org/x/image/font"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/font/opentype"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// The pictures are drawn with gonum's vector graphics layer (vg, vg/draw)
// and its raster back end (vg/vgimg) only. The gonum.org/v1/plot package
// itself registers every back end (PDF, SVG, EPS, TeX) with their fonts
// and encoders, which more than doubles the packages this program
// compiles (232 against 168) and slowed a first `go run` by 3 to 10
// seconds; the few chart elements the pictures need are drawn here.

// chart is one panel: a title, two labelled axes with plain tick labels
// and a light grid, the marks in the order they were added, and a
// legend.
type chart struct {
	Title, XLabel, YLabel string
	// LegendTop and LegendLeft place the legend in a corner of the data
	// area (default: bottom right).
	LegendTop, LegendLeft bool

	xFixed, yFixed         bool
	xmin, xmax, ymin, ymax float64
	marks                  []*mark
	legend                 []legendEntry
}

type markKind int

const (
	markLine  markKind = iota // a polyline, broken at non-finite values
	markDots                  // a glyph per point
	markStems                 // a vertical line from 0 and a glyph per point
	markFill                  // a filled polygon
)

// mark is one drawn element of a chart, in data coordinates.
type mark struct {
	kind   markKind
	x, y   []float64
	Color  color.Color
	Width  vg.Length // line width
	Dashes []vg.Length
	Glyph  draw.GlyphDrawer
	Radius vg.Length // glyph radius
}

type legendEntry struct {
	label string
	m     *mark
}

// add appends a mark to the chart and returns it for further styling.
func (c *chart) add(m *mark) *mark {
	c.marks = append(c.marks, m)
	return m
}

// addLegend adds a legend row showing m's style.
func (c *chart) addLegend(label string, m *mark) {
	c.legend = append(c.legend, legendEntry{label, m})
}

// setX fixes the x range.
func (c *chart) setX(lo, hi float64) { c.xFixed, c.xmin, c.xmax = true, lo, hi }

// setY fixes the y range.
func (c *chart) setY(lo, hi float64) { c.yFixed, c.ymin, c.ymax = true, lo, hi }

// xRange returns the x range drawn: the fixed one (when it is a finite,
// non-empty interval) or that of the data.
func (c *chart) xRange() (lo, hi float64) {
	if c.xFixed && finite(c.xmin) && finite(c.xmax) && c.xmin < c.xmax {
		return c.xmin, c.xmax
	}
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, m := range c.marks {
		a, b := finiteRange(m.x)
		lo, hi = math.Min(lo, a), math.Max(hi, b)
	}
	return widen(lo, hi, 0)
}

// yRange returns the y range drawn: the fixed one (when it is a finite,
// non-empty interval) or that of the data with 4 % room above and below.
func (c *chart) yRange() (lo, hi float64) {
	if c.yFixed && finite(c.ymin) && finite(c.ymax) && c.ymin < c.ymax {
		return c.ymin, c.ymax
	}
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, m := range c.marks {
		a, b := finiteRange(m.y)
		if m.kind == markStems {
			a, b = math.Min(a, 0), math.Max(b, 0)
		}
		lo, hi = math.Min(lo, a), math.Max(hi, b)
	}
	return widen(lo, hi, 0.04)
}

// finiteRange returns the smallest and largest finite values of v
// (+Inf, -Inf when there are none).
func finiteRange(v []float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			continue
		}
		lo, hi = math.Min(lo, x), math.Max(hi, x)
	}
	return lo, hi
}

// widen adds the fraction f of the span on both sides and gives empty or
// single-valued ranges a width.
func widen(lo, hi, f float64) (float64, float64) {
	switch {
	case lo > hi: // no data
		return 0, 1
	case lo == hi:
		d := math.Max(math.Abs(lo)*0.1, 1)
		return lo - d, hi + d
	}
	d := (hi - lo) * f
	return lo - d, hi + d
}

// ticks returns about five round values (1, 2 or 5 times a power of ten
// apart) inside [lo, hi] and their labels with as many decimals as the
// spacing needs (2500, not 2500.00; 0.05, not 0.05000000000000001).
func ticks(lo, hi float64) ([]float64, []string) {
	raw := (hi - lo) / 5
	e := math.Floor(math.Log10(raw))
	mag := math.Pow(10, e)
	step := 10 * mag
	switch f := raw / mag; {
	case f < 1.5:
		step = mag
	case f < 3.5:
		step = 2 * mag
	case f < 7.5:
		step = 5 * mag
	}
	dec := max(0, int(-math.Floor(math.Log10(step)+1e-9)))
	var vs []float64
	var ls []string
	for i := math.Ceil(lo/step - 1e-9); i*step <= hi+step*1e-9 && len(vs) < 20; i++ {
		v := i * step
		if math.Abs(v) < step*1e-9 {
			v = 0
		}
		vs = append(vs, v)
		ls = append(ls, strconv.FormatFloat(v, 'f', dec, 64))
	}
	return vs, ls
}

// chartFonts holds the Go fonts (regular for text, bold for titles),
// parsed on first use.
var chartFonts = sync.OnceValue(func() *font.Cache {
	parse := func(ttf []byte) *opentype.Font {
		f, err := opentype.Parse(ttf)
		if err != nil {
			panic("identify: embedded Go font: " + err.Error()) // the font is compiled in
		}
		return f
	}
	return font.NewCache(font.Collection{
		{Font: font.Font{Typeface: "Go"}, Face: parse(goregular.TTF)},
		{Font: font.Font{Typeface: "Go", Weight: xfont.WeightBold}, Face: parse(gobold.TTF)},
	})
})

// textStyle returns a text style of the given size in points.
func textStyle(size float64, bold bool) draw.TextStyle {
	f := font.Font{Typeface: "Go", Size: vg.Points(size)}
	if bold {
		f.Weight = xfont.WeightBold
	}
	return draw.TextStyle{Color: color.Black, Font: f, Handler: text.Plain{Fonts: chartFonts()}}
}

// Sizes of the chart furniture, in points.
const (
	titleSize = 12
	labelSize = 11
	tickSize  = 10
	tickLen   = 4
	gap       = 4
)

// leftMargin returns the room the chart needs left of its data area: the
// rotated y label, the longest y tick label, the tick marks.
func (c *chart) leftMargin() vg.Length {
	lo, hi := c.yRange()
	_, labels := ticks(lo, hi)
	ts := textStyle(tickSize, false)
	var w vg.Length
	for _, l := range labels {
		w = max(w, ts.Width(l))
	}
	return textStyle(labelSize, false).Height(c.YLabel) + 2*gap + w + gap + tickLen
}

// draw renders the chart into the canvas area dc; left is the room left
// of the data area (the same for every panel of a picture, so that their
// axes line up).
func (c *chart) draw(dc draw.Canvas, left vg.Length) {
	title, label, tick := textStyle(titleSize, true), textStyle(labelSize, false), textStyle(tickSize, false)
	bottom := label.Height(c.XLabel) + gap + tick.Height("0") + gap + tickLen
	top := title.Height(c.Title) + 2*gap
	area := draw.Canvas{Canvas: dc.Canvas, Rectangle: vg.Rectangle{
		Min: vg.Point{X: dc.Min.X + left, Y: dc.Min.Y + bottom},
		Max: vg.Point{X: dc.Max.X - vg.Points(14), Y: dc.Max.Y - top},
	}}
	x0, x1 := c.xRange()
	y0, y1 := c.yRange()
	px := func(x float64) vg.Length {
		return area.Min.X + vg.Length((x-x0)/(x1-x0))*(area.Max.X-area.Min.X)
	}
	py := func(y float64) vg.Length {
		return area.Min.Y + vg.Length((y-y0)/(y1-y0))*(area.Max.Y-area.Min.Y)
	}
	grid := draw.LineStyle{Color: color.Gray{Y: 225}, Width: vg.Points(0.5)}
	axis := draw.LineStyle{Color: color.Black, Width: vg.Points(0.6)}

	// Grid, tick marks and tick labels.
	xt, xl := ticks(x0, x1)
	tick.XAlign, tick.YAlign = draw.XCenter, draw.YTop
	for i, v := range xt {
		x := px(v)
		dc.StrokeLine2(grid, x, area.Min.Y, x, area.Max.Y)
		dc.StrokeLine2(axis, x, area.Min.Y, x, area.Min.Y-tickLen)
		dc.FillText(tick, vg.Point{X: x, Y: area.Min.Y - tickLen - vg.Points(2)}, xl[i])
	}
	yt, yl := ticks(y0, y1)
	tick.XAlign, tick.YAlign = draw.XRight, draw.YCenter
	for i, v := range yt {
		y := py(v)
		dc.StrokeLine2(grid, area.Min.X, y, area.Max.X, y)
		dc.StrokeLine2(axis, area.Min.X, y, area.Min.X-tickLen, y)
		dc.FillText(tick, vg.Point{X: area.Min.X - tickLen - vg.Points(2), Y: y}, yl[i])
	}

	// Marks, clipped to the data area.
	for _, m := range c.marks {
		ls := draw.LineStyle{Color: m.Color, Width: m.Width, Dashes: m.Dashes}
		gs := draw.GlyphStyle{Color: m.Color, Radius: m.Radius, Shape: m.Glyph}
		switch m.kind {
		case markLine:
			var runs [][]vg.Point
			var run []vg.Point
			for i := range m.x {
				if finite(m.x[i]) && finite(m.y[i]) {
					run = append(run, vg.Point{X: px(m.x[i]), Y: py(m.y[i])})
					continue
				}
				if len(run) > 1 {
					runs = append(runs, run)
				}
				run = nil
			}
			if len(run) > 1 {
				runs = append(runs, run)
			}
			area.StrokeLines(ls, area.ClipLinesXY(runs...)...)
		case markDots, markStems:
			for i := range m.x {
				if !finite(m.x[i]) || !finite(m.y[i]) {
					continue
				}
				p := vg.Point{X: px(m.x[i]), Y: py(m.y[i])}
				if m.kind == markStems {
					area.StrokeLines(ls, area.ClipLinesXY([]vg.Point{{X: p.X, Y: py(0)}, p})...)
				}
				if area.Contains(p) {
					area.DrawGlyph(gs, p)
				}
			}
		case markFill:
			pts := make([]vg.Point, 0, len(m.x))
			for i := range m.x {
				if finite(m.x[i]) && finite(m.y[i]) {
					pts = append(pts, vg.Point{X: px(m.x[i]), Y: py(m.y[i])})
				}
			}
			area.FillPolygon(m.Color, area.ClipPolygonXY(pts))
		}
	}

	// Frame: the two axes.
	dc.StrokeLine2(axis, area.Min.X, area.Min.Y, area.Max.X, area.Min.Y)
	dc.StrokeLine2(axis, area.Min.X, area.Min.Y, area.Min.X, area.Max.Y)

	// Title and axis labels.
	title.XAlign, title.YAlign = draw.XCenter, draw.YTop
	dc.FillText(title, vg.Point{X: (area.Min.X + area.Max.X) / 2, Y: dc.Max.Y - gap}, c.Title)
	label.XAlign, label.YAlign = draw.XCenter, draw.YBottom
	dc.FillText(label, vg.Point{X: (area.Min.X + area.Max.X) / 2, Y: dc.Min.Y}, c.XLabel)
	label.Rotation = math.Pi / 2
	label.XAlign, label.YAlign = draw.XCenter, draw.YTop
	dc.FillText(label, vg.Point{X: area.Min.X - left + gap, Y: (area.Min.Y + area.Max.Y) / 2}, c.YLabel)

	c.drawLegend(area)
}

// drawLegend draws the legend rows in a box with a white, slightly
// transparent background in the chosen corner of the data area.
func (c *chart) drawLegend(area draw.Canvas) {
	if len(c.legend) == 0 {
		return
	}
	ts := textStyle(tickSize, false)
	thumb := vg.Points(22)
	row := ts.Height("Mg") * 1.25
	var w vg.Length
	for _, e := range c.legend {
		w = max(w, ts.Width(e.label))
	}
	pad := vg.Points(4)
	bw, bh := pad+thumb+pad+w+pad, vg.Length(len(c.legend))*row+2*pad
	inset := vg.Points(5)
	x := area.Max.X - inset - bw
	if c.LegendLeft {
		x = area.Min.X + inset
	}
	y := area.Min.Y + inset
	if c.LegendTop {
		y = area.Max.Y - inset - bh
	}
	box := []vg.Point{{X: x, Y: y}, {X: x + bw, Y: y}, {X: x + bw, Y: y + bh}, {X: x, Y: y + bh}}
	area.FillPolygon(color.NRGBA{R: 255, G: 255, B: 255, A: 225}, box)
	area.StrokeLines(draw.LineStyle{Color: color.Gray{Y: 180}, Width: vg.Points(0.5)}, append(box, box[0]))
	ts.XAlign, ts.YAlign = draw.XLeft, draw.YCenter
	for i, e := range c.legend {
		cy := y + bh - pad - (vg.Length(i)+0.5)*row
		tx := x + pad
		m := e.m
		switch m.kind {
		case markLine:
			area.StrokeLine2(draw.LineStyle{Color: m.Color, Width: m.Width, Dashes: m.Dashes}, tx, cy, tx+thumb, cy)
		case markDots, markStems:
			area.DrawGlyph(draw.GlyphStyle{Color: m.Color, Radius: m.Radius, Shape: m.Glyph}, vg.Point{X: tx + thumb/2, Y: cy})
		case markFill:
			h := row * 0.35
			area.FillPolygon(m.Color, []vg.Point{{X: tx, Y: cy - h}, {X: tx + thumb, Y: cy - h}, {X: tx + thumb, Y: cy + h}, {X: tx, Y: cy + h}})
		}
		area.FillText(ts, vg.Point{X: tx + thumb + pad, Y: cy}, e.label)
	}
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// savePanels writes the charts stacked vertically into one PNG, wcm wide
// and hcm high per panel (in cm), at 110 dots per inch.
func savePanels(path string, panels []*chart, wcm, hcm float64) error {
	w := vg.Length(wcm) * vg.Centimeter
	h := vg.Length(hcm) * vg.Centimeter * vg.Length(len(panels))
	img := vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(110), vgimg.UseBackgroundColor(color.White))

	var left vg.Length
	for _, p := range panels {
		left = max(left, p.leftMargin())
	}
	ph := (h - vg.Points(8)) / vg.Length(len(panels))
	for i, p := range panels {
		top := h - vg.Points(4) - vg.Length(i)*ph
		sub := draw.Canvas{Canvas: img, Rectangle: vg.Rectangle{
			Min: vg.Point{X: vg.Points(4), Y: top - ph + vg.Points(6)},
			Max: vg.Point{X: w, Y: top},
		}}
		p.draw(sub, left)
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
