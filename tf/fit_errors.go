package tf

import (
	"fmt"
	"strings"
)

// FitProblem names what is wrong with the data or the model given to Fit,
// Forecast, Check or Identify.
type FitProblem int

const (
	// MissingSeries: a series the model names is not in the data.
	MissingSeries FitProblem = iota + 1
	// ExtraSeries: the data hold a series the model does not use.
	ExtraSeries
	// UnequalLengths: two series of one fit differ in length.
	UnequalLengths
	// TooFewObservations: fewer residuals than the model needs.
	TooFewObservations
	// NothingFree: the model has no free coefficient to estimate.
	NothingFree
	// FixedDifferencing: a differencing operator has a free coefficient
	// (differencing must be given as numbers).
	FixedDifferencing
	// NoOutput: the model names no output series.
	NoOutput
	// BadDenominator: a denominator or noise polynomial has a zero
	// constant term.
	BadDenominator
	// MixedFreedom: one parameter name is free in one place and held in
	// another.
	MixedFreedom
	// BadFuture: future input values for a forecast are missing, too
	// short, or not finite.
	BadFuture
	// ConstantSeries: the output is constant, or an input with free
	// coefficients never moves (constant, or constant after its
	// differencing), so that nothing can be estimated from it.
	ConstantSeries
	// ZeroResiduals: the residual sum of squares at the estimate is 0
	// (an exact fit, or samples so small that the squares of the
	// residuals underflow float64), so that sigma^2, the log-likelihood
	// and the information criteria do not exist.
	ZeroResiduals
	// Interrupted: the context was done before the fit converged; the
	// error wraps the context's error and the best point so far is
	// returned with it.
	Interrupted
	// NoSettledStart: an input without differencing whose denominator,
	// fixed as written, has a pole at z = 1 starts at a non-zero value,
	// so it cannot be taken as held at its first value before the record
	// (the default conditioning of Fit).
	NoSettledStart
	// NoStartPoint: the residuals are not finite at any start point
	// (fixed coefficients that make a filter blow up, or samples too
	// large).
	NoStartPoint
	// InternalError: a panic inside a goroutine of the fit was
	// recovered (a defect of the library, to be reported with the data
	// and model; Detail holds the panic's value).
	InternalError
)

// String describes the problem in a few words.
func (p FitProblem) String() string {
	switch p {
	case MissingSeries:
		return "series missing from the data"
	case ExtraSeries:
		return "series in the data not used by the model"
	case UnequalLengths:
		return "series lengths differ"
	case TooFewObservations:
		return "too few observations"
	case NothingFree:
		return "nothing free to estimate"
	case FixedDifferencing:
		return "differencing must be fixed numbers"
	case NoOutput:
		return "model names no output series"
	case BadDenominator:
		return "constant term of a denominator is zero"
	case MixedFreedom:
		return "parameter is free in one place and held in another"
	case BadFuture:
		return "future input values missing or too short"
	case ConstantSeries:
		return "series is constant"
	case ZeroResiduals:
		return "residual sum of squares is zero"
	case Interrupted:
		return "fit interrupted before converging"
	case NoSettledStart:
		return "input has no settled start"
	case NoStartPoint:
		return "no start point gives finite residuals"
	case InternalError:
		return "internal error in the fit (a defect of the library; please report it with the model and data)"
	}
	return fmt.Sprintf("FitProblem(%d)", int(p))
}

// FitError reports data or a model that Fit, Check, Forecast or Identify
// cannot use. Problem says what is wrong; Series names the series (or the
// parameter, for MixedFreedom and FixedDifferencing) concerned; Len and
// Want carry the facts of UnequalLengths (length of Series against the
// output's), TooFewObservations (residuals available against the number
// needed) and BadFuture (values given against needed). Non-finite samples
// are reported by *SampleError instead, with the series name and index.
type FitError struct {
	Problem FitProblem
	Series  string
	Len     int
	Want    int
	Detail  string
	// Err is the underlying error, if any (the context's error for
	// Interrupted); Unwrap returns it.
	Err error
}

// Unwrap returns the underlying error (nil for most problems), so that
// errors.Is(err, context.Canceled) holds for a cancelled fit.
func (e *FitError) Unwrap() error { return e.Err }

// Error describes the problem in one line.
func (e *FitError) Error() string {
	var b strings.Builder
	b.WriteString("tf: ")
	b.WriteString(e.Problem.String())
	if e.Series != "" {
		fmt.Fprintf(&b, ": %q", e.Series)
	}
	switch e.Problem {
	case UnequalLengths:
		fmt.Fprintf(&b, " has %d samples, the output %d", e.Len, e.Want)
	case TooFewObservations:
		fmt.Fprintf(&b, ": %d residuals, at least %d needed", e.Len, e.Want)
	case BadFuture:
		fmt.Fprintf(&b, ": %d values given, %d needed", e.Len, e.Want)
	}
	if e.Detail != "" {
		b.WriteString(" (")
		b.WriteString(e.Detail)
		b.WriteString(")")
	}
	if e.Err != nil {
		b.WriteString(": ")
		b.WriteString(e.Err.Error())
	}
	return b.String()
}
