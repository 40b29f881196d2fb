package testsignal

import (
	"math"
	"math/rand/v2"
	"strconv"
)

// BinaryNoise returns n samples of generalised binary noise with levels
// +1 and -1 (Tulleken 1990, "Generalized binary noise test-signal
// concept for improved identification-experiment design", Automatica
// 26(1)): the first sample is +1 or -1 with equal chance, and at each
// later sample the level switches with probability p, independently of
// the past. Its autocorrelation is (1-2p)^|k| at lag k, the
// autocorrelation of a first-order autoregression with coefficient
// a = 1 - 2p, and its mean time between switches is 1/p samples. Small p
// puts the power at low frequencies, p = 1/2 gives white noise.
//
// The random choices come from a PCG generator (math/rand/v2) seeded
// with seed, so one seed always gives one signal. An n outside 1..MaxSamples or a p
// outside (0, 1) is a *SettingError.
func BinaryNoise(n int, p float64, seed uint64) ([]float64, error) {
	const op = "testsignal.BinaryNoise"
	if n < 1 || n > MaxSamples {
		return nil, &SettingError{Op: op, Setting: "n", Value: strconv.Itoa(n), Rule: "the number of samples must lie between 1 and MaxSamples = " + strconv.Itoa(MaxSamples)}
	}
	if !(p > 0 && p < 1) {
		return nil, &SettingError{Op: op, Setting: "p", Value: strconv.FormatFloat(p, 'g', -1, 64), Rule: "the switching probability must lie strictly between 0 and 1 (SwitchProbability chooses one from the time constant)"}
	}
	return binaryNoise(n, p, seed), nil
}

func binaryNoise(n int, p float64, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 0x7465737473696700)) // second word fixed: "testsig"
	out := make([]float64, n)
	level := 1.0
	if rng.IntN(2) == 0 {
		level = -1
	}
	for i := range out {
		if i > 0 && rng.Float64() < p {
			level = -level
		}
		out[i] = level
	}
	return out
}

// BandFactor is the factor alpha of the upper edge of the band a
// designed signal excites, alpha / T for an expected dominant time
// constant T: the band reaches twice the process's corner frequency, so
// that a closed loop about twice as fast as the open loop can be
// designed from the model. LowFactor is beta of the lower edge,
// 1 / (beta T), so that the band reaches down to the frequencies that
// decide the steady-state gain (beta = 3, about 95 % settling). Both are
// the guideline of Rivera and Jun, "An integrated identification and
// control design methodology for multivariable process system
// applications", IEEE Control Systems Magazine 20(3), 2000 (values FROM
// MEMORY).
const (
	BandFactor = 2.0
	LowFactor  = 3.0
)

// SwitchProbability returns the switching probability of generalised
// binary noise sampled every sample time units whose spectrum falls to
// half its zero-frequency value at BandFactor / timeConstant, the upper
// edge of the band to excite for an expected dominant time constant.
//
// The rule, derived here from the spectrum of BinaryNoise: with
// a = 1 - 2p the spectrum is proportional to
// (1 - a^2) / (1 - 2a cos w + a^2), w in radians per sample; it equals
// half its value at w = 0 when a^2 - 2(2 - cos w) a + 1 = 0, whose root
// inside (0, 1) is a = c - sqrt(c^2 - 1), c = 2 - cos w. Then p = (1-a)/2.
// For a sample interval much shorter than the time constant this is
// p ~ sample * BandFactor / (2 timeConstant), a mean switching time of
// about timeConstant. Sources: the signal and its switching process are
// Tulleken's (1990); the spectrum and the half-power algebra are derived
// here (TestSwitchProbabilityHalfPower checks them); the band edge
// BandFactor / timeConstant is Rivera and Jun's guideline (from memory,
// see BandFactor). This is our rule, not one quoted from Tulleken.
//
// A timeConstant or sample that is not a positive finite number, and a
// sample so long that BandFactor / timeConstant lies at or beyond the
// Nyquist frequency (sample >= pi timeConstant / BandFactor), are
// *SettingError.
func SwitchProbability(timeConstant, sample float64) (float64, error) {
	const op = "testsignal.SwitchProbability"
	if err := positive(op, "timeConstant", timeConstant, "the expected dominant time constant, in the sample interval's units"); err != nil {
		return 0, err
	}
	if err := positive(op, "sample", sample, "the sample interval"); err != nil {
		return 0, err
	}
	w := BandFactor / timeConstant * sample
	if w >= math.Pi {
		return 0, &SettingError{Op: op, Setting: "sample", Value: strconv.FormatFloat(sample, 'g', -1, 64),
			Rule: "the sample interval must be shorter than pi*timeConstant/" + strconv.FormatFloat(BandFactor, 'g', -1, 64) + " = " + strconv.FormatFloat(math.Pi*timeConstant/BandFactor, 'g', 4, 64) + " to excite up to " + strconv.FormatFloat(BandFactor, 'g', -1, 64) + "/timeConstant (sample faster)"}
	}
	return switchProbability(w), nil
}

// switchProbability returns p for a half-power frequency w in radians
// per sample, 0 < w < pi. With h = c - 1 = 1 - cos w = 2 sin^2(w/2)
// and r = sqrt(c^2 - 1) = sqrt(h (2 + h)), a = 1/(c + r) and
// p = (1 - a)/2 = (h + r) / (2 (1 + h + r)): no difference of nearly
// equal numbers, so p keeps its digits for a sample interval many
// orders shorter than the time constant (2 - cos w rounds to 1 below
// w = 1.5e-8, where p ~ w/2 would come out 0).
func switchProbability(w float64) float64 {
	sh := math.Sin(w / 2)
	h := 2 * sh * sh
	r := math.Sqrt(h * (2 + h))
	return (h + r) / (2 * (1 + h + r))
}

// positive checks a required positive finite setting.
func positive(op, name string, v float64, what string) error {
	if !(v > 0) || math.IsInf(v, 0) {
		return &SettingError{Op: op, Setting: name, Value: strconv.FormatFloat(v, 'g', -1, 64), Rule: "must be a positive finite number (" + what + ")"}
	}
	return nil
}
