package chart

import (
	"image/color"
	"math"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Chart is one panel: a title, two labelled axes, the marks in the
// order they were added (later ones drawn over earlier ones) and a
// legend.
type Chart struct {
	// Title is written above the data area, XLabel below it and YLabel
	// to its left.
	Title, XLabel, YLabel string

	xFixed, yFixed         bool
	xmin, xmax, ymin, ymax float64
	marks                  []*Mark
	legend                 []legendRow
}

// New returns an empty chart with its title and axis labels.
func New(title, xlabel, ylabel string) *Chart {
	return &Chart{Title: title, XLabel: xlabel, YLabel: ylabel}
}

// kind is what a mark draws.
type kind int

const (
	lineKind  kind = iota // a polyline, broken at non-finite values
	dotsKind              // a glyph per point
	stemsKind             // a vertical line from 0 and a glyph per point
	fillKind              // a filled polygon
)

// Mark is one drawn element of a chart, in data coordinates. The
// methods of Chart that add marks return it, so that it can be given a
// dash pattern or a legend row.
type Mark struct {
	kind   kind
	x, y   []float64
	color  color.Color
	width  vg.Length // line width
	dashes []vg.Length
	glyph  draw.GlyphDrawer
	radius vg.Length // glyph radius
}

// Dashed draws the mark's lines dashed: on points drawn, off points
// left out, repeated. It returns m.
func (m *Mark) Dashed(on, off float64) *Mark {
	m.dashes = []vg.Length{vg.Points(on), vg.Points(off)}
	return m
}

// legendRow is one row of a legend: a sample of a mark's style and its
// label.
type legendRow struct {
	label string
	m     *Mark
}

// add appends a mark to the chart and returns it.
func (c *Chart) add(m *Mark) *Mark {
	c.marks = append(c.marks, m)
	return m
}

// Line adds a polyline through x, y (broken where a value is not
// finite), width points wide.
func (c *Chart) Line(x, y []float64, col color.Color, width float64) *Mark {
	return c.add(&Mark{kind: lineKind, x: x, y: y, color: col, width: vg.Points(width)})
}

// Dots adds the glyph g (draw.CircleGlyph{}, draw.CrossGlyph{}, ...) of
// radius points at every point.
func (c *Chart) Dots(x, y []float64, col color.Color, g draw.GlyphDrawer, radius float64) *Mark {
	return c.add(&Mark{kind: dotsKind, x: x, y: y, color: col, glyph: g, radius: vg.Points(radius)})
}

// Stems adds a stem plot: a vertical line from 0 and a dot at every
// point. The y range drawn includes 0.
func (c *Chart) Stems(x, y []float64, col color.Color) *Mark {
	return c.add(&Mark{kind: stemsKind, x: x, y: y, color: col, width: vg.Points(1.5),
		glyph: draw.CircleGlyph{}, radius: vg.Points(2)})
}

// HLine adds a horizontal line at y from x0 to x1, one point wide.
func (c *Chart) HLine(y, x0, x1 float64, col color.Color) *Mark {
	return c.Line([]float64{x0, x1}, []float64{y, y}, col, 1)
}

// VLine adds a vertical line at x from y0 to y1, 1.5 points wide.
func (c *Chart) VLine(x, y0, y1 float64, col color.Color) *Mark {
	return c.Line([]float64{x, x}, []float64{y0, y1}, col, 1.5)
}

// Band adds a filled area between lo and hi over x (a translucent
// colour lets what is drawn before it show through).
func (c *Chart) Band(x, lo, hi []float64, col color.Color) *Mark {
	px := make([]float64, 0, 2*len(x))
	py := make([]float64, 0, 2*len(x))
	for i := range x {
		px, py = append(px, x[i]), append(py, hi[i])
	}
	for i := len(x) - 1; i >= 0; i-- {
		px, py = append(px, x[i]), append(py, lo[i])
	}
	return c.add(&Mark{kind: fillKind, x: px, y: py, color: col})
}

// Legend adds a legend row showing m's style beside label. Rows are
// listed in the order they are added.
func (c *Chart) Legend(label string, m *Mark) {
	c.legend = append(c.legend, legendRow{label, m})
}

// SetX fixes the x range drawn (a range that is empty or not finite is
// ignored in favour of the data's).
func (c *Chart) SetX(lo, hi float64) { c.xFixed, c.xmin, c.xmax = true, lo, hi }

// SetY fixes the y range drawn (a range that is empty or not finite is
// ignored in favour of the data's).
func (c *Chart) SetY(lo, hi float64) { c.yFixed, c.ymin, c.ymax = true, lo, hi }

// XRange returns the x range drawn: the fixed one (when it is a finite,
// non-empty interval) or that of the data.
func (c *Chart) XRange() (lo, hi float64) {
	if usable(c.xFixed, c.xmin, c.xmax) {
		return c.xmin, c.xmax
	}
	lo, hi = c.dataRange(false)
	return widen(lo, hi, 0)
}

// YRange returns the y range drawn: the fixed one (when it is a finite,
// non-empty interval) or that of the data with 4 % room above and below.
func (c *Chart) YRange() (lo, hi float64) {
	if usable(c.yFixed, c.ymin, c.ymax) {
		return c.ymin, c.ymax
	}
	lo, hi = c.dataRange(true)
	return widen(lo, hi, 0.04)
}

// usable reports whether a range is fixed, finite and not empty.
func usable(fixed bool, lo, hi float64) bool {
	return fixed && finite(lo) && finite(hi) && lo < hi
}

// dataRange returns the smallest and largest finite x values of the
// marks (y values when y is set; those of stems with 0 among them).
func (c *Chart) dataRange(y bool) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, m := range c.marks {
		v := m.x
		if y {
			v = m.y
		}
		a, b := finiteRange(v)
		if y && m.kind == stemsKind {
			a, b = math.Min(a, 0), math.Max(b, 0)
		}
		lo, hi = math.Min(lo, a), math.Max(hi, b)
	}
	return lo, hi
}

// MovingAverage returns the centred moving average of y over n samples
// (n/2 on each side of a sample, fewer at the ends of the record, and
// NaN values left out). It shows the slow part of a series under a fast
// test signal, such as a dithered valve, which drawn raw fills a band.
func MovingAverage(y []float64, n int) []float64 {
	half := max(0, n/2)
	out := make([]float64, len(y))
	for i := range y {
		var sum float64
		var k int
		for j := max(0, i-half); j <= min(len(y)-1, i+half); j++ {
			if !math.IsNaN(y[j]) {
				sum += y[j]
				k++
			}
		}
		out[i] = math.NaN()
		if k > 0 {
			out[i] = sum / float64(k)
		}
	}
	return out
}

// finiteRange returns the smallest and largest finite values of v
// (+Inf, -Inf when there are none).
func finiteRange(v []float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, x := range v {
		if finite(x) {
			lo, hi = math.Min(lo, x), math.Max(hi, x)
		}
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

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
