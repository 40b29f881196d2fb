// Package cmdline holds the command-line steps the example programs
// share: parsing the flags with a usage text, and reading a config file
// named on the command line.
package cmdline

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
)

// Parse sets fs to print usage and then the flags on -h, and parses
// args. When the program is to end at once it returns stop true and the
// exit status: 0 after -h, 2 for a flag that cannot be read (fs has said
// why on its output).
func Parse(fs *flag.FlagSet, usage string, args []string) (status int, stop bool) {
	fs.Usage = func() {
		fmt.Fprint(fs.Output(), usage)
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return 0, true
		}
		return 2, true
	}
	return 0, false
}

// MaxConfig is the largest config file read, 16 MiB: a config holds a
// few model specs, and a file far larger is another file.
const MaxConfig = 16 << 20

// ReadConfig reads the config file name whole. An error from opening or
// reading it is the os package's (*fs.PathError, naming the file); a
// folder, or a file over MaxConfig bytes, is refused with a sentence that
// says so and does not repeat the name.
func ReadConfig(name string) ([]byte, error) {
	f, err := os.Open(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	if st, err := f.Stat(); err == nil && st.IsDir() {
		return nil, errors.New("a folder, not a config file")
	}
	raw, err := io.ReadAll(io.LimitReader(f, MaxConfig+1))
	if err != nil {
		return nil, err
	}
	if len(raw) > MaxConfig {
		return nil, fmt.Errorf("the file is over %d MiB; a config holds a few model specs: is it the right file?", MaxConfig>>20)
	}
	return raw, nil
}
