package tf_test

import (
	"fmt"
	"math"

	"github.com/backshift/backshift/tf"
)

// Gain and phase of the heater 0.5 B^2/(1 - 0.8 B) from steady state to
// the Nyquist frequency; the two samples of dead time add -2w to the
// phase.
func ExampleRational_GainPhase() {
	g := tf.MustRational([]float64{0.5}, []float64{1, -0.8}, 2)
	w := []float64{0, 0.1, 0.5, 1, math.Pi}
	mag, phase, err := g.GainPhase(w)
	if err != nil {
		fmt.Println(err)
		return
	}
	for i := range w {
		fmt.Printf("w=%.3f |G|=%.3f phase=%.1f deg\n", w[i], mag[i], phase[i]*180/math.Pi)
	}
	// Output:
	// w=0.000 |G|=2.500 phase=0.0 deg
	// w=0.100 |G|=2.282 phase=-32.8 deg
	// w=0.500 |G|=1.030 phase=-109.5 deg
	// w=1.000 |G|=0.568 phase=-164.4 deg
	// w=3.142 |G|=0.278 phase=-360.0 deg
}

// Time constants and damping of a term read from its poles, with a
// sample interval of 2 s.
func ExampleRational_Modes() {
	g, _ := tf.SecondOrder{Gain: 1, NaturalFrequency: 0.1, Damping: 0.4}.Discretize(2)
	lag, _ := tf.FOPDT{Gain: 1, TimeConstant: 30}.Discretize(2)
	both, _ := g.Times(lag)
	modes, _ := both.Modes(2)
	for _, m := range modes {
		switch m.Kind {
		case tf.ModeReal:
			fmt.Printf("lag: tau %.1f samples = %.1f s\n", m.TimeConstant.Samples, m.TimeConstant.Time)
		case tf.ModeComplex:
			fmt.Printf("oscillation: wn %.3f rad/s, damping %.2f\n", m.NaturalFrequencyTime, m.Damping)
		}
	}
	info, _ := both.StepFigures(tf.StepSettings{Interval: 2})
	fmt.Printf("rise %.0f s, settling (2 %%) %.0f s, overshoot %.1f %%\n", info.Rise.Time, info.Settle.Time, 100*info.Overshoot)
	// Output:
	// oscillation: wn 0.100 rad/s, damping 0.40
	// lag: tau 15.0 samples = 30.0 s
	// rise 60 s, settling (2 %) 120 s, overshoot 0.0 %
}

// Margins of the heater under a PI controller, open loop L = C G.
func ExampleRational_LoopMargins() {
	plant := tf.MustRational([]float64{0.5}, []float64{1, -0.8}, 2)
	pi := tf.MustRational([]float64{0.6 * 1.25, -0.6}, []float64{1, -1}, 0)
	loop, _ := pi.Times(plant)
	m, err := loop.LoopMargins()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("gain margin %.2f (%.1f dB) at %.3f rad/sample\n", m.GainMargin, m.GainMarginDecibels(), m.PhaseCrossover)
	fmt.Printf("phase margin %.1f deg at %.3f rad/sample\n", m.PhaseMargin*180/math.Pi, m.GainCrossover)
	// Output:
	// gain margin 2.67 (8.5 dB) at 1.047 rad/sample
	// phase margin 57.6 deg at 0.377 rad/sample
}
