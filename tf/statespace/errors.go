package statespace

import "github.com/backshift/backshift/internal/errs"

// The shared error shapes of the library (see internal/errs), under this
// package's names.
type (
	// ModelError reports a model that cannot be realised: Part names the
	// place ("input \"valve\"", "coefficients"), Problem says what is
	// wrong and how to fix it, and Err, when not nil, is the precise
	// cause (an error of package tf, for errors.As). It matches ErrModel.
	ModelError = errs.ModelError
	// SeriesError reports a whole series of the wrong length or count,
	// of kind ErrLength.
	SeriesError = errs.SeriesError
	// SampleError reports one NaN or infinite sample: the series (an
	// input's or the output's name, "innovations" or "start"), the
	// 0-based index and the value. It matches ErrSample.
	SampleError = errs.SampleError
	// SettingError reports an argument that breaks its rule (an input
	// number out of range, a negative length), naming it.
	SettingError = errs.SettingError
)

// The kinds of error, for errors.Is.
var (
	// ErrModel: a model that cannot be realised.
	ErrModel = errs.ErrModel
	// ErrLength: series or vectors of the wrong length.
	ErrLength = errs.ErrLength
	// ErrSample: a NaN or infinite value in a series or vector.
	ErrSample = errs.ErrSample
	// ErrSetting: an argument that breaks its rule.
	ErrSetting = errs.ErrSetting
)
