package statespace

import (
	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/tf"
)

// Realisation is the state-space form of a whole model,
//
//	x_{t+1} = A x_t + B u_t + G a_t
//	y_t     = C x_t + D u_t + a_t,
//
// built by Realise. It is immutable: the matrix methods return copies,
// so a Realisation is safe for concurrent use by many goroutines.
type Realisation struct {
	n, m   int
	a      []float64 // n*n, row-major
	b      []float64 // n*m, row-major
	c      []float64 // n
	d      []float64 // m
	g      []float64 // n
	noise  bool
	konst  int // index of the constant state, -1 without a constant
	parts  []Part
	inputs []string
	output string
	iv     tf.Interval
}

// States returns the number of states n.
func (r *Realisation) States() int { return r.n }

// Inputs returns the input series names in the order of the columns of
// B and D (the order of the model's inputs).
func (r *Realisation) Inputs() []string { return append([]string(nil), r.inputs...) }

// Output returns the output series name of the model.
func (r *Realisation) Output() string { return r.output }

// Interval returns the model's sample interval (the zero Interval when
// the model gives none); the realisation itself is in samples and does
// not need it.
func (r *Realisation) Interval() tf.Interval { return r.iv }

// Noise reports whether the model has a noise term, so that G is the
// Kalman predictor gain K (see Gain) and a_t enters the output.
func (r *Realisation) Noise() bool { return r.noise }

// ConstantState returns the index of the constant state and true, or -1
// and false for a model without a constant. The constant state has
// A = 1 on its diagonal, no other entry in its row, and holds 1 in a
// simulation started by default.
func (r *Realisation) ConstantState() (int, bool) { return r.konst, r.konst >= 0 }

// Parts returns where each part of the model sits in the state vector,
// in state order: the inputs in model order, then the noise part (when
// the model has a noise term or a constant), then the constant state.
func (r *Realisation) Parts() []Part {
	out := make([]Part, len(r.parts))
	for i, p := range r.parts {
		p.Num = append([]float64(nil), p.Num...)
		p.Den = append([]float64(nil), p.Den...)
		out[i] = p
	}
	return out
}

// A returns a copy of the n x n state matrix (nil when n is 0: a static
// model without states).
func (r *Realisation) A() *mat.Dense { return dense(r.n, r.n, r.a) }

// B returns a copy of the n x m input matrix, m the number of inputs
// (nil when n or m is 0).
func (r *Realisation) B() *mat.Dense { return dense(r.n, r.m, r.b) }

// C returns a copy of the 1 x n output matrix (nil when n is 0).
func (r *Realisation) C() *mat.Dense { return dense(1, r.n, r.c) }

// D returns a copy of the 1 x m feedthrough matrix: omega_0 of an input
// without dead time, 0 otherwise (nil when m is 0).
func (r *Realisation) D() *mat.Dense { return dense(1, r.m, r.d) }

// G returns a copy of the n x 1 noise input matrix (nil when n is 0);
// zero for a model without a noise term.
func (r *Realisation) G() *mat.Dense { return dense(r.n, 1, r.g) }

// dense returns a new rows x cols matrix holding v, nil for an empty
// shape (gonum has no empty matrix).
func dense(rows, cols int, v []float64) *mat.Dense {
	if rows == 0 || cols == 0 {
		return nil
	}
	return mat.NewDense(rows, cols, append([]float64(nil), v...))
}

// builder fills the matrices of a Realisation.
type builder struct{ *Realisation }

// source is where a part's driving signal comes from: a column of u, a
// state, or the innovation.
type source struct {
	input, state int // -1 when not this kind
	innov        bool
}

// feed adds v times the source to state row's update, or to the output
// for row -1.
func (w builder) feed(row int, s source, v float64) {
	switch {
	case s.innov && row < 0: // a_t enters y with coefficient 1 by the form
	case s.innov:
		w.g[row] += v
	case s.input >= 0 && row < 0:
		w.d[s.input] += v
	case s.input >= 0:
		w.b[row*w.m+s.input] += v
	case row < 0:
		w.c[s.state] += v
	default:
		w.a[row*w.n+s.state] += v
	}
}

// observer places the observer (output-feedback) form of den(B) on
// states f..f+order-1 and feeds it from each source with its numerator:
//
//	y part   = s_1 + sum_src num_0 v
//	s_j(t+1) = s_{j+1}(t) - den_j s_1(t) + sum_src (num_j - den_j num_0) v(t),
//
// with s_{order+1} = 0 and coefficients beyond a degree zero (den[0] = 1).
func (w builder) observer(f, order int, den []float64, srcs []source, nums [][]float64) {
	at := func(p []float64, j int) float64 {
		if j < len(p) {
			return p[j]
		}
		return 0
	}
	if order > 0 {
		w.c[f] += 1
	}
	for j := 1; j <= order; j++ {
		row := f + j - 1
		if j < order {
			w.a[row*w.n+row+1] = 1
		}
		w.a[row*w.n+f] -= at(den, j)
		for k, s := range srcs {
			w.feed(row, s, at(nums[k], j)-at(den, j)*at(nums[k], 0))
		}
	}
	for k, s := range srcs {
		w.feed(-1, s, at(nums[k], 0))
	}
}

// build places the planned parts in state order and fills the matrices.
func build(m tf.Model, plan []planned) *Realisation {
	n := 0
	for _, p := range plan {
		n += p.States
	}
	konst := -1
	if m.Const != nil {
		konst = n
		n++
	}
	r := &Realisation{n: n, m: len(m.Inputs), konst: konst, noise: m.Noise != nil, output: m.Output, iv: m.Interval}
	r.a, r.b, r.c, r.d, r.g = make([]float64, n*n), make([]float64, n*r.m), make([]float64, n), make([]float64, r.m), make([]float64, n)
	for _, in := range m.Inputs {
		r.inputs = append(r.inputs, in.Series)
	}
	w := builder{r}
	f := 0
	for _, p := range plan {
		p.First = f
		if p.input >= 0 {
			// An input part without states (a static gain, no dead time)
			// has only its feedthrough omega_0, which observer places in D.
			src := source{input: p.input, state: -1}
			for j := range p.DelayStates {
				w.feed(f+j, src, 1)
				src = source{input: -1, state: f + j}
			}
			num := append(make([]float64, p.absorb), p.Num...)
			w.observer(f+p.DelayStates, p.order, p.Den, []source{src}, [][]float64{num})
		} else if p.input < 0 {
			var srcs []source
			var nums [][]float64
			if p.noise {
				srcs, nums = append(srcs, source{input: -1, state: -1, innov: true}), append(nums, p.Num)
			}
			if konst >= 0 {
				srcs, nums = append(srcs, source{input: -1, state: konst}), append(nums, p.cnum)
			}
			w.observer(f, p.order, p.Den, srcs, nums)
		}
		r.parts = append(r.parts, p.Part)
		f += p.States
	}
	if konst >= 0 {
		r.a[konst*n+konst] = 1
		r.parts = append(r.parts, Part{Name: "constant", First: konst, States: 1})
	}
	return r
}
