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

// Spike is the bad reading the identify demo plants: +1 degC (about 33
// times the noise's innovation standard deviation of 0.03 degC, about 16
// times the standard deviation of the ARMA(1,1) noise itself, 0.063
// degC) at sample 2000, minute 560 of day 2 (09:20).
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
	c := d.clone()
	c.Temp[f.Sample] += f.Size
	return c, nil
}

// Dropout is a stretch of missing readings of the logged output: the
// temperature logged at samples Start to Start+Len-1 is missing (NaN),
// as when a sensor or its link to the logger fails. As with a [Fault],
// the controller's own measurement is not affected: the valve goes on
// as it did.
type Dropout struct {
	Start, Len int
}

// SensorDropout is the dropout the identify demo plants: an hour of
// missing temperatures (60 samples) from day 3 14:00 (sample 3720) to
// 14:59 (sample 3779), well away from the [Spike] and from both ends of
// the record.
var SensorDropout = Dropout{Start: 2*1440 + 14*60, Len: 60}

// WithDropout returns a copy of d (sharing no slice with it) whose logged
// output is NaN over the dropout. d is not modified: the plain record,
// and the harness and monitor that use it, see no gap. A dropout that
// is empty or does not lie wholly inside the record is an error.
func (d Data) WithDropout(g Dropout) (Data, error) {
	if g.Len < 1 || g.Start < 0 || g.Start > d.Len()-g.Len {
		return Data{}, fmt.Errorf("greenhouse: dropout of %d samples from sample %d does not lie inside the record (0 to %d) with at least one sample",
			g.Len, g.Start, d.Len()-1)
	}
	c := d.clone()
	for i := g.Start; i < g.Start+g.Len; i++ {
		c.Temp[i] = math.NaN()
	}
	return c, nil
}

// clone returns a copy of d that shares no slice with it.
func (d Data) clone() Data {
	return Data{
		Minute:   append([]float64(nil), d.Minute...),
		Setpoint: append([]float64(nil), d.Setpoint...),
		Valve:    append([]float64(nil), d.Valve...),
		Outdoor:  append([]float64(nil), d.Outdoor...),
		Temp:     append([]float64(nil), d.Temp...),
	}
}
