package ccf

import (
	"fmt"
	"strconv"
)

// Validate checks every field of s (nil is the defaults) and returns an
// *ArgError naming the first bad field: an unknown Method. Names accepts
// every value (the names appear only in messages). Cross calls it first.
func (s *Settings) Validate() error {
	if s == nil {
		return nil
	}
	switch s.Method {
	case Auto, Direct, FFT:
		return nil
	}
	return &ArgError{Arg: "Settings.Method", Value: s.Method.String(), Want: "Auto, Direct or FFT"}
}

// Validate checks every field of s (nil is the defaults) and returns an
// *ArgError naming the first bad field: Level outside [0, 1) (zero is
// the default 0.99), Input not a name the spec language reads (a letter
// or underscore, then letters, digits and underscores, not one of its
// words B, a, AR, MA, ARMA, where, every), Prefix not made of letters,
// digits and underscores starting with a letter or underscore, Penalty
// negative or not finite, MinFraction 1 or more or NaN, InputDiff
// without constant term 1 or with a NaN or infinite coefficient. MaxR
// and MaxS accept every value (negative is documented: order zero only).
// Identify calls it first.
func (s *IdentifySettings) Validate() error {
	if s == nil {
		return nil
	}
	if !(s.Level >= 0 && s.Level < 1) {
		return &ArgError{Arg: "IdentifySettings.Level", Value: strconv.FormatFloat(s.Level, 'g', -1, 64), Want: "in (0, 1) (zero means the default 0.99)"}
	}
	if s.Input != "" && (!isName(s.Input) || specWords[s.Input]) {
		return &ArgError{Arg: "IdentifySettings.Input", Value: strconv.Quote(s.Input), Want: "a name the spec texts can hold: a letter or underscore, then letters, digits or underscores, not one of B, a, AR, MA, ARMA, where, every"}
	}
	if s.Prefix != "" && !isName(s.Prefix) {
		return &ArgError{Arg: "IdentifySettings.Prefix", Value: strconv.Quote(s.Prefix), Want: "letters, digits or underscores, starting with a letter or underscore (it starts every coefficient name)"}
	}
	if !(s.Penalty >= 0) || s.Penalty-s.Penalty != 0 {
		return &ArgError{Arg: "IdentifySettings.Penalty", Value: strconv.FormatFloat(s.Penalty, 'g', -1, 64), Want: "finite, >= 0 (zero means the default 2)"}
	}
	if !(s.MinFraction < 1) {
		return &ArgError{Arg: "IdentifySettings.MinFraction", Value: strconv.FormatFloat(s.MinFraction, 'g', -1, 64), Want: "below 1 (zero means the default 0.1, negative no bound)"}
	}
	if d := s.InputDiff; d != nil {
		ok := len(d) > 0 && d[0] == 1
		for _, v := range d {
			ok = ok && v-v == 0
		}
		if !ok {
			return &ArgError{Arg: "IdentifySettings.InputDiff", Value: fmt.Sprint(d), Want: "finite coefficients with constant term 1"}
		}
	}
	return nil
}

// Validate checks every field of s (nil is the defaults) and returns an
// *ArgError naming the first bad field: Lags or MaxIter negative (zero
// means the default), a name given twice in Names. ARP accepts every
// value (negative is documented: no autoregressive noise); Output and
// empty Names entries (the default name) accept every value.
// DistributedLag calls it first; Lags, ARP and the number of Names
// against the data are checked there.
func (s *DistributedLagSettings) Validate() error {
	if s == nil {
		return nil
	}
	if s.Lags < 0 {
		return &ArgError{Arg: "DistributedLagSettings.Lags", Value: strconv.Itoa(s.Lags), Want: ">= 0 (zero means the default)"}
	}
	if s.MaxIter < 0 {
		return &ArgError{Arg: "DistributedLagSettings.MaxIter", Value: strconv.Itoa(s.MaxIter), Want: ">= 0 (zero means the default 50)"}
	}
	seen := map[string]bool{}
	for _, nm := range s.Names {
		if nm != "" && seen[nm] {
			return &ArgError{Arg: "DistributedLagSettings.Names", Value: strconv.Quote(nm) + " twice", Want: "one name per input"}
		}
		seen[nm] = true
	}
	return nil
}

// specWords are the reserved words of the spec language (package parse),
// which cannot name a series.
var specWords = map[string]bool{"B": true, "a": true, "AR": true, "MA": true, "ARMA": true, "where": true, "every": true}

// isName reports whether s is a name of the spec language: an ASCII
// letter or underscore, then letters, digits or underscores.
func isName(s string) bool {
	for i := 0; i < len(s); i++ {
		c := s[i]
		letter := 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z' || c == '_'
		if !letter && (i == 0 || c < '0' || c > '9') {
			return false
		}
	}
	return s != ""
}
