package arma

import (
	"math"
	"math/rand/v2"

	"github.com/backshift/backshift/internal/filter"
)

// MaxSamples bounds n plus the burn-in of Simulate: 2^26 samples are
// 512 MiB per series, and Simulate holds two. A larger request is a
// *SettingError.
const MaxSamples = 1 << 26

// SimSettings tunes Simulate. The zero value gives the defaults.
type SimSettings struct {
	// Seed1 and Seed2 seed the PCG source (math/rand/v2) of the Gaussian
	// innovations; equal seeds give equal series.
	Seed1, Seed2 uint64
	// BurnIn is the number of samples simulated and discarded before the
	// returned series, so that its stationary part starts in (very
	// nearly) its stationary distribution. The library's one meaning:
	// zero means automatic, enough draws for the noise filter's transient
	// to decay (here: for the slowest AR mode to decay by 1e-12, at least
	// 100 + the AR and MA degrees, at most 10^6); a positive value means
	// that many draws; a negative value means none (the series starts
	// from zero pre-sample values, and the AR part need not be
	// stationary).
	BurnIn int
	// Innovations, when not nil, is used as the innovation series a_t
	// (length n) instead of Gaussian draws; no burn-in is applied and
	// pre-sample values are zero. Model.Sigma2 is then ignored.
	Innovations []float64
}

// Simulate returns n samples of the ARIMA model m driven by Gaussian
// innovations of variance m.Sigma2:
//
//	phi(B)Phi(B^s) (w_t - Mean) = theta(B)Theta(B^s) a_t,
//	(1-B)^D (1-B^s)^SD y_t = w_t
//
// The stationary part w is simulated with a burn-in (see SimSettings);
// the integration of the differences starts from zero pre-sample values
// (an integrated series has no stationary distribution).
//
// Errors: *SettingError for n < 0, n plus the burn-in above MaxSamples
// and Innovations of the wrong length; *ModelError for non-finite
// coefficients and, when a burn-in is requested, an AR part that is not
// stationary (the message gives the offending roots); a *SeriesError of
// kind ErrOverflow for a simulated series that overflows float64 (the
// message gives the first sample); a *SampleError (Series "innovations",
// with the index) for a NaN or infinite innovation.
func Simulate(m Model, n int, s *SimSettings) (y []float64, err error) {
	defer withOp("arma.Simulate", &err)
	if err := s.validate(); err != nil {
		return nil, err
	}
	var set SimSettings
	if s != nil {
		set = *s
	}
	if n < 0 || n > MaxSamples {
		return nil, settingErr("n", itoa(n), "must be in 0..MaxSamples = "+itoa(MaxSamples))
	}
	if err := m.validate(); err != nil {
		return nil, err
	}
	ar, ma, diff := m.arPoly(), m.maPoly(), diffPoly(m.D, m.SD, m.Period) // orders checked by validate
	a, burn, err := innovations(m, n, set, ar, len(ma)-1)
	if err != nil {
		return nil, err
	}
	filter.Run(a, ma, ar, a)
	y = a[burn:]
	for i := range y {
		y[i] += m.Mean
	}
	if len(diff) > 1 {
		filter.Run(y, []float64{1}, diff, y)
	}
	if k := firstNonFinite(y); k >= 0 {
		return nil, &SeriesError{Series: "simulated", Kind: ErrOverflow, Detail: "the simulated series overflows at sample " + itoa(k) + " (explosive AR part or huge Mean/Sigma2)"}
	}
	return y, nil
}

// innovations returns the innovation series a_t of Simulate, the
// burn-in samples first, and the burn-in: SimSettings.Innovations when
// given, else Gaussian draws of variance m.Sigma2 from the seeds; ar is
// the expanded AR polynomial and q the MA degree (for the automatic
// burn-in).
func innovations(m Model, n int, set SimSettings, ar []float64, q int) (a []float64, burn int, err error) {
	if set.Innovations != nil {
		if len(set.Innovations) != n {
			return nil, 0, settingErr("SimSettings.Innovations", itoa(len(set.Innovations))+" values", "needs n = "+itoa(n)+" values")
		}
		if err := checkFinite("innovations", set.Innovations); err != nil {
			return nil, 0, err
		}
		return append([]float64(nil), set.Innovations...), 0, nil
	}
	if set.BurnIn >= 0 {
		ok, bad, err := m.stationary()
		if err != nil {
			return nil, 0, err
		}
		if !ok {
			return nil, 0, modelErr("model AR part", "not stationary (z-plane roots "+rootList(bad)+"); use SimSettings.BurnIn < 0")
		}
		burn = set.BurnIn
		if burn == 0 {
			burn = autoBurn(ar, q)
		}
		if burn > MaxSamples-n {
			return nil, 0, settingErr("SimSettings.BurnIn", itoa(burn), "n + BurnIn = "+itoa(n)+" + "+itoa(burn)+" is above MaxSamples = "+itoa(MaxSamples))
		}
	}
	a = make([]float64, burn+n)
	rng := rand.New(rand.NewPCG(set.Seed1, set.Seed2))
	sd := math.Sqrt(m.Sigma2)
	for i := range a {
		a[i] = sd * rng.NormFloat64()
	}
	return a, burn, nil
}

// autoBurn returns the burn-in for an AR polynomial with z-plane roots
// inside the unit circle.
func autoBurn(ar []float64, q int) int {
	p := len(ar) - 1
	b := 100 + p + q
	zs, err := zRoots(ar)
	if err == nil && len(zs) > 0 {
		r := 0.0
		for _, z := range zs {
			r = math.Max(r, cabs(z))
		}
		if r > 0 {
			b = max(b, int(math.Ceil(math.Log(1e-12)/math.Log(r)))+p+q)
		}
	}
	return min(b, 1_000_000)
}
