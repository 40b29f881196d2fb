package testsignal

import "github.com/backshift/backshift/internal/errs"

// SettingError reports a setting that breaks its rule, naming the field
// ("DesignSettings.TimeConstant"); it unwraps to ErrSetting. It is the
// shared shape of the whole library.
type SettingError = errs.SettingError

// ErrSetting is the kind of every *SettingError, for errors.Is.
var ErrSetting = errs.ErrSetting
