package monitor

import (
	"strconv"

	"github.com/backshift/backshift/internal/errs"
)

// The limits of Settings and of the samples, with their reasons.
const (
	// DefaultTargetARL is the in-control average run length of each test
	// when Settings.TargetARL is 0: 10080 samples, a false alarm of each
	// test about once a week at one sample a minute.
	DefaultTargetARL = 10080
	// MinTargetARL is the smallest target accepted: below 50 samples a
	// CUSUM alarms almost at once in control and Siegmund's
	// approximation, made for thresholds of a few standard deviations,
	// loses its accuracy.
	MinTargetARL = 50
	// MaxTargetARL is the largest target accepted: thresholds grow only
	// with the logarithm of the target, and no simulation could check a
	// longer run length.
	MaxTargetARL = 1e9
	// MaxLag is the largest input lag the correlation test watches (the
	// monitor keeps that many past input signs per input).
	MaxLag = 10000
	// MaxInput is the largest input magnitude accepted; beyond it the
	// input's running level could overflow.
	MaxInput = 1e150
	// MinSigma is the smallest Settings.Sigma accepted: its inverse must
	// stay far inside float64 (rescale the errors' units below it).
	MinSigma = 1e-150
	// MaxError is the magnitude at which a standardised error is clipped:
	// a standardised error beyond 1e6 alarms at once anyway, and the clip
	// keeps every statistic finite.
	MaxError = 1e6
)

// Settings configure a Monitor. The zero value of every field means its
// documented default.
type Settings struct {
	// Sigma is the standard deviation of the one-step prediction errors
	// while the plant behaves as its model (the noise model's sigma):
	// Update divides each error by it. 0 means 1: the errors passed are
	// already standardised, as tf/predict's Step.Z is (the quantity to
	// feed: see the package doc). It must be at least MinSigma.
	Sigma float64
	// TargetARL is the in-control average run length, in samples, of
	// each of the three tests (mean, variance, correlation): the mean
	// number of samples between false alarms of that test. With all
	// three running, the monitor as a whole alarms falsely about three
	// times as often. 0 means DefaultTargetARL; it must lie in
	// [MinTargetARL, MaxTargetARL].
	TargetARL float64
	// Shift is the shift of the errors' mean, in standard deviations,
	// that the mean test detects fastest: its reference value is Shift/2
	// (Page 1954; the CUSUM is the likelihood-ratio test for that shift).
	// 0 means 1; it must lie in (0, 4] (beyond 4 standard deviations a
	// single sample outside its limits is the quicker test: common
	// practice).
	Shift float64
	// VarianceRatio is the ratio of the errors' variance to its
	// in-control value that the variance test's up side detects
	// fastest; its down side is tuned to the inverse ratio. 0 means 2;
	// it must lie in (1, 100].
	VarianceRatio float64
	// CorrelationShift is the mean, in standard deviations, that a
	// change of gain or dead time gives the errors signed by the input's
	// deviation (see the package documentation), that the correlation
	// test detects fastest; its reference is half of it. 0 means 0.5; it
	// must lie in (0, 4].
	CorrelationShift float64
	// Lags lists, for each input, the lags k at which the correlation
	// test watches the errors e_t against the input u_{t-k}: a gain
	// change shows at the dead time and after it, a dead-time change at
	// the old and the new dead time. len(Lags) is the number of input
	// values Update takes (an input may have no lags: it is then not
	// watched). Lags lie in [0, MaxLag], without repeats for one input.
	// Use lag 0 only for an input not computed from the same sample's
	// output (open loop or a measured disturbance): under feedback u_t
	// depends on e_t and the test would alarm falsely.
	Lags [][]int
	// InputMemory is the number of samples over which the running level
	// of each input is judged (an exponentially weighted mean with
	// weight 1/InputMemory): the correlation test signs each input by
	// its deviation from that level. 0 means 100.
	InputMemory int
	// OnAlarm, when not nil, is called with each alarm on the goroutine
	// that called Update, before Update returns: keep it short (hand
	// the alarm on), as it delays the caller.
	OnAlarm func(Alarm)
	// Alarms, when not nil, receives each alarm by a send that never
	// waits: when the channel is full the alarm is dropped and counted
	// (Monitor.Dropped). Give it a buffer.
	Alarms chan<- Alarm
}

// withDefaults returns s with its zero fields set to their defaults.
func (s Settings) withDefaults() Settings {
	if s.Sigma == 0 {
		s.Sigma = 1
	}
	if s.TargetARL == 0 {
		s.TargetARL = DefaultTargetARL
	}
	if s.Shift == 0 {
		s.Shift = 1
	}
	if s.VarianceRatio == 0 {
		s.VarianceRatio = 2
	}
	if s.CorrelationShift == 0 {
		s.CorrelationShift = 0.5
	}
	if s.InputMemory == 0 {
		s.InputMemory = 100
	}
	return s
}

// Validate reports the first setting that breaks its rule as a
// *SettingError naming the field; nil means the settings are usable. A
// nil *Settings is the default and valid.
func (s *Settings) Validate() error {
	if s == nil {
		return nil
	}
	const op = "monitor.Settings.Validate"
	if err := errs.NonNegative(op, "Settings.Sigma", s.Sigma, "the errors' in-control standard deviation; 0 means 1"); err != nil {
		return err
	}
	if err := errs.Count(op, "Settings.InputMemory", s.InputMemory, "0 means 100"); err != nil {
		return err
	}
	if s.Sigma != 0 && s.Sigma < MinSigma {
		return &SettingError{Op: op, Setting: "Settings.Sigma", Value: formatFloat(s.Sigma),
			Rule: "must be 0 (meaning 1) or at least 1e-150 (rescale the errors: change their units)"}
	}
	d := s.withDefaults()
	if !(d.TargetARL >= MinTargetARL && d.TargetARL <= MaxTargetARL) {
		return &SettingError{Op: op, Setting: "Settings.TargetARL", Value: formatFloat(s.TargetARL),
			Rule: "must lie between 50 and 1e9 samples (0 means 10080, a false alarm a week at one sample a minute)"}
	}
	if !(d.Shift > 0 && d.Shift <= 4) {
		return &SettingError{Op: op, Setting: "Settings.Shift", Value: formatFloat(s.Shift),
			Rule: "must lie in (0, 4] standard deviations (0 means 1)"}
	}
	if !(d.VarianceRatio > 1 && d.VarianceRatio <= 100) {
		return &SettingError{Op: op, Setting: "Settings.VarianceRatio", Value: formatFloat(s.VarianceRatio),
			Rule: "must lie in (1, 100] (0 means 2, a doubled variance)"}
	}
	if !(d.CorrelationShift > 0 && d.CorrelationShift <= 4) {
		return &SettingError{Op: op, Setting: "Settings.CorrelationShift", Value: formatFloat(s.CorrelationShift),
			Rule: "must lie in (0, 4] standard deviations (0 means 0.5)"}
	}
	return validateLags(op, s.Lags)
}

// validateLags checks the range of every lag and repeats within an input.
func validateLags(op string, lags [][]int) error {
	for i, ls := range lags {
		for j, k := range ls {
			name := "Settings.Lags[" + strconv.Itoa(i) + "][" + strconv.Itoa(j) + "]"
			if k < 0 || k > MaxLag {
				return &SettingError{Op: op, Setting: name, Value: strconv.Itoa(k),
					Rule: "a lag lies between 0 and 10000 samples"}
			}
			for _, prev := range ls[:j] {
				if prev == k {
					return &SettingError{Op: op, Setting: name, Value: strconv.Itoa(k),
						Rule: "repeats a lag of input " + strconv.Itoa(i) + ": list each lag once"}
				}
			}
		}
	}
	return nil
}
