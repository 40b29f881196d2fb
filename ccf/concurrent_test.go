package ccf

import (
	"sync"
	"testing"
)

// TestConcurrentUse runs Cross (both paths), ImpulseWeights and Identify
// from several goroutines on shared inputs (run with -race) and checks
// that every goroutine gets the same results as a lone call.
func TestConcurrentUse(t *testing.T) {
	x, y := benchSeries(3000)
	for i := 3; i < len(y); i++ {
		y[i] += 0.8*x[i-3] + 0.5*y[i-1]
	}
	want := map[Method]*Correlation{}
	for _, m := range []Method{Direct, FFT} {
		c, err := Cross(x, y, 30, &Settings{Method: m})
		if err != nil {
			t.Fatal(err)
		}
		want[m] = c
	}
	w0, _ := ImpulseWeights(x, y, 20, "x", nil)
	id0, err := Identify(w0, nil)
	if err != nil {
		t.Fatal(err)
	}
	var wg sync.WaitGroup
	errs := make(chan string, 16)
	for g := 0; g < 8; g++ {
		wg.Add(1)
		go func(g int) {
			defer wg.Done()
			m := []Method{Direct, FFT}[g%2]
			c, err := Cross(x, y, 30, &Settings{Method: m})
			if err != nil {
				errs <- err.Error()
				return
			}
			for i := range c.R {
				if c.R[i] != want[m].R[i] {
					errs <- "Cross differs under concurrency"
					return
				}
			}
			w, _ := ImpulseWeights(x, y, 20, "x", nil)
			id, err := Identify(w, nil)
			if err != nil || id.DeadTime != id0.DeadTime || id.Forms[0].String() != id0.Forms[0].String() || id.Forms[0].Num[0] != id0.Forms[0].Num[0] {
				errs <- "Identify differs under concurrency"
			}
		}(g)
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
}
