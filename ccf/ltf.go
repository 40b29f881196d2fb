package ccf

import (
	"math"
	"strconv"

	"gonum.org/v1/gonum/mat"
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
	// MaxIter bounds the generalised least-squares iterations; zero
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
	// Iter is the number of iterations taken and Converged whether the
	// coefficients settled (relative change below 1e-10).
	Iter      int
	Converged bool
}

// DistributedLag fits the linear transfer function model
//
//	y_t = c + sum_i sum_{k=0..K} v_ik x_i,t-k + n_t,   phi(B) n_t = a_t
//
// jointly by conditional least squares: rows t = K..n-1 (no pre-sample
// inputs), the AR noise conditioned on its first p values. The solution
// is reached by iterating ordinary least squares on the phi-filtered
// regression and an autoregression (least squares on lags 1..p) of the
// noise, until the coefficients settle; the standard errors are those of
// the last filtered regression, given phi. Unlike prewhitening one input
// at a time, this is valid when the inputs are correlated with one
// another, and it gives weights with standard errors for each input,
// ready for Identify.
//
// Errors: *SettingError (no inputs, bad settings: see
// DistributedLagSettings.Validate), *SampleError (naming the series and
// index), *SeriesError of kind ErrLength, ErrShort (fewer than twice as
// many rows as coefficients) or ErrConstant (a constant series), and a
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
	m := len(xs)
	if m == 0 {
		return nil, &SettingError{Setting: "xs", Value: "no inputs", Rule: "must hold at least one input series"}
	}
	out := set.Output
	if out == "" {
		out = "y"
	}
	if len(set.Names) > m {
		return nil, &SettingError{Setting: "DistributedLagSettings.Names", Value: strconv.Itoa(len(set.Names)) + " names", Rule: "must hold at most one per input (" + strconv.Itoa(m) + ")"}
	}
	names := make([]string, m)
	for i := range names {
		if i < len(set.Names) && set.Names[i] != "" {
			names[i] = set.Names[i]
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
	n := len(y)
	if err := checkSeries(out, y); err != nil {
		return nil, err
	}
	for i, x := range xs {
		if len(x) != n {
			return nil, lengthError(out, names[i], n, len(x))
		}
		if err := checkSeries(names[i], x); err != nil {
			return nil, err
		}
		if n > 0 && isConstant(x) {
			return nil, constantError(names[i], x[0])
		}
	}
	K := set.Lags
	if K == 0 {
		K = max(1, min(24, n/(4*m)))
	}
	if K < 0 {
		return nil, &SettingError{Setting: "DistributedLagSettings.Lags", Value: strconv.Itoa(K), Rule: "must be zero or positive (0 means min(24, n/(4 inputs)), at least 1)"}
	}
	p := set.ARP
	if p == 0 {
		p = 1
	}
	if p < 0 {
		p = 0
	}
	// Lags and orders beyond the series cannot fit; checked here so that
	// the counts below cannot overflow.
	if K >= n {
		return nil, shortError(out, n, min(K, math.MaxInt-1)+1, "for lags up to "+strconv.Itoa(K))
	}
	if p >= n {
		return nil, &SettingError{Setting: "DistributedLagSettings.ARP", Value: strconv.Itoa(set.ARP), Rule: "must be below the series length " + strconv.Itoa(n)}
	}
	if m > n {
		return nil, shortError(out, n, m, "for "+strconv.Itoa(m)+" inputs")
	}
	maxIter := set.MaxIter
	if maxIter == 0 {
		maxIter = 50
	}
	ncoef := 1 + m*(K+1)
	rows := n - K - p
	if rows < 2*ncoef {
		return nil, shortError(out, n, K+p+2*ncoef, "for "+strconv.Itoa(ncoef)+" distributed-lag coefficients")
	}
	if n > 0 && isConstant(y) {
		return nil, constantError(out, y[0])
	}
	f := ltfFit(y, xs, K, p, maxIter)
	if f == nil {
		return nil, singularError(names)
	}
	res := &DistributedLagResult{Iter: f.iter, Converged: f.converged, Sigma2: f.sigma2, Start: K, Noise: f.noise}
	res.Const, res.ConstSE = f.c, f.cSE
	res.AR = make([]float64, p+1)
	res.AR[0] = 1
	for k := 1; k <= p; k++ {
		res.AR[k] = -f.phi[k-1]
	}
	for i := range xs {
		w := &Weights{Input: names[i], V: make([]float64, K+1), SE: make([]float64, K+1), N: rows,
			Cov: mat.NewSymDense(K+1, nil)}
		for k := 0; k <= K; k++ {
			j := 1 + i*(K+1) + k
			w.V[k] = f.beta[j]
			w.SE[k] = math.Sqrt(f.sigma2 * f.cov.At(j, j))
			for l := k; l <= K; l++ {
				w.Cov.SetSym(k, l, f.sigma2*f.cov.At(j, 1+i*(K+1)+l))
			}
		}
		res.Weights = append(res.Weights, w)
	}
	return res, nil
}

// ltfResult is the outcome of ltfFit.
type ltfResult struct {
	beta      []float64 // constant of the centred model, then v_ik
	cov       *mat.SymDense
	sigma2    float64
	c, cSE    float64 // constant of the model in the original units
	phi       []float64
	noise     []float64
	iter      int
	converged bool
}

// ltfFit runs the iterated generalised least squares of DistributedLag.
//
// Every quantity an iteration needs is a quadratic form in the Gram
// matrix M = E'E of one extended design E, built once: rows t = K+p..n-1,
// columns the constant, y at lags 0..p and every x_i at lags 0..K+p (all
// centred by their means). With c_0 = 1, c_q = -phi_q, the filtered
// regressor phi(B) x_i,t-k is sum_q c_q x_i,t-k-q, a fixed combination of
// columns of E; so the filtered normal equations, the residual sum of
// squares and the lagged products of the noise for the AR update are all
// W'MW for small combination matrices W. An iteration then costs nothing
// that grows with n; only M and the final noise series do.
func ltfFit(y []float64, xs [][]float64, K, p, maxIter int) *ltfResult {
	n, m := len(y), len(xs)
	L := K + p
	T0 := L
	Q := 1 + (p + 1) + m*(L+1)
	yIdx := func(q int) int { return 1 + q }
	xIdx := func(i, a int) int { return 2 + p + i*(L+1) + a }
	my := accurateSum(y) / float64(n)
	mx := make([]float64, m)
	for i, x := range xs {
		mx[i] = accurateSum(x) / float64(n)
	}
	// Gram matrix of the centred extended design, in blocks of rows.
	M := mat.NewSymDense(Q, nil)
	const blk = 1024
	eb := mat.NewDense(blk, Q, nil)
	for t0 := T0; t0 < n; t0 += blk {
		rb := min(blk, n-t0)
		e := eb
		if rb < blk {
			e = eb.Slice(0, rb, 0, Q).(*mat.Dense)
		}
		for r := 0; r < rb; r++ {
			t := t0 + r
			row := eb.RawRowView(r)
			row[0] = 1
			for q := 0; q <= p; q++ {
				row[yIdx(q)] = y[t-q] - my
			}
			for i, x := range xs {
				base := xIdx(i, 0)
				for a := 0; a <= L; a++ {
					row[base+a] = x[t-a] - mx[i]
				}
			}
		}
		M.SymRankK(M, 1, e.T())
	}
	ncoef := 1 + m*(K+1)
	rows := n - T0
	phi := make([]float64, p)
	beta := make([]float64, ncoef)
	prev := make([]float64, ncoef)
	W := mat.NewDense(Q, ncoef, nil)
	wy := mat.NewVecDense(Q, nil)
	var G mat.Dense
	var MW mat.Dense
	var h, Mwy mat.VecDense
	res := &ltfResult{}
	for it := 1; it <= maxIter; it++ {
		// Combination matrices for the filter c = (1, -phi_1, ..).
		W.Zero()
		wy.Zero()
		csum := 1.0
		for q := 1; q <= p; q++ {
			csum -= phi[q-1]
		}
		W.Set(0, 0, csum)
		for q := 0; q <= p; q++ {
			cq := 1.0
			if q > 0 {
				cq = -phi[q-1]
			}
			wy.SetVec(yIdx(q), cq)
			for i := 0; i < m; i++ {
				for k := 0; k <= K; k++ {
					W.Set(xIdx(i, k+q), 1+i*(K+1)+k, cq)
				}
			}
		}
		MW.Mul(M, W)
		G.Mul(W.T(), &MW)
		Mwy.MulVec(M, wy)
		h.MulVec(W.T(), &Mwy)
		zz := mat.Dot(wy, &Mwy)
		b, cov, ok := gramSolve(&G, &h)
		if !ok {
			return nil
		}
		copy(beta, b)
		// SSQ = z'z - 2 b'h + b'G b.
		bv := mat.NewVecDense(ncoef, beta)
		var Gb mat.VecDense
		Gb.MulVec(&G, bv)
		ssq := zz - 2*mat.Dot(bv, &h) + mat.Dot(bv, &Gb)
		res.cov = cov
		res.sigma2 = math.Max(ssq, 0) / float64(rows-ncoef)
		res.iter = it
		if p == 0 {
			res.converged = true
			break
		}
		change, scale := 0.0, 0.0
		for j := range beta {
			change = math.Max(change, math.Abs(beta[j]-prev[j]))
			scale = math.Max(scale, math.Abs(beta[j]))
		}
		if it > 1 && change <= 1e-10*math.Max(scale, 1e-300) {
			res.converged = true
			break
		}
		copy(prev, beta)
		// AR update: products of the unfiltered noise at lags q, r in
		// 0..p over the same rows, n_{t-q} = w_q' E_t.
		wn := make([]*mat.VecDense, p+1)
		for q := 0; q <= p; q++ {
			v := mat.NewVecDense(Q, nil)
			v.SetVec(0, -beta[0])
			v.SetVec(yIdx(q), 1)
			for i := 0; i < m; i++ {
				for k := 0; k <= K; k++ {
					v.SetVec(xIdx(i, k+q), -beta[1+i*(K+1)+k])
				}
			}
			wn[q] = v
		}
		A := make([]float64, p*p)
		rhs := make([]float64, p)
		var Mv mat.VecDense
		for q := 0; q <= p; q++ {
			Mv.MulVec(M, wn[q])
			for r := 1; r <= p; r++ {
				sqr := mat.Dot(wn[r], &Mv)
				if q == 0 {
					rhs[r-1] = sqr
				} else {
					A[(q-1)*p+(r-1)] = sqr
				}
			}
		}
		if ph, ok := solveSmall(A, rhs, p); ok {
			phi = ph
		} else {
			phi = make([]float64, p)
		}
	}
	res.beta = beta
	res.phi = phi
	// The constant in original units: y - my = c~ + sum v (x - mx).
	g := make([]float64, ncoef)
	g[0] = 1
	c := my + beta[0]
	for i := 0; i < m; i++ {
		for k := 0; k <= K; k++ {
			j := 1 + i*(K+1) + k
			c -= beta[j] * mx[i]
			g[j] = -mx[i]
		}
	}
	res.c = c
	gv := mat.NewVecDense(ncoef, g)
	var Cg mat.VecDense
	Cg.MulVec(res.cov, gv)
	res.cSE = math.Sqrt(res.sigma2 * math.Max(mat.Dot(gv, &Cg), 0))
	// The preliminary noise series.
	noise := make([]float64, n)
	for t := 0; t < K; t++ {
		noise[t] = math.NaN()
	}
	for t := K; t < n; t++ {
		noise[t] = y[t] - c
	}
	for i, x := range xs {
		for k := 0; k <= K; k++ {
			v := beta[1+i*(K+1)+k]
			dst := noise[K:]
			src := x[K-k : n-k]
			for t := range dst {
				dst[t] -= v * src[t]
			}
		}
	}
	res.noise = noise
	return res
}

// gramSolve solves the normal equations G b = h by a Cholesky
// factorisation of the diagonally scaled G and returns b and G^-1; ok is
// false when G is (numerically) singular.
func gramSolve(G *mat.Dense, h *mat.VecDense) (b []float64, inv *mat.SymDense, ok bool) {
	n, _ := G.Dims()
	sc := make([]float64, n)
	for j := 0; j < n; j++ {
		d := G.At(j, j)
		if !(d > 0) {
			return nil, nil, false
		}
		sc[j] = 1 / math.Sqrt(d)
	}
	S := mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			S.SetSym(i, j, 0.5*(G.At(i, j)+G.At(j, i))*sc[i]*sc[j])
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(S) || ch.Cond() > 1e12 {
		return nil, nil, false
	}
	hs := mat.NewVecDense(n, nil)
	for j := 0; j < n; j++ {
		hs.SetVec(j, h.AtVec(j)*sc[j])
	}
	var bs mat.VecDense
	if err := ch.SolveVecTo(&bs, hs); err != nil {
		return nil, nil, false
	}
	var si mat.SymDense
	if err := ch.InverseTo(&si); err != nil {
		return nil, nil, false
	}
	b = make([]float64, n)
	for j := range b {
		b[j] = bs.AtVec(j) * sc[j]
	}
	inv = mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			inv.SetSym(i, j, si.At(i, j)*sc[i]*sc[j])
		}
	}
	return b, inv, true
}
