package monitor

import (
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// arlFile is testdata/monitor/arl.json, written by make_arl.py (scipy
// 1.10.1, numpy 1.24.2).
type arlFile struct {
	Normal []struct {
		K, H, Mean, ARL float64
		Diff64          float64
	}
	Variance []struct {
		Up          bool
		K, H, Ratio float64
		ARL         float64
		ARL3000     float64
		ARL1500     float64
	}
}

func readARL(t *testing.T) arlFile {
	var f arlFile
	testutil.ReadJSON(t, "testdata/monitor/arl.json", &f)
	if len(f.Normal) == 0 || len(f.Variance) == 0 {
		t.Fatal("arl.json holds no cases")
	}
	return f
}

// Siegmund's approximation against the exact run length of the normal
// CUSUM: the solution of Page's integral equation by the Nystrom method
// (testdata/monitor/arl.json, scipy.stats.norm and numpy leggauss; 64 and
// 128 nodes agree to 2e-9 relative). For the drifts the monitor meets
// (in control, and shifts up to twice the reference) the approximation is
// within 1 % (measured: at most 0.84 %, at k = 0.5, h = 8 in control);
// far below the reference (d = -1.5) it overstates the run length by
// about 20 % (measured 20 %), which only makes the other side's
// contribution to a two-sided run length smaller still.
func TestCusumARLReference(t *testing.T) {
	for _, c := range readARL(t).Normal {
		got := CusumARL(c.K, c.H, c.Mean)
		tol := 0.01
		if c.Mean-c.K < -1 {
			tol = 0.25
		}
		if rel := math.Abs(got-c.ARL) / c.ARL; rel > tol {
			t.Errorf("k %v h %v mean %v: Siegmund %v, integral equation %v (rel %.3g > %v)", c.K, c.H, c.Mean, got, c.ARL, rel, tol)
		}
	}
}

// The chain of chainARL, fed a normal distribution (cdf Phi, integral
// x Phi(x) + phi(x)), against the integral equation: within 0.2 % with
// 200 states, so the chain machinery that calibrates the variance test is
// right on a case with an exact answer.
func TestChainARLNormalReference(t *testing.T) {
	for _, c := range readARL(t).Normal {
		if c.ARL > 1e5 {
			continue // the far-off side: its run length is beyond any use
		}
		d := c.Mean - c.K
		phi := func(x float64) float64 { return 0.5 * math.Erfc(-(x-d)/math.Sqrt2) }
		iphi := func(x float64) float64 {
			y := x - d
			return y*0.5*math.Erfc(-y/math.Sqrt2) + math.Exp(-y*y/2)/math.Sqrt(2*math.Pi)
		}
		got := chainARL(phi, iphi, c.H, chainStates)
		if rel := math.Abs(got-c.ARL) / c.ARL; rel > 0.002 {
			t.Errorf("k %v h %v mean %v: chain %v, integral equation %v (rel %.3g)", c.K, c.H, c.Mean, got, c.ARL, rel)
		}
	}
}

// The variance test's run lengths against an independent computation:
// Brook and Evans's centre-point chain with 3000 states and
// scipy.stats.chi2 transition probabilities, extrapolated from 1500 and
// 3000 states (testdata/monitor/arl.json; the two differ by up to
// 0.12 %, the reference's own uncertainty). The 200-state averaged chain
// is within 0.1 % for run lengths below 10^3 (measured: at most 0.07 %)
// and within 1 % for the in-control run lengths of the default
// thresholds, near 2 * 10^4 (measured: 0.32 % up, 0.72 % down).
func TestVarianceChainReference(t *testing.T) {
	for _, c := range readARL(t).Variance {
		got := varianceARL(c.Up, c.K, c.H, c.Ratio)
		tol := 0.001
		if c.ARL > 1e4 {
			tol = 0.01
		}
		if rel := math.Abs(got-c.ARL) / c.ARL; rel > tol {
			t.Errorf("up %v h %v ratio %v: chain %v, reference %v (rel %.3g)", c.Up, c.H, c.Ratio, got, c.ARL, rel)
		}
	}
}
