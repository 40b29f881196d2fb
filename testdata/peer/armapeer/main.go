// Command armapeer is the Go side of testdata/peer/arma_peer.R: it fits each CSV file named on
// the command line (one value per line, oldest first) with arma.Fit(Order{P: 2, Q: 1}), the
// mean estimated, and prints one line per file,
//
//	PEER n=<samples> seconds=<best wall-clock time of -reps fits> ssq=<sum of squares>
//
// for the script to set beside R's arima(method = "CSS"). Run it from the repository root:
//
//	go run ./testdata/peer/armapeer [-reps 3] FILE...
package main

import (
	"bufio"
	"context"
	"flag"
	"fmt"
	"os"
	"strconv"
	"strings"
	"time"

	"github.com/backshift/backshift/arma"
)

func main() {
	reps := flag.Int("reps", 3, "timed fits per file (the best is reported)")
	flag.Parse()
	if flag.NArg() == 0 || *reps < 1 {
		fmt.Fprintln(os.Stderr, "usage: armapeer [-reps N] FILE...")
		os.Exit(2)
	}
	for _, path := range flag.Args() {
		y, err := readSeries(path)
		if err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		var best time.Duration
		var res *arma.Result
		for r := 0; r < *reps; r++ {
			start := time.Now()
			res, err = arma.Fit(context.Background(), y, arma.Order{P: 2, Q: 1}, nil)
			elapsed := time.Since(start)
			if err != nil {
				fmt.Fprintf(os.Stderr, "%s: %v\n", path, err)
				os.Exit(1)
			}
			if r == 0 || elapsed < best {
				best = elapsed
			}
		}
		fmt.Printf("PEER n=%d seconds=%.6f ssq=%.17g\n", len(y), best.Seconds(), res.SSQ)
	}
}

// readSeries reads one number per line; blank lines are skipped.
func readSeries(path string) ([]float64, error) {
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
