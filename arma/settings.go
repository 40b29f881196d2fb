package arma

import (
	"math"
	"strconv"
)

// Validate checks every field of o on its own (nil is the defaults) and
// returns a typed error naming the first bad field: a *SettingError
// (Setting "FitSettings.<field>") for an unknown Constant rule, regressor
// columns of unequal lengths, RegressorNames not one per regressor,
// empty, repeated or "c", a NaN or infinite Held or StartValues value, a
// negative First or MaxIter, and Tol outside [0, 1); a *SampleError
// naming the regressor (its RegressorNames entry or "x1", "x2", ...) and
// the index for a NaN, infinite or too large regressor sample. Zero is
// the default of every number. Name and AllowNonInvertible accept every
// value. Fit, FitNoise and Select call it first; what depends on the
// series and the model (the regressors' length against the series,
// parameter names in Held and StartValues, First against the AR degree)
// is checked there.
func (o *FitSettings) Validate() (err error) {
	defer withOp("arma.FitSettings.Validate", &err)
	return o.validate()
}

func (o *FitSettings) validate() error {
	if o == nil {
		return nil
	}
	if o.Constant < ConstantUnlessDifferenced || o.Constant > ConstantFree {
		return settingErr("FitSettings.Constant", itoa(int(o.Constant)), "unknown ConstantRule; use ConstantUnlessDifferenced (the default), ConstantZero or ConstantFree")
	}
	for k, x := range o.Regressors {
		if len(x) != len(o.Regressors[0]) {
			return settingErr("FitSettings.Regressors", "column "+xName(*o, k)+" of "+itoa(len(x))+" samples", "every column needs the series' length, and "+xName(*o, 0)+" has "+itoa(len(o.Regressors[0])))
		}
		if err := checkFinite(xName(*o, k), x); err != nil {
			return err
		}
	}
	if len(o.RegressorNames) != 0 {
		if len(o.RegressorNames) != len(o.Regressors) {
			return settingErr("FitSettings.RegressorNames", itoa(len(o.RegressorNames))+" names", "give one name per regressor column ("+itoa(len(o.Regressors))+")")
		}
		seen := map[string]bool{}
		for _, nm := range o.RegressorNames {
			switch {
			case nm == "":
				return settingErr("FitSettings.RegressorNames", `""`, "an empty name; name every regressor or none")
			case nm == "c":
				return settingErr("FitSettings.RegressorNames", `"c"`, "is reserved for the constant c")
			case seen[nm]:
				return settingErr("FitSettings.RegressorNames", strconv.Quote(nm), "used twice")
			}
			seen[nm] = true
		}
	}
	for _, m := range []struct {
		field string
		vals  map[string]float64
	}{{"FitSettings.Held", o.Held}, {"FitSettings.StartValues", o.StartValues}} {
		for nm, v := range m.vals {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return settingErr(m.field+"["+strconv.Quote(nm)+"]", strconv.FormatFloat(v, 'g', -1, 64), "must be finite")
			}
		}
	}
	if o.Method < LeastSquares || o.Method > ExactML {
		return settingErr("FitSettings.Method", itoa(int(o.Method)), "unknown Method; use LeastSquares (the default) or ExactML")
	}
	if o.First < 0 {
		return settingErr("FitSettings.First", itoa(o.First), "must not be negative (zero means the default)")
	}
	if o.MaxIter < 0 {
		return settingErr("FitSettings.MaxIter", itoa(o.MaxIter), "must not be negative (zero means 500)")
	}
	if !(o.Tol >= 0 && o.Tol < 1) {
		return settingErr("FitSettings.Tol", strconv.FormatFloat(o.Tol, 'g', -1, 64), "must be in [0, 1) (zero means 1e-14)")
	}
	return nil
}

// Validate checks every field of s on its own (nil is the defaults) and
// returns a typed error naming the first bad field: a *SettingError
// (Setting "SimSettings.BurnIn") for a burn-in above MaxSamples (a
// negative burn-in is documented: none), and a *SampleError (Series
// "innovations", with the index) for a NaN or infinite innovation.
// Seed1 and Seed2 accept every value. Simulate calls it first; the
// innovations' length against n is checked there.
func (s *SimSettings) Validate() (err error) {
	defer withOp("arma.SimSettings.Validate", &err)
	return s.validate()
}

func (s *SimSettings) validate() error {
	if s == nil {
		return nil
	}
	if s.BurnIn > MaxSamples {
		return settingErr("SimSettings.BurnIn", itoa(s.BurnIn), "above MaxSamples = "+itoa(MaxSamples))
	}
	if s.Innovations != nil {
		if err := checkFinite("innovations", s.Innovations); err != nil {
			return err
		}
	}
	return nil
}

// Validate checks every field of g on its own and returns a
// *SettingError naming the first bad field: a negative MaxP, MaxQ, D,
// SP, SD, SQ, Period or Workers (zero Workers is the default), a seasonal
// part without Period >= 2, a degree above MaxLag, an unknown Criterion.
// Select calls it first.
func (g Grid) Validate() (err error) {
	defer withOp("arma.Grid.Validate", &err)
	return g.validate()
}

func (g Grid) validate() error {
	for _, f := range []struct {
		name string
		v    int
	}{{"Grid.MaxP", g.MaxP}, {"Grid.MaxQ", g.MaxQ}, {"Grid.D", g.D}, {"Grid.SP", g.SP}, {"Grid.SD", g.SD}, {"Grid.SQ", g.SQ}, {"Grid.Period", g.Period}, {"Grid.Workers", g.Workers}} {
		if f.v < 0 {
			return settingErr(f.name, itoa(f.v), "must not be negative")
		}
	}
	if g.Criterion < ByBIC || g.Criterion > ByAIC {
		return settingErr("Grid.Criterion", itoa(int(g.Criterion)), "unknown Criterion; use ByBIC (the default), ByAICc or ByAIC")
	}
	top := Order{P: g.MaxP, D: g.D, Q: g.MaxQ, SP: g.SP, SD: g.SD, SQ: g.SQ, Period: g.Period}
	if err := top.validate(); err != nil {
		e := err.(*SettingError)
		return settingErr("Grid", e.Value, e.Rule)
	}
	return nil
}
