package greenhouse

import (
	"fmt"
	"math"
)

// Fault is a single bad reading of the logged output: the temperature
// logged at sample Sample is off by Size degC. The controller's own
// measurement is not affected (a fault of the logging, such as a
// corrupted transfer or a sensor glitch between the logger and the
// controller), so the fault is an additive outlier of the output alone.
type Fault struct {
	Sample int
	Size   float64
}

// Spike is the bad reading the identify demo plants: +3 degC (100 times
// the noise's innovation standard deviation, about 30 times the standard
// deviation of the noise itself) at sample 2000, minute 560 of day 2
// (09:20).
var Spike = Fault{Sample: 1440 + 560, Size: 1}

// WithFault returns a copy of d (sharing no slice with it) whose logged
// output has the fault f added. d is not modified: other users of the
// record see the clean data. A sample outside the record or a size that
// is not finite is an error.
func (d Data) WithFault(f Fault) (Data, error) {
	if f.Sample < 0 || f.Sample >= d.Len() {
		return Data{}, fmt.Errorf("greenhouse: fault sample %d is outside the record (0 to %d)", f.Sample, d.Len()-1)
	}
	if math.IsNaN(f.Size) || math.IsInf(f.Size, 0) {
		return Data{}, fmt.Errorf("greenhouse: fault size %v is not a finite number", f.Size)
	}
	c := Data{
		Minute:   append([]float64(nil), d.Minute...),
		Setpoint: append([]float64(nil), d.Setpoint...),
		Valve:    append([]float64(nil), d.Valve...),
		Outdoor:  append([]float64(nil), d.Outdoor...),
		Temp:     append([]float64(nil), d.Temp...),
	}
	c.Temp[f.Sample] += f.Size
	return c, nil
}

// SENSOR DROPOUT, NOT YET HERE: the second fault, an hour of
// missing temperature readings (NaN in the output), is to be added as
// an opt-in copy like WithFault (Data.WithDropout) once fitting a
// whole model with missing outputs (the exact likelihood) is available;
// the conditional least squares of fit.Model cannot run through a gap
// in the output, so the identify demo would fail on it today.
