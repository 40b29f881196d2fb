package tf

import "github.com/backshift/backshift/internal/errs"

// The library's error vocabulary (shared by every package; see the
// package doc's section on errors): shapes to use with errors.As and
// kinds to use with errors.Is.
type (
	// SettingError reports a setting that breaks its rule, naming the
	// field as the caller wrote it ("SimSettings.BurnIn").
	SettingError = errs.SettingError
	// SeriesError reports a problem with a whole series: too short,
	// constant, of the wrong length, unknown, or overflowing.
	SeriesError = errs.SeriesError
	// ConvergenceError reports an iterative method that did not
	// converge.
	ConvergenceError = errs.ConvergenceError
)

// Kinds of error, for errors.Is; every error of the package matches one.
var (
	ErrSample      = errs.ErrSample      // a sample is NaN, infinite or too large
	ErrShort       = errs.ErrShort       // too few samples or residuals
	ErrConstant    = errs.ErrConstant    // a series is constant
	ErrLength      = errs.ErrLength      // series lengths differ
	ErrName        = errs.ErrName        // a series or input name is missing or unknown
	ErrSetting     = errs.ErrSetting     // a setting breaks its rule
	ErrModel       = errs.ErrModel       // a model, polynomial or coefficient cannot be used
	ErrConvergence = errs.ErrConvergence // an iterative method did not converge
	ErrOverflow    = errs.ErrOverflow    // a result leaves float64 range
	ErrInternal    = errs.ErrInternal    // a fault of the library
	ErrFormat      = errs.ErrFormat      // text that does not follow its format
)
