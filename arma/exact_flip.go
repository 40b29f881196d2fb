package arma

import (
	"context"
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/kalman"
	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/sym"
)

// The exact Gaussian likelihood of an MA part is the same for theta(B)
// and for the polynomial with its non-invertible roots inverted, the
// innovation variance rescaled (Brockwell & Davis 1991, sections 4.4 and
// 8.7; poly.InvertInside), and sigma^2 is concentrated out. So the
// exact-likelihood search of an invertible start may cross the MA
// invertibility boundary freely: the filter computes the same
// likelihood on either side, and the point is mapped back by inverting
// the roots outside after the search and after the final Newton steps.
// A search that refused to cross stalled at the boundary with the other
// coefficients left unoptimised.

// mlBoundaryTol is how close to the unit circle (1 - |z| for a z-plane
// root) an MA root of an exact-likelihood estimate is reported on the
// invertibility boundary (Result.Boundary). The likelihood is symmetric
// about the circle under root inversion, so a maximum on the circle is
// approached from inside only as fast as the search's tolerances allow:
// on the lh-with-gaps ARMA(2,1) of R's checks the search ends with
// |z| = 1 - 2e-4 or so (an increase of the log-likelihood below 1e-6
// remains); 1e-3 covers that with a margin, and a root that close to
// the circle gives pi weights that decay too slowly for the difference
// to matter to a user.
const mlBoundaryTol = 1e-3

// flipFactor is one factor of the MA polynomial whose base can be
// rewritten with its roots inverted: its constant term c0 (a fixed
// number) and, per power 1..m, the index in x of its free coefficient
// (-1 for a power without a term) and the term's sign.
type flipFactor struct {
	c0   float64
	ks   []int
	sign []float64
}

// maFlip inverts the non-invertible roots of the MA part in an engine's
// parameter vector, factor by factor.
type maFlip struct {
	factors []flipFactor
}

// newMAFlip returns the root inversion of e's MA part, nil when a factor
// with free coefficients cannot be rewritten in its own coefficients:
// its constant term is free or missing, a coefficient is held or
// appears elsewhere in the model, two terms share a power, or it is
// sparse with more than one free term (inverting some of its roots
// would give powers it does not have). A factor with one free term
// c B^s (a seasonal MA) keeps its form: all its roots have one modulus.
func newMAFlip(e *engine) *maFlip {
	uses := map[int]int{}
	for _, r := range e.refs {
		uses[r.k]++
	}
	fl := &maFlip{}
	for _, f := range e.ma.Factors {
		ff, free, ok := e.flipOf(f.Terms, uses)
		if !ok {
			return nil
		}
		if free {
			fl.factors = append(fl.factors, ff)
		}
	}
	if len(fl.factors) == 0 {
		return nil
	}
	return fl
}

// flipOf describes one factor's terms for newMAFlip: free reports
// whether it has free coefficients, ok whether it can be rewritten (a
// factor without free coefficients never changes: ok).
func (e *engine) flipOf(terms []sym.Term, uses map[int]int) (ff flipFactor, free, ok bool) {
	m, nfree := 0, 0
	for _, t := range terms {
		m = max(m, t.Power)
		if t.Coef.Free && t.Coef.Name != "" {
			nfree++
		}
	}
	if nfree == 0 {
		return ff, false, true
	}
	ff = flipFactor{ks: make([]int, m+1), sign: make([]float64, m+1)}
	for p := range ff.ks {
		ff.ks[p] = -1
	}
	c0set := false
	for _, t := range terms {
		isFree := t.Coef.Free && t.Coef.Name != ""
		k := -1
		if isFree {
			k = e.index[t.Coef.Name]
		}
		switch {
		case t.Power == 0 && !isFree && !c0set:
			ff.c0, c0set = t.Value(), true
		case t.Power > 0 && isFree && ff.ks[t.Power] < 0 && uses[k] == 1:
			ff.ks[t.Power], ff.sign[t.Power] = k, 1
			if t.Neg {
				ff.sign[t.Power] = -1
			}
		default:
			return ff, true, false
		}
	}
	ok = c0set && ff.c0 != 0 && (nfree == 1 || nfree == m)
	return ff, true, ok
}

// apply inverts, in x, the roots of each factor inside the unit circle
// in B (z-plane roots outside); changed reports whether x was modified.
// The error is the root finder's; x is then unchanged for that factor.
func (fl *maFlip) apply(x []float64) (changed bool, err error) {
	for _, ff := range fl.factors {
		base := make([]float64, len(ff.ks))
		base[0] = ff.c0
		nfree, last := 0, 0
		for p, k := range ff.ks {
			if k >= 0 {
				base[p] = ff.sign[p] * x[k]
				nfree, last = nfree+1, p
			}
		}
		var out []float64
		if nfree == 1 {
			// c0 + c B^s: every root has |z|^s = |c/c0|; inverted,
			// c0 + (c0^2/c) B^s.
			c := base[last]
			if !(math.Abs(c) > math.Abs(ff.c0)) {
				continue
			}
			out = append([]float64(nil), base...)
			out[last] = ff.c0 * ff.c0 / c
		} else {
			var ch bool
			out, _, ch, err = poly.InvertInside(base)
			if err != nil {
				return changed, err
			}
			if !ch {
				continue
			}
		}
		for p, k := range ff.ks {
			if k >= 0 {
				x[k] = ff.sign[p] * out[p]
			}
		}
		changed = true
	}
	return changed, nil
}

// boundaryIter bounds the first least-squares search of a fit that may
// cross the MA boundary. At an MA root on the unit circle each scaled
// innovation is an even function of the root's log-modulus, so its
// derivative in that direction vanishes: J'J turns singular, the
// Gauss-Newton model fails and Levenberg-Marquardt creeps with
// reductions at the rounding floor until its iteration limit. A search
// still running after boundaryIter iterations with a root within
// mlBoundaryTol of the circle is finished by Newton steps on the
// likelihood instead (finish); one that is not near the circle
// continues with the rest of FitSettings.MaxIter. Ordinary fits take
// far fewer iterations (the benchmark's ARMA(2,1) takes 3; lh with gaps
// 58).
const boundaryIter = 100

// decrementTol is the convergence test of a search finished by Newton
// steps at the MA boundary: half the Newton decrement g'H^-1 g (the
// increase of the log-likelihood that the local quadratic model still
// promises; Boyd & Vandenberghe 2004, section 9.5.1) must be below it.
// 1e-9 is far below the 1e-6 to which the log-likelihood is checked
// against R and far above the rounding of a central-difference gradient
// (relative noise 1e-13 of a log-likelihood of order n, over steps of
// about 1e-5, squared and divided by curvatures of order n).
const decrementTol = 1e-9

// search runs the least-squares search of prob from x0 and, with root
// inversion fl (nil: none), maps an end outside the invertible region
// back: the point has the same likelihood there (a converged search
// stays converged), and its Gauss-Newton information JTJInv is
// recomputed at the mapped point (nil when J'J is singular there).
// atBoundary reports a search stopped after boundaryIter iterations
// near the MA boundary, to be finished by Newton steps (see finish).
func (p *mlProblem) search(ctx context.Context, prob lm.Problem, x0 []float64, set lm.Settings, fl *maFlip) (lres lm.Result, atBoundary bool, err error) {
	if fl == nil {
		lres, err = lm.Minimize(ctx, prob, x0, &set)
		return lres, false, err
	}
	limit := set.MaxIter
	if limit == 0 {
		limit = 500 // lm's default
	}
	first := set
	first.MaxIter = min(limit, boundaryIter)
	if lres, err = lm.Minimize(ctx, prob, x0, &first); err != nil {
		return lres, false, err
	}
	p.mapBack(prob, &lres, fl)
	if lres.Reason != lm.IterationLimit || limit <= first.MaxIter {
		return lres, false, nil
	}
	if bad, err := outside(p.e.ma.Coeffs(), mlBoundaryTol); err == nil && len(bad) > 0 {
		return lres, true, nil
	}
	rest := set
	rest.MaxIter = limit - lres.Iter
	next, err := lm.Minimize(ctx, prob, lres.X, &rest)
	if err != nil {
		return lres, false, nil
	}
	next.Iter += lres.Iter
	next.Evals += lres.Evals
	p.mapBack(prob, &next, fl)
	return next, false, nil
}

// mapBack inverts the non-invertible MA roots of a search's end in
// place and recomputes its JTJInv there when it moved; it leaves e set
// at the end.
func (p *mlProblem) mapBack(prob lm.Problem, lres *lm.Result, fl *maFlip) {
	changed, ferr := fl.apply(lres.X)
	p.e.set(lres.X)
	if ferr != nil || !changed {
		return
	}
	lres.JTJInv = nil
	jac := make([][]float64, prob.N)
	for k := range jac {
		jac[k] = make([]float64, prob.M)
	}
	if prob.Eval(lres.X, lres.Resid, jac) != nil {
		return
	}
	jtj := mat.NewSymDense(prob.N, nil)
	for i := range jac {
		for j := 0; j <= i; j++ {
			d := 0.0
			for t, v := range jac[i] {
				d += v * jac[j][t]
			}
			jtj.SetSym(i, j, d)
		}
	}
	lres.JTJInv = invSym(jtj)
}

// finish is polish followed by the root inversion fl (nil: none): when
// the Newton steps end outside the invertible region, the point is
// mapped back and the observed information recomputed there. A search
// stopped at the MA boundary (atBoundary) gets the Newton steps of a
// converged one and counts as converged (lm.SmallGradient) when half the
// Newton decrement at the end is below decrementTol; the observed
// information is then that of the end.
func (p *mlProblem) finish(ctx context.Context, lres *lm.Result, fl *maFlip, atBoundary bool) ([]float64, *mat.SymDense, error) {
	end := kalman.SearchEnd{X: lres.X, Converged: lres.Reason.Converged() || atBoundary, JTJInv: lres.JTJInv, SSQ: lres.SSQ, N: len(lres.Resid)}
	x, hess, err := kalman.Polish(ctx, p.negLogLik, func(on bool) { p.anyMA = on }, end)
	if err != nil || fl == nil {
		return x, hess, err
	}
	changed, ferr := fl.apply(x)
	if ferr != nil || (!changed && !atBoundary) {
		return x, hess, nil
	}
	_, g, H, err := kalman.Information(ctx, p.negLogLik, x, nil, 0, 0)
	if err != nil {
		if errors.Is(err, kalman.ErrNotFinite) {
			return x, nil, nil
		}
		return x, nil, err
	}
	if atBoundary {
		if dec, ok := kalman.Decrement(H, g); ok && dec/2 < decrementTol {
			lres.Reason = lm.SmallGradient
		}
	}
	return x, H, nil
}

// flagNearMA adds the MA part to res.Boundary when a z-plane root of
// res.MA is within mlBoundaryTol of the unit circle and it is not
// flagged already.
func (res *Result) flagNearMA() {
	for _, b := range res.Boundary {
		if b.Part == "MA" {
			return
		}
	}
	if bad, err := outside(res.MA, mlBoundaryTol); err == nil && len(bad) > 0 {
		res.Boundary = append(res.Boundary, Boundary{Part: "MA", Roots: bad})
	}
}
