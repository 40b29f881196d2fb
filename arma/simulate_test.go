package arma

import (
	"math"
	"testing"
)

// TestSimulateStationaryStart checks the burn-in where it matters, at the
// first samples: over 4000 seeds, the sample variance of y_0 and the
// sample covariance of (y_0, y_1) match the model's autocovariances
// gamma_0 = sigma^2 sum psi_j^2 and gamma_1 = sigma^2 sum psi_j psi_{j+1}
// (common practice; the psi weights are checked against R's ARMAtoMA in
// TestWeightsRootsFilterR). Tolerance 0.1 relative: the standard error of
// a variance estimated from 4000 Gaussian draws is sqrt(2/4000) = 2.2 %,
// so 0.1 is 4.5 SE. Without a burn-in y_0 = Mean + a_0 has variance
// sigma^2, 53 % below gamma_0 = 2.135 sigma^2 for this model; that start must be
// detected by the same test.
func TestSimulateStationaryStart(t *testing.T) {
	m := Model{AR: []float64{0.6, -0.3}, MA: []float64{-0.4}, Mean: 10, Sigma2: 2}
	psi, err := m.Psi(400)
	if err != nil {
		t.Fatal(err)
	}
	var g0, g1 float64
	for j := range psi[:len(psi)-1] {
		g0 += psi[j] * psi[j]
		g1 += psi[j] * psi[j+1]
	}
	g0 *= m.Sigma2
	g1 *= m.Sigma2
	moments := func(burn int) (mean, v0, c01 float64) {
		const reps = 4000
		var s0, s1, s00, s01 float64
		for r := 0; r < reps; r++ {
			y, err := Simulate(m, 2, &SimSettings{Seed1: 77, Seed2: uint64(r), BurnIn: burn})
			if err != nil {
				t.Fatal(err)
			}
			s0 += y[0]
			s1 += y[1]
			s00 += y[0] * y[0]
			s01 += y[0] * y[1]
		}
		m0, m1 := s0/reps, s1/reps
		return m0, s00/reps - m0*m0, s01/reps - m0*m1
	}
	mean, v0, c01 := moments(0)
	if math.Abs(mean-10) > 4*math.Sqrt(g0/4000) || math.Abs(v0/g0-1) > 0.1 || math.Abs(c01/g1-1) > 0.1 {
		t.Errorf("first samples: mean %.4g (want 10), var %.4g (gamma0 %.4g), cov %.4g (gamma1 %.4g)", mean, v0, g0, c01, g1)
	}
	if _, v0none, _ := moments(-1); math.Abs(v0none/g0-1) <= 0.1 {
		t.Errorf("without burn-in the variance of y_0 is %.4g, indistinguishable from gamma0 %.4g: the test has no power", v0none, g0)
	}
}

// TestBurnInMeaning: a positive BurnIn is that many draws discarded, the
// same series as simulating without burn-in and dropping them (the same
// seed draws the same innovations); zero is automatic, so it differs from
// none.
func TestBurnInMeaning(t *testing.T) {
	m := Model{AR: []float64{0.9}, MA: []float64{0.2}, Mean: 1, Sigma2: 1}
	got, err := Simulate(m, 50, &SimSettings{Seed1: 9, BurnIn: 30})
	if err != nil {
		t.Fatal(err)
	}
	all, err := Simulate(m, 80, &SimSettings{Seed1: 9, BurnIn: -1})
	if err != nil {
		t.Fatal(err)
	}
	for i := range got {
		if got[i] != all[30+i] {
			t.Fatalf("sample %d: %v with BurnIn 30, %v after dropping 30 draws", i, got[i], all[30+i])
		}
	}
	auto, _ := Simulate(m, 50, &SimSettings{Seed1: 9})
	none, _ := Simulate(m, 50, &SimSettings{Seed1: 9, BurnIn: -1})
	if auto[0] == none[0] {
		t.Error("automatic burn-in gave the series without burn-in")
	}
}
