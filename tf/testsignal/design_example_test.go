package testsignal_test

import (
	"fmt"

	"github.com/backshift/backshift/tf/testsignal"
)

// A valve test: the process is expected to take about 10 minutes to
// respond (time constant) after 2 minutes of dead time, sampled every
// minute, with moves of 5 % about 40 % open, in at most 10 hours.
// Commission any controller designed from the resulting model on the
// plant under the site's safety procedures, with independent
// interlocks, deferring to local codes and licensed practice.
func ExampleDesign() {
	d, err := testsignal.Design(testsignal.DesignSettings{
		TimeConstant: 10, DeadTime: 2, Sample: 1,
		Level: 40, Amplitude: 5, Budget: 600,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%d-stage sequence, clock %g min, %d periods, %d samples\n", d.Stages, d.Clock, d.Periods, len(d.Signal))
	fmt.Printf("band %.3f to %.3f rad/min\n", d.BandLow, d.BandHigh)

	_, err = testsignal.Design(testsignal.DesignSettings{
		TimeConstant: 10, DeadTime: 2, Sample: 1,
		Level: 40, Amplitude: 5, Budget: 300,
	})
	fmt.Println(err)
	// Output:
	// 4-stage sequence, clock 13 min, 3 periods, 585 samples
	// band 0.032 to 0.215 rad/min
	// testsignal.Design: DesignSettings.Budget = 300: too short for the slowest expected dynamics: the test needs at least 2 periods of the 15-value sequence at clock 13, each covering 188.5, the time the slowest expected dynamics need, 390 in all (the first period lets the start-up transient die out, the rest give data); lengthen the budget, or check the time constant and dead time
}
