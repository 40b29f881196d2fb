package prewhiten

import (
	"context"
	"math"
	"strconv"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
)

// NoiseSettings tunes IdentifyNoise. The zero value gives the defaults.
type NoiseSettings struct {
	// MaxP and MaxQ bound the ARMA orders tried; zero means 2 each, a
	// negative value means order zero only (so MaxP -1 tries pure MA
	// models and white noise), the convention of ccf.IdentifySettings'
	// MaxR and MaxS. A negative bound is therefore not an error.
	MaxP, MaxQ int
	// Lags is the number of autocorrelations reported; zero means
	// min(24, n/4), negative is a *SettingError.
	Lags int
	// Criterion ranks the orders (arma.ByBIC by default).
	Criterion arma.Criterion
	// Name names the series in errors; empty means "noise".
	Name string
}

// Validate checks every field of s on its own (nil is the defaults)
// and returns a *SettingError naming the first bad field: MaxP or MaxQ
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
			return settingError(f.name, strconv.Itoa(f.v), "must be at most arma.MaxLag = "+strconv.Itoa(arma.MaxLag)+" (0 means 2, a negative value order zero only)")
		}
	}
	if err := errs.Count("", "NoiseSettings.Lags", s.Lags, "0 means min(24, n/4)"); err != nil {
		return err
	}
	if s.Criterion < arma.ByBIC || s.Criterion > arma.ByAIC {
		return settingError("NoiseSettings.Criterion", s.Criterion.String(), "must be arma.ByBIC (the default), arma.ByAICc or arma.ByAIC")
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
	// Best is the order of the first candidate that fitted (white
	// noise, the zero Order, when none did); its fitted coefficients
	// are that candidate's Result.Model.AR and MA. The result holds
	// numbers only: package tf turns an order into a noise model with
	// named coefficients.
	Best arma.Order
}

// IdentifyNoise proposes an ARMA model for a preliminary noise series
// n_t = y_t - sum v_k x_{t-k} (see ccf.NoiseSeries and ccf.DistributedLag):
// its ACF and PACF, and the orders p <= MaxP, q <= MaxQ ranked by
// arma.Select (conditional least squares, all candidates summing their
// residuals from the same index). Leading NaN samples are skipped.
//
// Errors: *SampleError for NaN/Inf after the leading NaN run,
// *SeriesError for fewer than 20 samples (ErrShort) or a constant series
// (ErrConstant), *SettingError for bad settings (NoiseSettings.Validate);
// a done ctx returns
// its error with the candidates fitted so far, and a fit that panicked
// (a bug, recovered on arma.Select's worker goroutine) an
// *arma.InternalError with them.
func IdentifyNoise(ctx context.Context, noise []float64, s *NoiseSettings) (*NoiseIdentification, error) {
	r0, err := identifyNoise(ctx, noise, s)
	return r0, withOp("prewhiten.IdentifyNoise", err)
}

func identifyNoise(ctx context.Context, noise []float64, s *NoiseSettings) (*NoiseIdentification, error) {
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
		e := err.(*SampleError)
		e.Index += start
		return nil, e
	}
	if len(w) < 20 {
		return nil, shortError(name, len(noise), start+20, "to identify a noise model")
	}
	if isConstant(w) {
		return nil, constantError(name, w[0], "")
	}
	maxP, maxQ := errs.OrderBound(set.MaxP, 2), errs.OrderBound(set.MaxQ, 2)
	lags := set.Lags
	if lags == 0 {
		lags = min(24, len(w)/4)
	}
	if lags < 1 || lags >= len(w) {
		return nil, settingError("NoiseSettings.Lags", strconv.Itoa(lags), "must lie in 1.."+strconv.Itoa(len(w)-1)+" for this series (0 means min(24, n/4))")
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
			return id, nil
		}
	}
	return id, nil
}
