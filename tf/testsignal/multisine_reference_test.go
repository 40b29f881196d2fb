package testsignal

import (
	"math"
	"slices"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// reference is testdata/testsignal/reference.json, written by
// make_reference.py with numpy 1.24 (numpy.fft.irfft, numpy.fft.rfft).
type reference struct {
	Multisine []struct {
		Period, Inputs, Lines int
		Harmonics             [][]int
		Signals               [][]float64
		Crest                 []float64
	}
	Periodogram []struct {
		Name     string
		X, Power []float64
	}
}

func readReference(t *testing.T) reference {
	var r reference
	testutil.ReadJSON(t, "testdata/testsignal/reference.json", &r)
	if len(r.Multisine) == 0 || len(r.Periodogram) == 0 {
		t.Fatal("reference.json holds no cases")
	}
	return r
}

// Schroeder-phase multisines against numpy: the script builds each
// signal by numpy.fft.irfft from its line spectrum with Schroeder's
// phases (an independent route to the Go cosine sums). Tolerance 1e-12
// on signals of peak 1: rounding of sums of at most 200 cosines and of an
// FFT of 1000 points, both near 1e-14.
func TestMultisineSchroederNumpy(t *testing.T) {
	for _, c := range readReference(t).Multisine {
		got, err := Multisine(MultisineSettings{Inputs: c.Inputs, Period: c.Period, Lines: c.Lines})
		if err != nil {
			t.Fatal(err)
		}
		for i := range c.Signals {
			if !slices.Equal(got.Lines[i], c.Harmonics[i]) {
				t.Errorf("period %d input %d: lines %v, numpy %v", c.Period, i, got.Lines[i], c.Harmonics[i])
			}
			worst := 0.0
			for k, v := range c.Signals[i] {
				worst = math.Max(worst, math.Abs(got.Signals[i][k]-v))
			}
			if worst > 1e-12 {
				t.Errorf("period %d input %d: signal differs from numpy's by %g", c.Period, i, worst)
			}
			if d := math.Abs(got.CrestFactor[i] - c.Crest[i]); d > 1e-12 {
				t.Errorf("period %d input %d: crest factor %v, numpy %v", c.Period, i, got.CrestFactor[i], c.Crest[i])
			}
			// Schroeder phases keep the crest factor far below that of
			// zero phases, sqrt(2L) (all cosines peak together at t = 0;
			// exact): for these cases below 1.9 against 7.9 to 20.
			if cf := got.CrestFactor[i]; cf > 1.9 || cf >= math.Sqrt(2*float64(c.Lines)) {
				t.Errorf("period %d input %d: crest factor %v, want below 1.9", c.Period, i, cf)
			}
		}
	}
}

// Periodogram against numpy.fft.rfft on the script's series. The script
// also generates a 7-stage maximum-length sequence with its own
// shift-register code, which MaxLength(7) must equal exactly. Tolerance
// 1e-11 relative to the largest line: FFT rounding on the prime lengths
// 127 and 101, measured at 6e-13 for 127 points (gonum's FFT against
// numpy's; the exact line, 128/127^2, lies between the two).
func TestPeriodogramNumpy(t *testing.T) {
	for _, c := range readReference(t).Periodogram {
		if c.Name == "maxlength7" {
			x, _ := MaxLength(7)
			if !slices.Equal(x, c.X) {
				t.Errorf("MaxLength(7) differs from the script's independent register")
			}
		}
		f, p, err := Periodogram(c.X, 0.5)
		if err != nil {
			t.Fatal(err)
		}
		if len(p) != len(c.Power) {
			t.Fatalf("%s: %d lines, numpy %d", c.Name, len(p), len(c.Power))
		}
		top := slices.Max(c.Power)
		for k := range p {
			if math.Abs(p[k]-c.Power[k]) > 1e-11*top {
				t.Errorf("%s line %d: %v, numpy %v", c.Name, k, p[k], c.Power[k])
			}
			if want := 2 * math.Pi * float64(k) / (float64(len(c.X)) * 0.5); math.Abs(f[k]-want) > 1e-15*want {
				t.Errorf("%s line %d: frequency %v, want %v", c.Name, k, f[k], want)
			}
		}
	}
}
