package arma

import (
	"context"
	"fmt"
	"sync"
	"testing"
)

// TestConcurrentUse runs fits on one shared series and the read-only
// methods of one shared Result from several goroutines; each must give
// the single-goroutine answer exactly (and go test -race must stay
// silent), as the package doc promises.
func TestConcurrentUse(t *testing.T) {
	ctx := context.Background()
	y, err := Simulate(Model{AR: []float64{0.7, -0.2}, MA: []float64{0.4}, Mean: 2, Sigma2: 1}, 400, &SimSettings{Seed1: 9, Seed2: 9})
	if err != nil {
		t.Fatal(err)
	}
	ord := Order{P: 2, Q: 1}
	res, err := Fit(ctx, y, ord, nil)
	if err != nil {
		t.Fatal(err)
	}
	fc, err := res.Forecast(12, 0.9, nil)
	if err != nil {
		t.Fatal(err)
	}
	lb, err := res.LjungBox(10)
	if err != nil {
		t.Fatal(err)
	}
	want := fmt.Sprint(ests(res), ses(res), res.SSQ, fc.Mean, fc.SE, lb.Q, res.String())
	var wg sync.WaitGroup
	errs := make(chan string, 8)
	for g := 0; g < 4; g++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := 0; i < 5; i++ {
				r, err := Fit(ctx, y, ord, nil)
				if err != nil {
					errs <- err.Error()
					return
				}
				f, err1 := res.Forecast(12, 0.9, nil)
				l, err2 := res.LjungBox(10)
				if err1 != nil || err2 != nil {
					errs <- fmt.Sprint(err1, err2)
					return
				}
				_, _ = ACF(y, 20)
				if got := fmt.Sprint(ests(r), ses(r), r.SSQ, f.Mean, f.SE, l.Q, res.String()); got != want {
					errs <- "concurrent result differs"
					return
				}
			}
		}()
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
}
