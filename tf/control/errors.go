package control

import "github.com/backshift/backshift/internal/errs"

// The shared error shapes of the library, under this package's names.
type (
	// SettingError reports a setting that breaks its rule, naming the
	// field ("TuneSettings.ClosedLoopTime"); it unwraps to ErrSetting.
	SettingError = errs.SettingError
	// ModelError reports a plant or controller that cannot be used here:
	// Part names it, Problem says what is wrong and the likely fix; it
	// matches ErrModel.
	ModelError = errs.ModelError
	// InternalError reports a fault of the library (a recovered panic).
	InternalError = errs.InternalError
)

// Kinds of error, for errors.Is.
var (
	ErrSetting = errs.ErrSetting // a setting breaks its rule
	ErrModel   = errs.ErrModel   // a plant or controller cannot be used
)
