package lm

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"sync"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/vec"
)

// Problem is a least-squares problem in N parameters with M residuals.
//
// Eval writes the residuals at x into r (length M). When jac is not nil it
// also writes the Jacobian: jac[j][i] = d r_i / d x_j, one column of length
// M per parameter. Eval returns an error when x is not admissible (for
// example an unstable filter); the solver then treats the point as worse
// than any other. Eval must not keep x, r or jac.
//
// The solver reuses its buffers across calls of Minimize. By default it
// clears them before handing them to Eval, so Eval may write only the
// non-zero entries; WritesAll promises that every call writes every entry
// of r (and of every column of jac when jac is not nil), which saves the
// clearing on long problems.
//
// Normal, when not nil, is used instead of Eval wherever the solver needs
// the Jacobian: it writes the residuals at x into r and adds J'J and J'r
// into acc (length N (N + 1), zeroed by the solver), row j holding
// J_j'J_k at acc[j (N+1) + k] for k = j..N-1 and J_j'r at
// acc[j (N+1) + N] (AddBlock adds one block of rows in this layout). A
// problem that can form its Jacobian a block of rows at a time then never
// stores it. Eval is still called for residuals alone (jac nil).
type Problem struct {
	M, N      int
	Eval      func(x, r []float64, jac [][]float64) error
	Normal    func(x, r, acc []float64) error
	WritesAll bool
}

// Settings tunes Minimize. The zero value gives the defaults.
type Settings struct {
	// MaxIter bounds the number of iterations (accepted or rejected
	// steps). Zero means 500.
	MaxIter int
	// FTol stops when the relative reduction of the sum of squares in an
	// accepted step is below it and a Gauss-Newton step would not reduce
	// it by more, or a following step fails; the tolerance used is at
	// least 10 eps sqrt(M), the rounding floor of a sum of M squares.
	// Zero means 1e-14.
	FTol float64
	// XTol stops when every step component is below XTol*(|x_j| + XTol).
	// Zero means 1e-12.
	XTol float64
	// GTol stops when the largest scaled gradient component
	// |J_j'r| / (||J_j|| ||r||) is below it. Zero means 1e-12.
	GTol float64
}

// Reason says why Minimize stopped.
type Reason int

const (
	// SmallReduction: the sum of squares stopped decreasing (FTol).
	SmallReduction Reason = iota + 1
	// SmallStep: the step became negligible (XTol).
	SmallStep
	// SmallGradient: the gradient vanished (GTol), or the residuals are zero.
	SmallGradient
	// IterationLimit: MaxIter reached before convergence.
	IterationLimit
	// Stalled: no step reduced the sum of squares although the damping
	// reached its upper limit.
	Stalled
	// Canceled: the context was done; the best point so far is returned.
	Canceled
)

// Converged reports whether r is one of the convergence reasons.
func (r Reason) Converged() bool {
	return r == SmallReduction || r == SmallStep || r == SmallGradient
}

// String says in words why the solver stopped.
func (r Reason) String() string {
	switch r {
	case SmallReduction:
		return "converged: relative reduction of the sum of squares below tolerance"
	case SmallStep:
		return "converged: step below tolerance"
	case SmallGradient:
		return "converged: gradient below tolerance"
	case IterationLimit:
		return "not converged: iteration limit reached"
	case Stalled:
		return "not converged: no further reduction possible"
	case Canceled:
		return "not converged: canceled"
	}
	return fmt.Sprintf("Reason(%d)", int(r))
}

// Result is the outcome of Minimize.
type Result struct {
	X      []float64     // best point reached
	SSQ    float64       // sum of squared residuals at X
	Resid  []float64     // residuals at X (length M)
	Iter   int           // iterations taken
	Evals  int           // calls of Eval
	Reason Reason        // why it stopped
	JTJInv *mat.SymDense // (J'J)^-1 at X (or, after a final Gauss-Newton step predicted below FTol, at the point just before it); nil when J'J is singular
}

const epsilon = 0x1p-52

// ErrStart is returned when Eval fails at the start point.
var ErrStart = errors.New("lm: residuals cannot be computed at the start point")

// Minimize runs Levenberg-Marquardt from x0 (not modified). On
// non-convergence it returns the best point reached with its Reason and a
// nil error; an error is returned only when the start point fails (ErrStart)
// or the problem or the settings are malformed (sizes that disagree, a nil
// Eval, a negative MaxIter, a negative or NaN tolerance).
//
// Each iteration solves (J'J + mu D) dx = -J'r, D = diag(J'J), by Cholesky
// and accepts the step when the sum of squares falls; mu follows Nielsen's
// update.
func Minimize(ctx context.Context, p Problem, x0 []float64, s *Settings) (Result, error) {
	if p.M <= 0 || p.N <= 0 || len(x0) != p.N || p.Eval == nil {
		return Result{}, fmt.Errorf("lm: malformed problem (M=%d, N=%d, len(x0)=%d)", p.M, p.N, len(x0))
	}
	var set Settings
	if s != nil {
		set = *s
	}
	if set.MaxIter < 0 || !(set.FTol >= 0) || !(set.XTol >= 0) || !(set.GTol >= 0) {
		return Result{}, fmt.Errorf("lm: malformed settings (MaxIter=%d, FTol=%v, XTol=%v, GTol=%v): negative or NaN", set.MaxIter, set.FTol, set.XTol, set.GTol)
	}
	if set.MaxIter == 0 {
		set.MaxIter = 500
	}
	if set.FTol == 0 {
		set.FTol = 1e-14
	}
	// Below the rounding floor of a sum of M squares (random-walk growth
	// of rounding errors, ~sqrt(M) eps relative, with a margin of 10)
	// reductions are noise.
	set.FTol = math.Max(set.FTol, 10*epsilon*math.Sqrt(float64(p.M)))
	if set.XTol == 0 {
		set.XTol = 1e-12
	}
	if set.GTol == 0 {
		set.GTol = 1e-12
	}
	if ctx == nil {
		ctx = context.Background()
	}
	m, n := p.M, p.N
	x := append([]float64(nil), x0...)
	size := (2*n + 2) * m
	if p.Normal != nil {
		size = 2 * m
	}
	wk := getWork(size, !p.WritesAll)
	defer workPool.Put(wk)
	back := *wk
	r, tr := back[:m:m], back[m:2*m:2*m]
	var jac, tjac [][]float64
	if p.Normal == nil {
		jac, tjac = cols(back[2*m:], n, m), cols(back[(n+2)*m:], n, m)
	}
	acc := make([]float64, 2*n*(n+1))
	a := mat.NewSymDense(n, nil)
	g := make([]float64, n)
	ta := mat.NewSymDense(n, nil)
	tg := make([]float64, n)
	// evalJ computes the residuals, J'J and J'r at x.
	evalJ := func(x, r []float64, jac [][]float64, a *mat.SymDense, g []float64) error {
		if p.Normal == nil {
			if err := p.Eval(x, r, jac); err != nil {
				return err
			}
			normal(a, g, jac, r, acc)
			return nil
		}
		w := n * (n + 1)
		clear(acc[:w])
		if err := p.Normal(x, r, acc[:w]); err != nil {
			return err
		}
		fromAcc(a, g, acc[:w])
		return nil
	}
	res := Result{}
	if err := evalJ(x, r, jac, a, g); err != nil {
		return Result{}, fmt.Errorf("%w: %v", ErrStart, err)
	}
	res.Evals++
	f := ssq(r)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return Result{}, fmt.Errorf("%w: sum of squares is %v", ErrStart, f)
	}
	// The damping multiplies D = diag(J'J) (Marquardt's scaling), so mu
	// is dimensionless and starts small: the first step is nearly
	// Gauss-Newton.
	mu := 1e-3
	nu := 2.0
	lastRel, prevRel := math.Inf(1), math.Inf(1)
	var gnChol mat.Cholesky
	dx := make([]float64, n)
	xt := make([]float64, n)
	aug := mat.NewSymDense(n, nil)
	var chol mat.Cholesky
	reason := IterationLimit
	for it := 0; it < set.MaxIter; it++ {
		if ctx.Err() != nil {
			reason = Canceled
			break
		}
		res.Iter = it + 1
		if f == 0 || gradSmall(a, g, f, set.GTol) {
			reason = SmallGradient
			break
		}
		// The last accepted step reduced the sum of squares by less than
		// FTol (relative): stop if a full Gauss-Newton step would not do
		// better either, so that a slow damped step in a flat valley is not
		// taken for convergence.
		// Two successive small reductions also stop: the sum of squares is
		// then at its rounding floor, where the prediction is noise too.
		if lastRel < set.FTol && (prevRel < set.FTol || gnSmall(&gnChol, a, g, f, set.FTol)) {
			reason = SmallReduction
			break
		}
		// After an accepted step, a full Gauss-Newton step that predicts
		// less than FTol (relative) from a positive definite J'J also
		// stops: near the minimum the quadratic model is accurate, and
		// taking that step would cost a whole evaluation (residuals and
		// Jacobian) for a change below the tolerance.
		// The step itself is still taken, with residuals only (no
		// Jacobian), and kept when it does not increase the sum of squares.
		if it > 0 && lastRel < math.Inf(1) {
			if pred, ok := gnPredict(&gnChol, a, g, dx); ok && pred <= set.FTol*f {
				for j := range x {
					xt[j] = x[j] + dx[j]
				}
				err := p.Eval(xt, tr, nil)
				res.Evals++
				if err == nil {
					if ft := ssq(tr); ft <= f {
						x, xt = xt, x
						r, tr = tr, r
						f = ft
					}
				}
				reason = SmallReduction
				break
			}
		}
		aug.CopySym(a)
		for j := 0; j < n; j++ {
			d := a.At(j, j)
			if d == 0 {
				d = 1
			}
			aug.SetSym(j, j, a.At(j, j)+mu*d)
		}
		if !chol.Factorize(aug) {
			mu *= nu
			nu *= 2
			if mu > 1e30 {
				reason = Stalled
				break
			}
			continue
		}
		rhs := mat.NewVecDense(n, nil)
		for j := range g {
			rhs.SetVec(j, -g[j])
		}
		sol := mat.NewVecDense(n, dx)
		if err := chol.SolveVecTo(sol, rhs); err != nil {
			mu *= nu
			nu *= 2
			continue
		}
		small := true
		for j := range x {
			xt[j] = x[j] + dx[j]
			if math.Abs(dx[j]) > set.XTol*(math.Abs(x[j])+set.XTol) {
				small = false
			}
		}
		if small {
			reason = SmallStep
			break
		}
		// Predicted reduction of the linear model: -dx'g - 0.5 dx'(J'J)dx
		// = 0.5 dx'(mu D dx - g).
		pred := 0.0
		for j := range dx {
			d := a.At(j, j)
			if d == 0 {
				d = 1
			}
			pred += 0.5 * dx[j] * (mu*d*dx[j] - g[j])
		}
		var ft float64
		err := evalJ(xt, tr, tjac, ta, tg)
		res.Evals++
		if err == nil {
			ft = ssq(tr)
		}
		if err != nil || math.IsNaN(ft) || math.IsInf(ft, 0) || ft >= f {
			if err == nil && ft-f <= set.FTol*f && (lastRel < set.FTol || gnSmall(&gnChol, a, g, f, set.FTol)) {
				// A step that cannot reduce the sum of squares, after a
				// tiny reduction or where a full Gauss-Newton step
				// predicts less than FTol (a start at the minimum): the
				// sum of squares is at its rounding floor.
				reason = SmallReduction
				break
			}
			mu *= nu
			nu *= 2
			if mu > 1e30 {
				reason = Stalled
				break
			}
			continue
		}
		rho := (f - ft) / math.Max(pred, math.SmallestNonzeroFloat64)
		mu *= math.Max(1.0/3, 1-math.Pow(2*rho-1, 3))
		nu = 2
		rel := (f - ft) / f
		x, xt = xt, x
		r, tr = tr, r
		jac, tjac = tjac, jac
		a, ta = ta, a
		g, tg = tg, g
		f = ft
		prevRel, lastRel = lastRel, rel
	}
	res.X = x
	res.SSQ = f
	res.Resid = append([]float64(nil), r...) // r is in the reused buffer
	res.Reason = reason
	var c mat.Cholesky
	if c.Factorize(a) {
		inv := mat.NewSymDense(n, nil)
		if err := c.InverseTo(inv); err == nil {
			res.JTJInv = inv
		}
	}
	return res, nil
}

// workPool holds the residual and Jacobian buffers of finished Minimize
// calls (a *[]float64 each), so that repeated fits of long series do not
// allocate, zero and page in tens of megabytes per call.
var workPool sync.Pool

// getWork returns a buffer of length size from workPool or a new one;
// zero clears a reused buffer.
func getWork(size int, zero bool) *[]float64 {
	if v, ok := workPool.Get().(*[]float64); ok {
		if cap(*v) >= size {
			*v = (*v)[:size]
			if zero {
				clear(*v)
			}
			return v
		}
		// Too small for this problem: dropped, a new one replaces it.
	}
	b := make([]float64, size)
	return &b
}

// cols cuts n columns of length m from back.
func cols(back []float64, n, m int) [][]float64 {
	c := make([][]float64, n)
	for j := range c {
		c[j] = back[j*m : (j+1)*m : (j+1)*m]
	}
	return c
}

func newCols(n, m int) [][]float64 {
	return cols(make([]float64, n*m), n, m)
}

// ssq is the sum of squares of r, in vec.Dot's order.
func ssq(r []float64) float64 {
	return vec.Dot(r, r)
}

// NormalBlock is the row block of normal. The rows of one block of every
// column (8 columns of 256 rows = 16 KiB) stay in the first-level cache
// while all their products are formed, so each column is read from
// memory once per evaluation instead of once per product it enters.
const NormalBlock = 256

// NormalSplit is the row count from which normal sums the two halves of
// the rows separately (the first half ending on a block boundary) and
// adds the halves' sums; the halves run on two goroutines when
// GOMAXPROCS > 1. The summation order depends only on the row count, so
// the result is the same bit for bit with one goroutine or two.
const NormalSplit = 50000

// SplitRow returns, for products over m rows, the first row of the
// second half when the two halves are summed separately (m >=
// NormalSplit; the first half ends on a block boundary), and 0 when the
// rows are summed in one pass. Every summation of J'J and J'r, stored or
// formed by a Normal function, splits the rows here.
func SplitRow(m int) int {
	if m < NormalSplit {
		return 0
	}
	return (m / 2) &^ (NormalBlock - 1)
}

// normal writes J'J into a and J'r into g. acc is scratch of length
// 2 n (n + 1). Each product is summed block by block in row order
// (AddBlock), the halves of SplitRow separately.
func normal(a *mat.SymDense, g []float64, jac [][]float64, r []float64, acc []float64) {
	n := len(jac)
	m := len(r)
	w := n * (n + 1)
	acc0, acc1 := acc[:w], acc[w:2*w]
	clear(acc0)
	if h := SplitRow(m); h == 0 {
		normalRange(acc0, jac, r, 0, m)
	} else {
		clear(acc1)
		if runtime.GOMAXPROCS(0) > 1 {
			var wg sync.WaitGroup
			wg.Add(1)
			go func() {
				defer wg.Done()
				normalRange(acc1, jac, r, h, m)
			}()
			normalRange(acc0, jac, r, 0, h)
			wg.Wait()
		} else {
			normalRange(acc0, jac, r, 0, h)
			normalRange(acc1, jac, r, h, m)
		}
		for i := range acc0 {
			acc0[i] += acc1[i]
		}
	}
	fromAcc(a, g, acc0)
}

// fromAcc copies J'J and J'r out of the accumulator layout of normal.
func fromAcc(a *mat.SymDense, g, acc []float64) {
	n := len(g)
	for j := 0; j < n; j++ {
		for k := j; k < n; k++ {
			a.SetSym(j, k, acc[j*(n+1)+k])
		}
		g[j] = acc[j*(n+1)+n]
	}
}

// normalRange adds to acc[j (n+1) + k] the products of column j with
// column k (k = j..n-1) and with r (k = n) over rows lo..hi-1, block by
// block.
func normalRange(acc []float64, jac [][]float64, r []float64, lo, hi int) {
	blk := make([][]float64, len(jac))
	for b := lo; b < hi; b += NormalBlock {
		e := min(b+NormalBlock, hi)
		for j := range jac {
			blk[j] = jac[j][b:e]
		}
		AddBlock(acc, blk, r[b:e])
	}
}

// AddBlock adds to acc[j (n+1) + k] the products of cols[j] with cols[k]
// (k = j..n-1) and with r (k = n), n = len(cols), over the rows of one
// block (every column as long as r). Each product is summed as vec.Dot
// sums it; column j is read once for four products at a time (vec.Dot4,
// with an AVX kernel on amd64), then for the last three, two or one.
// Summing blocks of NormalBlock rows in row order, the two halves of
// SplitRow separately and then added, gives what Minimize computes from
// the columns, bit for bit.
func AddBlock(acc []float64, cols [][]float64, r []float64) {
	n := len(cols)
	col := func(k int) []float64 {
		if k == n {
			return r
		}
		return cols[k]
	}
	for j, cj := range cols {
		row := acc[j*(n+1):]
		k := j
		for ; k+3 <= n; k += 4 {
			v := vec.Dot4(cj, col(k), col(k+1), col(k+2), col(k+3))
			row[k] += v[0]
			row[k+1] += v[1]
			row[k+2] += v[2]
			row[k+3] += v[3]
		}
		switch n + 1 - k {
		case 3:
			// Three left: one Dot4 with the last column twice beats a
			// Dot2 and a Dot (each product is the same either way).
			v := vec.Dot4(cj, col(k), col(k+1), col(k+2), col(k+2))
			row[k] += v[0]
			row[k+1] += v[1]
			row[k+2] += v[2]
		case 2:
			v0, v1 := vec.Dot2(cj, col(k), col(k+1))
			row[k] += v0
			row[k+1] += v1
		case 1:
			row[k] += vec.Dot(cj, r)
		}
	}
}

func gradSmall(a *mat.SymDense, g []float64, f, tol float64) bool {
	rn := math.Sqrt(f)
	for j, v := range g {
		d := math.Sqrt(a.At(j, j))
		if d == 0 {
			continue
		}
		if math.Abs(v)/(d*rn) > tol {
			return false
		}
	}
	return true
}

// gnPredict writes the full Gauss-Newton step dx = -(J'J)^-1 g into dx
// and returns the reduction of the sum of squares it predicts,
// 0.5 g'(J'J)^-1 g, and whether J'J was positive definite so that the
// prediction exists.
func gnPredict(c *mat.Cholesky, a *mat.SymDense, g, dx []float64) (float64, bool) {
	if !c.Factorize(a) {
		return 0, false
	}
	gv := mat.NewVecDense(len(g), append([]float64(nil), g...))
	d := mat.NewVecDense(len(dx), dx)
	if err := c.SolveVecTo(d, gv); err != nil {
		return 0, false
	}
	pred := 0.5 * mat.Dot(gv, d)
	for j := range dx {
		dx[j] = -dx[j]
	}
	return pred, !math.IsNaN(pred)
}

// gnSmall reports whether the Gauss-Newton step from the current point,
// dx = -(J'J)^-1 J'r, predicts a relative reduction of the sum of squares
// (0.5 g'(J'J)^-1 g / f with g = J'r) below tol. When J'J is not
// positive definite the prediction is unavailable and gnSmall reports true.
func gnSmall(c *mat.Cholesky, a *mat.SymDense, g []float64, f, tol float64) bool {
	if !c.Factorize(a) {
		return true
	}
	n := len(g)
	gv := mat.NewVecDense(n, append([]float64(nil), g...))
	var d mat.VecDense
	if err := c.SolveVecTo(&d, gv); err != nil {
		return true
	}
	pred := 0.5 * mat.Dot(gv, &d)
	return pred <= tol*f
}
