package online

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
)

// SettingError reports a setting that breaks its rule (the shared
// shape of the library, inspectable with errors.As; it matches
// ErrSetting).
type SettingError = errs.SettingError

// SampleError reports a NaN, infinite or too large sample: the series
// name and its 0-based index (the count of samples fed before it).
type SampleError = errs.SampleError

// SeriesError reports a problem with a whole series, here a sample of
// the wrong width (ErrLength).
type SeriesError = errs.SeriesError

// ModelError reports a model that cannot be estimated recursively.
type ModelError = errs.ModelError

// InternalError reports a fault of the library (a recovered panic).
type InternalError = errs.InternalError

// MaxMagnitude is the largest sample magnitude Update and Refitter.Add
// accept (1e150, the limit of the batch fit): beyond it the products of
// the gradient and the covariance recursion can overflow float64.
// Rescale such series (change units).
const MaxMagnitude = 1e150

// Settings tunes an Estimator. The zero value (or a nil pointer) gives
// the defaults.
type Settings struct {
	// Forgetting is the forgetting factor lambda in (0, 1]: a sample k
	// steps old weighs lambda^k, so the memory is about 1/(1 - lambda)
	// samples. 1 means no forgetting (the estimates of a stationary
	// record converge to the batch fit). Zero means 0.995 (a memory of
	// about 200 samples, time to follow a change of the plant within a
	// few hundred samples while averaging out noise of a few hundred
	// samples' correlation). Values below 0.9 (a memory under 10
	// samples, fewer than most models have coefficients) are refused.
	Forgetting float64
	// Ramp, when positive, lets the forgetting factor rise from 0.95
	// (or Forgetting, when smaller) at the first update to Forgetting,
	// as lambda_t = Forgetting - (Forgetting - 0.95) exp(-t/Ramp), t
	// counting updates: the information gathered while the estimates
	// were still far from their values (with gradients computed at
	// those values) is forgotten quickly, and the estimates settle
	// with the full memory later (Ljung & Soderstrom 1983, ch. 5,
	// the forgetting factor that tends to one). Zero means no ramp.
	// Use it when the start model is not a fit of the same plant.
	Ramp int
	// Warmup is the number of samples over which the filters run and
	// the information sum_t lambda^(n-t) psi_t psi_t' is gathered
	// before the first update; P then starts as its inverse (plus a
	// ridge of 1e-9 of its largest diagonal entry, so that a direction
	// the warm-up did not excite stays finite), which is the covariance
	// recursion least squares would have had from the first sample.
	// Zero means 10 per free coefficient, at least 20: the rule of thumb
	// of ten observations per estimated coefficient for a least-squares
	// information matrix that is well determined (common practice), so
	// that the first updates are not steps of an ill-conditioned P.
	Warmup int
	// MaxTrace bounds the trace of P: when an update leaves it larger,
	// P is scaled down to it (counted in Counts.Bounded). Without a
	// bound, forgetting with an input that stops moving lets P grow as
	// lambda^-t (estimator wind-up) until one noisy sample throws the
	// estimates far off. Zero means 10 times the trace of P at the end
	// of the warm-up (room for the covariance to grow tenfold, 460
	// samples of no excitation at lambda = 0.995, before the bound
	// acts).
	MaxTrace float64
	// DeadZone, when positive, skips the update (of the estimates and
	// of P) for a sample whose prediction error is at most DeadZone
	// times the running error standard deviation, so that small errors
	// (measurement noise, quantisation) do not move the estimates.
	// Zero means no dead zone. Because the skipped errors are selected
	// on |error| alone, which for a right model is independent of the
	// gradient, the estimates stay unbiased and lose only efficiency.
	DeadZone float64
}

// defaults returns s with every zero field at its default, for k free
// coefficients (MaxTrace stays 0: it is set at the end of the warm-up).
func (s Settings) defaults(k int) Settings {
	if s.Forgetting == 0 {
		s.Forgetting = 0.995
	}
	if s.Warmup == 0 {
		s.Warmup = max(10*k, 20)
	}
	return s
}

// Validate checks the settings by the library's settings rule (zero
// means the default, a negative or non-finite value is an error) and
// returns a *SettingError naming the field ("Settings.Forgetting"), or
// nil. Forgetting must also lie in [0.9, 1].
func (s Settings) Validate() error {
	op := "online.Settings.Validate"
	err := s.validate()
	errs.SetOp(op, err)
	return err
}

func (s Settings) validate() error {
	if err := errs.First(
		errs.NonNegative("", "Settings.Forgetting", s.Forgetting, "0 means 0.995"),
		errs.Count("", "Settings.Ramp", s.Ramp, "0 means no ramp"),
		errs.Count("", "Settings.Warmup", s.Warmup, "0 means 10 per free coefficient, at least 20"),
		errs.NonNegative("", "Settings.MaxTrace", s.MaxTrace, "0 means 10 times the trace of P after the warm-up"),
		errs.NonNegative("", "Settings.DeadZone", s.DeadZone, "0 means no dead zone"),
	); err != nil {
		return err
	}
	if f := s.Forgetting; f != 0 && !(f >= 0.9 && f <= 1) {
		return &SettingError{Setting: "Settings.Forgetting", Value: strconv.FormatFloat(f, 'g', -1, 64),
			Rule: "must lie in [0.9, 1] (a memory of 1/(1 - lambda) samples: 0.9 is 10 samples; 0 means 0.995)"}
	}
	if s.Warmup > math.MaxInt32 {
		return &SettingError{Setting: "Settings.Warmup", Value: strconv.Itoa(s.Warmup), Rule: "must be at most 2^31 - 1 samples (0 means 10 per free coefficient)"}
	}
	return nil
}
