package filter

// Diff writes the differenced series D(B) x into out (of len(x)) and
// returns out: D is given by its coefficients dc (constant term first, at
// least one), out[t] = sum_k dc[k] x[t-k] for t >= deg D, and the first
// deg D values, where the sum would reach before the record, are zero.
// The sum runs by rising power k for every degree (the first-order case
// is unrolled with the same operations), so the result does not depend on
// which path ran. out must not overlap x.
func Diff(out, x, dc []float64) []float64 {
	d := len(dc) - 1
	clear(out[:min(d, len(x))])
	switch {
	case d == 0 && dc[0] == 1:
		copy(out, x)
		return out
	case d == 1 && len(x) > 1:
		// The same operations as the general loop, unrolled.
		c0, c1 := dc[0], dc[1]
		o, x0, x1 := out[1:len(x)], x[1:], x[:len(x)-1]
		x0 = x0[:len(o)]
		x1 = x1[:len(o)]
		for t := range o {
			s := 0.0
			s += c0 * x0[t]
			s += c1 * x1[t]
			o[t] = s
		}
		return out
	}
	for t := d; t < len(x); t++ {
		s := 0.0
		for k, c := range dc {
			s += c * x[t-k]
		}
		out[t] = s
	}
	return out
}
