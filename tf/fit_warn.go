package tf

import (
	"fmt"
	"math"
	"math/cmplx"
)

// WarningKind classifies a Warning.
type WarningKind int

const (
	// UnstableDenominator: an input's estimated delta(B) has a pole at
	// or outside the unit circle (|z| >= 0.999).
	UnstableDenominator WarningKind = iota + 1
	// NonStationaryNoise: the estimated phi(B) has a root at or outside
	// the unit circle in the z-plane (|z| >= 0.999).
	NonStationaryNoise
	// NonInvertibleNoise: the estimated theta(B) has a zero at or
	// outside the unit circle (|z| >= 0.999).
	NonInvertibleNoise
	// CancellingRoots: a numerator zero lies within 0.05 of a
	// denominator pole (or an MA zero of an AR root) in the z-plane, so
	// that the parameters are redundant.
	CancellingRoots
	// HighCorrelation: two estimates correlate above 0.95 in magnitude.
	HighCorrelation
	// NotConverged: the optimiser stopped without meeting a convergence
	// test (iteration limit, stall, or cancellation).
	NotConverged
	// SingularInformation: J'J is singular at the estimate, so standard
	// errors do not exist (an unidentifiable parameter).
	SingularInformation
	// StartupTransient: the residuals at the start of the sum of squares
	// are far larger than the rest, a start-up transient that the
	// pre-sample convention does not explain (an input that was not
	// settled at its first value); FitSettings.Settle or a larger
	// FitSettings.First leaves it out.
	StartupTransient
	// FewResiduals: the number of residuals is small against the number
	// of free coefficients, so the estimates and their standard errors
	// are unreliable.
	FewResiduals
	// SlowPole: an estimated input pole or noise AR root is so slow that
	// the record covers few of its time constants, so the gain and the
	// time constant are poorly determined.
	SlowPole
	// BadStandardError: a standard error is NaN, infinite or zero.
	BadStandardError
)

// Serious reports whether a warning of this kind means the estimate must
// not be trusted (for control work or forecasts): every kind except
// CancellingRoots and HighCorrelation, which point to a simpler model but
// do not make the estimates wrong.
func (k WarningKind) Serious() bool {
	return k != CancellingRoots && k != HighCorrelation
}

// Thresholds of the warnings (common practice, not from a source).
const (
	fitBoundaryZ   = 0.999
	fitCancelDist  = 0.05
	fitCorrWarning = 0.95
)

// Warning is one problem found with an Estimate: its Kind, a sentence for
// people, and the parameters or series concerned.
type Warning struct {
	Kind    WarningKind
	Message string
	Params  []string
}

// String names the kind of warning in a few words.
func (k WarningKind) String() string {
	switch k {
	case UnstableDenominator:
		return "unstable denominator"
	case NonStationaryNoise:
		return "non-stationary noise AR"
	case NonInvertibleNoise:
		return "non-invertible noise MA"
	case CancellingRoots:
		return "cancelling roots"
	case HighCorrelation:
		return "highly correlated estimates"
	case NotConverged:
		return "not converged"
	case SingularInformation:
		return "singular information matrix"
	case StartupTransient:
		return "start-up transient"
	case FewResiduals:
		return "few residuals"
	case SlowPole:
		return "pole too slow for the record"
	case BadStandardError:
		return "standard error not available"
	}
	return fmt.Sprintf("WarningKind(%d)", int(k))
}

// fitPolyNames returns the free parameter names of p.
func fitPolyNames(p Poly) []string {
	var out []string
	seen := map[string]bool{}
	p.Each(func(c *Coef) {
		if c.Free && c.Name != "" && !seen[c.Name] {
			seen[c.Name] = true
			out = append(out, c.Name)
		}
	})
	return out
}

func fitWarnings(e *Estimate, singular bool) []Warning {
	var ws []Warning
	add := func(k WarningKind, names []string, format string, args ...any) {
		ws = append(ws, Warning{Kind: k, Message: fmt.Sprintf(format, args...), Params: names})
	}
	if !e.Converged {
		add(NotConverged, nil, "the fit stopped before converging: %s", e.Reason)
	}
	if singular {
		add(SingularInformation, nil, "J'J is singular at the estimate; standard errors are not available")
	}
	cancel := func(zeros, poles []complex128) (complex128, complex128, bool) {
		for _, z := range zeros {
			for _, p := range poles {
				if cmplx.Abs(z-p) < fitCancelDist {
					return z, p, true
				}
			}
		}
		return 0, 0, false
	}
	for _, in := range e.Model.Inputs {
		den := in.Den.Coeffs()
		poles := fitZRoots(den)
		if m := fitMaxZ(den); m >= fitBoundaryZ {
			add(UnstableDenominator, fitPolyNames(in.Den), "input %q: the denominator has a pole with |z| = %.4g, at or outside the unit circle", in.Series, m)
		}
		zeros := fitZRoots(in.Num.Coeffs())
		if z, p, ok := cancel(zeros, poles); ok {
			add(CancellingRoots, append(fitPolyNames(in.Num), fitPolyNames(in.Den)...),
				"input %q: numerator zero %s nearly cancels pole %s; a lower order may do", in.Series, fitFmtC(z), fitFmtC(p))
		}
	}
	if e.Model.Noise != nil {
		ar, ma := e.Model.Noise.AR.Coeffs(), e.Model.Noise.MA.Coeffs()
		if m := fitMaxZ(ar); m >= fitBoundaryZ {
			add(NonStationaryNoise, fitPolyNames(e.Model.Noise.AR), "noise AR has a root with |z| = %.4g, at or outside the unit circle", m)
		}
		if m := fitMaxZ(ma); m >= fitBoundaryZ {
			add(NonInvertibleNoise, fitPolyNames(e.Model.Noise.MA), "noise MA has a zero with |z| = %.4g, at or outside the unit circle", m)
		}
		if z, p, ok := cancel(fitZRoots(ma), fitZRoots(ar)); ok {
			add(CancellingRoots, append(fitPolyNames(e.Model.Noise.MA), fitPolyNames(e.Model.Noise.AR)...),
				"noise MA zero %s nearly cancels AR root %s; a lower order may do", fitFmtC(z), fitFmtC(p))
		}
	}
	for i := range e.Corr {
		for j := i + 1; j < len(e.Corr); j++ {
			if c := e.Corr[i][j]; math.Abs(c) > fitCorrWarning {
				a, b := e.Params[i].Name, e.Params[j].Name
				add(HighCorrelation, []string{a, b}, "estimates of %s and %s correlate at %.3f", a, b, c)
			}
		}
	}
	return ws
}

func fitFmtC(z complex128) string {
	if math.Abs(imag(z)) < 1e-12 {
		return fmt.Sprintf("%.4g", real(z))
	}
	return fmt.Sprintf("%.4g%+.4gi", real(z), imag(z))
}
