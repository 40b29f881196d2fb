package testsignal

import (
	"errors"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// Fixtures shared by the tests of package testsignal.

// isSettingError reports whether err is a *SettingError (the one shape
// of error the package returns).
func isSettingError(err error) bool {
	var se *SettingError
	return errors.As(err, &se)
}

// checkSettingError fails the test case named unless err is a
// *SettingError of kind ErrSetting whose message holds every word of
// want.
func checkSettingError(t *testing.T, name string, err error, want []string) {
	t.Helper()
	if !isSettingError(err) || !errors.Is(err, ErrSetting) {
		t.Errorf("%s: %v, want *SettingError", name, err)
		return
	}
	testutil.CheckWords(t, name, err.Error(), want, nil)
}
