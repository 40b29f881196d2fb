package greenhouse_test

import (
	"fmt"

	"github.com/backshift/backshift/examples/greenhouse"
)

func Example() {
	d := greenhouse.Default()
	fmt.Printf("%d samples, one a minute\n", d.Len())
	fmt.Printf("valve: gain %.2f degC/%%, dead time %d min, time constant %.1f min\n",
		greenhouse.True.Valve.Gain(), greenhouse.True.Valve.Delay, greenhouse.True.Valve.TimeConstant())
	fmt.Printf("outdoor: gain %.2f, dead time %d min, time constant %.1f min\n",
		greenhouse.True.Outdoor.Gain(), greenhouse.True.Outdoor.Delay, greenhouse.True.Outdoor.TimeConstant())
	// Output:
	// 5760 samples, one a minute
	// valve: gain 0.20 degC/%, dead time 3 min, time constant 19.5 min
	// outdoor: gain 0.50, dead time 1 min, time constant 9.5 min
}
