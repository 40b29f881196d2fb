package arma

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"

	"github.com/backshift/backshift/internal/poly"
)

// Psi returns the first n psi weights of the ARMA model ar(B) w_t =
// ma(B) a_t, the coefficients of the power series ma(B)/ar(B):
//
//	w_t = sum_{j>=0} psi_j a_{t-j},  psi_0 = ma[0]/ar[0] (1 for monic polynomials)
//
// ar and ma are polynomials as stored (ascending powers of B, signs
// included: ar = {1, -0.5} for 1 - 0.5 B); an empty ma is the constant 1.
// Multiply seasonal factors first (Model.ARPoly does). For an ARIMA model
// pass ar(B) times the differencing polynomial. It returns a *ModelError
// when ar is empty or ar[0] is zero or a coefficient is not finite, a
// *SettingError for n < 0 or n > MaxHorizon, a *ModelError for a
// polynomial of degree above 2 MaxLag (the degree of a model's AR part
// times its differencing can reach 2 MaxLag). Weights that overflow
// float64 (an explosive ar, roots far outside the unit circle, over many
// weights) are a *SeriesError of kind ErrOverflow, not +-Inf.
func Psi(ar, ma []float64, n int) (w []float64, err error) {
	defer withOp("arma.Psi", &err)
	return weights(ar, ma, n, "ar")
}

// Pi returns the first n pi weights, the coefficients of ar(B)/ma(B), so
// that a_t = sum_{j>=0} pi_j w_{t-j}. (Some texts define pi_j with the
// opposite sign for j >= 1; here they are the plain series coefficients.)
// It returns a *ModelError when ma is empty or ma[0] is zero, and the
// other errors as Psi does.
func Pi(ar, ma []float64, n int) (w []float64, err error) {
	defer withOp("arma.Pi", &err)
	return weights(ma, ar, n, "ma")
}

func weights(den, num []float64, n int, which string) ([]float64, error) {
	if n < 0 || n > MaxHorizon {
		return nil, settingErr("n", itoa(n), "must be in 0..MaxHorizon = "+itoa(MaxHorizon))
	}
	if len(den) > 2*MaxLag+1 || len(num) > 2*MaxLag+1 {
		return nil, modelErr("ar/ma", "polynomial degree above 2 MaxLag = "+itoa(2*MaxLag))
	}
	if len(den) == 0 || den[0] == 0 {
		return nil, modelErr(which, "constant term must be non-zero")
	}
	if len(num) == 0 {
		num = []float64{1}
	}
	for _, v := range append(append([]float64(nil), den...), num...) {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, modelErr(which, "coefficients must be finite")
		}
	}
	w, err := poly.Divide(num, den, n)
	if err != nil { // not reached: den[0] != 0 was checked above
		return nil, modelErr(which, "constant term must be non-zero")
	}
	if k := firstNonFinite(w); k >= 0 {
		return nil, &SeriesError{Series: "weights", Kind: ErrOverflow, Detail: "weight " + itoa(k) + " of " + which + " overflows (roots far outside the unit circle); ask for fewer than " + itoa(k) + " weights"}
	}
	return w, nil
}

// firstNonFinite returns the index of the first NaN or infinite value of
// x, or -1.
func firstNonFinite(x []float64) int {
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return i
		}
	}
	return -1
}

// zRoots returns the z-plane roots (z = 1/B) of a polynomial in B with a
// non-zero constant term: the roots of its reciprocal.
func zRoots(a []float64) ([]complex128, error) {
	d := poly.Degree(a)
	if d <= 0 {
		return nil, nil
	}
	return poly.Roots(poly.Reciprocal(a[:d+1]))
}

// outside returns the z-plane roots of a with |z| >= 1 - tol (on or
// outside the unit circle), nil when all are strictly inside, and an
// error when the root finder fails.
func outside(a []float64, tol float64) ([]complex128, error) {
	zs, err := zRoots(a)
	if err != nil {
		return nil, err
	}
	var bad []complex128
	for _, z := range zs {
		if cmplx.Abs(z) >= 1-tol {
			bad = append(bad, z)
		}
	}
	return bad, nil
}

// shrinkInside scales the coefficients c_k of a (constant 1) by r^k,
// which scales every z-plane root by r, until all roots have |z| <= lim.
// It returns a new slice.
func shrinkInside(a []float64, lim float64) []float64 {
	zs, err := zRoots(a)
	if err != nil {
		out := make([]float64, len(a))
		out[0] = 1
		return out
	}
	m := poly.MaxAbsRoot(zs)
	out := append([]float64(nil), a...)
	if m <= lim {
		return out
	}
	r := lim / m
	s := 1.0
	for k := 1; k < len(out); k++ {
		s *= r
		out[k] *= s
	}
	return out
}

// rootError turns a failure of the root finder on a factor of a model
// polynomial into a *ModelError.
func rootError(part string, seasonal bool, err error) error {
	names := map[string][2]string{"AR": {"phi(B)", "Phi(B^s)"}, "MA": {"theta(B)", "Theta(B^s)"}}
	i := 0
	if seasonal {
		i = 1
	}
	reason := "the eigenvalue solver failed"
	if errors.Is(err, poly.ErrTooLong) {
		reason = "degree above the root finder's limit"
	}
	what := "stationarity"
	if part == "MA" {
		what = "invertibility"
	}
	return modelErr(part+" polynomial "+names[part][i], "its roots could not be computed ("+reason+"), so its "+what+" cannot be judged; coefficients of this size belong to no stationary or invertible model: check their scale")
}

func cabs(z complex128) float64 { return cmplx.Abs(z) }

// rootList formats roots for messages.
func rootList(zs []complex128) string {
	s := ""
	for i, z := range zs {
		if i > 0 {
			s += ", "
		}
		if imag(z) == 0 {
			s += fmt.Sprintf("%.6g", real(z))
		} else {
			s += fmt.Sprintf("%.6g", z)
		}
	}
	return s
}
