package testsignal

import (
	"math"
	"testing"
)

// A multi-level design follows the same rules as a binary one: clock 13
// samples (floor(2.783 * 10 / 2)), the shortest ternary register whose
// period covers the 188.5 the dynamics need (3 stages: 26 values, 338
// time units), whole periods in the budget (700 holds 2). Its samples
// take the three levels 35, 40, 45. Because the sequence's second half
// is the negation of its first (MultiLevel), its periodogram is zero at
// every even harmonic of the period: an identity of the discrete Fourier
// transform of an antiperiodic series, checked to 1e-12 of the largest
// line (FFT rounding on 676 points), with power on the odd harmonics.
func TestDesignMultiLevel(t *testing.T) {
	s := plant
	s.Signal, s.Budget = KindMultiLevel, 700
	d, err := Design(s)
	if err != nil {
		t.Fatal(err)
	}
	if d.Clock != 13 || d.Stages != 3 || d.Periods != 2 || len(d.Signal) != 2*26*13 {
		t.Fatalf("clock %v, stages %d, periods %d, %d samples; want 13, 3, 2, 676", d.Clock, d.Stages, d.Periods, len(d.Signal))
	}
	seen := map[float64]int{}
	for _, v := range d.Signal {
		seen[v]++
	}
	if len(seen) != 3 || seen[35] == 0 || seen[40] == 0 || seen[45] == 0 {
		t.Errorf("levels %v, want 35, 40 and 45", seen)
	}
	if math.Abs(d.BandLow-2*math.Pi/338) > 1e-15 {
		t.Errorf("band low %v, want 2 pi / 338", d.BandLow)
	}
	top := 0.0
	for _, v := range d.Power {
		top = math.Max(top, v)
	}
	const P = 2 // lines per harmonic of the period: P periods in the record
	for k, v := range d.Power {
		if k%P == 0 && (k/P)%2 == 0 && v > 1e-12*top {
			t.Errorf("line %d (harmonic %d, even): power %g of %g", k, k/P, v, top)
		}
	}
	if d.Power[P] <= 1e-3*top {
		t.Errorf("fundamental carries %g of %g", d.Power[P], top)
	}
	s.Levels = 5
	d5, err := Design(s)
	if err != nil {
		t.Fatal(err)
	}
	// 5 levels: 2 stages give 24 values, 312 time units, covering 188.5.
	if d5.Stages != 2 || len(d5.Signal) != 2*24*13 {
		t.Errorf("5 levels: stages %d, %d samples; want 2, 624", d5.Stages, len(d5.Signal))
	}
}

func TestDesignMultiLevelBadInput(t *testing.T) {
	for _, tc := range []struct {
		name   string
		levels int
		budget float64
		want   []string
	}{
		{"levels", 4, 700, []string{"DesignSettings.Levels = 4", "3, 5 or 7"}},
		// 2 periods of 26 values at clock 13 = 676 needed.
		{"short budget", 3, 600, []string{"DesignSettings.Budget = 600", "2 periods of the 26-value sequence", "676 in all"}},
	} {
		s := plant
		s.Signal, s.Levels, s.Budget = KindMultiLevel, tc.levels, tc.budget
		_, err := Design(s)
		checkSettingError(t, tc.name, err, tc.want)
	}
}

// FuzzDesignMultiLevel: any settings of a multi-level design give a
// *SettingError or a plan whose every number is finite and whose
// samples are Level + Amplitude times a level of MultiLevel; never a
// panic.
func FuzzDesignMultiLevel(f *testing.F) {
	f.Add(10.0, 2.0, 1.0, 40.0, 5.0, 700.0, 3)
	f.Add(1.0, 0.0, 0.5, 0.0, 1.0, 2000.0, 5)
	f.Add(1e-3, 1e6, 1e-6, -1.0, 1e300, 1.0, 7)
	f.Add(1e-3, 1e6, 1e-2, -1.0, 1e300, 1.0, 7)
	f.Fuzz(func(t *testing.T, tau, dead, ts, level, amp, budget float64, levels int) {
		skipLongDesign(t, budget, ts)
		s := DesignSettings{TimeConstant: tau, DeadTime: dead, Sample: ts, Level: level, Amplitude: amp, Budget: budget, Signal: KindMultiLevel, Levels: levels}
		d, err := Design(s)
		if err != nil {
			if !isSettingError(err) {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		q := max(levels, 3)
		x, err := MultiLevel(q, d.Stages)
		if err != nil || len(d.Signal) == 0 || len(d.Signal) > MaxSamples {
			t.Fatalf("%d stages (%v), %d samples", d.Stages, err, len(d.Signal))
		}
		ok := map[float64]bool{}
		for _, v := range x {
			ok[level+amp*v] = true
		}
		for _, v := range d.Signal {
			if !ok[v] {
				t.Fatalf("sample %v is not a level", v)
			}
		}
		for _, v := range append([]float64{d.Clock, d.BandLow, d.BandHigh}, d.Power...) {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("non-finite figure %v", v)
			}
		}
	})
}
