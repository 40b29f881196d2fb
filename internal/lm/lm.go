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
	set, err := withDefaults(s, p.M)
	if err != nil {
		return Result{}, err
	}
	if ctx == nil {
		ctx = context.Background()
	}
	size := (2*p.N + 2) * p.M
	if p.Normal != nil {
		size = 2 * p.M
	}
	wk := getWork(size, !p.WritesAll)
	defer workPool.Put(wk)
	sr := newSearch(p, set, x0, *wk)
	if err := sr.begin(); err != nil {
		return Result{}, err
	}
	reason := sr.run(ctx)
	return sr.result(reason), nil
}

// withDefaults checks the settings s (nil for the defaults) and fills in
// the defaults; FTol is raised to the rounding floor of a sum of m
// squares.
func withDefaults(s *Settings, m int) (Settings, error) {
	var set Settings
	if s != nil {
		set = *s
	}
	if set.MaxIter < 0 || !(set.FTol >= 0) || !(set.XTol >= 0) || !(set.GTol >= 0) {
		return Settings{}, fmt.Errorf("lm: malformed settings (MaxIter=%d, FTol=%v, XTol=%v, GTol=%v): negative or NaN", set.MaxIter, set.FTol, set.XTol, set.GTol)
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
	set.FTol = math.Max(set.FTol, 10*epsilon*math.Sqrt(float64(m)))
	if set.XTol == 0 {
		set.XTol = 1e-12
	}
	if set.GTol == 0 {
		set.GTol = 1e-12
	}
	return set, nil
}

// search is the state of one Minimize call: the current point x with
// its residuals r, J'J (a) and J'r (g) and sum of squares f; the trial
// point's buffers (xt, tr, tjac, ta, tg), swapped with the current ones
// when a step is accepted; the damping mu and its growth factor nu; and
// the relative reductions of the last two accepted steps.
type search struct {
	p                Problem
	set              Settings
	x, xt, r, tr     []float64
	jac, tjac        [][]float64
	acc              []float64 // scratch of normal, or Problem.Normal's accumulator
	a, ta            *mat.SymDense
	g, tg            []float64
	f                float64
	mu, nu           float64
	lastRel, prevRel float64
	dx               []float64 // the step
	aug              *mat.SymDense
	chol, gnChol     mat.Cholesky
	iter, evals      int
}

// newSearch sets up the search from x0 with the residual and Jacobian
// buffers cut from back.
func newSearch(p Problem, set Settings, x0, back []float64) *search {
	m, n := p.M, p.N
	sr := &search{
		p: p, set: set,
		x: append([]float64(nil), x0...), xt: make([]float64, n),
		r: back[:m:m], tr: back[m : 2*m : 2*m],
		acc: make([]float64, 2*n*(n+1)),
		a:   mat.NewSymDense(n, nil), ta: mat.NewSymDense(n, nil),
		g: make([]float64, n), tg: make([]float64, n),
		dx: make([]float64, n), aug: mat.NewSymDense(n, nil),
		// The damping multiplies D = diag(J'J) (Marquardt's scaling), so
		// mu is dimensionless and starts small: the first step is nearly
		// Gauss-Newton.
		mu: 1e-3, nu: 2,
		lastRel: math.Inf(1), prevRel: math.Inf(1),
	}
	if p.Normal == nil {
		sr.jac, sr.tjac = cols(back[2*m:], n, m), cols(back[(n+2)*m:], n, m)
	}
	return sr
}

// evalJ computes the residuals r, J'J (a) and J'r (g) at x, with the
// Jacobian columns jac or through Problem.Normal.
func (sr *search) evalJ(x, r []float64, jac [][]float64, a *mat.SymDense, g []float64) error {
	sr.evals++
	if sr.p.Normal == nil {
		if err := sr.p.Eval(x, r, jac); err != nil {
			return err
		}
		normal(a, g, jac, r, sr.acc)
		return nil
	}
	n := sr.p.N
	w := n * (n + 1)
	clear(sr.acc[:w])
	if err := sr.p.Normal(x, r, sr.acc[:w]); err != nil {
		return err
	}
	fromAcc(a, g, sr.acc[:w])
	return nil
}

// begin evaluates the start point; a failure or a sum of squares that is
// not finite is ErrStart.
func (sr *search) begin() error {
	if err := sr.evalJ(sr.x, sr.r, sr.jac, sr.a, sr.g); err != nil {
		return fmt.Errorf("%w: %v", ErrStart, err)
	}
	sr.f = ssq(sr.r)
	if math.IsNaN(sr.f) || math.IsInf(sr.f, 0) {
		return fmt.Errorf("%w: sum of squares is %v", ErrStart, sr.f)
	}
	return nil
}

// run iterates until a stopping rule holds, ctx is done or MaxIter
// iterations are taken, and says why it stopped.
func (sr *search) run(ctx context.Context) Reason {
	for it := 0; it < sr.set.MaxIter; it++ {
		if ctx.Err() != nil {
			return Canceled
		}
		sr.iter = it + 1
		if reason, stop := sr.converged(it); stop {
			return reason
		}
		if reason, stop := sr.step(); stop {
			return reason
		}
	}
	return IterationLimit
}

// converged applies the stopping rules checked before a step of iteration
// it: a vanishing gradient, small reductions, and a last Gauss-Newton
// step that predicts less than FTol (finalStep).
func (sr *search) converged(it int) (Reason, bool) {
	set := &sr.set
	if sr.f == 0 || gradSmall(sr.a, sr.g, sr.f, set.GTol) {
		return SmallGradient, true
	}
	// The last accepted step reduced the sum of squares by less than
	// FTol (relative): stop if a full Gauss-Newton step would not do
	// better either, so that a slow damped step in a flat valley is not
	// taken for convergence.
	// Two successive small reductions also stop: the sum of squares is
	// then at its rounding floor, where the prediction is noise too.
	if sr.lastRel < set.FTol && (sr.prevRel < set.FTol || gnSmall(&sr.gnChol, sr.a, sr.g, sr.f, set.FTol)) {
		return SmallReduction, true
	}
	if it > 0 && sr.lastRel < math.Inf(1) && sr.finalStep() {
		return SmallReduction, true
	}
	return 0, false
}

// finalStep handles the point after an accepted step where a full
// Gauss-Newton step from a positive definite J'J predicts less than FTol
// (relative): near the minimum the quadratic model is accurate, and
// taking that step as an iteration would cost a whole evaluation
// (residuals and Jacobian) for a change below the tolerance. The step is
// taken with residuals only and kept when it does not increase the sum
// of squares. It reports whether the search stops here.
func (sr *search) finalStep() bool {
	pred, ok := gnPredict(&sr.gnChol, sr.a, sr.g, sr.dx)
	if !ok || pred > sr.set.FTol*sr.f {
		return false
	}
	for j := range sr.x {
		sr.xt[j] = sr.x[j] + sr.dx[j]
	}
	err := sr.p.Eval(sr.xt, sr.tr, nil)
	sr.evals++
	if err == nil {
		if ft := ssq(sr.tr); ft <= sr.f {
			sr.x, sr.xt = sr.xt, sr.x
			sr.r, sr.tr = sr.tr, sr.r
			sr.f = ft
		}
	}
	return true
}

// step solves the damped normal equations, evaluates the trial point and
// accepts or rejects it, adjusting the damping; it reports a stop with
// its reason (a negligible step, a sum of squares at its rounding floor,
// or damping beyond its upper limit).
func (sr *search) step() (Reason, bool) {
	factored, solved := sr.solveDamped()
	if !factored {
		return sr.raiseDamping()
	}
	if !solved {
		// A solve refused (J'J + mu D too ill-conditioned) raises the
		// damping and tries again; the next factorisation decides on
		// stalling.
		sr.raiseDamping()
		return 0, false
	}
	small := true
	for j := range sr.x {
		sr.xt[j] = sr.x[j] + sr.dx[j]
		if math.Abs(sr.dx[j]) > sr.set.XTol*(math.Abs(sr.x[j])+sr.set.XTol) {
			small = false
		}
	}
	if small {
		return SmallStep, true
	}
	pred := sr.predicted()
	var ft float64
	err := sr.evalJ(sr.xt, sr.tr, sr.tjac, sr.ta, sr.tg)
	if err == nil {
		ft = ssq(sr.tr)
	}
	if err != nil || math.IsNaN(ft) || math.IsInf(ft, 0) || ft >= sr.f {
		if err == nil && ft-sr.f <= sr.set.FTol*sr.f && (sr.lastRel < sr.set.FTol || gnSmall(&sr.gnChol, sr.a, sr.g, sr.f, sr.set.FTol)) {
			// A step that cannot reduce the sum of squares, after a
			// tiny reduction or where a full Gauss-Newton step
			// predicts less than FTol (a start at the minimum): the
			// sum of squares is at its rounding floor.
			return SmallReduction, true
		}
		return sr.raiseDamping()
	}
	sr.accept(ft, pred)
	return 0, false
}

// solveDamped writes into dx the solution of (J'J + mu D) dx = -J'r,
// D = diag(J'J) (1 for a zero diagonal entry). It reports whether the
// matrix was positive definite (factored) and whether the solve
// succeeded.
func (sr *search) solveDamped() (factored, solved bool) {
	n := sr.p.N
	sr.aug.CopySym(sr.a)
	for j := 0; j < n; j++ {
		d := sr.a.At(j, j)
		if d == 0 {
			d = 1
		}
		sr.aug.SetSym(j, j, sr.a.At(j, j)+sr.mu*d)
	}
	if !sr.chol.Factorize(sr.aug) {
		return false, false
	}
	rhs := mat.NewVecDense(n, nil)
	for j := range sr.g {
		rhs.SetVec(j, -sr.g[j])
	}
	sol := mat.NewVecDense(n, sr.dx)
	return true, sr.chol.SolveVecTo(sol, rhs) == nil
}

// raiseDamping multiplies mu by nu and doubles nu after a failed step;
// damping beyond 1e30 stops the search (Stalled).
func (sr *search) raiseDamping() (Reason, bool) {
	sr.mu *= sr.nu
	sr.nu *= 2
	if sr.mu > 1e30 {
		return Stalled, true
	}
	return 0, false
}

// predicted returns the reduction of the sum of squares the linear model
// predicts for the step dx: -dx'g - 0.5 dx'(J'J)dx = 0.5 dx'(mu D dx - g).
func (sr *search) predicted() float64 {
	pred := 0.0
	for j, dxj := range sr.dx {
		d := sr.a.At(j, j)
		if d == 0 {
			d = 1
		}
		pred += 0.5 * dxj * (sr.mu*d*dxj - sr.g[j])
	}
	return pred
}

// accept moves to the trial point with sum of squares ft and lowers the
// damping by Nielsen's rule from the ratio of the actual to the
// predicted reduction pred.
func (sr *search) accept(ft, pred float64) {
	rho := (sr.f - ft) / math.Max(pred, math.SmallestNonzeroFloat64)
	sr.mu *= math.Max(1.0/3, 1-math.Pow(2*rho-1, 3))
	sr.nu = 2
	rel := (sr.f - ft) / sr.f
	sr.x, sr.xt = sr.xt, sr.x
	sr.r, sr.tr = sr.tr, sr.r
	sr.jac, sr.tjac = sr.tjac, sr.jac
	sr.a, sr.ta = sr.ta, sr.a
	sr.g, sr.tg = sr.tg, sr.g
	sr.f = ft
	sr.prevRel, sr.lastRel = sr.lastRel, rel
}

// result returns the Result at the current point with (J'J)^-1 there
// (nil when J'J is singular).
func (sr *search) result(reason Reason) Result {
	res := Result{
		X:      sr.x,
		SSQ:    sr.f,
		Resid:  append([]float64(nil), sr.r...), // r is in the reused buffer
		Iter:   sr.iter,
		Evals:  sr.evals,
		Reason: reason,
	}
	var c mat.Cholesky
	if c.Factorize(sr.a) {
		inv := mat.NewSymDense(sr.p.N, nil)
		if err := c.InverseTo(inv); err == nil {
			res.JTJInv = inv
		}
	}
	return res
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
