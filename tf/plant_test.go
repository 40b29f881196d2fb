package tf_test

import (
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

// BenchmarkPlantStep times one Plant.Step of a (2,2) term with dead time
// 3; 10^3..10^6 steps per op so that the per-step cost is reported.
func BenchmarkPlantStep(b *testing.B) {
	p := tf.NewPlant(tf.MustRational([]float64{0.2, 0.1, 0.05}, []float64{1, -1.2, 0.5}, 3))
	b.ReportAllocs()
	u, s := 1.0, 0.0
	for b.Loop() {
		s += p.Step(u)
		u = -u
	}
	if s == 12345 {
		b.Log(s)
	}
}
