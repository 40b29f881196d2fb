// Package timing holds what the Go sides of the peer scripts share:
// reading a series file, timing the best of several runs, and the main
// loop of a command that fits each series file named on its command line.
package timing

import (
	"bufio"
	"flag"
	"fmt"
	"os"
	"strconv"
	"strings"
	"time"
)

// Best runs fn reps times (at least once) and returns the shortest
// wall-clock time of a run, or the first error.
func Best(reps int, fn func() error) (time.Duration, error) {
	var best time.Duration
	for r := 0; r < max(reps, 1); r++ {
		start := time.Now()
		err := fn()
		elapsed := time.Since(start)
		if err != nil {
			return 0, err
		}
		if r == 0 || elapsed < best {
			best = elapsed
		}
	}
	return best, nil
}

// Series is the main of a command named name that fits each series file
// named on the command line (read by ReadSeries): it parses the flag
// -reps (timed fits per file, default 3), times fit on each file's
// series with Best and prints the line that line returns for the series,
// the best time and the last fit's result. A usage error exits with
// status 2, a file or fit error with status 1.
func Series[R any](name string, fit func(y []float64) (R, error), line func(y []float64, best time.Duration, res R) string) {
	reps := flag.Int("reps", 3, "timed fits per file (the best is reported)")
	flag.Parse()
	if flag.NArg() == 0 || *reps < 1 {
		fmt.Fprintf(os.Stderr, "usage: %s [-reps N] FILE...\n", name)
		os.Exit(2)
	}
	for _, path := range flag.Args() {
		y, err := ReadSeries(path)
		if err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		var res R
		best, err := Best(*reps, func() (err error) {
			res, err = fit(y)
			return err
		})
		if err != nil {
			fmt.Fprintf(os.Stderr, "%s: %v\n", path, err)
			os.Exit(1)
		}
		fmt.Println(line(y, best, res))
	}
}

// ReadSeries reads one number per line ("nan" is a missing sample);
// blank lines are skipped. A line that is not a number is an error
// naming the file and line.
func ReadSeries(path string) ([]float64, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var y []float64
	sc := bufio.NewScanner(f)
	for line := 1; sc.Scan(); line++ {
		s := strings.TrimSpace(sc.Text())
		if s == "" {
			continue
		}
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			return nil, fmt.Errorf("%s:%d: %v", path, line, err)
		}
		y = append(y, v)
	}
	return y, sc.Err()
}
