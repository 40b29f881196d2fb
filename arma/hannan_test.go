package arma

import (
	"errors"
	"math"
	"testing"
)

// TestHannanRissanenConsistent: on a long ARMA(1,1) series (n = 20000)
// the two-step estimates are within 0.03 of the truth (their standard
// error is ~0.01 at this length; the method is consistent: Hannan &
// Rissanen 1982, common practice). The returned polynomials use the
// stored signs.
func TestHannanRissanenConsistent(t *testing.T) {
	m := Model{AR: []float64{0.7}, MA: []float64{-0.4}, Mean: 3, Sigma2: 1}
	y, _ := Simulate(m, 20000, &SimSettings{Seed1: 31, Seed2: 32})
	phi, theta, err := HannanRissanen(y, 1, 1, 0)
	if err != nil {
		t.Fatal(err)
	}
	// phi(B) = 1 - 0.7 B, theta(B) = 1 + 0.4 B.
	if math.Abs(phi[1]+0.7) > 0.03 || math.Abs(theta[1]-0.4) > 0.03 || phi[0] != 1 || theta[0] != 1 {
		t.Errorf("phi %v theta %v", phi, theta)
	}
	// Pure AR goes through Yule-Walker of that order.
	phi, theta, err = HannanRissanen(y, 2, 0, 0)
	if err != nil || len(phi) != 3 || len(theta) != 1 {
		t.Errorf("AR(2) start: %v %v %v", phi, theta, err)
	}
	var se *SeriesError
	if _, _, err := HannanRissanen(y[:8], 2, 2, 0); !errors.As(err, &se) || se.Kind != ErrShort || se.Op != "arma.HannanRissanen" {
		t.Errorf("short: %v", err)
	}
}

// TestPsiIntegrated: the psi weights of ARIMA(0,1,0) are all 1 and those
// of (1-B)(1-B^4) count the seasonal steps (1 for j < 4, 2 for 4 <= j < 8, ...).
func TestPsiIntegrated(t *testing.T) {
	rw, _ := Model{D: 1}.Psi(10)
	for _, v := range rw {
		if v != 1 {
			t.Fatalf("random-walk psi %v", rw)
		}
	}
	sw, _ := Model{D: 1, SD: 1, Period: 4}.Psi(12)
	for j, v := range sw {
		if v != float64(j/4+1) {
			t.Fatalf("seasonal psi %v", sw)
		}
	}
}
