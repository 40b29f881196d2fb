package arma

import (
	"bufio"
	"context"
	"fmt"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"
)

// TestPeerTiming is the Go side of testdata/peer/arma_peer.R: it runs
// only when BACKSHIFT_ARMA_PEER lists CSV files (one value per line),
// fits each with Fit(Order{P: 2, Q: 1}) and prints the best of three
// wall-clock times and the sum of squares for the script to compare. It
// asserts nothing about time.
func TestPeerTiming(t *testing.T) {
	list := os.Getenv("BACKSHIFT_ARMA_PEER")
	if list == "" {
		t.Skip("set BACKSHIFT_ARMA_PEER (see testdata/peer/arma_peer.R)")
	}
	for _, name := range strings.Split(list, ",") {
		f, err := os.Open(name)
		if err != nil {
			t.Fatal(err)
		}
		var y []float64
		sc := bufio.NewScanner(f)
		for sc.Scan() {
			v, err := strconv.ParseFloat(strings.TrimSpace(sc.Text()), 64)
			if err != nil {
				t.Fatal(err)
			}
			y = append(y, v)
		}
		f.Close()
		best := time.Duration(1 << 62)
		var res *Result
		for rep := 0; rep < 3; rep++ {
			start := time.Now()
			res, err = Fit(context.Background(), y, Order{P: 2, Q: 1}, nil)
			if d := time.Since(start); d < best {
				best = d
			}
			if err != nil {
				t.Fatal(err)
			}
		}
		fmt.Printf("PEER n=%d seconds=%.6f ssq=%.17g\n", len(y), best.Seconds(), res.SSQ)
	}
}
