package tf

import (
	"math"
	"math/cmplx"
	"strconv"

	"github.com/backshift/backshift/internal/poly"
)

// Constant returns the static gain k as a Rational (numerator {k},
// denominator {1}, no dead time); Constant(1) is the unity feedback path.
// It returns a *CoefError for a non-finite k.
func Constant(k float64) (Rational, error) {
	r, err := newRational([]float64{k}, []float64{1}, 0)
	return r, composeErr("tf.Constant", err)
}

// composeErr sets op on err, or returns nil.
func composeErr(op string, err error) error {
	if err == nil {
		return nil
	}
	return withOp(op, err)
}

// Times returns the product g*h: the two terms one after the other, the
// output of one feeding the other (the product commutes): numerators and
// denominators multiplied, dead times added. No pole-zero cancellation
// is attempted. It returns a *CoefError (ErrDegree) when a product's
// degree exceeds MaxDegree and a *DelayError when the dead times add up
// past MaxDelay (Op "tf.Rational.Times").
func (g Rational) Times(h Rational) (Rational, error) {
	gn, gd := g.coefs()
	hn, hd := h.coefs()
	r, err := newRational(poly.Mul(gn, hn), poly.Mul(gd, hd), g.delay+h.delay)
	return r, composeErr("tf.Rational.Times", err)
}

// Plus returns the sum g + h: the two terms fed the same input, their
// outputs added, over the common denominator delta_g delta_h:
//
//	(omega_g B^(b_g-b) delta_h + omega_h B^(b_h-b) delta_g) / (delta_g delta_h) * B^b,  b = min(b_g, b_h).
//
// A difference in dead time enters the numerator as a power of B, so it
// counts toward the degree limit. It returns a *CoefError (ErrDegree) when
// a degree exceeds MaxDegree (Op "tf.Rational.Plus").
func (g Rational) Plus(h Rational) (Rational, error) {
	const op = "tf.Rational.Plus"
	gn, gd := g.coefs()
	hn, hd := h.coefs()
	b := min(g.delay, h.delay)
	if d := max(g.delay, h.delay) - b; d+max(len(gn)+len(hd), len(hn)+len(gd))-2 > MaxDegree {
		return Rational{}, &CoefError{Op: op, Poly: "num", Index: d + max(len(gn)+len(hd), len(hn)+len(gd)) - 2, Err: ErrDegree}
	}
	num := poly.Add(poly.Shift(poly.Mul(gn, hd), g.delay-b), poly.Shift(poly.Mul(hn, gd), h.delay-b))
	r, err := newRational(num, poly.Mul(gd, hd), b)
	return r, composeErr(op, err)
}

// CloseLoop returns g with a negative-feedback loop closed around it
// through h, g/(1 + g h): g in the forward path, h in the return path:
//
//	omega_g delta_h B^(b_g) / (delta_g delta_h + omega_g omega_h B^(b_g+b_h)).
//
// For a controller c and a plant p, the response of the output to the
// set-point is c.Times(p) with the loop closed through Constant(1), and
// the response of the output to a load entering at the plant input is
// p.CloseLoop(c).
// The loop dead time b_g + b_h enters the denominator as a power of B, so
// loops with long dead times may exceed MaxDegree (a *CoefError with
// ErrDegree); simulate such loops with two Plants instead.
//
// It returns a *CoefError with ErrZeroConstant when the loop is
// ill-posed (b_g + b_h = 0 and 1 + g_0 h_0 = 0, where g_0 and h_0 are the
// feedthrough gains): the loop equation then has no solution; and a
// *CoefError with ErrNotFinite when a product of coefficients overflows
// (Op "tf.Rational.CloseLoop").
func (g Rational) CloseLoop(h Rational) (Rational, error) {
	const op = "tf.Rational.CloseLoop"
	gn, gd := g.coefs()
	hn, hd := h.coefs()
	lb := g.delay + h.delay
	if lb+len(gn)+len(hn)-2 > MaxDegree {
		return Rational{}, &CoefError{Op: op, Poly: "den", Index: lb + len(gn) + len(hn) - 2, Err: ErrDegree}
	}
	den := poly.Add(poly.Mul(gd, hd), poly.Shift(poly.Mul(gn, hn), lb))
	// den[0] is 1 + g_0 h_0 only when the loop has no dead time; then a
	// value within rounding of the two terms' size counts as zero.
	scale := math.Abs(gd[0] * hd[0])
	if lb == 0 {
		scale += math.Abs(gn[0] * hn[0])
	}
	if d0 := den[0]; !math.IsNaN(d0) && !math.IsInf(d0, 0) && (d0 == 0 || math.Abs(d0) <= 8*machineEps*scale) {
		return Rational{}, &CoefError{Op: op, Poly: "den", Index: 0, Value: den[0], Err: ErrZeroConstant}
	}
	r, err := newRational(poly.Mul(gn, hd), den, g.delay)
	return r, composeErr(op, err)
}

func formatNum(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// Cancel returns r with the pole-zero pairs that lie within tol of each
// other (|p - z| <= tol max(1, |p|)) removed, as after composing a
// controller with a plant whose dynamics it cancels. Each pole is paired
// with its nearest unpaired zero; complex pairs cancel pairwise. The
// result keeps the dead time, the leading zero coefficients of the
// numerator (extra delay) and its first non-zero coefficient, and is
// rebuilt from the remaining poles and zeros:
//
//	omega(B) = c B^m prod (1 - z_i B),   delta(B) = prod (1 - p_i B),
//
// so its coefficients carry the rounding of the root finder (about 1e-12
// relative for well separated roots). tol must lie in [0, 1); Cancel
// returns a *SettingError (Setting "tol") otherwise, and r itself when
// nothing cancels.
func (r Rational) Cancel(tol float64) (Rational, error) {
	const op = "tf.Rational.Cancel"
	if !(tol >= 0 && tol < 1) {
		return Rational{}, setting(op, "tol", tol, "must lie in [0, 1): the largest distance of a cancelled pole-zero pair, relative to max(1, |pole|)")
	}
	num, _ := r.coefs()
	poles, zeros := r.Poles(), r.Zeros()
	usedZ := make([]bool, len(zeros))
	keepP := make([]complex128, 0, len(poles))
	cancelled := 0
	for _, p := range poles {
		best, bi := math.Inf(1), -1
		for i, z := range zeros {
			if !usedZ[i] {
				if d := cmplx.Abs(p - z); d < best {
					best, bi = d, i
				}
			}
		}
		if bi >= 0 && best <= tol*math.Max(1, cmplx.Abs(p)) {
			usedZ[bi] = true
			cancelled++
			continue
		}
		keepP = append(keepP, p)
	}
	if cancelled == 0 {
		return r, nil
	}
	keepZ := make([]complex128, 0, len(zeros))
	for i, z := range zeros {
		if !usedZ[i] {
			keepZ = append(keepZ, z)
		}
	}
	m := 0
	for m < len(num)-1 && num[m] == 0 {
		m++
	}
	n := poly.Shift(poly.Scale(num[m], poly.FromInverseRoots(keepZ)), m)
	out, err := newRational(n, poly.FromInverseRoots(keepP), r.delay)
	return out, composeErr(op, err)
}
