package statespace

import (
	"math"
	"strconv"
)

// Simulate runs the realisation over the input series and returns the
// output y_0..y_{n-1}:
//
//	y_t     = C x_t + D u_t + a_t
//	x_{t+1} = A x_t + B u_t + G a_t.
//
// inputs holds one series per input, in the order of Inputs, all of one
// length n (the length of the result). innovations is the series a_t
// (nil for none, that is a_t = 0; a model without a noise term takes
// none). start is x_0 (nil for the default start: every state zero,
// that is every path at rest, except the constant state, which holds
// 1). From the default start Simulate gives the outputs of tf's
// Model.Simulate with SimSettings.FromRest and the same innovations
// (see the package doc). Nothing passed is modified.
//
// Errors (Op "statespace.Realisation.Simulate"): a *SeriesError
// (ErrLength) for a wrong number of input series, series of unequal
// lengths, innovations or start of the wrong length; a *SampleError for
// a NaN or infinite value in any of them; a *ModelError for innovations
// given to a model without noise, and a *ModelError (Part "output")
// naming the first step whose output left float64 range (an unstable
// path or noise term grown without bound, or data far beyond the
// model's scale).
func (r *Realisation) Simulate(inputs [][]float64, innovations, start []float64) ([]float64, error) {
	const op = "statespace.Realisation.Simulate"
	n, err := r.checkRun(op, inputs, innovations, start)
	if err != nil {
		return nil, err
	}
	x := r.start(start)
	xn := make([]float64, r.n)
	u := make([]float64, r.m)
	y := make([]float64, n)
	for t := range y {
		for i, s := range inputs {
			u[i] = s[t]
		}
		a := 0.0
		if innovations != nil {
			a = innovations[t]
		}
		y[t] = r.observe(x, u) + a
		if math.IsNaN(y[t]) || math.IsInf(y[t], 0) {
			return nil, outOfRange(op, "output", t, y[t])
		}
		r.advance(xn, x, u, r.g, a)
		x, xn = xn, x
	}
	return y, nil
}

// Impulse returns the response y_0..y_{n-1} of the output to a unit
// impulse in the input numbered input (0-based, the order of Inputs),
// from rest: every state zero, the constant state too, no innovations.
// It equals the impulse response of the input's transfer function
// Num(B)/Den(B) B^Delay of its Part (tf.Rational.Impulse). A negative n
// or an input out of range is a *SettingError.
func (r *Realisation) Impulse(input, n int) ([]float64, error) {
	return r.response("statespace.Realisation.Impulse", input, n, false)
}

// Step returns the unit step response y_0..y_{n-1} of the output to the
// input numbered input, from rest as for Impulse (tf.Rational.Step of
// the input's transfer function). A negative n or an input out of range
// is a *SettingError.
func (r *Realisation) Step(input, n int) ([]float64, error) {
	return r.response("statespace.Realisation.Step", input, n, true)
}

func (r *Realisation) response(op string, input, n int, step bool) ([]float64, error) {
	if input < 0 || input >= r.m {
		return nil, &SettingError{Op: op, Setting: "input", Value: strconv.Itoa(input),
			Rule: "must number an input, 0.." + strconv.Itoa(r.m-1) + " (the order of Realisation.Inputs)"}
	}
	if n < 0 || n > maxLength {
		return nil, &SettingError{Op: op, Setting: "n", Value: strconv.Itoa(n), Rule: "must lie between 0 and " + strconv.Itoa(maxLength) + " samples"}
	}
	x, xn := make([]float64, r.n), make([]float64, r.n)
	u := make([]float64, r.m)
	y := make([]float64, n)
	for t := range y {
		u[input] = 0
		if step || t == 0 {
			u[input] = 1
		}
		y[t] = r.observe(x, u)
		r.advance(xn, x, u, nil, 0)
		x, xn = xn, x
	}
	return y, nil
}

// maxLength bounds the length of a response, 10^8 samples (800 MB):
// far beyond any use, so that a slip in n is an error, not an exhausted
// memory.
const maxLength = 100_000_000

// observe returns C x + D u.
func (r *Realisation) observe(x, u []float64) float64 {
	y := 0.0
	for j, v := range x {
		y += r.c[j] * v
	}
	for i, v := range u {
		y += r.d[i] * v
	}
	return y
}

// advance writes A x + B u + g a into dst (g nil for none).
func (r *Realisation) advance(dst, x, u, g []float64, a float64) {
	for i := range dst {
		row := r.a[i*r.n : (i+1)*r.n]
		s := 0.0
		for j, v := range x {
			s += row[j] * v
		}
		brow := r.b[i*r.m : (i+1)*r.m]
		for j, v := range u {
			s += brow[j] * v
		}
		if g != nil {
			s += g[i] * a
		}
		dst[i] = s
	}
}

// start returns a private copy of the start state, or the default.
func (r *Realisation) start(x0 []float64) []float64 {
	x := make([]float64, r.n)
	if x0 != nil {
		copy(x, x0)
	} else if r.konst >= 0 {
		x[r.konst] = 1
	}
	return x
}

// checkRun checks the arguments of Simulate and OneStep and returns the
// common length of the input series (that of innovations without
// inputs, 0 when neither is given).
func (r *Realisation) checkRun(op string, inputs [][]float64, innovations, start []float64) (int, error) {
	if len(inputs) != r.m {
		return 0, &SeriesError{Op: op, Series: "inputs", Kind: ErrLength, Have: len(inputs), Need: r.m,
			Detail: "one series per input of the model, in the order of Realisation.Inputs"}
	}
	n := -1
	for i, s := range inputs {
		name := r.inputs[i]
		if n >= 0 && len(s) != n {
			return 0, &SeriesError{Op: op, Series: name, Kind: ErrLength, Have: len(s), Need: n, Detail: "the length of input " + strconv.Quote(r.inputs[0])}
		}
		n = len(s)
		if err := finite(op, name, s); err != nil {
			return 0, err
		}
	}
	if innovations != nil {
		if !r.noise {
			return 0, &ModelError{Op: op, Part: "noise", Problem: "innovations given but the model has no noise term; pass nil"}
		}
		if n >= 0 && len(innovations) != n {
			return 0, &SeriesError{Op: op, Series: "innovations", Kind: ErrLength, Have: len(innovations), Need: n, Detail: "one innovation per input sample"}
		}
		n = len(innovations)
		if err := finite(op, "innovations", innovations); err != nil {
			return 0, err
		}
	}
	if start != nil {
		if len(start) != r.n {
			return 0, &SeriesError{Op: op, Series: "start", Kind: ErrLength, Have: len(start), Need: r.n, Detail: "one value per state (Realisation.States)"}
		}
		if err := finite(op, "start", start); err != nil {
			return 0, err
		}
	}
	return max(n, 0), nil
}

// finite returns a *SampleError for the first NaN or infinite value.
func finite(op, name string, x []float64) error {
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return &SampleError{Op: op, Series: name, Index: i, Value: v}
		}
	}
	return nil
}
