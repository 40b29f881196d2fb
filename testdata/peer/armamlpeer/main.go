// Command armamlpeer is the Go side of testdata/peer/arma_ml_peer.py: it fits each CSV
// file named on the command line (one value per line, oldest first; "nan" for a missing
// sample) with arma.Fit(Order{P: 2, Q: 1}) by exact maximum likelihood (FitSettings.Method
// = arma.ExactML), the mean estimated, and prints one line per file,
//
//	PEER n=<samples> seconds=<best wall-clock time of -reps fits> loglik=<log-likelihood> coef=<phi1,phi2,theta1,c>
//
// for the script to set beside R's arima(method = "ML") and statsmodels' SARIMAX. Run it
// from the repository root:
//
//	go run ./testdata/peer/armamlpeer [-reps 3] FILE...
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
		fmt.Fprintln(os.Stderr, "usage: armamlpeer [-reps N] FILE...")
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
			res, err = arma.Fit(context.Background(), y, arma.Order{P: 2, Q: 1}, &arma.FitSettings{Method: arma.ExactML})
			elapsed := time.Since(start)
			if err != nil {
				fmt.Fprintf(os.Stderr, "%s: %v\n", path, err)
				os.Exit(1)
			}
			if r == 0 || elapsed < best {
				best = elapsed
			}
		}
		var cs []string
		for _, p := range res.Params {
			cs = append(cs, strconv.FormatFloat(p.Value, 'g', 8, 64))
		}
		fmt.Printf("PEER n=%d seconds=%.6f loglik=%.12g coef=%s\n", len(y), best.Seconds(), res.LogLik, strings.Join(cs, ","))
	}
}

// readSeries reads one number per line ("nan" is a missing sample); blank lines are
// skipped.
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
