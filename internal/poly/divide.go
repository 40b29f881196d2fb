package poly

import "errors"

// ErrZeroConstant is returned when a divisor's constant term is zero, so
// that the power series in B does not exist.
var ErrZeroConstant = errors.New("poly: divisor has a zero constant term")

// Divide returns the first n coefficients of the power series num(B)/den(B),
// which exists when den[0] != 0. These are the impulse-response weights of
// the rational term num/den, or the psi weights theta/phi of an ARMA model.
//
//	q_k = (num_k - sum_{j=1..min(k, deg den)} den_j q_{k-j}) / den_0
func Divide(num, den []float64, n int) ([]float64, error) {
	q := make([]float64, n)
	return q, DivideTo(q, num, den)
}

// DivideTo writes len(dst) coefficients of num/den into dst.
func DivideTo(dst, num, den []float64) error {
	if len(den) == 0 || den[0] == 0 {
		return ErrZeroConstant
	}
	d0 := den[0]
	for k := range dst {
		s := 0.0
		if k < len(num) {
			s = num[k]
		}
		m := min(k, len(den)-1)
		for j := 1; j <= m; j++ {
			s -= den[j] * dst[k-j]
		}
		dst[k] = s / d0
	}
	return nil
}
