package ccf

import (
	"context"
	"fmt"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/vec"
)

// DistributedLagSettings tunes DistributedLag. The zero value gives the
// defaults.
type DistributedLagSettings struct {
	// Lags is the longest lag K of every input's distributed lag; zero
	// means min(24, n/(4 m)) for n samples and m inputs, at least 1.
	Lags int
	// ARP is the order of the autoregressive noise; zero means 1, a
	// negative value means none (ordinary least squares).
	ARP int
	// Names names the inputs (default "x1", "x2", ...); Output names y
	// (default "y").
	Names  []string
	Output string
	// MaxIter bounds the iterations of the least-squares solver; zero
	// means 50.
	MaxIter int
}

// DistributedLagResult is the joint fit of DistributedLag.
type DistributedLagResult struct {
	// Weights[i] holds input i's weights v_i0..v_iK with their standard
	// errors (N is the number of residuals in the final fit).
	Weights []*Weights
	// Const is the constant c; ConstSE its standard error.
	Const, ConstSE float64
	// AR is phi(B) of the noise, ascending powers of B, signs as stored
	// ({1, -phi_1, ..}); {1} for none.
	AR []float64
	// Sigma2 is the innovation variance: the residual sum of squares of
	// the final fit divided by its residual count minus the number of
	// coefficients.
	Sigma2 float64
	// Start is the first sample of the noise series (K), and Noise the
	// preliminary noise n_t = y_t - c - sum_i sum_k v_ik x_i,t-k, of
	// length n with NaN before Start.
	Start int
	Noise []float64
	// Iter is the number of least-squares iterations taken and
	// Converged whether the solver met its convergence tests
	// (a relative reduction of the sum of squares below 1e-14, a step
	// below 1e-12 of the coefficients or a vanishing gradient).
	Iter      int
	Converged bool
}

// DistributedLag fits the linear transfer function model
//
//	y_t = c + sum_i sum_{k=0..K} v_ik x_i,t-k + n_t,   phi(B) n_t = a_t
//
// jointly by conditional least squares: rows t = K..n-1 (no pre-sample
// inputs), the AR noise conditioned on its first p values. The
// Levenberg-Marquardt solver of the estimators minimises the sum of
// squared innovations over the weights, the constant and phi together,
// starting from zero (its first step fits the regression on the lags of
// the inputs and of y, linearised there); the
// standard errors are those of the phi-filtered regression at the
// solution, given phi. Unlike prewhitening one input
// at a time, this is valid when the inputs are correlated with one
// another, and it gives weights with standard errors for each input,
// ready for Identify.
//
// Errors: *SettingError (no inputs, bad settings: see
// DistributedLagSettings.Validate), *SampleError (naming the series and
// index), *SeriesError of kind ErrLength, ErrShort (fewer than twice as
// many rows as coefficients), ErrConstant (a constant series) or
// ErrOverflow (magnitudes whose sums of products overflow), and a
// *ModelError for a rank-deficient regression. Inputs are not modified.
//
// References: Liu, L.-M., Hanssens, D.M. (1982), see the package
// documentation.
func DistributedLag(y []float64, xs [][]float64, s *DistributedLagSettings) (*DistributedLagResult, error) {
	r0, err := distributedLag(y, xs, s)
	return r0, withOp("ccf.DistributedLag", err)
}

func distributedLag(y []float64, xs [][]float64, s *DistributedLagSettings) (*DistributedLagResult, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	var set DistributedLagSettings
	if s != nil {
		set = *s
	}
	if len(xs) == 0 {
		return nil, &SettingError{Setting: "xs", Value: "no inputs", Rule: "must hold at least one input series"}
	}
	out := set.Output
	if out == "" {
		out = "y"
	}
	names, err := inputNames(set.Names, len(xs))
	if err != nil {
		return nil, err
	}
	if err := checkSeriesSet(y, xs, out, names); err != nil {
		return nil, err
	}
	K, p, err := ordersFor(set, len(y), len(xs), out)
	if err != nil {
		return nil, err
	}
	if isConstant(y) {
		return nil, constantError(out, y[0])
	}
	maxIter := set.MaxIter
	if maxIter == 0 {
		maxIter = 50
	}
	d := newDesign(y, xs, K, p)
	if !d.finite() {
		return nil, gramOverflowError(out, names, len(y))
	}
	f, err := d.fit(maxIter)
	if err != nil {
		return nil, err
	}
	if f == nil {
		return nil, singularError(names)
	}
	res := f.result(names)
	if !res.finite() {
		// The factorisation passed its condition test, but the
		// estimates or their standard errors left float64 range: the
		// regression is as good as singular.
		return nil, undeterminedError(names)
	}
	return res, nil
}

// finite reports whether every estimate and standard error of r is a
// finite number.
func (r *DistributedLagResult) finite() bool {
	ok := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	if !ok(r.Sigma2) || !ok(r.Const) || !ok(r.ConstSE) {
		return false
	}
	for _, w := range r.Weights {
		for k := range w.V {
			if !ok(w.V[k]) || !ok(w.SE[k]) {
				return false
			}
		}
	}
	return true
}

// inputNames returns the names of m inputs: the given ones, "x1", "x2",
// ... by position for the missing or empty ones. It refuses more names
// than inputs and a name given twice.
func inputNames(given []string, m int) ([]string, error) {
	if len(given) > m {
		return nil, &SettingError{Setting: "DistributedLagSettings.Names", Value: strconv.Itoa(len(given)) + " names", Rule: "must hold at most one per input (" + strconv.Itoa(m) + ")"}
	}
	names := make([]string, m)
	for i := range names {
		if i < len(given) && given[i] != "" {
			names[i] = given[i]
		} else {
			names[i] = "x" + strconv.Itoa(i+1)
		}
	}
	for i := range names {
		for j := 0; j < i; j++ {
			if names[i] == names[j] {
				return nil, &SettingError{Setting: "DistributedLagSettings.Names", Value: "input " + strconv.Itoa(i+1) + " named " + strconv.Quote(names[i]) + " like input " + strconv.Itoa(j+1), Rule: "must give one name per input (an empty entry is named x1, x2, ... by position)"}
			}
		}
	}
	return names, nil
}

// checkSeriesSet checks the output y (named out) and the inputs: finite
// samples, the inputs as long as y and none of them constant.
func checkSeriesSet(y []float64, xs [][]float64, out string, names []string) error {
	n := len(y)
	if err := checkSeries(out, y); err != nil {
		return err
	}
	for i, x := range xs {
		if len(x) != n {
			return lengthError(out, names[i], n, len(x))
		}
		if err := checkSeries(names[i], x); err != nil {
			return err
		}
		if n > 0 && isConstant(x) {
			return constantError(names[i], x[0])
		}
	}
	return nil
}

// ordersFor returns the longest lag K and the AR order p of the settings
// with their defaults for n samples of m inputs, and checks that the
// series is long enough for them: at least twice as many rows as
// distributed-lag coefficients.
func ordersFor(set DistributedLagSettings, n, m int, out string) (K, p int, err error) {
	K = set.Lags
	if K == 0 {
		K = max(1, min(24, n/(4*m)))
	}
	if K < 0 {
		return 0, 0, &SettingError{Setting: "DistributedLagSettings.Lags", Value: strconv.Itoa(K), Rule: "must be zero or positive (0 means min(24, n/(4 inputs)), at least 1)"}
	}
	p = set.ARP
	if p == 0 {
		p = 1
	}
	if p < 0 {
		p = 0
	}
	// Lags and orders beyond the series cannot fit; checked here so that
	// the counts below cannot overflow.
	if K >= n {
		return 0, 0, shortError(out, n, min(K, math.MaxInt-1)+1, "for lags up to "+strconv.Itoa(K))
	}
	if p >= n {
		return 0, 0, &SettingError{Setting: "DistributedLagSettings.ARP", Value: strconv.Itoa(set.ARP), Rule: "must be below the series length " + strconv.Itoa(n)}
	}
	if m > n {
		return 0, 0, shortError(out, n, m, "for "+strconv.Itoa(m)+" inputs")
	}
	ncoef := 1 + m*(K+1)
	if rows := n - K - p; rows < 2*ncoef {
		return 0, 0, shortError(out, n, K+p+2*ncoef, "for "+strconv.Itoa(ncoef)+" distributed-lag coefficients")
	}
	return K, p, nil
}

// design is the regression of DistributedLag reduced to a small
// equivalent problem.
//
// The extended design E has rows t = K+p..n-1 and Q columns: the
// constant, y at lags 0..p and every x_i at lags 0..K+p, all centred by
// their means. The innovation a_t of any coefficients (c, v, phi) is
// w'E_t for a combination vector w of length Q (with c_0 = 1,
// c_q = -phi_q, the filtered regressor phi(B) x_i,t-k is
// sum_q c_q x_i,t-k-q), and so is each column of the Jacobian. With the
// Gram matrix M = E'E factored as M = U'U (U square, Q by Q), the sum of
// squares w'Mw equals |U w|^2 and J'J, J'r are those of U times the
// combination vectors: the Q residuals U w with Jacobian U dw/dtheta are
// a least-squares problem with the same sum of squares, gradient and
// J'J as the n-row one, as the triangular factor of a QR decomposition
// stands in for a design. Only M and the final noise series cost time
// proportional to n.
type design struct {
	y     []float64     // the output
	xs    [][]float64   // the inputs
	K, p  int           // the longest lag and the AR order
	Q     int           // the columns of E
	my    float64       // the mean of y
	mx    []float64     // the means of the inputs
	gram  *mat.SymDense // M = E'E
	ucol  [][]float64   // ucol[c] is column c of U; nil when M has no factor
	ncoef int           // the constant and the m (K+1) weights
	nrows int           // the rows of E, n - K - p
}

// newDesign forms the Gram matrix of the extended design and its
// factor.
func newDesign(y []float64, xs [][]float64, K, p int) *design {
	n, m := len(y), len(xs)
	d := &design{y: y, xs: xs, K: K, p: p, Q: 1 + (p + 1) + m*(K+p+1),
		ncoef: 1 + m*(K+1), nrows: n - K - p, mx: make([]float64, m)}
	d.my = accurateSum(y) / float64(n)
	for i, x := range xs {
		d.mx[i] = accurateSum(x) / float64(n)
	}
	d.gram = d.gramMatrix()
	d.ucol = squareFactor(d.gram)
	return d
}

// yCol is the column of E holding y at lag q; xCol the column of x_i at
// lag a.
func (d *design) yCol(q int) int    { return 1 + q }
func (d *design) xCol(i, a int) int { return 2 + d.p + i*(d.K+d.p+1) + a }

// coef is the index of v_ik among the distributed-lag coefficients
// (index 0 is the constant).
func (d *design) coef(i, k int) int { return 1 + i*(d.K+1) + k }

// gramMatrix returns M = E'E. Each entry is a lagged product
// sum_t u_{t-a} v_{t-b} of two centred series over the rows; for one
// pair of series and one lag difference these differ only by the terms
// at the two ends of the rows, so productsByLag forms them from one lag
// sum (vec.LagSums) each, adding and removing end terms: the work is
// n times the number of lag differences, not n times Q^2/2.
func (d *design) gramMatrix() *mat.SymDense {
	n, L := len(d.y), d.K+d.p
	// The series as blocks of columns: y (lags 0..p), then every input
	// (lags 0..L), centred.
	series := [][]float64{centred(d.y, d.my)}
	lags := []int{d.p}
	first := []int{d.yCol(0)}
	for i, x := range d.xs {
		series = append(series, centred(x, d.mx[i]))
		lags = append(lags, L)
		first = append(first, d.xCol(i, 0))
	}
	M := mat.NewSymDense(d.Q, nil)
	M.SetSym(0, 0, float64(n-L))
	for s, u := range series {
		// The constant column: sum_t u_{t-a}, moved one row at a time.
		sum := accurateSum(u[L:])
		for a := 0; a <= lags[s]; a++ {
			if a > 0 {
				sum += u[L-a] - u[n-a]
			}
			M.SetSym(0, first[s]+a, sum)
		}
		for t := s; t < len(series); t++ {
			v := series[t]
			// Entries with b >= a, then (a pair of different series) b < a.
			productsByLag(func(a, b int, x float64) { M.SetSym(first[s]+a, first[t]+b, x) }, u, v, lags[s], lags[t], L, false)
			if t != s {
				productsByLag(func(b, a int, x float64) { M.SetSym(first[s]+a, first[t]+b, x) }, v, u, lags[t], lags[s], L, true)
			}
		}
	}
	return M
}

// centred returns x minus mu, a new slice.
func centred(x []float64, mu float64) []float64 {
	c := make([]float64, len(x))
	for i, v := range x {
		c[i] = v - mu
	}
	return c
}

// productsByLag calls set(a, b, sum_{r=t0}^{n-1} u_{r-a} v_{r-b}) for every
// a <= au, b <= bv with b >= a (b > a when strict); t0 >= bv. For a lag
// difference d = b - a the sums at b and b+1 differ in one term at each
// end, so one vec.LagSums over the rows at b = bv, d = 0..bv, and two
// terms per further entry give them all.
func productsByLag(set func(a, b int, x float64), u, v []float64, au, bv, t0 int, strict bool) {
	n := len(u)
	F := make([]float64, bv+1)
	vec.LagSums(F, v[t0-bv:n-bv], u[t0-bv:n])
	for d := 0; d <= bv; d++ {
		if strict && d == 0 {
			continue
		}
		h := F[d] // the sum at b = bv
		for b := bv; b >= d; b-- {
			if b < bv {
				h += v[n-1-b]*u[n-1-b+d] - v[t0-b-1]*u[t0-b-1+d]
			}
			if a := b - d; a <= au {
				set(a, b, h)
			}
		}
	}
}

// finite reports whether every entry of the Gram matrix is finite.
func (d *design) finite() bool {
	for i := 0; i < d.Q; i++ {
		for j := i; j < d.Q; j++ {
			if !finite(d.gram.At(i, j)) {
				return false
			}
		}
	}
	return true
}

// gramOverflowError is the error of series whose sums of products
// overflow: a *SeriesError of kind ErrOverflow naming the output and the
// inputs, with the magnitude sqrt(MaxFloat64/n) below which a sum of n
// squares cannot overflow.
func gramOverflowError(out string, names []string, n int) error {
	lim := math.Sqrt(math.MaxFloat64 / float64(n))
	return &SeriesError{Series: out + ", " + strings.Join(names, ", "), Kind: ErrOverflow,
		Detail: fmt.Sprintf("the sums of products of the lags overflow; keep magnitudes below about %.3g: rescale the series", lim)}
}

// squareFactor returns the columns of a square U with U'U = M: the
// Cholesky factor when M is positive definite, else (an output that the
// lags explain exactly makes M singular) diag(sqrt(lambda)) V' from the
// eigendecomposition M = V diag(lambda) V', rounding's negative
// eigenvalues taken as zero. It returns nil when neither exists.
func squareFactor(M *mat.SymDense) [][]float64 {
	Q := M.SymmetricDim()
	ucol := make([][]float64, Q)
	for c := range ucol {
		ucol[c] = make([]float64, Q)
	}
	// Cholesky without the condition estimate of mat.Cholesky: only the
	// factor is wanted here.
	raw := M.RawSymmetric()
	a := blas64.Symmetric{N: Q, Stride: Q, Uplo: blas.Upper, Data: make([]float64, Q*Q)}
	for i := 0; i < Q; i++ {
		copy(a.Data[i*Q+i:(i+1)*Q], raw.Data[i*raw.Stride+i:i*raw.Stride+Q])
	}
	if u, ok := lapack64.Potrf(a); ok {
		for k := 0; k < Q; k++ {
			for c := k; c < Q; c++ {
				ucol[c][k] = u.Data[k*u.Stride+c]
			}
		}
		return ucol
	}
	var eig mat.EigenSym
	if !eig.Factorize(M, true) {
		return nil
	}
	var V mat.Dense
	eig.VectorsTo(&V)
	for k, l := range eig.Values(nil) {
		s := math.Sqrt(math.Max(l, 0))
		for c := 0; c < Q; c++ {
			ucol[c][k] = s * V.At(c, k)
		}
	}
	return ucol
}

// filter returns the coefficients c_q of phi(B): c_0 = 1, c_q = -phi_q
// (phi shorter than p counts as zero).
func (d *design) filter(phi []float64) []float64 {
	c := make([]float64, d.p+1)
	c[0] = 1
	for q := range phi {
		c[q+1] = -phi[q]
	}
	return c
}

// innovation writes into w the combination vector of the innovations
// a_t = phi(B) n_t for the coefficients beta (the constant of the
// centred model, then v_ik) and phi.
func (d *design) innovation(w, beta, phi []float64) {
	clear(w)
	c := d.filter(phi)
	csum := 0.0
	for q, cq := range c {
		csum += cq
		w[d.yCol(q)] = cq
		for i := range d.xs {
			for k := 0; k <= d.K; k++ {
				w[d.xCol(i, k+q)] -= cq * beta[d.coef(i, k)]
			}
		}
	}
	w[0] = -csum * beta[0]
}

// noiseLag writes into w the combination vector of n_{t-q}, the noise
// y - c - sum v x at lag q, times -1: the derivative of a_t by phi_q.
func (d *design) noiseLag(w, beta []float64, q int) {
	clear(w)
	w[0] = beta[0]
	w[d.yCol(q)] = -1
	for i := range d.xs {
		for k := 0; k <= d.K; k++ {
			w[d.xCol(i, k+q)] = beta[d.coef(i, k)]
		}
	}
}

// regressor writes into w the combination vector of the derivative of
// a_t by coefficient j (0 the constant, else v_ik): minus the
// phi-filtered regressor.
func (d *design) regressor(w []float64, c []float64, j int) {
	clear(w)
	if j == 0 {
		for _, cq := range c {
			w[0] -= cq
		}
		return
	}
	i, k := (j-1)/(d.K+1), (j-1)%(d.K+1)
	for q, cq := range c {
		w[d.xCol(i, k+q)] = -cq
	}
}

// mulU writes U w into dst.
func (d *design) mulU(dst, w []float64) {
	clear(dst)
	for c, wc := range w {
		if wc == 0 {
			continue
		}
		for k, u := range d.ucol[c] {
			dst[k] += wc * u
		}
	}
}

// problem returns the reduced least-squares problem in the
// distributed-lag coefficients (the constant, then v_ik) and phi.
func (d *design) problem() lm.Problem {
	w := make([]float64, d.Q)
	return lm.Problem{M: d.Q, N: d.ncoef + d.p, WritesAll: true,
		Eval: func(x, r []float64, jac [][]float64) error {
			beta, phi := x[:d.ncoef], x[d.ncoef:]
			d.innovation(w, beta, phi)
			d.mulU(r, w)
			if jac == nil {
				return nil
			}
			c := d.filter(phi)
			for j := 0; j < d.ncoef; j++ {
				d.regressor(w, c, j)
				d.mulU(jac[j], w)
			}
			for q := 1; q <= d.p; q++ {
				d.noiseLag(w, beta, q)
				d.mulU(jac[d.ncoef+q-1], w)
			}
			return nil
		}}
}

// jointFit is the outcome of design.fit.
type jointFit struct {
	d         *design
	beta      []float64 // constant of the centred model, then v_ik
	phi       []float64
	cov       *mat.SymDense // (X'X)^-1 of the phi-filtered regression
	sigma2    float64
	iter      int
	converged bool
}

// fit minimises the sum of squared innovations over the coefficients
// and phi by internal/lm, from zero, and takes the covariance of the
// coefficients from the regression filtered by the fitted phi. It
// returns nil for a singular regression, and an error when the solver
// cannot start.
func (d *design) fit(maxIter int) (*jointFit, error) {
	if d.ucol == nil {
		return nil, nil
	}
	x0 := make([]float64, d.ncoef+d.p)
	res, err := lm.Minimize(context.Background(), d.problem(), x0, &lm.Settings{MaxIter: maxIter})
	if err != nil {
		return nil, startError(err)
	}
	f := &jointFit{d: d, iter: res.Iter, converged: res.Reason.Converged(),
		beta: res.X[:d.ncoef], phi: res.X[d.ncoef:]}
	f.sigma2 = math.Max(res.SSQ, 0) / float64(d.nrows-d.ncoef)
	f.cov = d.filteredInverse(f.phi)
	if f.cov == nil {
		return nil, nil
	}
	return f, nil
}

// startError is the error of a fit whose sum of squares cannot be
// computed at its start (lm.ErrStart, from magnitudes whose squares
// overflow).
func startError(err error) error {
	return &ModelError{Part: "the distributed-lag regression",
		Problem: "its sum of squares cannot be computed (" + err.Error() + "); rescale the series", Err: err}
}

// filteredInverse returns (X'X)^-1 of the regression filtered by phi
// (X'X = J'J of the coefficients given phi), or nil when it is singular.
func (d *design) filteredInverse(phi []float64) *mat.SymDense {
	c := d.filter(phi)
	w := make([]float64, d.Q)
	cols := make([][]float64, d.ncoef)
	for j := range cols {
		cols[j] = make([]float64, d.Q)
		d.regressor(w, c, j)
		d.mulU(cols[j], w)
	}
	G := mat.NewSymDense(d.ncoef, nil)
	for j := range cols {
		for k := j; k < d.ncoef; k++ {
			G.SetSym(j, k, vec.Dot(cols[j], cols[k]))
		}
	}
	return gramInverse(G)
}

// gramInverse returns G^-1 by a Cholesky factorisation of the
// diagonally scaled G, or nil when G is singular: a non-positive
// diagonal, a failed factorisation or a condition number of the scaled
// matrix above 1e12 (about 1e-4 of 1/eps: below it the inverse keeps at
// least four correct digits, common practice for a rank test).
func gramInverse(G *mat.SymDense) *mat.SymDense {
	n := G.SymmetricDim()
	sc := make([]float64, n)
	for j := 0; j < n; j++ {
		d := G.At(j, j)
		if !(d > 0) {
			return nil
		}
		sc[j] = 1 / math.Sqrt(d)
	}
	S := mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			S.SetSym(i, j, G.At(i, j)*sc[i]*sc[j])
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(S) || ch.Cond() > 1e12 {
		return nil
	}
	var si mat.SymDense
	if err := ch.InverseTo(&si); err != nil {
		return nil
	}
	inv := mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			inv.SetSym(i, j, si.At(i, j)*sc[i]*sc[j])
		}
	}
	return inv
}

// result assembles the DistributedLagResult of the fit for the inputs
// named names.
func (f *jointFit) result(names []string) *DistributedLagResult {
	d := f.d
	res := &DistributedLagResult{Iter: f.iter, Converged: f.converged, Sigma2: f.sigma2, Start: d.K}
	res.Const, res.ConstSE = f.constant()
	res.Noise = f.noise(res.Const)
	res.AR = make([]float64, d.p+1)
	res.AR[0] = 1
	for k := 1; k <= d.p; k++ {
		res.AR[k] = -f.phi[k-1]
	}
	for i := range d.xs {
		w := &Weights{Input: names[i], V: make([]float64, d.K+1), SE: make([]float64, d.K+1), N: d.nrows,
			Cov: mat.NewSymDense(d.K+1, nil)}
		for k := 0; k <= d.K; k++ {
			j := d.coef(i, k)
			w.V[k] = f.beta[j]
			w.SE[k] = math.Sqrt(f.sigma2 * f.cov.At(j, j))
			for l := k; l <= d.K; l++ {
				w.Cov.SetSym(k, l, f.sigma2*f.cov.At(j, d.coef(i, l)))
			}
		}
		res.Weights = append(res.Weights, w)
	}
	return res
}

// constant returns the constant c of the model in the original units,
// y - my = c~ + sum v (x - mx), and its standard error.
func (f *jointFit) constant() (c, se float64) {
	d := f.d
	g := make([]float64, d.ncoef)
	g[0] = 1
	c = d.my + f.beta[0]
	for i := range d.xs {
		for k := 0; k <= d.K; k++ {
			j := d.coef(i, k)
			c -= f.beta[j] * d.mx[i]
			g[j] = -d.mx[i]
		}
	}
	gv := mat.NewVecDense(d.ncoef, g)
	var Cg mat.VecDense
	Cg.MulVec(f.cov, gv)
	return c, math.Sqrt(f.sigma2 * math.Max(mat.Dot(gv, &Cg), 0))
}

// noise returns the preliminary noise series n_t = y_t - c - sum v x,
// NaN before lag K.
func (f *jointFit) noise(c float64) []float64 {
	d := f.d
	n := len(d.y)
	noise := make([]float64, n)
	for t := 0; t < d.K; t++ {
		noise[t] = math.NaN()
	}
	for t := d.K; t < n; t++ {
		noise[t] = d.y[t] - c
	}
	for i, x := range d.xs {
		for k := 0; k <= d.K; k++ {
			v := f.beta[d.coef(i, k)]
			dst := noise[d.K:]
			src := x[d.K-k : n-k]
			for t := range dst {
				dst[t] -= v * src[t]
			}
		}
	}
	return noise
}
