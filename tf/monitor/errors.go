package monitor

import "github.com/backshift/backshift/internal/errs"

// SettingError reports a setting that breaks its rule (the shared shape
// of internal/errs); it matches ErrSetting.
type SettingError = errs.SettingError

// SampleError reports a sample that is not a finite number, or an input
// beyond the largest magnitude accepted (the shared shape of
// internal/errs); it matches ErrSample.
type SampleError = errs.SampleError

// SeriesError reports a whole-series problem (the shared shape of
// internal/errs): here, a number of input values that differs from the
// number of inputs the monitor watches (Kind ErrLength).
type SeriesError = errs.SeriesError

// The kinds of error of this package, for errors.Is.
var (
	ErrSetting = errs.ErrSetting
	ErrSample  = errs.ErrSample
	ErrLength  = errs.ErrLength
)
