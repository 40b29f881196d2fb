package testsignal

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
)

// Kind chooses the family of signal Design builds.
type Kind int

const (
	// KindMaxLength, the zero value: a maximum-length binary sequence
	// held for a clock period, repeated for whole periods.
	KindMaxLength Kind = iota
	// KindBinaryNoise: generalised binary noise, deciding at every sample.
	KindBinaryNoise
	// KindMultiLevel: a maximum-length sequence of DesignSettings.Levels
	// levels (see MultiLevel), held and repeated as KindMaxLength, for a
	// test that must show non-linearity.
	KindMultiLevel
)

// MinPeriods is the number of whole periods of the slowest expected
// dynamics (see DesignSettings) a test budget must hold: the first lets
// the plant's response to the start of the test die out and is
// discarded, the rest give the data. Two is the least that leaves any
// data (common practice: one period settles, at least one is used; more
// periods average the noise down).
const MinPeriods = 2

// DesignSettings is what the engineer knows before a plant test. Times
// are in one unit of the caller's choice (seconds, minutes), the same
// for every field; frequencies in the result are in radians per that
// unit.
//
// The rules Design applies, with T the time constant and theta the dead
// time:
//
//   - Band: from 1/(LowFactor T) to BandFactor/T (Rivera and Jun 2000,
//     from memory; see BandFactor).
//   - Clock period of a maximum-length sequence: 2.783/(BandFactor/T),
//     rounded down to a whole number of samples and at least one, so
//     that the half-power frequency of the held sequence's spectrum,
//     2.783/clock (where (sin x / x)^2 = 1/2 at x = 1.3916, an exact
//     property of a held signal's spectrum), lies at or above the top of
//     the band. Rivera and Jun give the same rule, clock <= 2.78 T/alpha
//     (from memory).
//   - Period of the sequence: the shortest register whose period covers
//     the time the slowest dynamics need, max(2 pi LowFactor T,
//     theta + 4 T): the first term puts the period's fundamental
//     frequency at or below the bottom of the band (Rivera and Jun, from
//     memory), the second lets the response of a first-order lag with
//     dead time settle to 98 % (1 - e^-4, exact) within one period.
//   - Budget: at least MinPeriods periods (binary noise: MinPeriods times
//     the time the slowest dynamics need). A shorter budget is a
//     *SettingError naming DesignSettings.Budget with the time needed.
//   - Binary noise: the switching probability of SwitchProbability.
type DesignSettings struct {
	// TimeConstant is the expected dominant (slowest) time constant of
	// the plant. Required, positive.
	TimeConstant float64
	// DeadTime is the expected dead time; zero or positive.
	DeadTime float64
	// Sample is the sample interval of the test. Required, positive.
	Sample float64
	// Level is the operating point the signal moves about; a finite
	// number of magnitude at most MaxMagnitude.
	Level float64
	// Amplitude is the largest move allowed about Level: the signal takes
	// the values Level - Amplitude and Level + Amplitude. Required,
	// positive, at most MaxMagnitude; choose it within the plant's safe
	// range.
	Amplitude float64
	// Budget is the time the test may take. Required, positive.
	Budget float64
	// Signal chooses the family: KindMaxLength (the zero value),
	// KindBinaryNoise or KindMultiLevel.
	Signal Kind
	// Levels is the number of levels of a KindMultiLevel sequence: 3, 5
	// or 7; 0 means 3. Unused by the other kinds.
	Levels int
	// Seed seeds the binary noise; unused for a maximum-length sequence.
	Seed uint64
}

// Validate checks the settings against their rules; the error is a
// *SettingError naming the field. It does not check the budget against
// the dynamics: Design does.
func (s DesignSettings) Validate() error {
	const op = "testsignal.Design"
	for _, f := range []struct {
		name, what string
		v          float64
	}{
		{"DesignSettings.TimeConstant", "the expected dominant time constant", s.TimeConstant},
		{"DesignSettings.Sample", "the sample interval", s.Sample},
		{"DesignSettings.Amplitude", "the largest move about Level", s.Amplitude},
		{"DesignSettings.Budget", "the time the test may take", s.Budget},
	} {
		if err := positive(op, f.name, f.v, f.what); err != nil {
			return err
		}
	}
	if err := errs.NonNegative(op, "DesignSettings.DeadTime", s.DeadTime, "the expected dead time, 0 for none"); err != nil {
		return err
	}
	if !(math.Abs(s.Level) <= MaxMagnitude) {
		return &SettingError{Op: op, Setting: "DesignSettings.Level", Value: fmtG(s.Level), Rule: "must be a finite number of magnitude at most MaxMagnitude = 1e100 (the operating point)"}
	}
	if s.Amplitude > MaxMagnitude {
		return &SettingError{Op: op, Setting: "DesignSettings.Amplitude", Value: fmtG(s.Amplitude), Rule: "must be at most MaxMagnitude = 1e100 (rescale: change the units)"}
	}
	if s.Signal != KindMaxLength && s.Signal != KindBinaryNoise && s.Signal != KindMultiLevel {
		return &SettingError{Op: op, Setting: "DesignSettings.Signal", Value: strconv.Itoa(int(s.Signal)), Rule: "must be KindMaxLength, KindBinaryNoise or KindMultiLevel"}
	}
	if s.Signal == KindMultiLevel && s.Levels != 0 && MaxMultiStages(s.Levels) == 0 {
		return &SettingError{Op: op, Setting: "DesignSettings.Levels", Value: strconv.Itoa(s.Levels), Rule: "must be 3, 5 or 7 (0 means 3)"}
	}
	if s.Budget/s.Sample > MaxSamples {
		return &SettingError{Op: op, Setting: "DesignSettings.Budget", Value: fmtG(s.Budget),
			Rule: "Budget/Sample = " + fmtG(s.Budget/s.Sample) + " samples, more than MaxSamples = " + strconv.Itoa(MaxSamples) + " (check the units of Budget and Sample)"}
	}
	if s.Sample >= s.Budget {
		return &SettingError{Op: op, Setting: "DesignSettings.Sample", Value: fmtG(s.Sample), Rule: "must be shorter than Budget = " + fmtG(s.Budget)}
	}
	return nil
}

// Plan is a designed test signal and what it excites.
type Plan struct {
	// Signal holds one value per sample, Level - Amplitude or
	// Level + Amplitude (for KindMultiLevel, Level + Amplitude times a
	// level of MultiLevel), for the whole test.
	Signal []float64
	// Sample is the sample interval (DesignSettings.Sample).
	Sample float64
	// Clock is the time between possible switches: the hold of each
	// value of a maximum-length sequence, a whole number of samples; the
	// sample interval for binary noise.
	Clock float64
	// Stages is the register length of a maximum-length sequence (its
	// period is 2^Stages - 1 clock periods, q^Stages - 1 for q levels);
	// 0 for binary noise.
	Stages int
	// Periods is the number of whole periods of the sequence in Signal;
	// 0 for binary noise.
	Periods int
	// SwitchProbability is the binary noise's probability of switching
	// at each sample; 0 for a maximum-length sequence.
	SwitchProbability float64
	// Frequency and Power are the periodogram of Signal - Level (see
	// Periodogram): frequencies in radians per time unit.
	Frequency, Power []float64
	// BandLow and BandHigh bound the band the signal excites, in radians
	// per time unit: the lowest frequency it puts power on (the period's
	// fundamental; for binary noise, the lowest frequency the record
	// resolves, 2 pi / (length * Sample)) and the frequency where its
	// spectrum falls to half its low-frequency level (half the sampling
	// frequency times 2 pi when it stays flat to there).
	BandLow, BandHigh float64
	// Warnings lists conditions that weaken the test without making it
	// useless, each a sentence with the fix.
	Warnings []string
}

// MaxSamples is the longest signal this package builds, ten million
// samples (about 116 days at one sample a second): far beyond any plant
// test, and small enough to allocate safely. Longer requests are a
// *SettingError, most often a slip in the units of a setting.
const MaxSamples = 10_000_000

// MaxMagnitude bounds Level and Amplitude and the samples Periodogram
// accepts, 1e100: far beyond any physical unit, and small enough that
// the signal's values and the squares of the periodogram stay finite
// (|X_k| is at most MaxSamples * 1e100 = 1e107, its square 1e214).
const MaxMagnitude = 1e100

// halfPowerX solves (sin x / x)^2 = 1/2 (checked in the tests).
const halfPowerX = 1.3915573782515103

// Design builds a test signal from what the engineer knows, by the rules
// stated on DesignSettings. Bad settings, and a budget too short for the
// slowest expected dynamics, are a *SettingError naming the field.
func Design(s DesignSettings) (*Plan, error) {
	const op = "testsignal.Design"
	if err := s.Validate(); err != nil {
		return nil, err
	}
	tau := s.TimeConstant
	wHigh := BandFactor / tau
	need := math.Max(2*math.Pi*LowFactor*tau, s.DeadTime+4*tau)
	d := &Plan{Sample: s.Sample}
	if s.Signal == KindBinaryNoise {
		if s.Budget < MinPeriods*need {
			return nil, budgetError(op, s.Budget, strconv.Itoa(MinPeriods)+" times "+fmtG(need)+", the time the slowest expected dynamics need (max(2 pi * 3 * TimeConstant, DeadTime + 4 * TimeConstant))", MinPeriods*need)
		}
		w := wHigh * s.Sample
		if w >= math.Pi {
			d.SwitchProbability = 0.5
			d.BandHigh = math.Pi / s.Sample
			d.Warnings = append(d.Warnings, "the sample interval "+fmtG(s.Sample)+" is too long to excite up to "+fmtG(wHigh)+" rad per time unit ("+fmtG(BandFactor)+"/TimeConstant): the noise is white up to half the sampling frequency; sample faster than "+fmtG(math.Pi/wHigh))
		} else {
			d.SwitchProbability = switchProbability(w)
			d.BandHigh = wHigh
		}
		n := int(s.Budget / s.Sample)
		x := binaryNoise(n, d.SwitchProbability, s.Seed)
		d.Clock = s.Sample
		d.BandLow = 2 * math.Pi / (float64(n) * s.Sample)
		d.Signal = scale(x, 1, s.Level, s.Amplitude)
	} else if err := designSequence(op, s, d, wHigh, need); err != nil {
		return nil, err
	}
	dev := make([]float64, len(d.Signal))
	for i, v := range d.Signal {
		dev[i] = v - s.Level
	}
	d.Frequency, d.Power = periodogram(dev, s.Sample)
	return d, nil
}

// scale returns level + amplitude*x with each value held for hold samples.
func scale(x []float64, hold int, level, amplitude float64) []float64 {
	out := make([]float64, 0, len(x)*hold)
	for _, v := range x {
		for range hold {
			out = append(out, level+amplitude*v)
		}
	}
	return out
}

// heldHalfPower returns the frequency, radians per time unit, where the
// power envelope of a sequence held for hold samples,
// (sin(w hold Ts / 2) / (hold sin(w Ts / 2)))^2, falls to 1/2; pi/Ts
// (half the sampling frequency) when hold is 1 (a flat spectrum).
func heldHalfPower(hold int, ts float64) float64 {
	if hold == 1 {
		return math.Pi / ts
	}
	m := float64(hold)
	env := func(w float64) float64 {
		r := math.Sin(w*m/2) / (m * math.Sin(w/2))
		return r * r
	}
	// The envelope falls from 1 at w = 0 to 0 at w = 2 pi / hold.
	lo, hi := 0.0, 2*math.Pi/m
	for range 200 {
		mid := (lo + hi) / 2
		if env(mid) > 0.5 {
			lo = mid
		} else {
			hi = mid
		}
		if hi-lo <= 1e-15*hi {
			break
		}
	}
	return (lo + hi) / 2 / ts
}

func budgetError(op string, budget float64, what string, needed float64) error {
	return &SettingError{Op: op, Setting: "DesignSettings.Budget", Value: fmtG(budget),
		Rule: "too short for the slowest expected dynamics: the test needs at least " + what + ", " + fmtG(needed) + " in all (the first period lets the start-up transient die out, the rest give data); lengthen the budget, or check the time constant and dead time"}
}

func fmtG(v float64) string { return strconv.FormatFloat(v, 'g', 5, 64) }

// designSequence fills d with a held maximum-length sequence, binary or
// of s.Levels levels, by the rules on DesignSettings: the clock from the
// band's top, the shortest register whose period covers need, whole
// periods within the budget.
func designSequence(op string, s DesignSettings, d *Plan, wHigh, need float64) error {
	q, lo, hi := 2, MinStages, MaxStages
	if s.Signal == KindMultiLevel {
		q = max(s.Levels, 3)
		lo, hi = MinMultiStages, MaxMultiStages(q)
	}
	hold := int(math.Floor(2 * halfPowerX / wHigh / s.Sample))
	if hold < 1 {
		hold = 1
		d.Warnings = append(d.Warnings, "the sample interval "+fmtG(s.Sample)+" is longer than the clock period the band needs ("+fmtG(2*halfPowerX/wHigh)+"): the sequence excites only up to half the sampling frequency; sample faster")
	}
	d.Clock = float64(hold) * s.Sample
	length := func(n int) int { // q^n - 1
		p := 1
		for range n {
			p *= q
		}
		return p - 1
	}
	stages := lo
	for ; stages <= hi && float64(length(stages))*d.Clock < need; stages++ {
	}
	if stages > hi {
		return &SettingError{Op: op, Setting: "DesignSettings.DeadTime", Value: fmtG(s.DeadTime),
			Rule: "the slowest dynamics need " + fmtG(need) + ", more than the longest sequence (" + strconv.Itoa(q) + "^" + strconv.Itoa(hi) + " - 1 clock periods of " + fmtG(d.Clock) + "): check the dead time and time constant"}
	}
	period := float64(length(stages)) * d.Clock
	if s.Budget < MinPeriods*period {
		return budgetError(op, s.Budget, strconv.Itoa(MinPeriods)+" periods of the "+strconv.Itoa(length(stages))+"-value sequence at clock "+fmtG(d.Clock)+", each covering "+fmtG(need)+", the time the slowest expected dynamics need", MinPeriods*period)
	}
	d.Stages = stages
	d.Periods = int(s.Budget / period)
	var x []float64
	if q == 2 {
		x, _ = MaxLength(stages)
	} else {
		x, _ = MultiLevel(q, stages)
	}
	d.Signal = scale(x, hold, s.Level, s.Amplitude)
	for p := 1; p < d.Periods; p++ {
		d.Signal = append(d.Signal, d.Signal[:len(x)*hold]...)
	}
	d.BandLow = 2 * math.Pi / period
	d.BandHigh = heldHalfPower(hold, s.Sample)
	return nil
}
