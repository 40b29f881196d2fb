package arma

import (
	"errors"
)

// Helpers reading the Params of a Result as parallel slices, for the
// tests written against the values.

func names(r *Result) []string {
	out := make([]string, len(r.Params))
	for i, p := range r.Params {
		out[i] = p.Name
	}
	return out
}

func ests(r *Result) []float64 {
	out := make([]float64, len(r.Params))
	for i, p := range r.Params {
		out[i] = p.Value
	}
	return out
}

func ses(r *Result) []float64 {
	out := make([]float64, len(r.Params))
	for i, p := range r.Params {
		out[i] = p.SE
	}
	return out
}

// kindOf returns the kind of the library (ErrSample ... ErrInternal) that
// err matches, nil when it matches none.
func kindOf(err error) error {
	for _, k := range []error{ErrSample, ErrShort, ErrConstant, ErrLength, ErrSetting, ErrModel, ErrConvergence, ErrOverflow, ErrInternal} {
		if errors.Is(err, k) {
			return k
		}
	}
	return nil
}
