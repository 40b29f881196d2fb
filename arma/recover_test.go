package arma

import (
	"context"
	"errors"
	"strings"
	"testing"
)

// TestSelectRecoversPanic injects a panic into one fit of Select (through
// the fitting function of selectOrders, run on the worker goroutine): the
// process survives, the candidate carries an *InternalError naming the
// order and the series, and Select returns that error with every
// candidate (the others fitted normally).
func TestSelectRecoversPanic(t *testing.T) {
	y, err := Simulate(Model{AR: []float64{0.6}, Sigma2: 1}, 200, &SimSettings{Seed1: 3, Seed2: 4})
	if err != nil {
		t.Fatal(err)
	}
	faulty := func(ctx context.Context, y []float64, o Order, opt *FitSettings) (*Result, error) {
		if o.P == 1 && o.Q == 1 {
			var s []int
			_ = s[o.P+5] // an index panic, as a bug would make
		}
		return fit(ctx, y, o, opt)
	}
	cands, err := selectOrders(context.Background(), y, Grid{MaxP: 1, MaxQ: 1, Workers: 2}, &FitSettings{Name: "flow"}, faulty)
	var ie *InternalError
	if !errors.As(err, &ie) {
		t.Fatalf("Select error %T %v, want *InternalError", err, err)
	}
	for _, w := range []string{"arma.Select: internal fault: fit of order (1,0,1) to flow", "index out of range", "a fault of the library"} {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("message %q lacks %q", err, w)
		}
	}
	if !strings.Contains(string(ie.Stack), "selectOne") {
		t.Errorf("stack does not show the worker: %.200s", ie.Stack)
	}
	if len(cands) != 4 {
		t.Fatalf("%d candidates, want 4", len(cands))
	}
	fitted := 0
	for _, c := range cands {
		if c.Order.P == 1 && c.Order.Q == 1 {
			if !errors.As(c.Err, &ie) || c.Result != nil {
				t.Errorf("panicking candidate: %v %v", c.Result, c.Err)
			}
			continue
		}
		if c.Err == nil && c.Result != nil {
			fitted++
		}
	}
	if fitted != 3 {
		t.Errorf("%d other candidates fitted, want 3", fitted)
	}
}
