package arma

import (
	"math"
	"strconv"
)

// Validate checks every field of o on its own (nil is the defaults) and
// returns a typed error naming the first bad field: an *ArgError (Arg
// "Options.<field>") for an unknown Mean mode, regressor columns of
// unequal lengths, XNames not one per regressor, empty, repeated or
// "mean", a NaN or infinite Fixed or Init value, a negative Start or
// MaxIter, and Tol outside [0, 1); a *DataError naming the regressor
// (its XNames entry or "x1", "x2", ...) and the index for a NaN,
// infinite or too large regressor sample. Zero is the default of every
// number. Name and AllowNonInvertible accept every value. Fit, FitNoise
// and Select call it first; what depends on the series and the model
// (the regressors' length against the series, parameter names in Fixed
// and Init, Start against the AR degree) is checked there.
func (o *Options) Validate() error {
	if o == nil {
		return nil
	}
	if o.Mean < MeanAuto || o.Mean > MeanFree {
		return &ArgError{Arg: "Options.Mean", Msg: "unknown MeanMode " + itoa(int(o.Mean)) + "; use MeanAuto, MeanNone or MeanFree"}
	}
	for k, x := range o.X {
		if len(x) != len(o.X[0]) {
			return &ArgError{Arg: "Options.X", Msg: "regressor " + xName(*o, k) + " has " + itoa(len(x)) + " samples, " + xName(*o, 0) + " has " + itoa(len(o.X[0])) + "; every column needs the series' length"}
		}
		if err := checkFinite(xName(*o, k), x); err != nil {
			return err
		}
	}
	if len(o.XNames) != 0 {
		if len(o.XNames) != len(o.X) {
			return &ArgError{Arg: "Options.XNames", Msg: itoa(len(o.XNames)) + " names for " + itoa(len(o.X)) + " regressors; give one name per column of X"}
		}
		seen := map[string]bool{}
		for _, nm := range o.XNames {
			switch {
			case nm == "":
				return &ArgError{Arg: "Options.XNames", Msg: "an empty name; name every regressor or none"}
			case nm == "mean":
				return &ArgError{Arg: "Options.XNames", Msg: `"mean" is reserved for the mean parameter`}
			case seen[nm]:
				return &ArgError{Arg: "Options.XNames", Msg: "name " + strconv.Quote(nm) + " used twice"}
			}
			seen[nm] = true
		}
	}
	for _, m := range []struct {
		field string
		vals  map[string]float64
	}{{"Options.Fixed", o.Fixed}, {"Options.Init", o.Init}} {
		for nm, v := range m.vals {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return &ArgError{Arg: m.field, Msg: "value of " + nm + " is " + strconv.FormatFloat(v, 'g', -1, 64) + ", must be finite"}
			}
		}
	}
	if o.Start < 0 {
		return &ArgError{Arg: "Options.Start", Msg: "is " + itoa(o.Start) + ", must not be negative (zero means the default)"}
	}
	if o.MaxIter < 0 {
		return &ArgError{Arg: "Options.MaxIter", Msg: "is " + itoa(o.MaxIter) + ", must not be negative (zero means the default)"}
	}
	if !(o.Tol >= 0 && o.Tol < 1) {
		return &ArgError{Arg: "Options.Tol", Msg: "is " + strconv.FormatFloat(o.Tol, 'g', -1, 64) + ", must be in [0, 1) (zero means the default)"}
	}
	return nil
}

// Validate checks every field of s on its own (nil is the defaults) and
// returns a typed error naming the first bad field: an *ArgError (Arg
// "SimSettings.BurnIn") for a burn-in above MaxSamples (a negative
// burn-in is documented: none), and a *DataError (Series
// "innovations", with the index) for a NaN or infinite innovation.
// Seed1 and Seed2 accept every value. Simulate calls it first; the
// innovations' length against n is checked there.
func (s *SimSettings) Validate() error {
	if s == nil {
		return nil
	}
	if s.BurnIn > MaxSamples {
		return &ArgError{Arg: "SimSettings.BurnIn", Msg: "is " + itoa(s.BurnIn) + ", above MaxSamples = " + itoa(MaxSamples)}
	}
	if s.Innovations != nil {
		if err := checkFinite("innovations", s.Innovations); err != nil {
			return err
		}
	}
	return nil
}

// Validate checks every field of g on its own and returns an *ArgError
// naming the first bad field: a negative MaxP, MaxQ, D, SP, SD, SQ,
// Period or Workers (zero Workers is the default), a seasonal part without Period
// >= 2, a degree above MaxLag, an unknown Criterion. Select calls it
// first.
func (g Grid) Validate() error {
	for _, f := range []struct {
		name string
		v    int
	}{{"Grid.MaxP", g.MaxP}, {"Grid.MaxQ", g.MaxQ}, {"Grid.D", g.D}, {"Grid.SP", g.SP}, {"Grid.SD", g.SD}, {"Grid.SQ", g.SQ}, {"Grid.Period", g.Period}, {"Grid.Workers", g.Workers}} {
		if f.v < 0 {
			return &ArgError{Arg: f.name, Msg: "is " + itoa(f.v) + ", must not be negative"}
		}
	}
	if g.Criterion < ByAICc || g.Criterion > ByAIC {
		return &ArgError{Arg: "Grid.Criterion", Msg: "unknown Criterion " + itoa(int(g.Criterion)) + "; use ByAICc, ByBIC or ByAIC"}
	}
	top := Order{P: g.MaxP, D: g.D, Q: g.MaxQ, SP: g.SP, SD: g.SD, SQ: g.SQ, Period: g.Period}
	if err := top.validate(); err != nil {
		e := err.(*ArgError)
		return &ArgError{Arg: "Grid", Msg: e.Msg}
	}
	return nil
}
