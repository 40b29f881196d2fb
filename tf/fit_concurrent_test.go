package tf

import (
	"context"
	"sync"
	"testing"
)

// TestFitConcurrent fits one model to several series in parallel and
// checks that every result equals the sequential fit of the same series
// exactly (no shared state between fits).
func TestFitConcurrent(t *testing.T) {
	const k = 8
	datas := make([]map[string][]float64, k)
	want := make([]*Estimate, k)
	for i := range datas {
		y, x := mcSim(newRand(uint64(100+i)), 300)
		datas[i] = map[string][]float64{"y": y, "x": x}
		e, err := Fit(context.Background(), mcModel(), datas[i], nil)
		if err != nil {
			t.Fatal(err)
		}
		want[i] = e
	}
	m := mcModel()
	got := make([]*Estimate, k)
	var wg sync.WaitGroup
	for i := range datas {
		wg.Add(1)
		go func(i int) {
			defer wg.Done()
			e, err := Fit(context.Background(), m, datas[i], nil)
			if err != nil {
				t.Error(err)
				return
			}
			got[i] = e
		}(i)
	}
	wg.Wait()
	for i := range got {
		if got[i] == nil || got[i].SSQ != want[i].SSQ {
			t.Fatalf("series %d: concurrent fit differs from sequential", i)
		}
		for j, p := range got[i].Params {
			if p.Value != want[i].Params[j].Value {
				t.Errorf("series %d %s: %v vs %v", i, p.Name, p.Value, want[i].Params[j].Value)
			}
		}
	}
}
