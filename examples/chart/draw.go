package chart

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

// DPI is the density the pictures are written at: twice the 110 dots
// per inch of a common screen, so that they stay sharp in print.
const DPI = 220

// Sizes of the chart furniture, in points.
const (
	titleSize = 12
	labelSize = 11
	tickSize  = 10
	tickLen   = 4
	gap       = 4
	thumb     = 22 // length of the style sample in a legend row
)

// Save writes the charts stacked vertically into one PNG file at path,
// widthCM wide and heightCM high per panel (in centimetres), at DPI dots
// per inch. The panels share their left and right margins, so that
// their data areas line up; legends sit right of the data areas.
func Save(path string, panels []*Chart, widthCM, heightCM float64) error {
	w := vg.Length(widthCM) * vg.Centimeter
	h := vg.Length(heightCM) * vg.Centimeter * vg.Length(len(panels))
	img := vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(DPI), vgimg.UseBackgroundColor(color.White))

	var left, right vg.Length = 0, vg.Points(14)
	for _, p := range panels {
		left = max(left, p.leftMargin())
		right = max(right, p.legendWidth()+2*gap)
	}
	ph := (h - vg.Points(8)) / vg.Length(len(panels))
	for i, p := range panels {
		top := h - vg.Points(4) - vg.Length(i)*ph
		p.draw(draw.Canvas{Canvas: img, Rectangle: vg.Rectangle{
			Min: vg.Point{X: vg.Points(4), Y: top - ph + vg.Points(6)},
			Max: vg.Point{X: w, Y: top},
		}}, left, right)
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

// fonts holds the Go fonts (regular for text, bold for titles), parsed
// on first use.
var fonts = sync.OnceValue(func() *font.Cache {
	parse := func(ttf []byte) *opentype.Font {
		f, err := opentype.Parse(ttf)
		if err != nil {
			panic("chart: embedded Go font: " + err.Error()) // the font is compiled in
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
	return draw.TextStyle{Color: color.Black, Font: f, Handler: text.Plain{Fonts: fonts()}}
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

// leftMargin returns the room the chart needs left of its data area: the
// rotated y label, the longest y tick label, the tick marks.
func (c *Chart) leftMargin() vg.Length {
	lo, hi := c.YRange()
	_, labels := ticks(lo, hi)
	ts := textStyle(tickSize, false)
	var w vg.Length
	for _, l := range labels {
		w = max(w, ts.Width(l))
	}
	return textStyle(labelSize, false).Height(c.YLabel) + 2*gap + w + gap + tickLen
}

// legendWidth returns the width of the chart's legend box (0 without a
// legend).
func (c *Chart) legendWidth() vg.Length {
	if len(c.legend) == 0 {
		return 0
	}
	ts := textStyle(tickSize, false)
	var w vg.Length
	for _, e := range c.legend {
		w = max(w, ts.Width(e.label))
	}
	return gap + vg.Points(thumb) + gap + w + gap
}

// frame maps data coordinates into the data area of a panel.
type frame struct {
	area           draw.Canvas
	x0, x1, y0, y1 float64
}

// px returns the canvas position of x.
func (f frame) px(x float64) vg.Length {
	return f.area.Min.X + vg.Length((x-f.x0)/(f.x1-f.x0))*(f.area.Max.X-f.area.Min.X)
}

// py returns the canvas position of y.
func (f frame) py(y float64) vg.Length {
	return f.area.Min.Y + vg.Length((y-f.y0)/(f.y1-f.y0))*(f.area.Max.Y-f.area.Min.Y)
}

// at returns the canvas point of (x, y).
func (f frame) at(x, y float64) vg.Point { return vg.Point{X: f.px(x), Y: f.py(y)} }

// Line styles of the chart furniture.
var (
	gridStyle = draw.LineStyle{Color: color.Gray{Y: 225}, Width: vg.Points(0.5)}
	axisStyle = draw.LineStyle{Color: color.Black, Width: vg.Points(0.6)}
)

// draw renders the chart into the canvas area dc; left and right are the
// room left and right of the data area (the same for every panel of a
// picture, so that their axes line up).
func (c *Chart) draw(dc draw.Canvas, left, right vg.Length) {
	title, label, tick := textStyle(titleSize, true), textStyle(labelSize, false), textStyle(tickSize, false)
	bottom := label.Height(c.XLabel) + gap + tick.Height("0") + gap + tickLen
	top := title.Height(c.Title) + 2*gap
	f := frame{area: draw.Canvas{Canvas: dc.Canvas, Rectangle: vg.Rectangle{
		Min: vg.Point{X: dc.Min.X + left, Y: dc.Min.Y + bottom},
		Max: vg.Point{X: dc.Max.X - right, Y: dc.Max.Y - top},
	}}}
	f.x0, f.x1 = c.XRange()
	f.y0, f.y1 = c.YRange()
	f.drawGrid(dc)
	for _, m := range c.marks {
		f.drawMark(m)
	}
	a := f.area
	dc.StrokeLine2(axisStyle, a.Min.X, a.Min.Y, a.Max.X, a.Min.Y)
	dc.StrokeLine2(axisStyle, a.Min.X, a.Min.Y, a.Min.X, a.Max.Y)
	c.drawLabels(dc, a.Rectangle, left)
	c.drawLegend(dc, vg.Point{X: a.Max.X + gap, Y: a.Max.Y})
}

// drawGrid draws the grid lines, tick marks and tick labels of both
// axes.
func (f frame) drawGrid(dc draw.Canvas) {
	a := f.area
	tick := textStyle(tickSize, false)
	xt, xl := ticks(f.x0, f.x1)
	tick.XAlign, tick.YAlign = draw.XCenter, draw.YTop
	for i, v := range xt {
		x := f.px(v)
		dc.StrokeLine2(gridStyle, x, a.Min.Y, x, a.Max.Y)
		dc.StrokeLine2(axisStyle, x, a.Min.Y, x, a.Min.Y-tickLen)
		dc.FillText(tick, vg.Point{X: x, Y: a.Min.Y - tickLen - vg.Points(2)}, xl[i])
	}
	yt, yl := ticks(f.y0, f.y1)
	tick.XAlign, tick.YAlign = draw.XRight, draw.YCenter
	for i, v := range yt {
		y := f.py(v)
		dc.StrokeLine2(gridStyle, a.Min.X, y, a.Max.X, y)
		dc.StrokeLine2(axisStyle, a.Min.X, y, a.Min.X-tickLen, y)
		dc.FillText(tick, vg.Point{X: a.Min.X - tickLen - vg.Points(2), Y: y}, yl[i])
	}
}

// drawMark draws one mark, clipped to the data area.
func (f frame) drawMark(m *Mark) {
	a := f.area
	ls := draw.LineStyle{Color: m.color, Width: m.width, Dashes: m.dashes}
	gs := draw.GlyphStyle{Color: m.color, Radius: m.radius, Shape: m.glyph}
	switch m.kind {
	case lineKind:
		a.StrokeLines(ls, a.ClipLinesXY(f.runs(m)...)...)
	case dotsKind, stemsKind:
		for i := range m.x {
			if !finite(m.x[i]) || !finite(m.y[i]) {
				continue
			}
			p := f.at(m.x[i], m.y[i])
			if m.kind == stemsKind {
				a.StrokeLines(ls, a.ClipLinesXY([]vg.Point{{X: p.X, Y: f.py(0)}, p})...)
			}
			if a.Contains(p) {
				a.DrawGlyph(gs, p)
			}
		}
	case fillKind:
		pts := make([]vg.Point, 0, len(m.x))
		for i := range m.x {
			if finite(m.x[i]) && finite(m.y[i]) {
				pts = append(pts, f.at(m.x[i], m.y[i]))
			}
		}
		a.FillPolygon(m.color, a.ClipPolygonXY(pts))
	}
}

// runs returns the stretches of a line mark between non-finite values,
// in canvas coordinates (stretches of one point are left out).
func (f frame) runs(m *Mark) [][]vg.Point {
	var runs [][]vg.Point
	var run []vg.Point
	for i := range m.x {
		if finite(m.x[i]) && finite(m.y[i]) {
			run = append(run, f.at(m.x[i], m.y[i]))
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
	return runs
}

// drawLabels writes the title above the data area a, the x label below
// it and the y label, rotated, at the left edge of the panel (left
// points left of the data area).
func (c *Chart) drawLabels(dc draw.Canvas, a vg.Rectangle, left vg.Length) {
	title, label := textStyle(titleSize, true), textStyle(labelSize, false)
	title.XAlign, title.YAlign = draw.XCenter, draw.YTop
	dc.FillText(title, vg.Point{X: (a.Min.X + a.Max.X) / 2, Y: dc.Max.Y - gap}, c.Title)
	label.XAlign, label.YAlign = draw.XCenter, draw.YBottom
	dc.FillText(label, vg.Point{X: (a.Min.X + a.Max.X) / 2, Y: dc.Min.Y}, c.XLabel)
	label.Rotation = math.Pi / 2
	label.XAlign, label.YAlign = draw.XCenter, draw.YTop
	dc.FillText(label, vg.Point{X: a.Min.X - left + gap, Y: (a.Min.Y + a.Max.Y) / 2}, c.YLabel)
}

// drawLegend draws the legend rows in a framed box whose top left corner
// is at, beside the data area.
func (c *Chart) drawLegend(dc draw.Canvas, at vg.Point) {
	if len(c.legend) == 0 {
		return
	}
	ts := textStyle(tickSize, false)
	row := ts.Height("Mg") * 1.25
	bw, bh := c.legendWidth(), vg.Length(len(c.legend))*row+2*gap
	x, y := at.X, at.Y-bh
	box := []vg.Point{{X: x, Y: y}, {X: x + bw, Y: y}, {X: x + bw, Y: y + bh}, {X: x, Y: y + bh}}
	dc.StrokeLines(draw.LineStyle{Color: color.Gray{Y: 180}, Width: vg.Points(0.5)}, append(box, box[0]))
	ts.XAlign, ts.YAlign = draw.XLeft, draw.YCenter
	for i, e := range c.legend {
		cy := y + bh - gap - (vg.Length(i)+0.5)*row
		tx := x + gap
		drawSample(dc, e.m, tx, cy, row)
		dc.FillText(ts, vg.Point{X: tx + vg.Points(thumb) + gap, Y: cy}, e.label)
	}
}

// drawSample draws a sample of m's style in a legend row whose sample
// starts at x and is centred on y; row is the row height.
func drawSample(dc draw.Canvas, m *Mark, x, y, row vg.Length) {
	w := vg.Points(thumb)
	switch m.kind {
	case lineKind:
		dc.StrokeLine2(draw.LineStyle{Color: m.color, Width: m.width, Dashes: m.dashes}, x, y, x+w, y)
	case dotsKind, stemsKind:
		dc.DrawGlyph(draw.GlyphStyle{Color: m.color, Radius: m.radius, Shape: m.glyph}, vg.Point{X: x + w/2, Y: y})
	case fillKind:
		h := row * 0.35
		dc.FillPolygon(m.color, []vg.Point{{X: x, Y: y - h}, {X: x + w, Y: y - h}, {X: x + w, Y: y + h}, {X: x, Y: y + h}})
	}
}
