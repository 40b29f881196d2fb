package statespace

import (
	"strconv"

	"gonum.org/v1/gonum/mat"
)

// Steady returns the state of the realisation settled at the constant
// inputs u (one value per input, in the order of Inputs): each input
// path's states solve x = A x + B u (the path has been fed u for ever, so
// its output is its gain times u), the noise part is at rest (zero) and
// the constant state holds 1. Started from it, Simulate gives, for a
// model without output differencing, the outputs of tf's Model.Simulate
// with its default settled start (each input held at its first sample
// before the record) and the same innovations; NewPredictor started from
// it starts as the fit's residual recursion assumes of the inputs.
//
// Errors (Op "statespace.Realisation.Steady"): a *SeriesError
// (ErrLength) for a u of the wrong length, a *SampleError for a NaN or
// infinite value, and a *ModelError for an input path with a pole at
// z = 1 (an integrator: an input integrated by the output's
// differencing) and a nonzero u for it, which has no settled state, or
// whose settled state leaves float64 range.
func (r *Realisation) Steady(u []float64) ([]float64, error) {
	const op = "statespace.Realisation.Steady"
	if len(u) != r.m {
		return nil, &SeriesError{Op: op, Series: "u", Kind: ErrLength, Have: len(u), Need: r.m, Detail: "one value per input, in the order of Realisation.Inputs"}
	}
	if err := finite(op, "u", u); err != nil {
		return nil, err
	}
	x := r.start(nil)
	for i, p := range r.parts[:r.m] {
		if p.States == 0 || u[i] == 0 {
			continue
		}
		// (I - A_p) x_p = B_p u_i on the path's own states: the path's
		// rows of A refer to no state outside it.
		k := p.States
		lhs, rhs := mat.NewDense(k, k, nil), mat.NewVecDense(k, nil)
		for a := range k {
			for b := range k {
				lhs.Set(a, b, -r.a[(p.First+a)*r.n+p.First+b])
			}
			lhs.Set(a, a, lhs.At(a, a)+1)
			rhs.SetVec(a, r.b[(p.First+a)*r.m+i]*u[i])
		}
		var sol mat.VecDense
		if err := sol.SolveVec(lhs, rhs); err != nil || integrator(p.Den) {
			return nil, &ModelError{Op: op, Part: "input " + strconv.Quote(p.Name),
				Problem: "the path has a pole at z = 1 (an integrator), so it has no settled state for the input " + strconv.FormatFloat(u[i], 'g', -1, 64) + "; start it from rest (u = 0 for it) or from a state of the data"}
		}
		for a := range k {
			x[p.First+a] = sol.AtVec(a)
			if v := x[p.First+a]; v-v != 0 {
				return nil, &ModelError{Op: op, Part: "input " + strconv.Quote(p.Name),
					Problem: "the settled state for the input " + strconv.FormatFloat(u[i], 'g', -1, 64) + " leaves float64 range (a pole very near z = 1 or a huge gain); rescale the series"}
			}
		}
	}
	return x, nil
}

// integrator reports whether den(1) = 0 to rounding, a pole at z = 1.
func integrator(den []float64) bool {
	s, m := 0.0, 0.0
	for _, v := range den {
		s += v
		m = max(m, abs(v))
	}
	return abs(s) <= 1e-12*m
}

func abs(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}
