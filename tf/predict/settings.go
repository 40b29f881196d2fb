package predict

import (
	"errors"
	"strconv"
	"time"

	"github.com/backshift/backshift/internal/errs"
)

// The shared error shapes and kinds this package returns (the library's
// one vocabulary, see internal/errs), under this package's name.
type (
	// SettingError reports a setting or argument that breaks its rule,
	// naming it ("Settings.Level", "sigma2").
	SettingError = errs.SettingError
	// SampleError reports one NaN, infinite or too large sample, naming
	// the series and its index.
	SampleError = errs.SampleError
	// SeriesError reports a problem with a whole series or with the
	// number of values given (ErrLength, ErrName, ErrShort, ErrOverflow).
	SeriesError = errs.SeriesError
	// ModelError reports a model, a part of one or a snapshot that cannot
	// be used.
	ModelError = errs.ModelError
)

// Kinds of error, for errors.Is.
var (
	ErrSample   = errs.ErrSample   // a sample is NaN, infinite or too large
	ErrSetting  = errs.ErrSetting  // a setting breaks its rule
	ErrModel    = errs.ErrModel    // a model, or a snapshot, cannot be used
	ErrLength   = errs.ErrLength   // the wrong number of values
	ErrName     = errs.ErrName     // a series is missing
	ErrShort    = errs.ErrShort    // too few samples seen for the request
	ErrOverflow = errs.ErrOverflow // a result leaves float64 range
	ErrFormat   = errs.ErrFormat   // a snapshot that does not follow its format
)

// ErrOtherModel is the precise cause (Err of a *ModelError) when a
// snapshot taken from one model is restored into a predictor of another
// model, other Settings.First/ZeroPreSample, or with the model's events
// placed otherwise (other Settings.Offset or Start): the fingerprints
// differ.
var ErrOtherModel = errors.New("snapshot taken from a different model")

// Settings tunes New. The zero value (or a nil pointer) gives the
// defaults: the fit's automatic start-up, inputs held at their first
// sample before the record, 95 % intervals.
type Settings struct {
	// First is the index of the first sample whose innovation (and
	// prediction) the predictor computes, as Conditioning.First of the
	// fit (FitSettings.First, or Settle): before it the innovations are
	// taken as zero. Zero means the automatic index NoiseStart + p of
	// the fit (see Predictor.First); a value below the automatic index
	// has no effect, as in the fit.
	First int
	// ZeroPreSample takes inputs without differencing as zero before
	// their first sample instead of held at it, as
	// Conditioning.ZeroPreSample of the fit; a step event before sample
	// 0 is held at 1 all the same (see Offset).
	ZeroPreSample bool
	// Level is the coverage of the prediction intervals, in (0, 1).
	// Zero means 0.95.
	Level float64
	// Offset is the record sample of sample 0, the first sample fed
	// after New, Reset or Warm: the index in the fit's record of the
	// stream's first sample, so that an event given as a sample index T
	// (step(120)) falls at the predictor's sample T - Offset. An event
	// that falls before sample 0 has happened: a step is 1 throughout,
	// held at 1 before the first sample (its steady state, also with
	// ZeroPreSample), and a pulse never shows. Zero keeps the fit's
	// indices (a stream that starts with the record, or Warm with it).
	// Events given as times are placed by Start instead.
	Offset int
	// Start is the time of sample 0, the first sample fed after New,
	// Reset or Warm, used only to place the model's events given as
	// times (step(2026-03-01T08:00)) with the model's sample interval,
	// as fit.Settings.Start places them in the record; an event before
	// Start has happened, as for Offset. Events given as sample indices
	// need none (they are placed by Offset). A model with a timed event
	// needs Start: New refuses the zero time there (a *ModelError naming
	// the event).
	Start time.Time
}

// Validate checks the settings by the library's settings rule (zero
// means the default; a negative count or a Level outside (0, 1) is an
// error) and returns a *SettingError naming the field, or nil.
func (s Settings) Validate() error {
	return s.validate("predict.Settings.Validate")
}

func (s Settings) validate(op string) error {
	if err := errs.Count(op, "Settings.First", s.First, "0 means the automatic first index NoiseStart + p"); err != nil {
		return err
	}
	if err := errs.Count(op, "Settings.Offset", s.Offset, "the record sample of the first sample fed; 0 keeps the fit's indices"); err != nil {
		return err
	}
	return errs.Probability(op, "Settings.Level", s.Level, "0 means 0.95")
}

// settingErr is a *SettingError of op for an argument.
func settingErr(op, name, value, rule string) error {
	return &errs.SettingError{Op: op, Setting: name, Value: value, Rule: rule}
}

// itoa is strconv.Itoa.
func itoa(i int) string { return strconv.Itoa(i) }
