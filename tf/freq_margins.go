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
	num, den := r.coefs()
	b := float64(r.delay)
	n := max(4096, 8*(r.delay+len(den)+len(num)))
	// Rational-part phase, unwrapped along the grid, and magnitude.
	w := make([]float64, n)
	ph := make([]float64, n)
	mag := make([]float64, n)
	prev := 0.0
	for i := range w {
		w[i] = math.Pi * float64(i+1) / float64(n)
		g, ok := ratEvalRational(num, den, w[i])
		if !ok {
			return LoopMargins{}, &UnstableError{Op: "tf.Rational.LoopMargins", What: "margins (pole on the unit circle at w = " + formatNum(w[i]) + ")", MaxPole: 1}
		}
		p := cmplx.Phase(g)
		if i > 0 {
			p += 2 * math.Pi * math.Round((prev-p)/(2*math.Pi))
		}
		prev = p
		ph[i] = p
		mag[i] = cmplx.Abs(g)
	}
	// phaseAt returns the full unwrapped phase at v near a grid point
	// whose rational-part phase is ref.
	phaseAt := func(v, ref float64) (float64, float64) {
		g, _ := ratEvalRational(num, den, v)
		p := cmplx.Phase(g)
		p += 2 * math.Pi * math.Round((ref-p)/(2*math.Pi))
		return p - b*v, cmplx.Abs(g)
	}
	var m LoopMargins
	for i := 0; i+1 < n; i++ {
		f0, f1 := ph[i]-b*w[i], ph[i+1]-b*w[i+1]
		// Phase crossovers: levels -pi - 2 pi k between f0 and f1.
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
				fm, _ := phaseAt(mid, ref)
				if (fm-level)*(f0-level) > 0 {
					a = mid
				} else {
					c = mid
				}
			}
			wc := 0.5 * (a + c)
			_, g := phaseAt(wc, ref)
			if g > 0 {
				if gm := 1 / g; !m.HasGainMargin || gm < m.GainMargin {
					m.GainMargin, m.PhaseCrossover, m.HasGainMargin = gm, wc, true
				}
			}
		}
		// Gain crossovers: |L| - 1 changes sign, or is 0 at a grid point
		// (counted once, at the interval it ends).
		d0, d1 := mag[i]-1, mag[i+1]-1
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
				_, g := phaseAt(mid, ref)
				if (g-1)*d0 > 0 {
					a = mid
				} else {
					c = mid
				}
			}
			wc = 0.5 * (a + c)
		default:
			continue
		}
		f, _ := phaseAt(wc, ref)
		pm := math.Remainder(f+math.Pi, 2*math.Pi) // in [-pi, pi]
		if pm == -math.Pi {
			pm = math.Pi
		}
		if !m.HasPhaseMargin || pm < m.PhaseMargin {
			m.PhaseMargin, m.GainCrossover, m.HasPhaseMargin = pm, wc, true
		}
	}
	return m, nil
}

// ratEvalRational returns omega/delta at B = e^{-iw}, and false when delta
// vanishes there.
func ratEvalRational(num, den []float64, w float64) (complex128, bool) {
	z := cmplx.Exp(complex(0, -w))
	d := poly.Eval(den, z)
	if d == 0 {
		return 0, false
	}
	return poly.Eval(num, z) / d, true
}
