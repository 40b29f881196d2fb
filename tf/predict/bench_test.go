package predict_test

import (
	"runtime"
	"strconv"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf/predict"
)

// BenchmarkUpdate times one sample of the speed target's model (two
// inputs with (2, 2) terms, ARMA(1, 1) noise; benchSpec) after its
// start-up, over a simulated record of 4096 samples fed in a cycle. On
// Linux it also reports cpu-ns/op, the CPU time of the benchmark's
// thread per sample, which leaves out the time spent waiting for a core
// on a shared machine.
func BenchmarkUpdate(b *testing.B) { benchUpdate(b, benchSpec) }

// BenchmarkUpdateDifferenced times one sample of a model outside the
// small kernel (differenced output and input), which takes the general
// recursion.
func BenchmarkUpdateDifferenced(b *testing.B) {
	benchUpdate(b, "(1 - B) y = 2 / (1 - 0.7 B) B ((1 - B) u1) + (1 - 0.3 B) / (1 - 0.5 B) a")
}

// benchUpdate times Update for the model spec over a simulated record.
func benchUpdate(b *testing.B, spec string) {
	runtime.LockOSThread()
	defer runtime.UnlockOSThread()
	m := fixture.MustModel(b, spec)
	data := record(b, spec, 4096, 1)
	p := mustPredictor(b, m, 1, nil)
	rows := make([][]float64, 4096)
	for i := range rows {
		rows[i] = row(p, data, i)
	}
	y := data["y"]
	for i := 0; i < 100; i++ {
		p.Update(rows[i], y[i])
	}
	b.ReportAllocs()
	c0, ok := testutil.ThreadCPU()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		k := i & 4095
		if _, err := p.Update(rows[k], y[k]); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	if c1, ok1 := testutil.ThreadCPU(); ok && ok1 {
		b.ReportMetric(float64(c1-c0)/float64(b.N), "cpu-ns/op")
	}
}

// BenchmarkForecast times a forecast of h steps with planned inputs
// for the same model, h = 10, 100, 1000.
func BenchmarkForecast(b *testing.B) {
	m := fixture.MustModel(b, benchSpec)
	data := record(b, benchSpec, 500, 1)
	p := mustPredictor(b, m, 1, nil)
	warm(b, p, data, 500)
	for _, h := range []int{10, 100, 1000} {
		dst := make([]predict.Point, h)
		plan := [][]float64{make([]float64, h), nil}
		for j := range plan[0] {
			plan[0][j] = 55
		}
		b.Run(strconv.Itoa(h), func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				if err := p.Forecast(dst, plan); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
