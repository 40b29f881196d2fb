package tf

import (
	"math"
	"math/cmplx"

	"github.com/backshift/backshift/internal/poly"
)

// LoopMargins are the classical stability margins of an open loop L under
// negative feedback (the closed loop L/(1 + L)), read from its frequency
// response on 0 < w <= pi rad/sample.
type LoopMargins struct {
	// GainMargin is the factor by which the loop gain may grow before
	// the closed loop reaches the stability boundary: 1/|L| at the phase
	// crossover, where the phase is -180 degrees (mod 360), taking the
	// smallest over all such crossovers. HasGainMargin is false when the
	// phase never reaches -180 degrees.
	GainMargin    float64
	HasGainMargin bool
	// PhaseCrossover is the frequency of that crossover, rad/sample.
	PhaseCrossover float64
	// PhaseMargin is 180 degrees plus the phase at the gain crossover,
	// where |L| = 1, in radians in (-pi, pi], taking the smallest over all
	// gain crossovers. HasPhaseMargin is false when |L| never crosses 1.
	PhaseMargin    float64
	HasPhaseMargin bool
	// GainCrossover is the frequency of that crossover, rad/sample.
	GainCrossover float64
}

// GainMarginDecibels returns the gain margin in decibels,
// 20 log10(GainMargin), or 0 when there is none.
func (m LoopMargins) GainMarginDecibels() float64 {
	if !m.HasGainMargin {
		return 0
	}
	return 20 * math.Log10(m.GainMargin)
}

// LoopMargins returns the gain and phase margins of r taken as an open
// loop (for a controller c and a plant p, r = c.Times(p)). The frequency
// response is scanned on a grid of at least 4096 points in (0, pi], fine
// enough for the dead time (at least 8 points per pi/b), and each
// crossover is refined by bisection to 1e-13 rad/sample.
//
// The margins describe the distance to instability of a loop whose
// closed loop is stable; they do not by themselves prove stability
// (check the closed loop's Stable, or the Nyquist criterion for an
// unstable open loop). A pole of r on the unit circle within the scanned
// range (other than an integrator at w = 0, which is excluded) makes the
// response infinite there; LoopMargins returns an *UnstableError then
// (Op "tf.Rational.LoopMargins").
func (r Rational) LoopMargins() (LoopMargins, error) {
	g, err := r.marginGrid()
	if err != nil {
		return LoopMargins{}, err
	}
	var m LoopMargins
	for i := 0; i+1 < len(g.w); i++ {
		g.phaseCrossovers(i, &m)
		g.gainCrossover(i, &m)
	}
	return m, nil
}

// marginGrid is the loop's frequency response on a grid of (0, pi]: the
// rational part's phase unwrapped along the grid and its magnitude; the
// dead time's phase -b w is added where the phase is read.
type marginGrid struct {
	num, den   []float64
	b          float64
	w, ph, mag []float64
}

// marginGrid evaluates the rational part of r on max(4096, 8 (b + r + s
// + 2)) points of (0, pi], refusing a pole on the unit circle.
func (r Rational) marginGrid() (*marginGrid, error) {
	num, den := r.coefs()
	n := max(4096, 8*(r.delay+len(den)+len(num)))
	g := &marginGrid{num: num, den: den, b: float64(r.delay), w: make([]float64, n), ph: make([]float64, n), mag: make([]float64, n)}
	prev := 0.0
	for i := range g.w {
		g.w[i] = math.Pi * float64(i+1) / float64(n)
		v, ok := evalRational(num, den, g.w[i])
		if !ok {
			return nil, &UnstableError{Op: "tf.Rational.LoopMargins", What: "margins (pole on the unit circle at w = " + formatNum(g.w[i]) + ")", MaxPole: 1}
		}
		p := cmplx.Phase(v)
		if i > 0 {
			p += 2 * math.Pi * math.Round((prev-p)/(2*math.Pi))
		}
		prev = p
		g.ph[i] = p
		g.mag[i] = cmplx.Abs(v)
	}
	return g, nil
}

// phaseAt returns the full unwrapped phase at v near a grid point whose
// rational-part phase is ref, and the magnitude.
func (g *marginGrid) phaseAt(v, ref float64) (float64, float64) {
	x, _ := evalRational(g.num, g.den, v)
	p := cmplx.Phase(x)
	p += 2 * math.Pi * math.Round((ref-p)/(2*math.Pi))
	return p - g.b*v, cmplx.Abs(x)
}

// phaseCrossovers finds the phase crossovers (levels -pi - 2 pi k)
// between grid points i and i+1 by bisection and keeps the smallest gain
// margin in m.
func (g *marginGrid) phaseCrossovers(i int, m *LoopMargins) {
	w, ph, b := g.w, g.ph, g.b
	f0, f1 := ph[i]-b*w[i], ph[i+1]-b*w[i+1]
	lo, hi := math.Min(f0, f1), math.Max(f0, f1)
	for k := math.Ceil((-math.Pi - hi) / (2 * math.Pi)); ; k++ {
		level := -math.Pi - 2*math.Pi*k
		if level < lo {
			break
		}
		if level > hi || (level == f0 && i > 0) { // a grid hit counts once
			continue
		}
		a, c := w[i], w[i+1]
		ref := ph[i]
		for it := 0; it < 100 && c-a > 1e-13; it++ {
			mid := 0.5 * (a + c)
			fm, _ := g.phaseAt(mid, ref)
			if (fm-level)*(f0-level) > 0 {
				a = mid
			} else {
				c = mid
			}
		}
		wc := 0.5 * (a + c)
		_, mag := g.phaseAt(wc, ref)
		if mag > 0 {
			if gm := 1 / mag; !m.HasGainMargin || gm < m.GainMargin {
				m.GainMargin, m.PhaseCrossover, m.HasGainMargin = gm, wc, true
			}
		}
	}
}

// gainCrossover finds a gain crossover between grid points i and i+1
// (|L| - 1 changes sign, or is 0 at a grid point, counted once, at the
// interval it ends) by bisection and keeps the smallest phase margin in
// m.
func (g *marginGrid) gainCrossover(i int, m *LoopMargins) {
	w, ph := g.w, g.ph
	d0, d1 := g.mag[i]-1, g.mag[i+1]-1
	var wc float64
	ref := ph[i]
	switch {
	case d1 == 0:
		wc, ref = w[i+1], ph[i+1]
	case d0 == 0 && i == 0:
		wc = w[0]
	case d0*d1 < 0:
		a, c := w[i], w[i+1]
		for it := 0; it < 100 && c-a > 1e-13; it++ {
			mid := 0.5 * (a + c)
			_, mag := g.phaseAt(mid, ref)
			if (mag-1)*d0 > 0 {
				a = mid
			} else {
				c = mid
			}
		}
		wc = 0.5 * (a + c)
	default:
		return
	}
	f, _ := g.phaseAt(wc, ref)
	pm := math.Remainder(f+math.Pi, 2*math.Pi) // in [-pi, pi]
	if pm == -math.Pi {
		pm = math.Pi
	}
	if !m.HasPhaseMargin || pm < m.PhaseMargin {
		m.PhaseMargin, m.GainCrossover, m.HasPhaseMargin = pm, wc, true
	}
}

// evalRational returns omega/delta at B = e^{-iw}, and false when delta
// vanishes there.
func evalRational(num, den []float64, w float64) (complex128, bool) {
	z := cmplx.Exp(complex(0, -w))
	d := poly.Eval(den, z)
	if d == 0 {
		return 0, false
	}
	return poly.Eval(num, z) / d, true
}
