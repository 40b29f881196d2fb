package arma

import (
	"fmt"
	"math"
	"strconv"
)

// DataError reports a sample that is NaN or infinite. Index is the
// 0-based position in the series; Series names it when the caller gave a
// name (Options.Name), and is empty otherwise.
type DataError struct {
	Series string
	Index  int
	Value  float64
}

// Error implements the error interface.
func (e *DataError) Error() string {
	name := e.Series
	if name == "" {
		name = "series"
	}
	return fmt.Sprintf("arma: %s sample %d is %v", name, e.Index, e.Value)
}

// ShortError reports a series too short for the requested computation:
// N samples were given, Need are required, What says for what.
type ShortError struct {
	Series string
	N      int
	Need   int
	What   string
}

// Error implements the error interface.
func (e *ShortError) Error() string {
	name := e.Series
	if name == "" {
		name = "series"
	}
	return fmt.Sprintf("arma: %s has %d samples, %s needs at least %d", name, e.N, e.What, e.Need)
}

// ConstantError reports a series whose samples are all equal (zero
// variance after removing the mean), so that correlations and fits are
// undefined.
type ConstantError struct {
	Series string
	N      int
}

// Error implements the error interface.
func (e *ConstantError) Error() string {
	name := e.Series
	if name == "" {
		name = "series"
	}
	return fmt.Sprintf("arma: %s is constant over its %d samples", name, e.N)
}

// ArgError reports an invalid argument that depends on the caller's
// configuration rather than the data: a negative order or lag, an
// unknown parameter name, a regressor of the wrong length.
type ArgError struct {
	Arg string
	Msg string
}

// Error implements the error interface.
func (e *ArgError) Error() string { return fmt.Sprintf("arma: %s: %s", e.Arg, e.Msg) }

// ConvergenceError is returned by Fit together with a valid *Result when
// the optimiser stopped before convergence. The result holds the best
// point reached; Reason says why the optimiser stopped.
type ConvergenceError struct {
	Reason string
	Iter   int
}

// Error implements the error interface.
func (e *ConvergenceError) Error() string {
	return fmt.Sprintf("arma: fit not converged after %d iterations: %s", e.Iter, e.Reason)
}

// checkFinite returns a *DataError for the first NaN or infinite sample.
func checkFinite(name string, x []float64) error {
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return &DataError{Series: name, Index: i, Value: v}
		}
	}
	return nil
}

func itoa(k int) string { return strconv.Itoa(k) }
