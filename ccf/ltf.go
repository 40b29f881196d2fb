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
// Errors: *ArgError (no inputs, bad settings), *LengthError, *ValueError
// (naming the series and index), *ShortError (fewer than twice as many
// rows as coefficients), *ConstantError for a constant input and
// *SingularError for a rank-deficient regression. Inputs are not
// modified.
//
// References: Liu, L.-M., Hanssens, D.M. (1982), see the package
// documentation.
func DistributedLag(y []float64, xs [][]float64, s *DistributedLagSettings) (*DistributedLagResult, error) {
	var set DistributedLagSettings
	if s != nil {
		set = *s
	}
	m := len(xs)
	if m == 0 {
		return nil, &ArgError{Arg: "xs", Value: "no inputs", Want: "at least one input series"}
	}
	out := set.Output
	if out == "" {
		out = "y"
	}
	names := make([]string, m)
	for i := range names {
		if i < len(set.Names) && set.Names[i] != "" {
			names[i] = set.Names[i]
		} else {
			names[i] = "x" + strconv.Itoa(i+1)
		}
	}
	n := len(y)
	if err := checkSeries(out, y); err != nil {
		return nil, err
	}
	for i, x := range xs {
		if len(x) != n {
			return nil, &LengthError{Names: [2]string{out, names[i]}, Lens: [2]int{n, len(x)}}
		}
		if err := checkSeries(names[i], x); err != nil {
			return nil, err
		}
		if n > 0 && isConstant(x) {
			return nil, &ConstantError{Name: names[i], Value: x[0]}
		}
	}
	K := set.Lags
	if K == 0 {
		K = max(1, min(24, n/(4*m)))
	}
	if K < 0 {
		return nil, &ArgError{Arg: "DistributedLagSettings.Lags", Value: strconv.Itoa(K), Want: ">= 0"}
	}
	p := set.ARP
	if p == 0 {
		p = 1
	}
	if p < 0 {
		p = 0
	}
	maxIter := set.MaxIter
	if maxIter <= 0 {
		maxIter = 50
	}
	ncoef := 1 + m*(K+1)
	rows := n - K - p
	if rows < 2*ncoef {
		return nil, &ShortError{Name: out, Len: n, Need: K + p + 2*ncoef, Why: "for " + strconv.Itoa(ncoef) + " distributed-lag coefficients"}
	}
	if n > 0 && isConstant(y) {
		return nil, &ConstantError{Name: out, Value: y[0]}
	}
	// Column j of the unfiltered design at row t (t = K..n-1).
	col := func(j, t int) float64 {
		if j == 0 {
			return 1
		}
		i, k := (j-1)/(K+1), (j-1)%(K+1)
		return xs[i][t-k]
	}
	phi := make([]float64, p) // n_t = sum phi_k n_{t-k} + a_t
	beta := make([]float64, ncoef)
	prev := make([]float64, ncoef)
	noise := make([]float64, n)
	X := mat.NewDense(n-K-p, ncoef, nil)
	yv := mat.NewVecDense(n-K-p, nil)
	var cov *mat.SymDense
	var sigma2 float64
	res := &DistributedLagResult{}
	for it := 1; it <= maxIter; it++ {
		// Filtered regression over t = K+p..n-1: phi(B) applied to y and
		// to every column.
		for r := 0; r < rows; r++ {
			t := K + p + r
			v := y[t]
			for k := 1; k <= p; k++ {
				v -= phi[k-1] * y[t-k]
			}
			yv.SetVec(r, v)
			for j := 0; j < ncoef; j++ {
				c := col(j, t)
				for k := 1; k <= p; k++ {
					c -= phi[k-1] * col(j, t-k)
				}
				X.Set(r, j, c)
			}
		}
		b, c, ssq, ok := olsSolve(X, yv)
		if !ok {
			return nil, &SingularError{Inputs: names}
		}
		copy(beta, b)
		cov = c
		sigma2 = ssq / float64(rows-ncoef)
		// Noise from the unfiltered model, then its autoregression.
		for t := 0; t < K; t++ {
			noise[t] = math.NaN()
		}
		for t := K; t < n; t++ {
			v := y[t]
			for j := 0; j < ncoef; j++ {
				v -= beta[j] * col(j, t)
			}
			noise[t] = v
		}
		res.Iter = it
		if p == 0 {
			res.Converged = true
			break
		}
		change := 0.0
		scale := 0.0
		for j := range beta {
			change = math.Max(change, math.Abs(beta[j]-prev[j]))
			scale = math.Max(scale, math.Abs(beta[j]))
		}
		if it > 1 && change <= 1e-10*math.Max(scale, 1e-300) {
			res.Converged = true
			break
		}
		copy(prev, beta)
		phi = arLS(noise[K:], p)
	}
	res.Const = beta[0]
	res.ConstSE = math.Sqrt(sigma2 * cov.At(0, 0))
	res.AR = make([]float64, p+1)
	res.AR[0] = 1
	for k := 1; k <= p; k++ {
		res.AR[k] = -phi[k-1]
	}
	res.Sigma2 = sigma2
	res.Start = K
	res.Noise = noise
	for i := range xs {
		w := &Weights{Input: names[i], V: make([]float64, K+1), SE: make([]float64, K+1), N: rows}
		for k := 0; k <= K; k++ {
			j := 1 + i*(K+1) + k
			w.V[k] = beta[j]
			w.SE[k] = math.Sqrt(sigma2 * cov.At(j, j))
		}
		res.Weights = append(res.Weights, w)
	}
	return res, nil
}

// olsSolve returns the least-squares coefficients of y on X, (X'X)^-1,
// and the residual sum of squares, by a Cholesky factorisation of the
// column-scaled normal equations; ok is false when X is (numerically)
// rank deficient.
func olsSolve(X *mat.Dense, y *mat.VecDense) (b []float64, cov *mat.SymDense, ssq float64, ok bool) {
	r, c := X.Dims()
	// Column scales for conditioning.
	sc := make([]float64, c)
	for j := 0; j < c; j++ {
		s := 0.0
		for i := 0; i < r; i++ {
			v := X.At(i, j)
			s += v * v
		}
		if s == 0 {
			return nil, nil, 0, false
		}
		sc[j] = 1 / math.Sqrt(s)
	}
	Xs := mat.NewDense(r, c, nil)
	Xs.Apply(func(i, j int, v float64) float64 { return v * sc[j] }, X)
	var xtx mat.SymDense
	xtx.SymOuterK(1, Xs.T())
	var ch mat.Cholesky
	if !ch.Factorize(&xtx) || ch.Cond() > 1e12 {
		return nil, nil, 0, false
	}
	var xty mat.VecDense
	xty.MulVec(Xs.T(), y)
	var bs mat.VecDense
	if err := ch.SolveVecTo(&bs, &xty); err != nil {
		return nil, nil, 0, false
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return nil, nil, 0, false
	}
	b = make([]float64, c)
	for j := range b {
		b[j] = bs.AtVec(j) * sc[j]
	}
	cov = mat.NewSymDense(c, nil)
	for i := 0; i < c; i++ {
		for j := i; j < c; j++ {
			cov.SetSym(i, j, inv.At(i, j)*sc[i]*sc[j])
		}
	}
	var fit mat.VecDense
	fit.MulVec(X, mat.NewVecDense(c, b))
	for i := 0; i < r; i++ {
		d := y.AtVec(i) - fit.AtVec(i)
		ssq += d * d
	}
	return b, cov, ssq, true
}

// arLS fits n_t = sum_{k=1..p} phi_k n_{t-k} + a_t by least squares over
// t = p..len(e)-1 (no mean: e are regression residuals with a constant
// in the model). A singular system gives zeros.
func arLS(e []float64, p int) []float64 {
	A := make([]float64, p*p)
	rhs := make([]float64, p)
	for t := p; t < len(e); t++ {
		for i := 0; i < p; i++ {
			rhs[i] += e[t-1-i] * e[t]
			for j := 0; j < p; j++ {
				A[i*p+j] += e[t-1-i] * e[t-1-j]
			}
		}
	}
	phi, ok := solveSmall(A, rhs, p)
	if !ok {
		return make([]float64, p)
	}
	return phi
}
