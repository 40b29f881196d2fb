package identify

import (
	"maps"
	"math"
	"slices"
	"strconv"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
)

// specNameErr reports a series name given to Candidates that a model spec
// cannot hold (the candidates print as specs and are read back by
// package parse), as a *SeriesError of kind ErrName: role is "output"
// or "input".
func specNameErr(name, role string) error {
	return errs.Series(name, errs.ErrName, 0, 0, "the "+role+" series name cannot be written in a model spec: "+
		"use an ASCII letter or underscore, then letters, digits or underscores, not one of B, a, AR, MA, ARMA, where, every (rename the series)")
}

// scoreErr is the Err of a candidate whose fit succeeded but whose
// ranking criterion (BIC, or AIC) is not a finite number, which would
// otherwise rank it first (-Inf) or anywhere (NaN): typically a sum of
// squares of zero, a model that reproduces the output exactly. It is a
// *ModelError.
func scoreErr(label, criterion string, v float64) error {
	return errs.Model("candidate "+label, "its "+criterion+" is "+errs.Num(v)+", not a finite number (a zero or overflowing sum of squares); it is not ranked")
}

// Validate checks the settings by the library's settings rule and the
// rules of Settings' fields (see its doc), and returns a
// *SettingError naming the field ("Settings.MaxLag",
// "Settings.Fit.MaxIter"), or nil. What needs the data (an
// InputDiff entry that is not an input, a differencing degree against
// the record's length) is checked by Candidates.
func (s Settings) Validate() (err error) {
	defer setOp("identify.Settings.Validate", &err)
	return s.validate(nil, -1)
}

// validate reports a bad setting of Candidates as a *SettingError naming
// the field (or a *SeriesError of kind ErrName for an InputDiff entry
// that is not an input). The rule: zero means the default for every number; a negative
// count (MaxLag, Forms, NoiseOrders, MaxCandidates, Workers) is an
// error, while a negative order bound (MaxR, MaxS, MaxP, MaxQ) means
// order zero only, as in packages ccf and prewhiten; MaxP and MaxQ are
// at most arma.MaxLag. A differencing
// operator must have finite coefficients, constant term 1 and a degree
// below half the record.
func (s *Settings) validate(inputs []string, n int) error {
	for _, err := range []error{
		errs.Count("", "Settings.MaxLag", s.MaxLag, "0 means max(10, min(36, n/6))"),
		errs.Count("", "Settings.Forms", s.Forms, "0 means 2"),
		errs.Count("", "Settings.NoiseOrders", s.NoiseOrders, "0 means 2"),
		errs.Count("", "Settings.MaxCandidates", s.MaxCandidates, "0 means 24"),
		errs.Count("", "Settings.Workers", s.Workers, "0 means GOMAXPROCS"),
	} {
		if err != nil {
			return err
		}
	}
	for _, c := range []struct {
		name string
		v    int
	}{{"MaxP", s.MaxP}, {"MaxQ", s.MaxQ}} {
		if c.v > arma.MaxLag {
			return errs.Setting("Settings."+c.name, strconv.Itoa(c.v), "must be at most "+strconv.Itoa(arma.MaxLag)+" (arma.MaxLag); 0 means 2, a negative value order zero only")
		}
	}
	if err := checkDiffSetting("Settings.OutputDiff", s.OutputDiff, n); err != nil {
		return err
	}
	known := map[string]bool{}
	for _, in := range inputs {
		known[in] = true
	}
	for _, name := range slices.Sorted(maps.Keys(s.InputDiff)) {
		if inputs != nil && !known[name] {
			return errs.UnknownInput("Settings.InputDiff", name, inputs)
		}
		if err := checkDiffSetting("Settings.InputDiff["+strconv.Quote(name)+"]", s.InputDiff[name], n); err != nil {
			return err
		}
	}
	return s.validateNested()
}

// checkDiffSetting checks the differencing coefficients c of the setting
// arg: finite, constant term 1 and, for a record of n samples (n < 0
// when unknown), degree below n/2.
func checkDiffSetting(arg string, c []float64, n int) error {
	for k, v := range c {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return errs.Setting(arg+"["+strconv.Itoa(k)+"]", errs.Num(v), "a differencing coefficient must be a finite number")
		}
	}
	if len(c) > 0 && c[0] != 1 {
		return errs.Setting(arg+"[0]", errs.Num(c[0]), "the constant term of a differencing operator must be 1, as in {1, -1} for 1 - B")
	}
	if n >= 0 && len(c) > 1 && 2*(len(c)-1) >= n {
		return errs.Setting(arg, "degree "+strconv.Itoa(len(c)-1), "the degree of the differencing must be below half the record ("+strconv.Itoa(n)+" samples)")
	}
	return nil
}

// validateNested checks the settings of the fits and checks Candidates
// runs, naming a bad field under Settings.
func (s *Settings) validateNested() error {
	if s.Fit != nil {
		if err := s.Fit.Validate(); err != nil {
			return renameSetting(err, "Settings.", "Settings.Fit.")
		}
	}
	if s.Check != nil {
		if err := s.Check.Validate(); err != nil {
			return renameSetting(err, "CheckSettings.", "Settings.Check.")
		}
	}
	return nil
}

// renameSetting returns err, a *SettingError of nested settings, with
// the field named as the caller wrote it: the prefix from (the nested
// struct's own name) replaced by to. Other errors are returned as they
// are.
func renameSetting(err error, from, to string) error {
	if se, ok := err.(*errs.SettingError); ok {
		c := *se
		c.Setting = to + se.Setting[len(from):]
		return &c
	}
	return err
}

// setOp names the exported function op in *err's chain (errs.SetOp);
// deferred at each exported entry point.
func setOp(op string, err *error) { errs.SetOp(op, *err) }
