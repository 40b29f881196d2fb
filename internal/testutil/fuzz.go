package testutil

import "math"

// Hostile says how HostileSeries reads fuzz bytes: at most Max samples,
// the ordinary value int8(byte)/Div, and the factors Up and Down that
// scale it (Down zero: no scaled-down case).
type Hostile struct {
	Max      int
	Div      float64
	Up, Down float64
}

// HostileSeries turns fuzz bytes into a series with hostile values: each
// pair of bytes is one sample, the first byte choosing NaN, +-Inf,
// 1e300, 1e-300, a repeat of the previous sample (constant runs), the
// value scaled by h.Up or h.Down, or the ordinary value from the second
// byte. The fuzz targets of arma and ccf share it, so that a byte string
// means the same samples in both.
func HostileSeries(data []byte, h Hostile) []float64 {
	var y []float64
	prev := 0.0
	for i := 0; i+1 < len(data) && len(y) < h.Max; i += 2 {
		v := float64(int8(data[i+1])) / h.Div
		switch data[i] % 24 {
		case 0:
			v = math.NaN()
		case 1:
			v = math.Inf(1)
		case 2:
			v = math.Inf(-1)
		case 3:
			v = 1e300
		case 4:
			v = 1e-300
		case 5, 6, 7, 8:
			v = prev
		case 9:
			v *= h.Up
		case 10:
			if h.Down != 0 {
				v *= h.Down
			}
		}
		y = append(y, v)
		prev = v
	}
	return y
}
