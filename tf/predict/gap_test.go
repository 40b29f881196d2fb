package predict_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf/monitor"
)

// gapExperiment is the experiment: the loop (1 - B) y = 0.5 B
// (1 - B) x + (1 - 0.3 B) a with sigma = 0.1 in control (x held at 0),
// its output missing for samples 200-259, the predictor's standardised
// errors Z fed to a drift monitor (Sigma 1, the given target run
// length, the sample index as the Stamp of the alarms), over runs
// seeded 0..runs-1. It returns the number of alarms
// before the gap (samples First..199) and the number of samples they
// came from, summed over the runs, the number of alarms in the 15
// samples after the gap (260-274), and the Z of samples 260-274 of
// every run.
func gapExperiment(t *testing.T, runs int, arl float64) (before, samples, after int, z []float64) {
	const sigma = 0.1
	m := fixture.MustModel(t, "(1 - B) y = 0.5 B (1 - B) x + (1 - 0.3 B) a")
	for run := range runs {
		rng := rand.New(rand.NewPCG(uint64(run), 9))
		p := mustPredictor(t, m, sigma*sigma, nil)
		mo, err := monitor.New(&monitor.Settings{TargetARL: arl, OnAlarm: func(a monitor.Alarm) {
			switch {
			case a.Stamp < 200:
				before++
			case a.Stamp >= 260 && a.Stamp < 275:
				after++
			}
		}})
		if err != nil {
			t.Fatal(err)
		}
		samples += 200 - p.First()
		y, last := 0.0, 0.0
		for i := range 400 {
			a := sigma * rng.NormFloat64()
			y += a - 0.3*last
			last = a
			obs := y
			if i >= 200 && i < 260 {
				obs = math.NaN()
			}
			s, err := p.Update([]float64{0}, obs)
			if err != nil {
				t.Fatal(err)
			}
			if i >= 260 && i < 275 {
				z = append(z, s.Z)
			}
			if i >= p.First() && !math.IsNaN(s.Z) {
				if _, err := mo.Update(int64(i), s.Z, nil); err != nil {
					t.Fatal(err)
				}
			}
		}
	}
	return before, samples, after, z
}

// TestGapNoFalseAlarms: in a seeded experiment (runs
// seeded 0..199), a monitor fed the standardised errors Z alarms after
// a 60-sample gap no more often than before it: the alarms in the 15
// samples after the gap stay within the count the rate before the gap
// predicts for 15 samples, plus 3 Poisson standard deviations, plus 1
// (common practice for a count near zero). Checked at the monitor's
// default target run length (the setting, where 77 of 200
// runs alarmed after the gap when the raw errors were fed) and at a
// target of 200 samples, where false alarms are frequent enough for the
// comparison to have power. Over 1000 runs the Z after the gap have
// mean 0 and variance 1 within 4 standard errors (15000 values: the
// standard error of the mean is 0.008, of the variance sqrt(2/15000) =
// 0.012 for independent normal values: common practice).
func TestGapNoFalseAlarms(t *testing.T) {
	for _, arl := range []float64{0, 200} {
		before, samples, after, _ := gapExperiment(t, 200, arl)
		expect := float64(before) / float64(samples) * 15 * 200
		t.Logf("target run length %v: %d alarms in %d samples before the gap (%.2f expected in 15 samples of 200 runs), %d in the 15 samples after it",
			arl, before, samples, expect, after)
		if float64(after) > expect+3*math.Sqrt(expect)+1 {
			t.Errorf("target run length %v: %d alarms after the gap, %.2f expected from the rate before it", arl, after, expect)
		}
	}
	_, _, _, z := gapExperiment(t, 1000, 0)
	mean, v := 0.0, 0.0
	for _, x := range z {
		mean += x
	}
	mean /= float64(len(z))
	for _, x := range z {
		v += (x - mean) * (x - mean)
	}
	v /= float64(len(z) - 1)
	t.Logf("Z after the gap: %d values, mean %.4f, variance %.4f", len(z), mean, v)
	if math.Abs(mean) > 4*math.Sqrt(1/float64(len(z))) || math.Abs(v-1) > 4*math.Sqrt(2/float64(len(z))) {
		t.Errorf("Z after the gap: mean %v, variance %v, want 0 and 1", mean, v)
	}
}
