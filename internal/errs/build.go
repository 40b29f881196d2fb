package errs

import (
	"strconv"
	"strings"
)

// The constructors below build the shapes as the packages of the
// library report them; Op is left empty for the exported function to
// set (SetOp).

// Series returns a *SeriesError of the given kind for the series named.
func Series(series string, kind error, have, need int, detail string) error {
	return &SeriesError{Series: series, Kind: kind, Have: have, Need: need, Detail: detail}
}

// Model returns a *ModelError for the part named.
func Model(part, problem string) error {
	return &ModelError{Part: part, Problem: problem}
}

// Setting returns a *SettingError for the setting named.
func Setting(setting, value, rule string) error {
	return &SettingError{Setting: setting, Value: value, Rule: rule}
}

// Num formats a number for a message in the fewest digits that read
// back to it ('g', -1).
func Num(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// UnknownInput reports a settings map keyed by input name (such as
// ForecastSettings.Future or Settings.InputDiff) holding a name that is
// not an input, as a *SeriesError of kind ErrName naming the map and
// the inputs there are. It usually means a misspelt name, which would
// otherwise leave the input to its default silently.
func UnknownInput(setting, name string, inputs []string) error {
	q := make([]string, len(inputs))
	for i, s := range inputs {
		q[i] = strconv.Quote(s)
	}
	have := "there are no inputs"
	if len(q) > 0 {
		have = "the inputs are " + strings.Join(q, ", ")
	}
	return Series(name, ErrName, 0, 0, "named in "+setting+", it is not an input ("+have+"); check the spelling")
}

// OrderBound applies the settings rule to the bound m of an order
// search: zero means def, a negative value means order zero only.
func OrderBound(m, def int) int {
	switch {
	case m == 0:
		return def
	case m < 0:
		return 0
	}
	return m
}

// First returns the first non-nil error of checks, or nil: the field
// checks of a settings struct, written in the order of its fields, so
// that the first field that breaks its rule is the one reported.
func First(checks ...error) error {
	for _, err := range checks {
		if err != nil {
			return err
		}
	}
	return nil
}
