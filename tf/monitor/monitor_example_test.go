package monitor_test

import (
	"fmt"
	"math/rand/v2"

	"github.com/backshift/backshift/tf/monitor"
)

// A monitor on a model's one-step errors (noise sigma 0.2) and one input
// with a dead time of 3 samples; at sample 2000 the plant's gain rises
// by 0.1, which the model does not know, and the errors begin to follow
// the input.
func Example() {
	alarms := make(chan monitor.Alarm, 16)
	m, err := monitor.New(&monitor.Settings{
		Sigma:  0.2,
		Lags:   [][]int{{3, 4}},
		Alarms: alarms,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	rng := rand.New(rand.NewPCG(1, 2))
	var u [8]float64
	for t := 0; t < 4000; t++ {
		u[t%8] = rng.NormFloat64() // the input's move at t
		e := 0.2 * rng.NormFloat64()
		if t >= 2000 && t >= 3 {
			e += 0.1 * u[(t-3)%8]
		}
		if _, err := m.Update(int64(1_700_000_000+60*t), e, u[t%8:t%8+1]); err != nil {
			fmt.Println(err)
			return
		}
	}
	close(alarms)
	before, after := 0, 0
	for a := range alarms {
		if a.Index < 2000 {
			before++
			continue
		}
		if after++; after == 1 {
			fmt.Println(a)
		}
	}
	fmt.Printf("%d alarms before the change, %d after it\n", before, after)
	// Output:
	// correlation up (input 0, lag 3) at sample 2130 (stamp 1700127800): statistic 16.23 > threshold 15.89; advice to an operator, not an interlock
	// 0 alarms before the change, 16 after it
}
