package fleet_test

import (
	"context"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/tf/fleet"
	"github.com/backshift/backshift/tf/monitor"
)

// monitorLoop replays a record of 10^4 samples of one loop (errors and
// one input from the loop's own seed, a mean shift of one standard
// deviation planted half-way) through a monitor watching the input at
// lags {3, 4}, and returns the index of the first mean alarm after the
// shift.
func monitorLoop(_ context.Context, loop int) (int64, error) {
	first := int64(-1)
	m, err := monitor.New(&monitor.Settings{Lags: [][]int{{3, 4}}, OnAlarm: func(a monitor.Alarm) {
		if a.Kind == monitor.Mean && a.Index >= 5000 && first < 0 {
			first = a.Index
		}
	}})
	if err != nil {
		return 0, err
	}
	rng := rand.New(rand.NewPCG(fleet.Seed(11, loop), 0))
	u := []float64{0}
	for i := 0; i < 10_000; i++ {
		u[0] = 0.9*u[0] + rng.NormFloat64()
		e := rng.NormFloat64()
		if i >= 5000 {
			e++
		}
		if _, err := m.Update(int64(i), e, u); err != nil {
			return 0, err
		}
	}
	return first, nil
}

// Monitoring a fleet gives every loop the same alarm whatever the pool
// size, and every loop detects the planted shift.
func TestMonitorFleet(t *testing.T) {
	one, err := fleet.Run(context.Background(), 40, monitorLoop, &fleet.Settings{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	many, err := fleet.Run(context.Background(), 40, monitorLoop, &fleet.Settings{Workers: 5})
	if err != nil {
		t.Fatal(err)
	}
	for i := range one {
		if one[i] != many[i] || one[i].Value < 5000 {
			t.Errorf("loop %d: %+v with one worker, %+v with five", i, one[i], many[i])
		}
	}
}

// 1000 loops of 10^4 samples each through a monitor, on the pool with
// one worker per core: loops/s is 1000 / (s/op).
func BenchmarkMonitorFleet(b *testing.B) {
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := fleet.Run(context.Background(), 1000, monitorLoop, nil); err != nil {
			b.Fatal(err)
		}
	}
}
