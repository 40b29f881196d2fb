package fleet

import (
	"context"
	"errors"
	"math/rand/v2"
	"runtime"
	"strconv"
	"strings"
	"sync/atomic"
	"testing"
	"time"
)

// fakeFit is a stand-in for a per-loop fit: it simulates a record of
// 200 samples of an AR(1) loop from the loop's own seed and returns the
// lag-1 least-squares coefficient, sleeping a loop-dependent few
// microseconds so that loops finish out of order. The loops with
// loop % 7 == 3 fail.
func fakeFit(_ context.Context, loop int) (float64, error) {
	if loop%7 == 3 {
		return 0, errors.New("loop " + strconv.Itoa(loop) + ": no data")
	}
	rng := rand.New(rand.NewPCG(Seed(42, loop), 0))
	time.Sleep(time.Duration(rng.IntN(50)) * time.Microsecond)
	phi := 0.5 + 0.4*float64(loop%10)/10
	y, sxy, sxx := 0.0, 0.0, 0.0
	for i := 0; i < 200; i++ {
		prev := y
		y = phi*y + rng.NormFloat64()
		sxy += prev * y
		sxx += prev * prev
	}
	return sxy / sxx, nil
}

// The results of every loop are the same, bit for bit, whatever the
// pool size, and in loop order; failures stay with their loop.
func TestRunDeterministic(t *testing.T) {
	const loops = 300
	want, err := Run(context.Background(), loops, fakeFit, &Settings{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range []int{2, 3, 8, 64, 1000} {
		got, err := Run(context.Background(), loops, fakeFit, &Settings{Workers: w})
		if err != nil {
			t.Fatal(err)
		}
		for i := range want {
			if got[i].Value != want[i].Value || (got[i].Err == nil) != (want[i].Err == nil) {
				t.Fatalf("workers %d, loop %d: %+v, with one worker %+v", w, i, got[i], want[i])
			}
		}
	}
	for i, r := range want {
		if (i%7 == 3) != (r.Err != nil) {
			t.Errorf("loop %d: error %v", i, r.Err)
		}
	}
}

// No more than Workers jobs run at a time, and with enough loops that
// many do run at once.
func TestRunBounded(t *testing.T) {
	for _, w := range []int{1, 3, 5} {
		var running, most atomic.Int32
		job := func(_ context.Context, loop int) (int, error) {
			n := running.Add(1)
			for {
				m := most.Load()
				if n <= m || most.CompareAndSwap(m, n) {
					break
				}
			}
			time.Sleep(200 * time.Microsecond)
			running.Add(-1)
			return loop, nil
		}
		if _, err := Run(context.Background(), 60, job, &Settings{Workers: w}); err != nil {
			t.Fatal(err)
		}
		if m := most.Load(); m > int32(w) || m < 1 {
			t.Errorf("workers %d: %d jobs at once", w, m)
		}
	}
}

// Progress comes once per loop on the caller's goroutine (the race
// detector checks the unguarded counters), Done rising to Total, Failed
// counting the failures.
func TestRunProgress(t *testing.T) {
	calls, lastDone := 0, 0
	seen := map[int]bool{}
	var last Progress
	_, err := Run(context.Background(), 50, fakeFit, &Settings{Workers: 4, OnProgress: func(p Progress) {
		calls++
		if p.Done != lastDone+1 || p.Total != 50 || seen[p.Loop] {
			t.Errorf("progress %+v after %d", p, lastDone)
		}
		seen[p.Loop] = true
		lastDone = p.Done
		last = p
	}})
	if err != nil {
		t.Fatal(err)
	}
	failures := 0
	for i := 0; i < 50; i++ {
		if i%7 == 3 {
			failures++
		}
	}
	if calls != 50 || last.Done != 50 || last.Failed != failures {
		t.Errorf("%d calls, last %+v, want 50 and %d failed", calls, last, failures)
	}
}

// Cancelling stops new loops: Run returns an error matching
// context.Canceled, the loops never started carry it, the finished ones
// keep their values, and every started job has ended when Run returns.
func TestRunCancel(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	var running atomic.Int32
	job := func(ctx context.Context, loop int) (int, error) {
		running.Add(1)
		defer running.Add(-1)
		if loop == 10 {
			cancel()
		}
		time.Sleep(100 * time.Microsecond)
		return loop + 1, nil
	}
	res, err := Run(ctx, 1000, job, &Settings{Workers: 3})
	if !errors.Is(err, context.Canceled) || !strings.HasPrefix(err.Error(), "fleet.Run: stopped after starting") {
		t.Fatalf("error %v", err)
	}
	if running.Load() != 0 {
		t.Error("a job still runs after Run returned")
	}
	finished, skipped := 0, 0
	for i, r := range res {
		switch {
		case r.Err == nil && r.Value == i+1:
			finished++
		case errors.Is(r.Err, context.Canceled) && r.Value == 0:
			skipped++
		default:
			t.Fatalf("loop %d: %+v", i, r)
		}
	}
	if finished < 11 || skipped < 900 || finished+skipped != 1000 {
		t.Errorf("%d finished, %d skipped", finished, skipped)
	}
	// Already cancelled: nothing runs.
	res, err = Run(ctx, 5, job, nil)
	if !errors.Is(err, context.Canceled) || len(res) != 5 || !errors.Is(res[0].Err, context.Canceled) {
		t.Errorf("cancelled before the start: %v, %+v", err, res)
	}
}

// A panic in one job becomes that loop's *InternalError; the other
// loops run as usual.
func TestRunPanic(t *testing.T) {
	job := func(_ context.Context, loop int) (int, error) {
		if loop == 4 {
			panic("bad loop")
		}
		return loop, nil
	}
	res, err := Run(context.Background(), 9, job, &Settings{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	var ie *InternalError
	if !errors.As(res[4].Err, &ie) || ie.Value != "bad loop" || !errors.Is(res[4].Err, ErrInternal) || len(ie.Stack) == 0 {
		t.Errorf("loop 4: %v", res[4].Err)
	}
	for i, r := range res {
		if i != 4 && (r.Err != nil || r.Value != i) {
			t.Errorf("loop %d: %+v", i, r)
		}
	}
}

// Bad arguments are a *SettingError naming them; zero loops is an empty
// result.
func TestRunBadArguments(t *testing.T) {
	for _, c := range []struct {
		loops int
		job   func(context.Context, int) (int, error)
		s     *Settings
		name  string
	}{
		{3, func(context.Context, int) (int, error) { return 0, nil }, &Settings{Workers: -2}, "Settings.Workers"},
		{-1, func(context.Context, int) (int, error) { return 0, nil }, nil, "loops"},
		{3, nil, nil, "job"},
		// Beyond MaxLoops: refused before the results are allocated (2^40
		// results would not fit in memory).
		{1 << 40, func(context.Context, int) (int, error) { return 0, nil }, nil, "loops"},
		{MaxLoops + 1, func(context.Context, int) (int, error) { return 0, nil }, nil, "loops"},
	} {
		_, err := Run(context.Background(), c.loops, c.job, c.s)
		var se *SettingError
		if !errors.As(err, &se) || se.Setting != c.name || se.Op != "fleet.Run" || !errors.Is(err, ErrSetting) {
			t.Errorf("%s: %v", c.name, err)
		}
	}
	_, err := Run(nil, 2, fakeFit, nil) // a nil context is the bad argument here
	var se *SettingError
	if !errors.As(err, &se) || se.Setting != "ctx" || !strings.Contains(err.Error(), "context.Background()") {
		t.Errorf("nil ctx: %v, want a *SettingError naming ctx", err)
	}
	res, err := Run(context.Background(), 0, fakeFit, nil)
	if err != nil || len(res) != 0 {
		t.Errorf("zero loops: %v, %v", res, err)
	}
}

// Seed gives distinct seeds to neighbouring loops and bases (no
// collisions among 10^4 loops of two bases), and the SplitMix64 output
// for base 0, loop 0 (the mixer applied to 0x9e3779b97f4a7c15, the
// first output of SplitMix64 seeded with 0: 0xe220a8397b1dcdaf, from
// memory, as printed by the reference implementation of Vigna's
// splitmix64.c).
func TestSeed(t *testing.T) {
	if got := Seed(0, 0); got != 0xe220a8397b1dcdaf {
		t.Errorf("Seed(0, 0) = %#x", got)
	}
	seen := map[uint64]bool{}
	for _, base := range []uint64{1, 2} {
		for i := 0; i < 10000; i++ {
			s := Seed(base, i)
			if seen[s] {
				t.Fatalf("seed of base %d loop %d repeats", base, i)
			}
			seen[s] = true
		}
	}
}

// The pool's own cost per loop, with a job that does nothing.
func BenchmarkRunOverhead(b *testing.B) {
	job := func(_ context.Context, loop int) (int, error) { return loop, nil }
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := Run(context.Background(), 1000, job, &Settings{Workers: 2}); err != nil {
			b.Fatal(err)
		}
	}
}

// A panic in a job is reported as the caller's job panicking, naming
// the loop, not as a fault of the library.
func TestRunPanicBlamesJob(t *testing.T) {
	res, err := Run(context.Background(), 3, func(_ context.Context, loop int) (int, error) {
		if loop == 1 {
			panic("bad loop")
		}
		return loop, nil
	}, &Settings{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	msg := res[1].Err.Error()
	if !strings.Contains(msg, "the job of loop 1 panicked: bad loop") || strings.Contains(msg, "fault of the library") {
		t.Errorf("loop 1: %q", msg)
	}
}

// A panic in OnProgress leaves no goroutine of Run behind: Run waits for
// its workers and raises the panic again on the calling goroutine.
func TestRunProgressPanicNoLeak(t *testing.T) {
	before := runtime.NumGoroutine()
	var got any
	func() {
		defer func() { got = recover() }()
		Run(context.Background(), 100, func(ctx context.Context, loop int) (int, error) {
			time.Sleep(time.Millisecond)
			return loop, nil
		}, &Settings{Workers: 2, OnProgress: func(p Progress) {
			if p.Done == 3 {
				panic("progress callback failed")
			}
		}})
	}()
	if got != "progress callback failed" {
		t.Errorf("recovered %v, want the callback's panic value", got)
	}
	// Run has returned (by panicking) only after its goroutines ended; a
	// goroutine that has called wg.Done may still be leaving, so allow
	// the scheduler a moment (common practice for NumGoroutine checks).
	deadline := time.Now().Add(2 * time.Second)
	for runtime.NumGoroutine() > before && time.Now().Before(deadline) {
		time.Sleep(5 * time.Millisecond)
	}
	if n := runtime.NumGoroutine(); n > before {
		t.Errorf("%d goroutines after Run, %d before", n, before)
	}
}
