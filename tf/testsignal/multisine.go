package testsignal

import (
	"math"
	"math/rand/v2"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
)

// Phases chooses the phases of a multisine's cosines.
type Phases int

const (
	// SchroederPhases, the zero value: phi_n = -pi n (n - 1) / L for the
	// n-th of an input's L lines (n = 1 .. L), the equal-power case of
	// Schroeder's rule (M. R. Schroeder, "Synthesis of low-peak-factor
	// signals and binary sequences with low autocorrelation", IEEE Trans.
	// Information Theory 16(1), 85-89, 1970), which keeps the peak low
	// for a given power.
	SchroederPhases Phases = iota
	// RandomPhases draws each phase uniformly on [0, 2 pi) from a PCG
	// generator seeded with MultisineSettings.Seed.
	RandomPhases
)

// MultisineSettings describes a set of periodic multisines, one per
// input. The zero value of each field means its documented default.
type MultisineSettings struct {
	// Inputs is the number of signals, one per plant input; 0 means 1.
	Inputs int
	// Period is the number of samples in one period; at least
	// 2*Inputs + 1 so that every input gets a line below half the
	// sampling frequency, and at most MaxSamples. Required.
	Period int
	// Lines is the number of frequency lines (cosines) of each input;
	// 0 means as many as fit below half the sampling frequency,
	// ((Period-1)/2) / Inputs. The lines are the harmonics
	// k = 1 .. Inputs*Lines of the period, dealt out in turn: input i
	// (from 0) gets k = i+1, i+1+Inputs, i+1+2*Inputs, ... No two inputs
	// share a line, so over whole periods the inputs are uncorrelated at
	// every lag. The highest line k sets the top of the band excited,
	// 2 pi k / (Period * sample).
	Lines int
	// Phases chooses Schroeder (the default) or random phases.
	Phases Phases
	// Seed seeds the random phases; unused for Schroeder phases.
	Seed uint64
	// Amplitude is the peak of each signal (its largest magnitude over a
	// period); 0 means 1.
	Amplitude float64
}

// Validate checks the settings against their rules; the error is a
// *SettingError naming the field.
func (s MultisineSettings) Validate() error {
	const op = "testsignal.Multisine"
	if err := errs.Count(op, "MultisineSettings.Inputs", s.Inputs, "0 means 1"); err != nil {
		return err
	}
	if err := errs.Count(op, "MultisineSettings.Lines", s.Lines, "0 means all that fit below half the sampling frequency"); err != nil {
		return err
	}
	if err := errs.NonNegative(op, "MultisineSettings.Amplitude", s.Amplitude, "the peak of each signal; 0 means 1"); err != nil {
		return err
	}
	if s.Phases != SchroederPhases && s.Phases != RandomPhases {
		return &SettingError{Op: op, Setting: "MultisineSettings.Phases", Value: strconv.Itoa(int(s.Phases)), Rule: "must be SchroederPhases or RandomPhases"}
	}
	if s.Inputs > (MaxSamples-1)/2 {
		return &SettingError{Op: op, Setting: "MultisineSettings.Inputs", Value: strconv.Itoa(s.Inputs),
			Rule: "must be at most (MaxSamples-1)/2 = " + strconv.Itoa((MaxSamples-1)/2) + ": the period, at most MaxSamples, holds at least 2*Inputs + 1 samples"}
	}
	m := max(s.Inputs, 1)
	if s.Period < 2*m+1 {
		return &SettingError{Op: op, Setting: "MultisineSettings.Period", Value: strconv.Itoa(s.Period),
			Rule: "must be at least 2*Inputs + 1 = " + strconv.Itoa(2*m+1) + " samples, so that each input has a line below half the sampling frequency"}
	}
	if s.Period > MaxSamples {
		return &SettingError{Op: op, Setting: "MultisineSettings.Period", Value: strconv.Itoa(s.Period), Rule: "must not exceed MaxSamples = " + strconv.Itoa(MaxSamples)}
	}
	// Lines > ((Period-1)/2)/Inputs is Inputs*Lines > (Period-1)/2
	// without the product, which can overflow.
	if s.Lines > (s.Period-1)/2/m {
		return &SettingError{Op: op, Setting: "MultisineSettings.Lines", Value: strconv.Itoa(s.Lines),
			Rule: "Inputs*Lines must not exceed (Period-1)/2 = " + strconv.Itoa((s.Period-1)/2) + ", the harmonics below half the sampling frequency (lengthen the period or use fewer lines)"}
	}
	return nil
}

// MultisineSet is one period of a multisine for each input.
type MultisineSet struct {
	// Signals holds one period of each input's signal, Period samples,
	// with zero mean and peak magnitude Amplitude.
	Signals [][]float64
	// Lines holds each input's harmonics k (frequency 2 pi k / Period
	// radians per sample).
	Lines [][]int
	// PhaseAngles holds the phase of each line, radians.
	PhaseAngles [][]float64
	// CrestFactor holds each signal's peak over its root mean square,
	// over the samples of one period (sqrt 2 for a single cosine; lower
	// is better: more power for the same peak).
	CrestFactor []float64
}

// Multisine returns one period of a multisine for each input: input i is
// the sum of equal-amplitude cosines at its lines with the phases of
// s.Phases, scaled to the peak s.Amplitude. Repeat the period for a test
// of several periods; discard the first as the transient settles. Bad
// settings are a *SettingError naming the field.
func Multisine(s MultisineSettings) (*MultisineSet, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	m := max(s.Inputs, 1)
	lines := s.Lines
	if lines == 0 {
		lines = (s.Period - 1) / 2 / m
	}
	amp := s.Amplitude
	if amp == 0 {
		amp = 1
	}
	var rng *rand.Rand
	if s.Phases == RandomPhases {
		rng = rand.New(rand.NewPCG(s.Seed, 0x6d756c7469736e00)) // "multisn"
	}
	out := &MultisineSet{}
	for i := 0; i < m; i++ {
		ks := make([]int, lines)
		ph := make([]float64, lines)
		for j := range ks {
			ks[j] = i + 1 + j*m
			n := float64(j + 1)
			if rng != nil {
				ph[j] = 2 * math.Pi * rng.Float64()
			} else {
				ph[j] = -math.Pi * n * (n - 1) / float64(lines)
			}
		}
		x := make([]float64, s.Period)
		for t := range x {
			v := 0.0
			for j, k := range ks {
				// k*t reduced modulo Period keeps the cosine's argument small and exact.
				v += math.Cos(2*math.Pi*float64(k*t%s.Period)/float64(s.Period) + ph[j])
			}
			x[t] = v
		}
		peak, ss := 0.0, 0.0
		for _, v := range x {
			peak = math.Max(peak, math.Abs(v))
			ss += v * v
		}
		for t := range x {
			x[t] *= amp / peak
		}
		out.Signals = append(out.Signals, x)
		out.Lines = append(out.Lines, ks)
		out.PhaseAngles = append(out.PhaseAngles, ph)
		out.CrestFactor = append(out.CrestFactor, peak/math.Sqrt(ss/float64(s.Period)))
	}
	return out, nil
}
