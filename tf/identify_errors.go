package tf

import (
	"fmt"
	"math"
	"strconv"

	"github.com/backshift/backshift/arma"
)

// InputListError reports a list of inputs given to Identify that cannot
// be used: Name is the entry at fault and Problem says why (listed
// twice, the output itself, empty).
type InputListError struct {
	Name    string
	Problem string
}

// Error describes the problem in one line.
func (e *InputListError) Error() string {
	return fmt.Sprintf("tf: Identify: inputs: %q %s", e.Name, e.Problem)
}

// SeriesNameError reports a series name given to Identify that a model
// spec cannot hold (the candidates print as specs and are read back by
// package parse): Role is "output" or "input".
type SeriesNameError struct {
	Name string
	Role string
}

// Error describes the problem and the fix in one line.
func (e *SeriesNameError) Error() string {
	return fmt.Sprintf("tf: Identify: %s series name %q cannot be written in a model spec: "+
		"use an ASCII letter or underscore, then letters, digits or underscores, not one of B, a, AR, MA, ARMA, where, every (rename the series)", e.Role, e.Name)
}

// ScoreError is the Err of a Candidate whose fit succeeded but whose
// ranking criterion (BIC, or AIC) is not a finite number, which would
// otherwise rank it first (-Inf) or anywhere (NaN): typically a sum of
// squares of zero, a model that reproduces the output exactly.
type ScoreError struct {
	Criterion string
	Value     float64
}

// Error describes the problem in one line.
func (e *ScoreError) Error() string {
	return fmt.Sprintf("tf: Identify: the candidate's %s is %v, not a finite number (a zero or overflowing sum of squares); it is not ranked", e.Criterion, e.Value)
}

// PanicError is the Err of a Candidate whose fit or check panicked: a
// fault of the library, caught at the boundary of the goroutine that ran
// it so that the caller's process survives. Stage says what was being
// done and Value is what the panic carried. Please report it.
type PanicError struct {
	Stage string
	Value any
}

// Error describes the problem in one line.
func (e *PanicError) Error() string {
	return fmt.Sprintf("tf: Identify: internal error while %s: %v (a library fault; please report it)", e.Stage, e.Value)
}

// validate reports a bad setting of Identify as an *ArgError naming the
// field (or an *UnknownInputError for an InputDiff entry that is not an
// input). The rule: zero means the default for every number; a negative
// count (MaxLag, Forms, NoiseOrders, MaxCandidates, Workers) is an
// error, while a negative order bound (MaxR, MaxS, MaxP, MaxQ) means
// order zero only, as in packages ccf and prewhiten; MaxP and MaxQ are
// at most arma.MaxLag. A differencing
// operator must have finite coefficients, constant term 1 and a degree
// below half the record.
func (s *IdentifySettings) validate(inputs []string, n int) error {
	for _, c := range []struct {
		name string
		v    int
	}{{"MaxLag", s.MaxLag}, {"Forms", s.Forms}, {"NoiseOrders", s.NoiseOrders}, {"MaxCandidates", s.MaxCandidates}, {"Workers", s.Workers}} {
		if c.v < 0 {
			return &ArgError{Arg: "IdentifySettings." + c.name, Value: float64(c.v), Rule: "must be zero (the default) or positive"}
		}
	}
	for _, c := range []struct {
		name string
		v    int
	}{{"MaxP", s.MaxP}, {"MaxQ", s.MaxQ}} {
		if c.v > arma.MaxLag {
			return &ArgError{Arg: "IdentifySettings." + c.name, Value: float64(c.v), Rule: "must be at most " + strconv.Itoa(arma.MaxLag) + " (arma.MaxLag)"}
		}
	}
	diff := func(arg string, c []float64) error {
		for k, v := range c {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return &ArgError{Arg: arg + "[" + strconv.Itoa(k) + "]", Value: v, Rule: "a differencing coefficient must be a finite number"}
			}
		}
		if len(c) > 0 && c[0] != 1 {
			return &ArgError{Arg: arg + "[0]", Value: c[0], Rule: "the constant term of a differencing operator must be 1, as in {1, -1} for 1 - B"}
		}
		if len(c) > 1 && 2*(len(c)-1) >= n {
			return &ArgError{Arg: arg, Value: float64(len(c) - 1), Rule: "the degree of the differencing must be below half the record (" + strconv.Itoa(n) + " samples)"}
		}
		return nil
	}
	if err := diff("IdentifySettings.OutputDiff", s.OutputDiff); err != nil {
		return err
	}
	known := map[string]bool{}
	for _, in := range inputs {
		known[in] = true
	}
	for _, name := range fcSortedKeys(s.InputDiff) {
		if !known[name] {
			return &UnknownInputError{Setting: "IdentifySettings.InputDiff", Name: name, Inputs: inputs}
		}
		if err := diff("IdentifySettings.InputDiff["+strconv.Quote(name)+"]", s.InputDiff[name]); err != nil {
			return err
		}
	}
	if s.Check != nil {
		if err := s.Check.validate(); err != nil {
			if ae, ok := err.(*ArgError); ok {
				c := *ae
				c.Arg = "IdentifySettings.Check." + ae.Arg[len("CheckSettings."):]
				return &c
			}
			return err
		}
	}
	return nil
}
