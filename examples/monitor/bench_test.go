package main

import (
	"io"
	"runtime"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf/monitor"
)

// benchLoop is the built-in loop (the greenhouse model: two inputs,
// first-order paths, ARMA(1, 1) noise; the monitor watching each input
// at two lags) with a week of the greenhouse record as rows, settled on
// its first day. Its alarms go to a channel nobody reads (each is
// dropped, as in a service whose reader has stalled: the samples never
// wait).
func benchLoop(tb testing.TB) (*loop, [][]float64, []float64) {
	specs, err := decodeConfig(builtin, nil)
	if err != nil {
		tb.Fatal(err)
	}
	l, err := newLoop(specs[0], 0, make(chan monitor.Alarm, 1))
	if err != nil {
		tb.Fatal(err)
	}
	rec := greenhouse.Generate(greenhouse.Settings{Days: 7})
	rows := make([][]float64, rec.Len())
	for i := range rows {
		rows[i] = []float64{rec.Valve[i], rec.Outdoor[i]}
	}
	for i := 0; i < 1440; i++ {
		copy(l.x, rows[i])
		if _, err := l.take(int64(i), rec.Temp[i]); err != nil {
			tb.Fatal(err)
		}
	}
	return l, rows, rec.Temp
}

// BenchmarkPredictMonitor times one sample of a loop on one core: the
// predictor's Update and the monitor's Update on the standardised error
// (loop.take, the per-sample work of the service without its JSON),
// over the week's record fed in a cycle. It reports samples/s and, on
// Linux, cpu-ns/op, the thread's CPU time per sample, which leaves out
// the time spent waiting for a core on a shared machine. Run it with
//
//	go test ./examples/monitor -run '^$' -bench PredictMonitor -cpu 1 -benchtime 2s
func BenchmarkPredictMonitor(b *testing.B) {
	runtime.LockOSThread()
	defer runtime.UnlockOSThread()
	l, rows, y := benchLoop(b)
	b.ReportAllocs()
	c0, ok := testutil.ThreadCPU()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		k := i % len(rows)
		copy(l.x, rows[k])
		if _, err := l.take(int64(i), y[k]); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "samples/s")
	if c1, ok1 := testutil.ThreadCPU(); ok && ok1 {
		b.ReportMetric(float64(c1-c0)/float64(b.N), "cpu-ns/op")
		b.ReportMetric(float64(b.N)/(c1-c0).Seconds(), "cpu-samples/s")
	}
}

// BenchmarkFeed times the service's path for one sample line: the JSON
// line read, then loop.take (a day of lines per op).
func BenchmarkFeed(b *testing.B) {
	l, _, _ := benchLoop(b)
	rec := greenhouse.Default()
	body := sampleLines(rec, 0, 1440, nil, nil)
	b.SetBytes(int64(len(body)))
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		l.mu.Lock()
		_, _, err := l.feed(&byteReader{b: body})
		l.mu.Unlock()
		if err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.N*1440)/b.Elapsed().Seconds(), "lines/s")
}

// byteReader reads b once.
type byteReader struct{ b []byte }

func (r *byteReader) Read(p []byte) (int, error) {
	if len(r.b) == 0 {
		return 0, io.EOF
	}
	n := copy(p, r.b)
	r.b = r.b[n:]
	return n, nil
}

// The per-sample work of a loop (predictor and monitor) allocates
// nothing, alarms included: the loop's kept list is full after 100
// alarms and then reuses its array, and a full channel drops the alarm
// without waiting.
func TestTakeAllocs(t *testing.T) {
	l, rows, y := benchLoop(t)
	// Fill the kept list, so that the measurement sees the steady state.
	for len(l.alarms) < maxKept {
		l.keep(monitor.Alarm{})
	}
	before, k := l.total, 1440
	allocs := testing.AllocsPerRun(20000, func() {
		copy(l.x, rows[k])
		if _, err := l.take(int64(k), y[k]+float64(k%7)*0.5); err != nil { // jumps that alarm
			t.Fatal(err)
		}
		k = 1440 + (k-1440+1)%(len(rows)-1440)
	})
	if allocs != 0 {
		t.Errorf("%v allocations per sample, want 0", allocs)
	}
	if l.total == before || l.mon.Dropped() == 0 {
		t.Errorf("%d alarms, %d dropped: the measurement did not exercise the alarm path", l.total-before, l.mon.Dropped())
	}
}
