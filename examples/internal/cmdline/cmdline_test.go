package cmdline

import (
	"bytes"
	"errors"
	"flag"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestParse checks the exit statuses and the usage text: -h prints the
// usage then the flags and ends with 0, a bad flag ends with 2, good
// flags go on.
func TestParse(t *testing.T) {
	for _, c := range []struct {
		args   []string
		status int
		stop   bool
		out    string
	}{
		{[]string{"-h"}, 0, true, "usage text\n  -n int"},
		{[]string{"-x"}, 2, true, "flag provided but not defined: -x"},
		{[]string{"-n", "3"}, 0, false, ""},
	} {
		var out bytes.Buffer
		fset := flag.NewFlagSet("t", flag.ContinueOnError)
		fset.SetOutput(&out)
		fset.Int("n", 0, "a number")
		status, stop := Parse(fset, "usage text\n", c.args)
		if status != c.status || stop != c.stop || !strings.Contains(out.String(), c.out) {
			t.Errorf("%v: status %d stop %v output %q, want %d %v containing %q", c.args, status, stop, out.String(), c.status, c.stop, c.out)
		}
	}
}

// TestReadConfig checks a good file, a missing one (the os error), a
// folder and a file over the limit.
func TestReadConfig(t *testing.T) {
	dir := t.TempDir()
	good := filepath.Join(dir, "good.json")
	if err := os.WriteFile(good, []byte(`{"models": []}`), 0o644); err != nil {
		t.Fatal(err)
	}
	if raw, err := ReadConfig(good); err != nil || string(raw) != `{"models": []}` {
		t.Errorf("good file: %q %v", raw, err)
	}
	var pe *fs.PathError
	if _, err := ReadConfig(filepath.Join(dir, "none.json")); !errors.As(err, &pe) || !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("missing file: %v", err)
	}
	if _, err := ReadConfig(dir); err == nil || err.Error() != "a folder, not a config file" {
		t.Errorf("folder: %v", err)
	}
	big := filepath.Join(dir, "big.json")
	if err := os.WriteFile(big, make([]byte, MaxConfig+1), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := ReadConfig(big); err == nil || !strings.Contains(err.Error(), "the file is over 16 MiB") {
		t.Errorf("big file: %v", err)
	}
}
