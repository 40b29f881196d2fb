package arma

import (
	"fmt"
	"math"
	"math/cmplx"
	"strconv"

	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/sym"
)

// Order is the structure of a seasonal ARIMA(P, D, Q) x (SP, SD, SQ)_Period
// model: P autoregressive and Q moving-average lags, D ordinary
// differences (1-B), and the seasonal counterparts in B^Period. Period is
// ignored (and may be 0) when SP = SD = SQ = 0.
type Order struct {
	P, D, Q    int
	SP, SD, SQ int
	Period     int
}

// String returns the order as "(P,D,Q)" or "(P,D,Q)x(SP,SD,SQ)_s".
func (o Order) String() string {
	if o.SP == 0 && o.SD == 0 && o.SQ == 0 {
		return fmt.Sprintf("(%d,%d,%d)", o.P, o.D, o.Q)
	}
	return fmt.Sprintf("(%d,%d,%d)x(%d,%d,%d)_%d", o.P, o.D, o.Q, o.SP, o.SD, o.SQ, o.Period)
}

// Validate returns a *SettingError (Setting "order") for a negative order, a
// seasonal part without Period >= 2, or an expanded AR, MA or
// differencing polynomial of degree above MaxLag; nil otherwise. Fit,
// Select and every Model method check it.
func (o Order) Validate() (err error) {
	defer withOp("arma.Order.Validate", &err)
	return o.validate()
}

func (o Order) validate() error {
	if o.P < 0 || o.D < 0 || o.Q < 0 || o.SP < 0 || o.SD < 0 || o.SQ < 0 {
		return settingErr("order", o.String(), "orders must not be negative")
	}
	if (o.SP > 0 || o.SD > 0 || o.SQ > 0) && o.Period < 2 {
		return settingErr("order", o.String(), "a seasonal part needs Period >= 2")
	}
	// Each term is bounded first so that the degrees below cannot
	// overflow (SP*Period wraps to a negative degree for a huge Period).
	s := 0
	if o.SP > 0 || o.SD > 0 || o.SQ > 0 {
		s = o.Period
	}
	for _, v := range []int{o.P, o.D, o.Q, o.SP, o.SD, o.SQ, s} {
		if v > MaxLag {
			return settingErr("order", o.String(), "a polynomial's degree is above MaxLag = "+itoa(MaxLag))
		}
	}
	if o.P+o.SP*s > MaxLag || o.Q+o.SQ*s > MaxLag || o.D+o.SD*s > MaxLag {
		return settingErr("order", o.String(), "an expanded polynomial's degree is above MaxLag = "+itoa(MaxLag))
	}
	return nil
}

// MaxLag bounds the degree of each expanded polynomial of a model (AR,
// MA, differencing), to keep fits and root finding meaningful.
const MaxLag = 256

// Model is a seasonal ARIMA model with numeric coefficients:
//
//	phi(B) Phi(B^s) (w_t - Mean) = theta(B) Theta(B^s) a_t,
//	w_t = (1-B)^D (1-B^s)^SD z_t,   var(a_t) = Sigma2,
//
// where z_t is the modelled series (after subtracting any regression
// part) and Mean is the constant c, the mean of the (differenced) series
// (the parameter "c" of a fit). The coefficient slices use the
// Box-Jenkins signs:
//
//	phi(B)   = 1 - AR[0] B - ... - AR[p-1] B^p
//	Phi(B^s) = 1 - SAR[0] B^s - ... - SAR[P-1] B^(P s)
//	theta(B) = 1 - MA[0] B - ... - MA[q-1] B^q
//	Theta(B^s) = 1 - SMA[0] B^s - ...
//
// The zero Model is white noise with zero mean and variance zero.
type Model struct {
	AR, MA   []float64
	SAR, SMA []float64
	D, SD    int
	Period   int
	Mean     float64
	Sigma2   float64
}

// Order returns the orders of m.
func (m Model) Order() Order {
	return Order{P: len(m.AR), D: m.D, Q: len(m.MA), SP: len(m.SAR), SD: m.SD, SQ: len(m.SMA), Period: m.Period}
}

// lagPoly returns 1 - sum c_k B^(k*step).
func lagPoly(c []float64, step int) []float64 {
	p := make([]float64, len(c)*step+1)
	p[0] = 1
	for k, v := range c {
		p[(k+1)*step] = -v
	}
	return p
}

// ARPoly returns the expanded stationary AR polynomial phi(B) Phi(B^s)
// (ascending powers of B, constant 1). Like MAPoly and DiffPoly it returns
// nil for a model whose orders are invalid (a negative D or SD, a seasonal
// part with Period < 2, a degree above MaxLag); Psi, Pi, Stationary,
// Invertible and Simulate report those as a *SettingError.
func (m Model) ARPoly() []float64 {
	if m.Order().validate() != nil {
		return nil
	}
	return m.arPoly()
}

// arPoly and maPoly are ARPoly and MAPoly for orders already checked.
func (m Model) arPoly() []float64 {
	return poly.Mul(lagPoly(m.AR, 1), lagPoly(m.SAR, max(m.Period, 1)))
}

func (m Model) maPoly() []float64 {
	return poly.Mul(lagPoly(m.MA, 1), lagPoly(m.SMA, max(m.Period, 1)))
}

// MAPoly returns the expanded MA polynomial theta(B) Theta(B^s).
func (m Model) MAPoly() []float64 {
	if m.Order().validate() != nil {
		return nil
	}
	return m.maPoly()
}

// DiffPoly returns the differencing polynomial (1-B)^D (1-B^s)^SD.
func (m Model) DiffPoly() []float64 {
	if m.Order().validate() != nil {
		return nil
	}
	return diffPoly(m.D, m.SD, m.Period)
}

func diffPoly(d, sd, s int) []float64 {
	c := poly.Pow([]float64{1, -1}, d)
	if sd > 0 {
		seas := make([]float64, s+1)
		seas[0], seas[s] = 1, -1
		c = poly.Mul(c, poly.Pow(seas, sd))
	}
	return c
}

// Stationary reports whether every z-plane root of phi(z^-1) Phi(z^-s)
// lies strictly inside the unit circle, and returns the offending roots
// (|z| >= 1) otherwise. The differencing is not part of this check. The
// roots are found factor by factor (those of Phi(B^s) are the s-th roots
// of those of Phi(B)), so that coefficients whose expanded product would
// overflow float64 are still judged. It returns false and a
// *SettingError for invalid orders (see ARPoly), a *ModelError for a NaN
// or infinite coefficient, and a *ModelError naming the polynomial when
// its roots cannot be computed.
func (m Model) Stationary() (ok bool, bad []complex128, err error) {
	defer withOp("arma.Model.Stationary", &err)
	return m.stationary()
}

func (m Model) stationary() (bool, []complex128, error) {
	if err := m.Order().validate(); err != nil {
		return false, nil, err
	}
	if err := finiteCoefs("AR", m.AR, m.SAR); err != nil {
		return false, nil, err
	}
	bad, err := factorOutside("AR", m.AR, m.SAR, max(m.Period, 1))
	return err == nil && len(bad) == 0, bad, err
}

// Invertible reports whether every z-plane root of the MA polynomial lies
// strictly inside the unit circle, and returns the offending roots. Errors
// as for Stationary.
func (m Model) Invertible() (ok bool, bad []complex128, err error) {
	defer withOp("arma.Model.Invertible", &err)
	if err := m.Order().validate(); err != nil {
		return false, nil, err
	}
	if err := finiteCoefs("MA", m.MA, m.SMA); err != nil {
		return false, nil, err
	}
	bad, err = factorOutside("MA", m.MA, m.SMA, max(m.Period, 1))
	return err == nil && len(bad) == 0, bad, err
}

// factorOutside returns the z-plane roots with |z| >= 1 of
// (1 - sum c_k B^k)(1 - sum sc_k B^(k s)), found per factor: when u is a
// z-plane root of the seasonal factor in B, its s roots in z are the s-th
// roots of u. part ("AR" or "MA") names the polynomial in a *ModelError.
func factorOutside(part string, c, sc []float64, s int) ([]complex128, error) {
	var bad []complex128
	if len(c) > 0 {
		zs, err := zRoots(lagPoly(c, 1))
		if err != nil {
			return nil, rootError(part, false, err)
		}
		for _, z := range zs {
			if cmplx.Abs(z) >= 1 {
				bad = append(bad, z)
			}
		}
	}
	if len(sc) > 0 {
		us, err := zRoots(lagPoly(sc, 1))
		if err != nil {
			return nil, rootError(part, true, err)
		}
		for _, u := range us {
			if cmplx.Abs(u) < 1 {
				continue
			}
			r := math.Pow(cmplx.Abs(u), 1/float64(s))
			for k := 0; k < s; k++ {
				bad = append(bad, cmplx.Rect(r, (cmplx.Phase(u)+2*math.Pi*float64(k))/float64(s)))
			}
		}
	}
	return bad, nil
}

// Psi returns the first n psi weights of the model including its
// differencing: the coefficients of theta(B)Theta(B^s) / (phi(B)Phi(B^s)
// (1-B)^D (1-B^s)^SD), so that the h-step forecast error variance is
// Sigma2 sum_{j<h} psi_j^2. Errors as for the package-level Psi, and an
// *SettingError for invalid orders (see ARPoly).
func (m Model) Psi(n int) (w []float64, err error) {
	defer withOp("arma.Model.Psi", &err)
	if err := m.Order().validate(); err != nil {
		return nil, err
	}
	if err := m.expandedFinite(); err != nil {
		return nil, err
	}
	return weights(poly.Mul(m.arPoly(), diffPoly(m.D, m.SD, m.Period)), m.maPoly(), n, "ar")
}

// expandedFinite returns a *ModelError naming the part when a coefficient
// is not finite or the product of the ordinary and seasonal factors
// overflows float64 (factors of finite but huge coefficients).
func (m Model) expandedFinite() error {
	if err := finiteCoefs("AR", m.AR, m.SAR); err != nil {
		return err
	}
	if err := finiteCoefs("MA", m.MA, m.SMA); err != nil {
		return err
	}
	for _, p := range []struct {
		part, text string
		c          []float64
	}{{"AR", "phi(B)Phi(B^s)", m.arPoly()}, {"MA", "theta(B)Theta(B^s)", m.maPoly()}} {
		if firstNonFinite(p.c) >= 0 {
			return modelErr(p.part+" polynomial "+p.text, "its expanded coefficients overflow float64: coefficients far too large")
		}
	}
	return nil
}

// Pi returns the first n pi weights of the stationary part (differencing
// excluded): the coefficients of phi(B)Phi(B^s) / (theta(B)Theta(B^s)).
// Errors as for Model.Psi.
func (m Model) Pi(n int) (w []float64, err error) {
	defer withOp("arma.Model.Pi", &err)
	if err := m.Order().validate(); err != nil {
		return nil, err
	}
	if err := m.expandedFinite(); err != nil {
		return nil, err
	}
	return weights(m.maPoly(), m.arPoly(), n, "ma")
}

// Noise returns the model's noise term as named factors, the form used in
// whole-model specs: (1 - phi1 B - ...)(1 - Phi1 B^s - ...) for AR and
// (1 - theta1 B - ...)(1 - Theta1 B^s - ...) for MA, every coefficient
// Free with its value set. Empty parts are left out.
func (m Model) Noise() Noise {
	return Noise{
		AR: factors(m.AR, m.SAR, "phi", "Phi", m.Period),
		MA: factors(m.MA, m.SMA, "theta", "Theta", m.Period),
	}
}

func factors(c, sc []float64, name, sname string, s int) sym.Poly {
	var p sym.Poly
	if len(c) > 0 {
		p.Factors = append(p.Factors, namedFactor(c, name, 1))
	}
	if len(sc) > 0 {
		p.Factors = append(p.Factors, namedFactor(sc, sname, s))
	}
	return p
}

// namedFactor returns 1 - name1 B^step - name2 B^(2 step) - ... with the
// values of c.
func namedFactor(c []float64, name string, step int) sym.Factor {
	f := sym.Factor{Exp: 1, Terms: []sym.Term{{Coef: sym.Coef{Value: 1}}}}
	for k, v := range c {
		f.Terms = append(f.Terms, sym.Term{Neg: true, Power: (k + 1) * step,
			Coef: sym.Coef{Name: name + itoa(k+1), Value: v, Free: true}})
	}
	return f
}

// validate checks that the coefficients are finite.
func (m Model) validate() error {
	if err := m.Order().validate(); err != nil {
		return err
	}
	if err := finiteCoefs("AR", m.AR, m.SAR); err != nil {
		return err
	}
	if err := finiteCoefs("MA", m.MA, m.SMA); err != nil {
		return err
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"Mean", m.Mean}, {"Sigma2", m.Sigma2}} {
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) {
			return modelErr("model "+f.name, "is "+fmtFloat(f.v)+": coefficients must be finite")
		}
	}
	if m.Sigma2 < 0 {
		return modelErr("model Sigma2", "is "+fmtFloat(m.Sigma2)+": a variance must not be negative")
	}
	return nil
}

// EquationConstant returns k = phi(1) Phi(1) Mean, the constant of the
// difference-equation form phi(B)Phi(B^s) w_t = k + theta(B)Theta(B^s) a_t
// (Mean is the constant c, the mean of the differenced series). It is
// NaN for a model whose orders are invalid (see ARPoly).
func (m Model) EquationConstant() float64 {
	if m.Order().validate() != nil {
		return math.NaN()
	}
	return poly.EvalReal(m.arPoly(), 1) * m.Mean
}

// finiteCoefs returns a *ModelError naming part when a coefficient of any
// of the slices is NaN or infinite.
// The message names the slice and index: "AR[1] is NaN" (the seasonal
// slice, the second of cs, is "SAR" or "SMA").
func finiteCoefs(part string, cs ...[]float64) error {
	for i, c := range cs {
		for k, v := range c {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				name := part
				if i > 0 {
					name = "S" + part
				}
				return modelErr("model "+name+"["+itoa(k)+"]", "is "+fmtFloat(v)+": coefficients must be finite")
			}
		}
	}
	return nil
}

func fmtFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
