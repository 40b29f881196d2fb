package tf

import (
	"math"
	"math/cmplx"
	"strconv"

	"github.com/backshift/backshift/internal/poly"
)

// Freq returns the frequency response G(e^{-i w}) = omega(e^{-i w}) /
// delta(e^{-i w}) * e^{-i w b} at each angular frequency w in radians per
// sample (0 is steady state, pi the Nyquist frequency). A frequency where
// delta vanishes (a pole on the unit circle, such as w = 0 for an
// integrator) gives a complex infinity or NaN there; use GainPhase for checked
// values. w is not modified.
func (r Rational) Freq(w []float64) []complex128 {
	num, den := r.coefs()
	h := make([]complex128, len(w))
	for i, wi := range w {
		z := cmplx.Exp(complex(0, -wi))
		h[i] = poly.Eval(num, z) / poly.Eval(den, z) * cmplx.Exp(complex(0, -wi*float64(r.delay)))
	}
	return h
}

// GainPhase returns the gain (magnitude) |G(e^{-i w})| and the phase in radians at
// the angular frequencies w (radians per sample), which must be finite and
// strictly increasing. The phase is unwrapped: the phase of the rational
// part starts in (-pi, pi] at w[0] and then changes by less than pi
// between neighbours (jumps of more than pi are taken as 2 pi wraps, as
// numpy.unwrap does), and the dead time adds exactly -b w, so that long
// dead times are unwrapped correctly even on a coarse grid.
//
// It returns a *SettingError (Setting "w[i]") for a non-finite or
// non-increasing frequency and an *UnstableError (What names the
// frequency) when a pole lies on the unit circle at one of the
// frequencies (the response is infinite there); Op "tf.Rational.GainPhase".
func (r Rational) GainPhase(w []float64) (mag, phase []float64, err error) {
	const op = "tf.Rational.GainPhase"
	num, den := r.coefs()
	for i, wi := range w {
		if math.IsNaN(wi) || math.IsInf(wi, 0) {
			return nil, nil, setting(op, "w["+strconv.Itoa(i)+"]", wi, "a frequency must be finite (radians per sample)")
		}
		if i > 0 && !(wi > w[i-1]) {
			return nil, nil, setting(op, "w["+strconv.Itoa(i)+"]", wi, "frequencies must be strictly increasing (w["+strconv.Itoa(i-1)+"] = "+formatNum(w[i-1])+")")
		}
	}
	mag = make([]float64, len(w))
	phase = make([]float64, len(w))
	prev := 0.0
	for i, wi := range w {
		z := cmplx.Exp(complex(0, -wi))
		dz := poly.Eval(den, z)
		if dz == 0 {
			return nil, nil, &UnstableError{Op: op, What: "frequency response at w = " + formatNum(wi), MaxPole: 1}
		}
		g := poly.Eval(num, z) / dz
		mag[i] = cmplx.Abs(g)
		ph := cmplx.Phase(g)
		if i > 0 {
			ph += 2 * math.Pi * math.Round((prev-ph)/(2*math.Pi))
		}
		prev = ph
		phase[i] = ph - wi*float64(r.delay)
	}
	return mag, phase, nil
}
