package lm

import (
	"context"

	"gonum.org/v1/gonum/mat"
)

// Crossing describes a search whose parameters may leave a region and be
// mapped back to an equivalent point of the same objective (an
// exact-likelihood MA part crossing the invertibility boundary: the
// likelihood is the same with its roots inverted).
type Crossing struct {
	// Invert maps x back into the region in place and reports whether it
	// moved.
	Invert func(x []float64) bool
	// Information returns (J'J)^-1 at a mapped point (Result.JTJInv).
	Information func(x []float64) *mat.SymDense
	// AtBoundary reports whether x, inside the region, lies on its edge
	// (where the search creeps: see FirstIter).
	AtBoundary func(x []float64) bool
	// FirstIter bounds the first search. One stopped by it at the
	// boundary is handed back with atBoundary true, for the caller to
	// finish by other means; one stopped away from it continues with the
	// rest of Settings.MaxIter.
	FirstIter int
}

// MinimizeCrossing is Minimize for a search that may cross the edge of
// a region: the search's end is mapped back by c.Invert (with its J'J
// inverse recomputed), the first search runs at most c.FirstIter
// iterations, and when it stopped by that limit at the boundary
// (c.AtBoundary) MinimizeCrossing returns with atBoundary true;
// otherwise the search continues from the mapped point with the rest of
// the iterations. An error of the second search leaves the first one's
// result.
func MinimizeCrossing(ctx context.Context, p Problem, x0 []float64, s *Settings, c Crossing) (res Result, atBoundary bool, err error) {
	var set Settings
	if s != nil {
		set = *s
	}
	limit := set.MaxIter
	if limit == 0 {
		limit = 500 // Minimize's default
	}
	first := set
	first.MaxIter = min(limit, c.FirstIter)
	if res, err = Minimize(ctx, p, x0, &first); err != nil {
		return res, false, err
	}
	mapBack := func(r *Result) {
		if c.Invert(r.X) {
			r.JTJInv = c.Information(r.X)
		}
	}
	mapBack(&res)
	if res.Reason != IterationLimit || limit <= first.MaxIter {
		return res, false, nil
	}
	if c.AtBoundary(res.X) {
		return res, true, nil
	}
	rest := set
	rest.MaxIter = limit - res.Iter
	next, err := Minimize(ctx, p, res.X, &rest)
	if err != nil {
		return res, false, nil
	}
	next.Iter += res.Iter
	next.Evals += res.Evals
	mapBack(&next)
	return next, false, nil
}
