package arma

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"
)

// The joint stage of Outliers: the sizes of all outliers found,
// re-estimated together by least squares from the original residuals,
// and the marks for the ends of the record and gaps.

// joint re-estimates the sizes of the outliers in fs jointly and drops,
// one at a time, the one with the smallest |t| while that is not above
// crit. It returns the outliers kept (in time order), the residuals
// adjusted for them (NaN where missing) and the scale of their t.
func (sc *scanner) joint(fs []found, crit, sigma float64) ([]Outlier, []float64, float64, error) {
	fs = slices.Clone(fs)
	for {
		w, inv, ok := sc.solve(fs)
		if !ok {
			// Patterns that are linearly dependent over the present
			// residuals (two kinds at one end): drop the later find.
			fs = fs[:len(fs)-1]
			continue
		}
		adj := sc.adjusted(fs, w)
		s := sc.scale(adj, sigma)
		if !(s > 0) {
			return nil, nil, 0, &SeriesError{Series: "residuals", Kind: ErrConstant, Detail: "the residuals less the outliers' effects are all zero, so there is no scale for the t-statistics"}
		}
		out := make([]Outlier, len(fs))
		weak := -1
		for i, f := range fs {
			t := w[i] / (s * math.Sqrt(inv[i]))
			out[i] = Outlier{Index: f.T, Kind: sc.pats[f.pat].kind, Size: w[i], T: t}
			if !(math.Abs(t) > crit) && (weak < 0 || math.Abs(t) < math.Abs(out[weak].T)) {
				weak = i
			}
		}
		if weak >= 0 {
			fs = slices.Delete(fs, weak, weak+1)
			continue
		}
		for t, m := range sc.mask {
			if m == 0 {
				adj[t] = math.NaN()
			}
		}
		slices.SortFunc(out, func(a, b Outlier) int { return a.Index - b.Index })
		return out, adj, s, nil
	}
}

// solve returns the least-squares sizes of the outliers fs fitted
// together to the original residuals and the diagonal of the inverse of
// X'X (X the patterns over the present residuals); ok is false when X'X
// is not positive definite. No outliers give empty results.
func (sc *scanner) solve(fs []found) (w, inv []float64, ok bool) {
	k := len(fs)
	if k == 0 {
		return nil, nil, true
	}
	g := mat.NewSymDense(k, nil)
	b := mat.NewVecDense(k, nil)
	for i, fi := range fs {
		pi := &sc.pats[fi.pat]
		for j := i; j < k; j++ {
			fj := fs[j]
			pj := &sc.pats[fj.pat]
			s := 0.0
			for t := max(fi.T, fj.T); t < min(pi.end(fi.T, sc.n), pj.end(fj.T, sc.n)); t++ {
				s += pi.at(t-fi.T) * pj.at(t-fj.T) * sc.mask[t]
			}
			g.SetSym(i, j, s)
		}
		s := 0.0
		for t := fi.T; t < pi.end(fi.T, sc.n); t++ {
			s += pi.at(t-fi.T) * sc.orig[t]
		}
		b.SetVec(i, s)
	}
	var ch mat.Cholesky
	if !ch.Factorize(g) {
		return nil, nil, false
	}
	var x mat.VecDense
	if err := ch.SolveVecTo(&x, b); err != nil {
		return nil, nil, false
	}
	var gi mat.SymDense
	if err := ch.InverseTo(&gi); err != nil {
		return nil, nil, false
	}
	w, inv = make([]float64, k), make([]float64, k)
	for i := range w {
		w[i], inv[i] = x.AtVec(i), gi.At(i, i)
		if !(inv[i] > 0) || math.IsInf(w[i], 0) || math.IsNaN(w[i]) {
			return nil, nil, false
		}
	}
	return w, inv, true
}

// adjusted returns the original residuals less the effects of the
// outliers fs with sizes w (0 where missing).
func (sc *scanner) adjusted(fs []found, w []float64) []float64 {
	adj := append([]float64(nil), sc.orig...)
	for i, f := range fs {
		sc.remove(adj, f.T, f.pat, w[i])
	}
	return adj
}

// mark sets AtStart, AtEnd and NearGap of the outliers.
func (sc *scanner) mark(out []Outlier, edge int) {
	first, last := -1, -1
	for t, m := range sc.mask {
		if m != 0 {
			if first < 0 {
				first = t
			}
			last = t
		}
	}
	for i := range out {
		o := &out[i]
		o.AtStart = o.Index < first+edge
		o.AtEnd = o.Index > last-edge
		for t := max(first, o.Index-edge); t <= min(last, o.Index+edge); t++ {
			if sc.mask[t] == 0 {
				o.NearGap = true
				break
			}
		}
	}
}
