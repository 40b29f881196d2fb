package est

import (
	"math"
	"testing"
)

// The values below are worked by hand from the definitions in doc.go.
func TestSigma2AndMLScale(t *testing.T) {
	if got := Sigma2(12, 10, 4); got != 2 {
		t.Errorf("Sigma2(12, 10, 4) = %v, want 12/6 = 2", got)
	}
	if got := Sigma2(1, 3, 3); !math.IsNaN(got) {
		t.Errorf("Sigma2 with n = k = %v, want NaN", got)
	}
	if got := MLScale(100, 19); got != 0.9 {
		t.Errorf("MLScale(100, 19) = %v, want sqrt(81/100) = 0.9", got)
	}
	if got := MLScale(0, 0); !math.IsNaN(got) {
		t.Errorf("MLScale(0, 0) = %v, want NaN", got)
	}
}

func TestCorr(t *testing.T) {
	cov := [][]float64{{4, 3, 0}, {3, 9, 1}, {0, 1, math.NaN()}}
	got := Corr(cov)
	// 3/sqrt(4*9) = 0.5; the third variance is NaN, so its row and
	// column are NaN.
	want := [][]float64{{1, 0.5, math.NaN()}, {0.5, 1, math.NaN()}, {math.NaN(), math.NaN(), math.NaN()}}
	for i := range want {
		for j := range want[i] {
			g, w := got[i][j], want[i][j]
			if !(g == w || math.IsNaN(g) && math.IsNaN(w)) {
				t.Errorf("Corr[%d][%d] = %v, want %v", i, j, g, w)
			}
		}
	}
	if cov[0][1] != 3 {
		t.Error("Corr modified its argument")
	}
}
