package tf_test

import (
	"strconv"
	"testing"

	"github.com/backshift/backshift/tf"
)

func TestPlantFeedthrough(t *testing.T) {
	for _, c := range []struct {
		num   []float64
		delay int
		want  bool
	}{
		{[]float64{0.5, 0.2}, 0, true},
		{[]float64{0, 0.2}, 0, false},
		{[]float64{0.5}, 1, false},
	} {
		p := tf.NewPlant(tf.MustRational(c.num, []float64{1, -0.5}, c.delay))
		if got := p.Feedthrough(); got != c.want {
			t.Errorf("num %v delay %d: Feedthrough %v, want %v", c.num, c.delay, got, c.want)
		}
		// With feedthrough the first output responds to the first input.
		if y := p.Step(1); (y != 0) != c.want {
			t.Errorf("num %v delay %d: first output %v", c.num, c.delay, y)
		}
	}
}

func TestPlantAllocs(t *testing.T) {
	p := tf.NewPlant(tf.MustRational([]float64{0.2, 0.1, 0.05}, []float64{1, -1.2, 0.5}, 3))
	if n := testing.AllocsPerRun(1000, func() { p.Step(1) }); n != 0 {
		t.Errorf("Plant.Step allocates %v times per step", n)
	}
}

// BenchmarkPlantStep times Plant.Step for a (2,2) term with dead time 3,
// n = 10^3..10^6 steps per op; ns/step is reported (target <= 10, 0
// allocs).
func BenchmarkPlantStep(b *testing.B) {
	p := tf.NewPlant(tf.MustRational([]float64{0.2, 0.1, 0.05}, []float64{1, -1.2, 0.5}, 3))
	for n := 1000; n <= 1_000_000; n *= 10 {
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			s := 0.0
			for b.Loop() {
				u := 1.0
				for i := 0; i < n; i++ {
					s += p.Step(u)
					u = -u
				}
			}
			if s == 12345 {
				b.Log(s)
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/step")
		})
	}
}
