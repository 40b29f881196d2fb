package prewhiten

import (
	"context"
	"math"
	"strconv"
	"strings"

	"github.com/backshift/backshift/arma"
)

// NoiseSettings tunes IdentifyNoise. The zero value gives the defaults.
type NoiseSettings struct {
	// MaxP and MaxQ bound the ARMA orders tried; zero means 2 each, a
	// negative value means order zero only (so MaxP -1 tries pure MA
	// models and white noise), the convention of ccf.IdentifySettings'
	// MaxR and MaxS. A negative bound is therefore not an error.
	MaxP, MaxQ int
	// Lags is the number of autocorrelations reported; zero means
	// min(24, n/4), negative is an *ArgError.
	Lags int
	// Criterion ranks the orders (arma.ByBIC by default).
	Criterion arma.Criterion
	// Name names the series in errors; empty means "noise".
	Name string
}

// Validate checks every field of s on its own (nil is the defaults)
// and returns an *ArgError naming the first bad field: MaxP or MaxQ
// above arma.MaxLag (a negative bound is documented: order zero only),
// Lags negative, an unknown Criterion. Name accepts every value.
// IdentifyNoise calls it first; Lags against the series length is
// checked there.
func (s *NoiseSettings) Validate() error {
	if s == nil {
		return nil
	}
	for _, f := range []struct {
		name string
		v    int
	}{{"NoiseSettings.MaxP", s.MaxP}, {"NoiseSettings.MaxQ", s.MaxQ}} {
		if f.v > arma.MaxLag {
			return &ArgError{Arg: f.name, Value: strconv.Itoa(f.v), Want: "at most arma.MaxLag = " + strconv.Itoa(arma.MaxLag)}
		}
	}
	if s.Lags < 0 {
		return &ArgError{Arg: "NoiseSettings.Lags", Value: strconv.Itoa(s.Lags), Want: ">= 0 (zero means the default)"}
	}
	if s.Criterion < arma.ByBIC || s.Criterion > arma.ByAIC {
		return &ArgError{Arg: "NoiseSettings.Criterion", Value: s.Criterion.String(), Want: "arma.ByAICc, arma.ByBIC or arma.ByAIC"}
	}
	return nil
}

// NoiseIdentification describes a preliminary noise series.
type NoiseIdentification struct {
	// Start is the number of leading NaN samples skipped (the noise of
	// ccf.NoiseSeries and ccf.DistributedLag starts with NaN).
	Start int
	// ACF and PACF are the sample autocorrelations and partial
	// autocorrelations (arma.ACF, arma.PACF) of the series from Start.
	ACF  arma.Correlogram
	PACF arma.Partial
	// Candidates are the ARMA(p, q) fits of arma.Select, best first.
	Candidates []arma.OrderFit
	// Best is the order of the first candidate that fitted.
	Best arma.Order
	// Term is the noise term of Best as spec text with free coefficients,
	// "(1 - theta1 B) / (1 - phi1 B) a", "1 / (1 - phi1 B) a",
	// "(1 - theta1 B) a", or "a" for white noise; Names
	// lists its coefficient names in written order and Starts their
	// start values (the fitted estimates), for Candidate.Spec-style
	// assembly (ccf.StartClause).
	Term   string
	Names  []string
	Starts map[string]float64
}

// IdentifyNoise proposes an ARMA model for a preliminary noise series
// n_t = y_t - sum v_k x_{t-k} (see ccf.NoiseSeries and ccf.DistributedLag):
// its ACF and PACF, and the orders p <= MaxP, q <= MaxQ ranked by
// arma.Select (conditional least squares, all candidates summing their
// residuals from the same index). Leading NaN samples are skipped.
//
// Errors: *ValueError for NaN/Inf after the leading NaN run, *ShortError
// for fewer than 20 samples, *ConstantError for a constant series,
// *ArgError for bad settings (NoiseSettings.Validate); a done ctx returns
// its error with the candidates fitted so far, and a fit that panicked
// (a bug, recovered on arma.Select's worker goroutine) an
// *arma.InternalError with them.
func IdentifyNoise(ctx context.Context, noise []float64, s *NoiseSettings) (*NoiseIdentification, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	var set NoiseSettings
	if s != nil {
		set = *s
	}
	name := set.Name
	if name == "" {
		name = "noise"
	}
	start := 0
	for start < len(noise) && math.IsNaN(noise[start]) {
		start++
	}
	w := noise[start:]
	if err := checkSeries(name, w); err != nil {
		e := err.(*ValueError)
		e.Index += start
		return nil, e
	}
	if len(w) < 20 {
		return nil, &ShortError{Name: name, Len: len(noise), Need: start + 20, Why: "to identify a noise model"}
	}
	if isConstant(w) {
		return nil, &ConstantError{Name: name, Value: w[0]}
	}
	maxP, maxQ := bound(set.MaxP), bound(set.MaxQ)
	lags := set.Lags
	if lags == 0 {
		lags = min(24, len(w)/4)
	}
	if lags < 1 || lags >= len(w) {
		return nil, &ArgError{Arg: "NoiseSettings.Lags", Value: strconv.Itoa(lags), Want: "in 1.." + strconv.Itoa(len(w)-1)}
	}
	id := &NoiseIdentification{Start: start}
	var err error
	if id.ACF, err = arma.ACF(w, lags); err != nil {
		return nil, err
	}
	if id.PACF, err = arma.PACF(w, lags); err != nil {
		return nil, err
	}
	id.Candidates, err = arma.Select(ctx, w, arma.Grid{MaxP: maxP, MaxQ: maxQ, Criterion: set.Criterion}, &arma.FitSettings{Name: name})
	if err != nil {
		return id, err
	}
	for _, c := range id.Candidates {
		if c.Result != nil && !math.IsInf(c.Score, 1) {
			id.Best = c.Order
			id.Term, id.Names, id.Starts = noiseText(c.Result.Model)
			return id, nil
		}
	}
	id.Term, id.Starts = "a", map[string]float64{}
	return id, nil
}

// bound returns the order bound m: 2 for zero, 0 for a negative value.
func bound(m int) int {
	switch {
	case m == 0:
		return 2
	case m < 0:
		return 0
	}
	return m
}

// noiseText writes the noise term of m with coefficients named phi1..,
// theta1.. (Box-Jenkins signs, as arma.Model.Noise).
func noiseText(m arma.Model) (string, []string, map[string]float64) {
	starts := map[string]float64{}
	var names []string
	part := func(c []float64, name string) string {
		if len(c) == 0 {
			return ""
		}
		var sb strings.Builder
		sb.WriteString("(1")
		for k, v := range c {
			n := name + strconv.Itoa(k+1)
			sb.WriteString(" - " + n + " B")
			if k > 0 {
				sb.WriteString("^" + strconv.Itoa(k+1))
			}
			names = append(names, n)
			starts[n] = v
		}
		sb.WriteString(")")
		return sb.String()
	}
	ma := part(m.MA, "theta")
	ar := part(m.AR, "phi")
	switch {
	case ma == "" && ar == "":
		return "a", names, starts
	case ar == "":
		return ma + " a", names, starts
	case ma == "":
		return "1 / " + ar + " a", names, starts
	}
	return ma + " / " + ar + " a", names, starts
}
