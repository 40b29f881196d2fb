package online_test

import (
	"testing"

	"github.com/backshift/backshift/tf/online"
)

// feed runs the record through e from sample lo to hi (exclusive),
// failing the test on an error.
func feed(t testing.TB, e *online.Estimator, data map[string][]float64, y string, lo, hi int) {
	t.Helper()
	names := e.Inputs()
	x := make([]float64, len(names))
	for i := lo; i < hi; i++ {
		for j, nm := range names {
			x[j] = data[nm][i]
		}
		if err := e.Update(x, data[y][i]); err != nil {
			t.Fatalf("sample %d: %v", i, err)
		}
	}
}

// Update allocates nothing per sample, during the warm-up or after it.
func TestUpdateAllocs(t *testing.T) {
	m := mustModel(t, eightSpec)
	data := record(t, m, 2000, 0.3, 3)
	e, err := online.New(m, nil)
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, 2)
	i := 0
	allocs := testing.AllocsPerRun(1500, func() {
		x[0], x[1] = data["x1"][i], data["x2"][i]
		if err := e.Update(x, data["y"][i]); err != nil {
			t.Fatal(err)
		}
		i++
	})
	if allocs != 0 {
		t.Errorf("Update: %v allocations per sample, want 0", allocs)
	}
	if c := e.Counts(); c.Updates == 0 {
		t.Errorf("no update after the warm-up: %+v", c)
	}
	ps := make([]online.Param, 0, 8)
	if a := testing.AllocsPerRun(10, func() { ps = e.Params(ps[:0]) }); a != 0 {
		t.Errorf("Params with room: %v allocations, want 0", a)
	}
}

// BenchmarkUpdate: one sample of the eight-coefficient model (two
// inputs, first-order terms, a constant, ARMA(1,1) noise), after the
// warm-up.
func BenchmarkUpdate(b *testing.B) {
	m := mustModel(b, eightSpec)
	const n = 1 << 14
	data := record(b, m, n, 0.3, 5)
	e, err := online.New(m, nil)
	if err != nil {
		b.Fatal(err)
	}
	feed(b, e, data, "y", 0, 200)
	x := make([]float64, 2)
	x1, x2, y := data["x1"], data["x2"], data["y"]
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		t := 200 + i%(n-200)
		x[0], x[1] = x1[t], x2[t]
		if err := e.Update(x, y[t]); err != nil {
			b.Fatal(err)
		}
	}
}
