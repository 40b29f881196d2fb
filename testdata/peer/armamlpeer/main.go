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
	"context"
	"fmt"
	"strconv"
	"strings"
	"time"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/testdata/peer/internal/timing"
)

func main() {
	timing.Series("armamlpeer",
		func(y []float64) (*arma.Result, error) {
			return arma.Fit(context.Background(), y, arma.Order{P: 2, Q: 1}, &arma.FitSettings{Method: arma.ExactML})
		},
		func(y []float64, best time.Duration, res *arma.Result) string {
			var cs []string
			for _, p := range res.Params {
				cs = append(cs, strconv.FormatFloat(p.Value, 'g', 8, 64))
			}
			return fmt.Sprintf("PEER n=%d seconds=%.6f loglik=%.12g coef=%s", len(y), best.Seconds(), res.LogLik, strings.Join(cs, ","))
		})
}
