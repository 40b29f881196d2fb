package ccf

import (
	"strconv"

	"github.com/backshift/backshift/internal/errs"
)

// Validate checks every field of s (nil is the defaults) and returns a
// *SettingError naming the first bad field: an unknown Method. Names accepts
// every value (the names appear only in messages). Cross calls it first.
func (s *Settings) Validate() error {
	if s == nil {
		return nil
	}
	switch s.Method {
	case Auto, Direct, FFT:
		return nil
	}
	return &SettingError{Setting: "Settings.Method", Value: s.Method.String(), Rule: "must be Auto, Direct or FFT (the zero value is Auto)"}
}

// Validate checks every field of s (nil is the defaults) and returns a
// *SettingError naming the first bad field: Level outside [0, 1) (zero
// is the default 0.99), Penalty negative or not finite, MinFraction 1 or
// more or NaN. MaxR and MaxS accept every value (a negative bound is
// documented: order zero only); Input accepts every value (it appears
// only in the result and in messages). Identify calls it first.
func (s *IdentifySettings) Validate() error {
	if s == nil {
		return nil
	}
	if err := errs.Probability("", "IdentifySettings.Level", s.Level, "0 means 0.99"); err != nil {
		return err
	}
	if err := errs.NonNegative("", "IdentifySettings.Penalty", s.Penalty, "0 means 2, the AIC weight"); err != nil {
		return err
	}
	if !(s.MinFraction < 1) {
		return &SettingError{Setting: "IdentifySettings.MinFraction", Value: strconv.FormatFloat(s.MinFraction, 'g', -1, 64), Rule: "must be below 1 (0 means 0.1, a negative value no bound)"}
	}
	return nil
}

// Validate checks every field of s (nil is the defaults) and returns a
// *SettingError naming the first bad field: Lags or MaxIter negative
// (zero means the default), a name given twice in Names. ARP accepts
// every value (negative is documented: no autoregressive noise); Output
// and empty Names entries (the default name) accept every value.
// DistributedLag calls it first; Lags, ARP and the number of Names
// against the data are checked there.
func (s *DistributedLagSettings) Validate() error {
	if s == nil {
		return nil
	}
	if err := errs.Count("", "DistributedLagSettings.Lags", s.Lags, "0 means min(24, n/(4 inputs)), at least 1"); err != nil {
		return err
	}
	if err := errs.Count("", "DistributedLagSettings.MaxIter", s.MaxIter, "0 means 50"); err != nil {
		return err
	}
	seen := map[string]bool{}
	for _, nm := range s.Names {
		if nm != "" && seen[nm] {
			return &SettingError{Setting: "DistributedLagSettings.Names", Value: strconv.Quote(nm) + " twice", Rule: "must give one name per input"}
		}
		seen[nm] = true
	}
	return nil
}
