package modelinfo_test

import (
	"os"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/examples/internal/modelinfo"
)

func ExampleWrite() {
	modelinfo.Write(os.Stdout, greenhouse.True.Model())
	// Output:
	// valve -> temp
	//     gain             0.2 temp per unit of valve
	//     dead time        3 min
	//     time constant    19.5 min (pole 0.9500)
	//     stable           yes (largest pole magnitude 0.9500)
	//     step response    rise (10-90 %) 42.8 min, settling (2 %) 78.3 min, overshoot 0.0 %
	//   outdoor -> temp
	//     gain             0.5 temp per unit of outdoor
	//     dead time        1 min
	//     time constant    9.49 min (pole 0.9000)
	//     stable           yes (largest pole magnitude 0.9000)
	//     step response    rise (10-90 %) 20.9 min, settling (2 %) 37.1 min, overshoot 0.0 %
}
