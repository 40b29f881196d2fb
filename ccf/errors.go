package ccf

import (
	"fmt"
	"strconv"
	"strings"
)

// The error types below mirror prewhiten's on purpose: each package's
// errors carry its own message prefix and are distinct types for
// errors.As, and DESIGN.md keeps ccf and prewhiten independent.

// LengthError reports two series that must have equal lengths but do not.
type LengthError struct {
	// Names and Lens are the two series' names and lengths.
	Names [2]string
	Lens  [2]int
}

// Error describes the problem in one line, naming the series and values involved.
func (e *LengthError) Error() string {
	return fmt.Sprintf("ccf: series %q has %d samples but %q has %d; they must be of equal length",
		e.Names[0], e.Lens[0], e.Names[1], e.Lens[1])
}

// ShortError reports a series too short for what was asked: Len samples
// where at least Need are required, for the reason given in Why.
type ShortError struct {
	Name string
	Len  int
	Need int
	Why  string
}

// Error describes the problem in one line, naming the series and values involved.
func (e *ShortError) Error() string {
	return fmt.Sprintf("ccf: series %q has %d samples, need at least %d %s", e.Name, e.Len, e.Need, e.Why)
}

// ConstantError reports a series with zero variance (all samples equal to
// Value), whose correlation with anything is undefined. After, when not
// empty, says the series is constant only after a filter (ImpulseWeights'
// filtered output: the series given was then constant, or a trend that the
// filter's differencing removed); Value is then rounding noise and not
// printed.
type ConstantError struct {
	Name  string
	Value float64
	After string
}

// Error describes the problem in one line, naming the series and values involved.
func (e *ConstantError) Error() string {
	if e.After != "" {
		return fmt.Sprintf("ccf: series %q is constant after %s (the series itself is constant, or only a trend that the filter's differencing removes), its correlations are undefined", e.Name, e.After)
	}
	return fmt.Sprintf("ccf: series %q is constant (every sample is %s), its correlations are undefined", e.Name, strconv.FormatFloat(e.Value, 'g', 6, 64))
}

// ValueError reports a NaN or infinite sample, or a value outside what
// the series allows (a standard error that is not positive): series Name
// at Index (0 = oldest sample) holds Value.
type ValueError struct {
	Name  string
	Index int
	Value float64
	// Want, when not empty, says what the series allows ("a positive
	// finite number"); it is empty for a NaN or infinite sample.
	Want string
}

// Error describes the problem in one line, naming the series and values involved.
func (e *ValueError) Error() string {
	if e.Want != "" {
		return fmt.Sprintf("ccf: series %q has %v at index %d, want %s", e.Name, e.Value, e.Index, e.Want)
	}
	return fmt.Sprintf("ccf: series %q has %v at index %d", e.Name, e.Value, e.Index)
}

// ArgError reports a setting or argument outside its valid range, such as a
// negative number of lags or a significance level outside (0, 1).
type ArgError struct {
	// Arg names the argument or settings field.
	Arg string
	// Value is the offending value as text.
	Value string
	// Want says what is allowed.
	Want string
}

// Error describes the problem in one line, naming the series and values involved.
func (e *ArgError) Error() string {
	return fmt.Sprintf("ccf: %s = %s, want %s", e.Arg, e.Value, e.Want)
}

// NoResponseError is returned by identification when no non-negative lag
// up to MaxLag carries a significant weight at the level used: the data
// show no effect of the input on the output that the method can find.
type NoResponseError struct {
	Input  string
	MaxLag int
	Level  float64
	// Largest is the largest |weight / standard error| seen, and Lag
	// where it occurred.
	Largest float64
	Lag     int
}

// Error describes the problem in one line, naming the series and values involved.
func (e *NoResponseError) Error() string {
	return fmt.Sprintf("ccf: no significant response of the output to input %q at lags 0..%d (level %g; largest |t| = %.2f at lag %d)",
		e.Input, e.MaxLag, e.Level, e.Largest, e.Lag)
}

// SingularError is returned by DistributedLag when the regression matrix
// is rank deficient, for example when one input is an exact linear
// function of the lags of another.
type SingularError struct {
	// Inputs names the inputs of the regression.
	Inputs []string
}

// Error describes the problem in one line, naming the series and values involved.
func (e *SingularError) Error() string {
	return fmt.Sprintf("ccf: the distributed-lag regression on inputs %s is singular (an input is a linear combination of the lags of the others)",
		strings.Join(e.Inputs, ", "))
}

// checkSeries returns a *ValueError for the first NaN or infinite sample.
func checkSeries(name string, x []float64) error {
	for i, v := range x {
		if v-v != 0 { // NaN or +-Inf
			return &ValueError{Name: name, Index: i, Value: v}
		}
	}
	return nil
}
