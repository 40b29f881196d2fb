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
	"context"
	"fmt"
	"time"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/testdata/peer/internal/timing"
)

func main() {
	timing.Series("armapeer",
		func(y []float64) (*arma.Result, error) {
			return arma.Fit(context.Background(), y, arma.Order{P: 2, Q: 1}, nil)
		},
		func(y []float64, best time.Duration, res *arma.Result) string {
			return fmt.Sprintf("PEER n=%d seconds=%.6f ssq=%.17g", len(y), best.Seconds(), res.SSQ)
		})
}
