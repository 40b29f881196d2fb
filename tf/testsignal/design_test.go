package testsignal

import (
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// halfPowerX solves (sin x / x)^2 = 1/2: checked by evaluating it, to
// 1e-15 (rounding of sin and a division).
func TestHalfPowerX(t *testing.T) {
	if d := math.Sin(halfPowerX)/halfPowerX - 1/math.Sqrt2; math.Abs(d) > 1e-15 {
		t.Errorf("sin(x)/x - 1/sqrt 2 = %g at x = %v", d, halfPowerX)
	}
}

var plant = DesignSettings{TimeConstant: 10, DeadTime: 2, Sample: 1, Level: 40, Amplitude: 5, Budget: 600}

// A maximum-length design: its figures follow the rules on
// DesignSettings, and its periodogram is exactly that of a held
// maximum-length sequence. For N values held M samples over P periods,
// amplitude A, the periodogram is zero except at every P-th line, where
// line P j holds A^2 (N+1) (sin(pi j/N) / sin(pi j/(N M)))^2 / (N M)^2
// (j not a multiple of N; A^2/N^2 at j = 0): the flat spectrum of the
// sequence (Golomb 1967, from memory) times the transform of the hold
// (an identity of the discrete Fourier transform). Tolerance 1e-12 of
// the largest line: FFT rounding on 585 points.
func TestDesignMaxLength(t *testing.T) {
	d, err := Design(plant)
	if err != nil {
		t.Fatal(err)
	}
	// Rules: clock floor(2.783 * 10 / 2) = 13 samples; the slowest dynamics
	// need max(2 pi 3 10, 2 + 40) = 188.5, so 15 values (4 stages, 195 time
	// units); 600 holds 3 whole periods.
	if d.Clock != 13 || d.Stages != 4 || d.Periods != 3 || len(d.Signal) != 3*15*13 {
		t.Fatalf("clock %v, stages %d, periods %d, %d samples; want 13, 4, 3, 585", d.Clock, d.Stages, d.Periods, len(d.Signal))
	}
	if len(d.Warnings) != 0 {
		t.Errorf("warnings %q", d.Warnings)
	}
	for i, v := range d.Signal {
		if v != 35 && v != 45 {
			t.Fatalf("sample %d = %v, want 35 or 45", i, v)
		}
	}
	if math.Abs(d.BandLow-2*math.Pi/195) > 1e-15 || d.BandHigh < BandFactor/plant.TimeConstant || d.BandHigh > 1.1*BandFactor/plant.TimeConstant {
		t.Errorf("band %v to %v; want 2pi/195 = %v to just above %v", d.BandLow, d.BandHigh, 2*math.Pi/195, BandFactor/plant.TimeConstant)
	}
	const N, M, P, A = 15.0, 13.0, 3, 5.0
	top := A * A * (N + 1) / (N * N)
	for k, v := range d.Power {
		want := 0.0
		if k%P == 0 {
			j := float64(k / P)
			switch {
			case j == 0:
				want = A * A / (N * N)
			case math.Mod(j, N) != 0:
				r := math.Sin(math.Pi*j/N) / math.Sin(math.Pi*j/(N*M))
				want = A * A * (N + 1) * r * r / (N * M * N * M)
			}
		}
		if math.Abs(v-want) > 1e-12*top {
			t.Errorf("line %d (%.4g rad per unit): %v, want %v", k, d.Frequency[k], v, want)
		}
	}
	// The band's top is where that envelope falls to half.
	r := math.Sin(d.BandHigh*M/2) / (M * math.Sin(d.BandHigh/2))
	if math.Abs(r*r-0.5) > 1e-12 {
		t.Errorf("envelope at BandHigh = %v, want 1/2", r*r)
	}
}

// Binary noise: the switching probability of SwitchProbability, one
// sample per second of budget, the levels, and determinism by seed.
func TestDesignBinaryNoise(t *testing.T) {
	s := plant
	s.Signal, s.Seed, s.Budget = KindBinaryNoise, 11, 1000
	d, err := Design(s)
	if err != nil {
		t.Fatal(err)
	}
	p, _ := SwitchProbability(10, 1)
	if d.SwitchProbability != p || len(d.Signal) != 1000 || d.Clock != 1 || d.BandHigh != 0.2 || d.Stages != 0 {
		t.Errorf("p %v (want %v), %d samples, clock %v, band top %v", d.SwitchProbability, p, len(d.Signal), d.Clock, d.BandHigh)
	}
	e, _ := Design(s)
	for i := range d.Signal {
		if d.Signal[i] != e.Signal[i] || (d.Signal[i] != 35 && d.Signal[i] != 45) {
			t.Fatalf("sample %d: %v and %v", i, d.Signal[i], e.Signal[i])
		}
	}
}

// A sample interval too coarse for the band gives a warning, not an
// error: the signal is still usable, over a narrower band.
func TestDesignCoarseSampleWarns(t *testing.T) {
	for _, k := range []Kind{KindMaxLength, KindBinaryNoise} {
		s := DesignSettings{TimeConstant: 1, Sample: 2, Amplitude: 1, Budget: 200, Signal: k}
		d, err := Design(s)
		if err != nil {
			t.Fatal(err)
		}
		if len(d.Warnings) != 1 {
			t.Fatalf("kind %d: warnings %q, want one", k, d.Warnings)
		}
		testutil.CheckWords(t, "coarse", d.Warnings[0], []string{"sample interval 2", "sample faster"}, nil)
	}
}

func TestDesignBadInput(t *testing.T) {
	with := func(f func(*DesignSettings)) DesignSettings { s := plant; f(&s); return s }
	for _, tc := range []struct {
		name string
		s    DesignSettings
		want []string
	}{
		{"zero settings", DesignSettings{}, []string{"testsignal.Design", "DesignSettings.TimeConstant = 0", "positive finite"}},
		{"no sample", with(func(s *DesignSettings) { s.Sample = 0 }), []string{"DesignSettings.Sample = 0"}},
		{"negative amplitude", with(func(s *DesignSettings) { s.Amplitude = -1 }), []string{"DesignSettings.Amplitude = -1"}},
		{"NaN dead time", with(func(s *DesignSettings) { s.DeadTime = math.NaN() }), []string{"DesignSettings.DeadTime = NaN"}},
		{"infinite level", with(func(s *DesignSettings) { s.Level = math.Inf(1) }), []string{"DesignSettings.Level = +Inf", "finite"}},
		{"huge amplitude", with(func(s *DesignSettings) { s.Amplitude = 1e200 }), []string{"DesignSettings.Amplitude = 1e+200", "MaxMagnitude"}},
		{"huge level", with(func(s *DesignSettings) { s.Level = -1e101 }), []string{"DesignSettings.Level = -1e+101"}},
		{"bad kind", with(func(s *DesignSettings) { s.Signal = 3 }), []string{"DesignSettings.Signal = 3"}},
		{"sample over budget", with(func(s *DesignSettings) { s.Sample = 700 }), []string{"DesignSettings.Sample = 700", "shorter than Budget"}},
		// 2 periods of 195 = 390 needed.
		{"short budget", with(func(s *DesignSettings) { s.Budget = 389 }), []string{"DesignSettings.Budget = 389", "too short for the slowest expected dynamics", "2 periods of the 15-value sequence at clock 13", "390 in all", "lengthen the budget"}},
		{"short budget noise", with(func(s *DesignSettings) { s.Budget = 300; s.Signal = KindBinaryNoise }), []string{"DesignSettings.Budget = 300", "2 times 188.5", "376.99 in all"}},
		{"budget in the wrong units", with(func(s *DesignSettings) { s.Budget = 1e12 }), []string{"DesignSettings.Budget = 1e+12", "more than MaxSamples", "units"}},
		{"dead time beyond the longest sequence", with(func(s *DesignSettings) { s.DeadTime = 1e9; s.Budget = 9e6 }), []string{"DesignSettings.DeadTime = 1e+09", "longest sequence"}},
	} {
		_, err := Design(tc.s)
		checkSettingError(t, tc.name, err, tc.want)
	}
}
