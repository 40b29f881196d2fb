package monitor

import (
	"errors"
	"math"
	"math/rand/v2"
	"reflect"
	"testing"
)

// feedSamples feeds n samples of a seeded stream with a planted shift
// (so that alarms occur) to each monitor.
func feedSamples(ms []*Monitor, seed uint64, from, n int) {
	rng := rand.New(rand.NewPCG(seed, 5))
	u := make([]float64, len(ms[0].level))
	for i := from; i < from+n; i++ {
		for j := range u {
			u[j] = 0.8*u[j] + rng.NormFloat64()
		}
		e := rng.NormFloat64() + 0.7
		for _, m := range ms {
			m.Update(int64(i), e, u)
		}
	}
}

// A monitor restored from a snapshot goes on exactly as the one that
// made it: the same alarms, bit for bit, and the same status.
func TestSnapshotRoundTrip(t *testing.T) {
	var a1, a2 []Alarm
	s := Settings{Lags: [][]int{{1, 3}, {2}}, TargetARL: 200}
	s.OnAlarm = func(a Alarm) { a1 = append(a1, a) }
	m1 := mustNew(t, &s)
	feedSamples([]*Monitor{m1}, 1, 0, 777)
	snap, err := m1.MarshalBinary()
	if err != nil {
		t.Fatal(err)
	}
	s.OnAlarm = func(a Alarm) { a2 = append(a2, a) }
	m2 := mustNew(t, &s)
	if err := m2.UnmarshalBinary(snap); err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(m1.Status(), m2.Status()) {
		t.Fatalf("status %+v, restored %+v", m1.Status(), m2.Status())
	}
	a1 = nil
	feedSamples([]*Monitor{m1, m2}, 2, 777, 3000)
	if len(a1) == 0 || !reflect.DeepEqual(a1, a2) {
		t.Errorf("after the restore: %d alarms, the restored monitor %d (or they differ)", len(a1), len(a2))
	}
}

// A snapshot of a monitor with other settings, or a damaged one (every
// truncation, a byte beyond the end, a statistic made negative), is a
// *ModelError matching ErrFormat, and leaves the monitor as it was.
func TestSnapshotRefused(t *testing.T) {
	m := mustNew(t, &Settings{Lags: [][]int{{1, 3}, {2}}})
	feedSamples([]*Monitor{m}, 3, 0, 100)
	snap, _ := m.MarshalBinary()
	for _, other := range []Settings{
		{Lags: [][]int{{1, 3}}},
		{Lags: [][]int{{1, 4}, {2}}},
		{Lags: [][]int{{1, 3}, {2}}, Shift: 1.5},
		{Lags: [][]int{{1, 3}, {2}}, Sigma: 2},
		{Lags: [][]int{{1, 3}, {2}}, InputMemory: 50},
	} {
		o := mustNew(t, &other)
		before := o.Status()
		err := o.UnmarshalBinary(snap)
		var me *ModelError
		if !errors.As(err, &me) || !errors.Is(err, ErrFormat) {
			t.Errorf("settings %+v: %v", other, err)
		}
		if !reflect.DeepEqual(before, o.Status()) {
			t.Errorf("settings %+v: a refused snapshot changed the monitor", other)
		}
	}
	bad := [][]byte{append(append([]byte(nil), snap...), 0)}
	for n := 0; n < len(snap); n++ {
		bad = append(bad, snap[:n])
	}
	// Values no monitor can hold, written through a monitor's own
	// fields: a negative statistic, a NaN level, a sign of 2.
	for _, spoil := range []func(*Monitor){
		func(x *Monitor) { x.meanUp = -1 },
		func(x *Monitor) { x.pairs[1].down = math.Inf(1) },
		func(x *Monitor) { x.level[1] = math.NaN() },
		func(x *Monitor) { x.signs[0] = 2 },
	} {
		x := mustNew(t, &Settings{Lags: [][]int{{1, 3}, {2}}})
		spoil(x)
		b, _ := x.MarshalBinary()
		bad = append(bad, b)
	}
	for _, b := range bad {
		if err := m.UnmarshalBinary(b); !errors.Is(err, ErrFormat) {
			t.Fatalf("damaged snapshot of %d bytes: %v", len(b), err)
		}
	}
	if err := m.UnmarshalBinary(snap); err != nil {
		t.Errorf("its own snapshot: %v", err)
	}
}
