package control

import (
	"math"
	"math/cmplx"

	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// The frequency grid of the loop sweep: logGrid points spaced evenly in
// log w over [pi 1e-5, pi], merged with linear points spaced pi/n for n
// = max(linGrid, 8 (b + r + s + 2)), b the loop dead time and r, s the
// degrees of the loop's rational part (8 points per pi/b, as
// tf.Rational.LoopMargins uses, follow the dead time's phase). The log
// points resolve slow loops, whose crossovers lie far below pi/n.
const (
	logGrid = 256
	linGrid = 512
)

// loopFreq is the open loop L = C P on the unit circle: its rational part
// num/den (products of the two terms) and its dead time b.
type loopFreq struct {
	num, den []float64
	b        float64
}

func newLoopFreq(c, p tf.Rational) loopFreq {
	return loopFreq{num: poly.Mul(c.Num(), p.Num()), den: poly.Mul(c.Den(), p.Den()), b: float64(c.Delay() + p.Delay())}
}

// rat returns the rational part num/den at B = e^{-iw}.
func (l *loopFreq) rat(w float64) complex128 {
	s, c := math.Sincos(w)
	z := complex(c, -s)
	return horner(l.num, z) / horner(l.den, z)
}

// at returns L(e^{-iw}).
func (l *loopFreq) at(w float64) complex128 {
	s, c := math.Sincos(l.b * w)
	return l.rat(w) * complex(c, -s)
}

func horner(a []float64, z complex128) complex128 {
	var v complex128
	for k := len(a) - 1; k >= 0; k-- {
		v = v*z + complex(a[k], 0)
	}
	return v
}

// analyzer holds the buffers of a sweep, reused across loops (one
// analyzer per goroutine).
type analyzer struct {
	w, ph, mag []float64
}

func newAnalyzer() *analyzer { return &analyzer{} }

// freqFigures are the figures of a loop's sweep.
type freqFigures struct {
	margins          tf.LoopMargins
	delayMargin      float64 // samples; +Inf without a gain crossover
	ms, msAt         float64
	mt, mtAt         float64
	poleOnUnitCircle bool
}

// grid fills a.w for the loop l.
func (a *analyzer) grid(l *loopFreq) {
	nl := max(linGrid, 8*(int(l.b)+len(l.num)+len(l.den)))
	a.w = a.w[:0]
	lo := math.Log(math.Pi * 1e-5)
	j := 1
	for i := 0; i < logGrid; i++ {
		wl := math.Exp(lo + (math.Log(math.Pi)-lo)*float64(i)/logGrid)
		for ; j <= nl && math.Pi*float64(j)/float64(nl) <= wl; j++ {
			a.w = append(a.w, math.Pi*float64(j)/float64(nl))
		}
		if len(a.w) == 0 || wl > a.w[len(a.w)-1] {
			a.w = append(a.w, wl)
		}
	}
	for ; j <= nl; j++ {
		a.w = append(a.w, math.Pi*float64(j)/float64(nl))
	}
}

// sweep evaluates the loop on the grid and returns its figures.
func (a *analyzer) sweep(l *loopFreq) freqFigures {
	a.grid(l)
	n := len(a.w)
	a.ph = grow(a.ph, n)
	a.mag = grow(a.mag, n)
	f := freqFigures{delayMargin: math.Inf(1)}
	prev := 0.0
	iS, iT := 0, 0
	for i, w := range a.w {
		r := l.rat(w)
		if cmplx.IsInf(r) || cmplx.IsNaN(r) {
			// A pole of L on the unit circle at a grid point (the
			// integrator of a controller sits at w = 0, off the grid; a
			// deadbeat Dahlin controller has poles at roots of unity):
			// read the loop just beside it, where |S| is near 0.
			w *= 1 - 1e-9
			a.w[i] = w
			if r = l.rat(w); cmplx.IsInf(r) || cmplx.IsNaN(r) {
				f.poleOnUnitCircle = true
				return f
			}
		}
		p := math.Atan2(imag(r), real(r))
		if i > 0 {
			p += 2 * math.Pi * math.Round((prev-p)/(2*math.Pi))
		}
		prev = p
		m2 := real(r)*real(r) + imag(r)*imag(r)
		a.ph[i], a.mag[i] = p, math.Sqrt(m2)
		// |1 + L|^2 = 1 + 2 Re L + |L|^2, with Re L = |r| cos(p - b w).
		sb, cb := math.Sincos(l.b * w)
		reL := real(r)*cb + imag(r)*sb
		d2 := 1 + 2*reL + m2
		if s := 1 / d2; s > f.ms {
			f.ms, iS = s, i
		}
		if t := m2 / d2; t > f.mt {
			f.mt, iT = t, i
		}
	}
	f.ms, f.msAt = a.refinePeak(l, iS, func(L complex128) float64 { return 1 / cmplx.Abs(1+L) })
	f.mt, f.mtAt = a.refinePeak(l, iT, func(L complex128) float64 { return cmplx.Abs(L / (1 + L)) })
	for i := 0; i+1 < n; i++ {
		a.phaseCrossings(l, i, &f)
		a.gainCrossing(l, i, &f)
	}
	return f
}

func grow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}

// refinePeak maximises g(L(w)) around grid point i by golden-section
// search over its two neighbouring intervals.
func (a *analyzer) refinePeak(l *loopFreq, i int, g func(complex128) float64) (float64, float64) {
	lo, hi := a.w[max(i-1, 0)], a.w[min(i+1, len(a.w)-1)]
	if i == 0 {
		lo = 0
	}
	best, bw := g(l.at(a.w[i])), a.w[i]
	const r = 0.6180339887498949
	x1, x2 := hi-r*(hi-lo), lo+r*(hi-lo)
	f1, f2 := g(l.at(x1)), g(l.at(x2))
	for it := 0; it < 80 && hi-lo > 1e-14; it++ {
		if f1 > f2 {
			hi, x2, f2 = x2, x1, f1
			x1 = hi - r*(hi-lo)
			f1 = g(l.at(x1))
		} else {
			lo, x1, f1 = x1, x2, f2
			x2 = lo + r*(hi-lo)
			f2 = g(l.at(x2))
		}
	}
	for _, c := range [...]struct{ f, w float64 }{{f1, x1}, {f2, x2}} {
		if c.f > best && c.w > 0 {
			best, bw = c.f, c.w
		}
	}
	return best, bw
}

// phaseAt returns the unwrapped phase of L at w (rational part taken
// near ref) and |L|.
func (l *loopFreq) phaseAt(w, ref float64) (float64, float64) {
	r := l.rat(w)
	p := cmplx.Phase(r)
	p += 2 * math.Pi * math.Round((ref-p)/(2*math.Pi))
	return p - l.b*w, cmplx.Abs(r)
}

// phaseCrossings finds the phase crossovers (levels -pi - 2 pi k)
// between grid points i and i+1 and keeps the smallest gain margin.
func (a *analyzer) phaseCrossings(l *loopFreq, i int, f *freqFigures) {
	w, ph, b := a.w, a.ph, l.b
	f0, f1 := ph[i]-b*w[i], ph[i+1]-b*w[i+1]
	lo, hi := math.Min(f0, f1), math.Max(f0, f1)
	for k := math.Ceil((-math.Pi - hi) / (2 * math.Pi)); ; k++ {
		level := -math.Pi - 2*math.Pi*k
		if level < lo {
			break
		}
		if level > hi || (level == f0 && i > 0) {
			continue
		}
		x, y := w[i], w[i+1]
		for it := 0; it < 100 && y-x > 1e-13; it++ {
			mid := 0.5 * (x + y)
			fm, _ := l.phaseAt(mid, ph[i])
			if (fm-level)*(f0-level) > 0 {
				x = mid
			} else {
				y = mid
			}
		}
		wc := 0.5 * (x + y)
		if _, mag := l.phaseAt(wc, ph[i]); mag > 0 {
			if gm := 1 / mag; !f.margins.HasGainMargin || gm < f.margins.GainMargin {
				f.margins.GainMargin, f.margins.PhaseCrossover, f.margins.HasGainMargin = gm, wc, true
			}
		}
	}
}

// gainCrossing finds a gain crossover (|L| = 1) between grid points i
// and i+1 and keeps the smallest phase margin and delay margin.
func (a *analyzer) gainCrossing(l *loopFreq, i int, f *freqFigures) {
	w, ph := a.w, a.ph
	d0, d1 := a.mag[i]-1, a.mag[i+1]-1
	var wc float64
	switch {
	case d1 == 0:
		wc = w[i+1]
	case d0 == 0 && i == 0:
		wc = w[0]
	case d0*d1 < 0:
		x, y := w[i], w[i+1]
		for it := 0; it < 100 && y-x > 1e-13; it++ {
			mid := 0.5 * (x + y)
			if _, mag := l.phaseAt(mid, ph[i]); (mag-1)*d0 > 0 {
				x = mid
			} else {
				y = mid
			}
		}
		wc = 0.5 * (x + y)
	default:
		return
	}
	p, _ := l.phaseAt(wc, ph[i])
	pm := math.Remainder(p+math.Pi, 2*math.Pi)
	if pm == -math.Pi {
		pm = math.Pi
	}
	if !f.margins.HasPhaseMargin || pm < f.margins.PhaseMargin {
		f.margins.PhaseMargin, f.margins.GainCrossover, f.margins.HasPhaseMargin = pm, wc, true
	}
	f.delayMargin = math.Min(f.delayMargin, math.Max(pm, 0)/wc)
}

// peakS returns the peak |S| of the loop c p (the sweep alone), +Inf
// for a pole of the loop on the unit circle.
func (a *analyzer) peakS(c, p tf.Rational) (float64, error) {
	l := newLoopFreq(c, p)
	f := a.sweep(&l)
	if f.poleOnUnitCircle {
		return math.Inf(1), nil
	}
	return f.ms, nil
}
