package testsignal

import (
	"errors"
	"math"
	"slices"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// Inputs on disjoint harmonics are orthogonal over a period at every
// circular lag (an identity of the discrete Fourier transform: the cross
// spectrum is zero on every line). Tolerance 1e-10 on sums of 240
// products of numbers at most 1.
func TestMultisineUncorrelated(t *testing.T) {
	for _, ph := range []Phases{SchroederPhases, RandomPhases} {
		set, err := Multisine(MultisineSettings{Inputs: 3, Period: 240, Phases: ph, Seed: 9, Amplitude: 2})
		if err != nil {
			t.Fatal(err)
		}
		if len(set.Signals) != 3 || len(set.Lines[0]) != 119/3 {
			t.Fatalf("%d signals, %d lines; want 3 and %d", len(set.Signals), len(set.Lines[0]), 119/3)
		}
		for i := range set.Signals {
			if pk := math.Max(slices.Max(set.Signals[i]), -slices.Min(set.Signals[i])); math.Abs(pk-2) > 1e-15 {
				t.Errorf("input %d: peak %v, want 2", i, pk)
			}
			for j := i + 1; j < 3; j++ {
				for lag := 0; lag < 240; lag++ {
					s := 0.0
					for k := range 240 {
						s += set.Signals[i][k] * set.Signals[j][(k+lag)%240]
					}
					if math.Abs(s) > 1e-10 {
						t.Errorf("phases %d inputs %d, %d lag %d: cross sum %g, want 0", ph, i, j, lag, s)
					}
				}
			}
		}
	}
}

func TestMultisineRandomSeeded(t *testing.T) {
	s := MultisineSettings{Period: 100, Phases: RandomPhases, Seed: 5}
	a, _ := Multisine(s)
	b, _ := Multisine(s)
	s.Seed = 6
	c, _ := Multisine(s)
	if !slices.Equal(a.Signals[0], b.Signals[0]) || slices.Equal(a.Signals[0], c.Signals[0]) {
		t.Error("random phases are not fixed by the seed")
	}
}

func TestMultisineBadInput(t *testing.T) {
	for _, tc := range []struct {
		name string
		s    MultisineSettings
		want []string
	}{
		{"no period", MultisineSettings{}, []string{"testsignal.Multisine", "MultisineSettings.Period = 0", "at least 2*Inputs + 1 = 3"}},
		{"huge period", MultisineSettings{Period: MaxSamples + 1}, []string{"MultisineSettings.Period = 10000001", "MaxSamples"}},
		{"negative inputs", MultisineSettings{Inputs: -1, Period: 10}, []string{"MultisineSettings.Inputs = -1"}},
		{"too many lines", MultisineSettings{Inputs: 2, Period: 20, Lines: 5}, []string{"MultisineSettings.Lines = 5", "(Period-1)/2 = 9"}},
		{"bad amplitude", MultisineSettings{Period: 20, Amplitude: math.NaN()}, []string{"MultisineSettings.Amplitude = NaN"}},
		{"bad phases", MultisineSettings{Period: 20, Phases: 7}, []string{"MultisineSettings.Phases = 7", "SchroederPhases or RandomPhases"}},
		// Counts whose products with 2 or Inputs would overflow an int.
		{"inputs beyond the period", MultisineSettings{Inputs: 1 << 62, Period: 11}, []string{"MultisineSettings.Inputs = 4611686018427387904", "at most (MaxSamples-1)/2 = 4999999"}},
		{"largest int inputs", MultisineSettings{Inputs: math.MaxInt, Period: 11}, []string{"MultisineSettings.Inputs = 9223372036854775807"}},
		{"lines overflowing", MultisineSettings{Inputs: 2, Lines: 1 << 62, Period: 11}, []string{"MultisineSettings.Lines = 4611686018427387904", "(Period-1)/2 = 5"}},
	} {
		_, err := Multisine(tc.s)
		checkSettingError(t, tc.name, err, tc.want)
	}
}

func TestPeriodogramBadInput(t *testing.T) {
	_, _, err := Periodogram([]float64{1}, 1)
	testutil.CheckWords(t, "short", errString(err), []string{"testsignal.Periodogram", "x = a series of 1 samples", "at least 2"}, nil)
	_, _, err = Periodogram([]float64{1, 2}, 0)
	testutil.CheckWords(t, "sample", errString(err), []string{"sample = 0", "positive finite"}, nil)
	x := []float64{1, 2, math.Inf(-1)}
	_, _, err = Periodogram(x, 1)
	var se *SampleError
	if !errors.As(err, &se) || se.Index != 2 {
		t.Errorf("Inf sample: %v, want *SampleError at index 2", err)
	}
	// A finite sample whose square overflows (1e200^2 = +Inf) is refused
	// with the limit, MaxMagnitude, rather than giving an infinite power.
	_, _, err = Periodogram([]float64{1e200, -1e200, 3}, 1)
	if !errors.As(err, &se) || se.Index != 0 || se.Limit != MaxMagnitude {
		t.Errorf("1e200 sample: %v, want *SampleError at index 0 with Limit MaxMagnitude", err)
	}
	testutil.CheckWords(t, "huge", errString(err), []string{"testsignal.Periodogram", `series "x" sample 0 is 1e+200`, "largest magnitude accepted, 1e+100"}, nil)
	if _, p, err := Periodogram([]float64{MaxMagnitude, -MaxMagnitude, 3}, 1); err != nil || math.IsInf(p[1], 0) {
		t.Errorf("samples of magnitude MaxMagnitude: power %v, error %v; want finite power", p, err)
	}
}

func errString(err error) string {
	if err == nil {
		return "<nil>"
	}
	return err.Error()
}

// The periodogram of a maximum-length sequence is flat: every line but
// the zero-frequency one has |X_k|^2 = N + 1, and X_0 = 1 (one more +1
// than -1), a mathematical fact that follows from the two-valued
// autocorrelation. Tolerance 1e-12 relative: FFT rounding.
func TestPeriodogramMaxLengthFlat(t *testing.T) {
	x, _ := MaxLength(9)
	n := float64(len(x))
	_, p, err := Periodogram(x, 1)
	if err != nil {
		t.Fatal(err)
	}
	for k, v := range p {
		want := (n + 1) / (n * n)
		if k == 0 {
			want = 1 / (n * n)
		}
		if math.Abs(v-want) > 1e-12*want {
			t.Errorf("line %d: %v, want %v", k, v, want)
		}
	}
}
