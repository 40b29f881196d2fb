package online

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/est"
	"github.com/backshift/backshift/internal/sym"
	"github.com/backshift/backshift/tf"
)

// Param is one estimated coefficient (the library's one parameter
// type): its name, the current estimate, the start value, the standard
// error and T = Value/SE.
type Param = est.Param

// Counts tallies what an Estimator did with the samples fed so far.
type Counts struct {
	// Samples is the number of samples accepted by Update.
	Samples int
	// Updates counts the samples that moved the estimates (after the
	// warm-up, outside the dead zone, not rejected).
	Updates int
	// DeadZone counts the samples skipped by the dead zone.
	DeadZone int
	// Rejected counts the updates refused by the stability projection:
	// the update would have put a root of a denominator or of the noise
	// MA polynomial on or inside the unit circle in B (a pole or noise
	// zero on or outside the unit circle in z), so the previous
	// estimates were kept.
	Rejected int
	// Bounded counts the updates after which P was scaled down to
	// Settings.MaxTrace.
	Bounded int
	// Resets counts the updates at which P had lost positive
	// definiteness (psi' P psi not positive) and was set back to its
	// value at the end of the warm-up.
	Resets int
}

// inputTerm is the recursive state of one input term of the model.
type inputTerm struct {
	col      int       // index of the series in Update's x
	b        int       // dead time
	diff     []float64 // D_i(B) coefficients
	xh       []float64 // x_t, x_(t-1), ...: len(diff)
	ring     []float64 // z = D_i(B) x, the last b + deg(num) + 1 values
	pos      int       // index of z_t in ring
	num, den *polyMap
	// signal indices in the history block: u the term's output, s =
	// B^b z / delta, st = (phi/theta) s, q = u / delta, qt = (phi/theta) q.
	u, s, st, q, qt int
}

// Estimator estimates the free coefficients of a transfer-function
// noise model recursively, one sample at a time, by the recursive
// prediction-error method with exponential forgetting; see the package
// doc for the algorithm, its safeguards and the standard errors.
//
// An Estimator is not safe for use from several goroutines at once
// (each Update changes its state); give each goroutine its own, or
// guard it with a mutex.
type Estimator struct {
	set    Settings
	output string
	series []string // the input series, in the order of Update's x
	names  []string
	start  []float64
	x, old []float64 // estimates, and the previous ones
	work   tf.Model  // a clone of the start model, whose bound coefficients Model sets
	coefs  [][]*tf.Coef

	constK  int // parameter of the constant, -1 when it is not free
	cval    float64
	outDiff []float64
	yh      []float64
	ins     []inputTerm
	ar, ma  *polyMap
	checks  []*polyMap // polynomials the stability projection guards
	// affine lists the free terms of every affine polynomial, grouped
	// by coefficient, and products the polynomials with a free
	// coefficient that are products of factors: evalPolys sets their
	// coefficients at the estimates.
	affine   []affineOp
	products []*polyMap
	// grads and chains: how gradient sums psi (see addGrad).
	grads  []gradTerm
	chains []chainTerm
	buf    []float64 // scratch of stable

	// hist holds the recursive signals, H rows of ns values: row j is
	// lag j (row 0 the current sample).
	hist              []float64
	ns, h             int
	n, e, nt, et, g   int // signal indices of the noise part
	psi, ppsi, p, p0  []float64
	sumE2, sumW, lamT float64
	maxTrace          float64
	lastErr           float64
	counts            Counts
	broken            error
}

// New returns an Estimator that starts from the model m: its structure
// (inputs, dead times, orders, differencing, noise model) and every
// coefficient's value. The free coefficients (Coef.Free) are estimated;
// fixed numbers and held names stay where they are. A fitted model
// (the fit's Estimate.Model, whose estimates stay free) is the usual
// start. m is not modified; s may be nil for the defaults.
//
// Errors (Op "online.New"): a *SettingError from Settings.Validate; a
// *ModelError for a model that tf.Model.Validate refuses, one with no
// output, nothing free, a free differencing coefficient, a name free in
// one place and held in another, a zero constant term of a denominator
// or noise polynomial, a denominator with a free coefficient whose
// start value has a pole on or outside the unit circle, or a noise MA
// polynomial that is not invertible (a zero on or outside the unit
// circle), since the predictor divides by it, or an event input
// (step(T), pulse(T)), whose indicator this package does not build (the
// message names the input; feed the indicator as an input series
// instead, tf.Model.EventData).
func New(m tf.Model, s *Settings) (_ *Estimator, err error) {
	defer errs.Recover("online.New", &err)
	defer func() { setOp("online.New", err) }()
	var set Settings
	if s != nil {
		set = *s
	}
	if err := set.validate(); err != nil {
		return nil, err
	}
	e, err := bind(m)
	if err != nil {
		return nil, err
	}
	e.set = set.defaults(len(e.names))
	e.maxTrace = set.MaxTrace
	if err := e.build(); err != nil {
		return nil, err
	}
	return e, nil
}

// setOp names op in the shared shapes of err's chain.
func setOp(op string, err error) {
	if err == nil {
		return
	}
	errs.SetOp(op, err)
	if me, ok := err.(*ModelError); ok && me.Op == "" {
		me.Op = op
	}
}

// bind checks m and binds its free coefficients to the parameter
// vector, in order of first appearance (constant, each input's
// numerator and denominator, noise MA, noise AR), in a clone of m.
func bind(m tf.Model) (*Estimator, error) {
	if err := checkModel(m); err != nil {
		return nil, err
	}
	e := &Estimator{output: m.Output, work: m.Clone(), constK: -1}
	p := sym.GroupParams(e.work.EachParam)
	e.names, e.coefs = p.Names, p.Coefs
	for _, cs := range p.Coefs {
		e.start = append(e.start, cs[0].Value)
	}
	if err := noFreeDiff(e.work); err != nil {
		return nil, err
	}
	if name := p.Conflict; name != "" {
		return nil, &ModelError{Part: "coefficient " + name, Problem: "it is free in one place and held in another; one name is one parameter, so mark it the same way everywhere (or rename one)"}
	}
	if len(e.names) == 0 {
		return nil, &ModelError{Part: "model", Problem: "nothing is free to estimate (every coefficient is held); mark at least one coefficient free"}
	}
	e.x = append([]float64(nil), e.start...)
	e.old = make([]float64, len(e.x))
	return e, nil
}

// checkModel makes the checks of a model that New and NewRefitter share:
// an output series, tf.Model.Validate (a *ModelError of it has its Op
// cleared, so that the caller's setOp names the caller) and no event
// input.
func checkModel(m tf.Model) error {
	if m.Output == "" {
		return &ModelError{Part: "model", Problem: "it names no output series (Model.Output is empty)"}
	}
	if err := m.Validate(); err != nil {
		if me, ok := err.(*ModelError); ok {
			me.Op = ""
		}
		return err
	}
	return noEvents(m)
}

// noEvents refuses a model with an event input (step(T), pulse(T)),
// naming it: the estimator's inputs are fed by the caller, and an
// event's indicator depends on where the record starts.
func noEvents(m tf.Model) error {
	for _, in := range m.Inputs {
		if in.Event != nil {
			return &ModelError{Part: "input " + strconv.Quote(in.Series),
				Problem: "it is an event, whose indicator this package does not build (it depends on where the record starts); " +
					"make the event an input series that carries its indicator (tf.Model.EventData) and feed it, " +
					"or track the model without the event (tf/predict builds event indicators for prediction)"}
		}
	}
	return nil
}

// noFreeDiff refuses a free coefficient in a differencing polynomial.
func noFreeDiff(m tf.Model) error {
	var err error
	check := func(p tf.Poly) {
		p.Each(func(c *tf.Coef) {
			if c.Name != "" && c.Free && err == nil {
				err = &ModelError{Part: "differencing coefficient " + c.Name, Problem: "differencing must be given as fixed numbers, not estimated (write the value, or hold it with =)"}
			}
		})
	}
	check(m.Diff)
	for _, in := range m.Inputs {
		check(in.Diff)
	}
	return err
}

// build lays out the recursive state: the polynomial maps, the input
// terms, the history block and the covariance buffers, and checks the
// start model's constant terms and stability.
//
// Over 60 lines: one layout of the state vector, whose parts take offsets
// that depend on the parts laid out before them; the steps read in the
// order of the layout.
func (e *Estimator) build() error {
	k := len(e.names)
	index := func(c tf.Coef) int {
		if c.Name == "" || !c.Free {
			return -1
		}
		for i, n := range e.names {
			if n == c.Name {
				return i
			}
		}
		return -1
	}
	m := e.work
	if m.Const != nil {
		e.cval = m.Const.Value
		e.constK = index(*m.Const)
	}
	e.outDiff = m.Diff.Coeffs()
	e.yh = make([]float64, len(e.outDiff))
	var ma, ar tf.Poly
	if m.Noise != nil {
		ma, ar = m.Noise.MA, m.Noise.AR
	}
	e.ma, e.ar = newPolyMap(ma, index, e.x), newPolyMap(ar, index, e.x)
	deg := max(e.ma.deg, e.ar.deg)
	col := map[string]int{}
	for _, in := range m.Inputs {
		c, ok := col[in.Series]
		if !ok {
			c = len(e.series)
			col[in.Series] = c
			e.series = append(e.series, in.Series)
		}
		it := inputTerm{col: c, b: in.Delay, diff: in.Diff.Coeffs(),
			num: newPolyMap(in.Num, index, e.x), den: newPolyMap(in.Den, index, e.x)}
		it.xh = make([]float64, len(it.diff))
		it.ring = make([]float64, it.b+it.num.deg+1)
		deg = max(deg, it.num.deg, it.den.deg)
		if err := e.checkTerm(in, it.den); err != nil {
			return err
		}
		e.ins = append(e.ins, it)
	}
	if err := e.checkNoise(); err != nil {
		return err
	}
	for _, it := range e.ins {
		e.addFree(it.num)
		e.addFree(it.den)
	}
	e.addFree(e.ma)
	e.addFree(e.ar)
	e.h = deg + 1
	e.ns = 5*len(e.ins) + 5
	for i := range e.ins {
		it := &e.ins[i]
		it.u, it.s, it.st, it.q, it.qt = 5*i, 5*i+1, 5*i+2, 5*i+3, 5*i+4
	}
	b := 5 * len(e.ins)
	e.n, e.e, e.nt, e.et, e.g = b, b+1, b+2, b+3, b+4
	for _, it := range e.ins {
		e.addGrad(it.num, it.st, 1)
		e.addGrad(it.den, it.qt, -1)
	}
	e.addGrad(e.ma, e.et, 1)
	e.addGrad(e.ar, e.nt, -1)
	e.hist = make([]float64, e.h*e.ns)
	e.buf = make([]float64, tf.MaxDegree+1)
	e.psi, e.ppsi = make([]float64, k), make([]float64, k)
	e.p, e.p0 = make([]float64, k*k), make([]float64, k*k)
	e.lamT = 1
	return nil
}

// checkTerm refuses a zero constant term of an input's denominator and
// a free denominator whose start value is not stable.
func (e *Estimator) checkTerm(in tf.Input, den *polyMap) error {
	part := "input " + strconv.Quote(in.Series) + " denominator"
	if den.c[0] == 0 {
		return &ModelError{Part: part, Problem: "the constant term is zero, so the term is not causal; write it as 1 + ... (or move the dead time to the input's delay)"}
	}
	if den.free() {
		if !stable(den.c, e.scratch(len(den.c))) {
			return &ModelError{Part: part, Problem: "the start values put a pole on or outside the unit circle; the recursive estimates must start from a stable term (start from a fitted model, or from smaller denominator coefficients)"}
		}
		e.checks = append(e.checks, den)
	}
	return nil
}

// checkNoise refuses a zero constant term of the noise polynomials, a
// noise MA polynomial that is not invertible and a free noise AR
// polynomial that is not stationary, and guards the free ones.
func (e *Estimator) checkNoise() error {
	if e.ar.c[0] == 0 {
		return &ModelError{Part: "noise AR", Problem: "the constant term is zero; write it as 1 + ..."}
	}
	if e.ma.c[0] == 0 {
		return &ModelError{Part: "noise MA", Problem: "the constant term is zero; write it as 1 + ..."}
	}
	if !stable(e.ma.c, e.scratch(len(e.ma.c))) {
		return &ModelError{Part: "noise MA", Problem: "the start values put a zero on or outside the unit circle (not invertible), and the one-step predictor divides by the MA polynomial; start from an invertible MA polynomial (a fitted model)"}
	}
	if e.ma.free() {
		e.checks = append(e.checks, e.ma)
	}
	if e.ar.free() {
		if !stable(e.ar.c, e.scratch(len(e.ar.c))) {
			return &ModelError{Part: "noise AR", Problem: "the start values put a root on or outside the unit circle (not stationary); put integration in the model's differencing and start from a stationary AR polynomial (a fitted model)"}
		}
		e.checks = append(e.checks, e.ar)
	}
	return nil
}

// affineOp sets one coefficient of an affine polynomial from one free
// term: *c = (first ? base : *c) + sign x[k].
type affineOp struct {
	c     *float64
	base  float64
	k     int
	sign  float64
	first bool
}

// addFree records how evalPolys sets m's coefficients, when m has a
// free coefficient: its free terms grouped by power for an affine
// polynomial, m itself for a product.
func (e *Estimator) addFree(m *polyMap) {
	switch {
	case !m.free():
	case !m.affine:
		e.products = append(e.products, m)
	default:
		for j := range m.c {
			first := true
			for _, t := range m.terms {
				if t.power == j {
					e.affine = append(e.affine, affineOp{c: &m.c[j], base: m.base[j], k: t.k, sign: t.sign, first: first})
					first = false
				}
			}
		}
	}
}

// scratch returns a buffer of at least m values for stable.
func (e *Estimator) scratch(m int) []float64 {
	if len(e.buf) < m {
		e.buf = make([]float64, m)
	}
	return e.buf
}

// Inputs returns the names of the input series in the order Update
// takes their samples (each series once, in order of first use in the
// model). The slice is the caller's.
func (e *Estimator) Inputs() []string { return append([]string(nil), e.series...) }

// Names returns the names of the estimated coefficients, in the order
// of Params. The slice is the caller's.
func (e *Estimator) Names() []string { return append([]string(nil), e.names...) }

// Counts returns the tallies of the samples fed so far.
func (e *Estimator) Counts() Counts { return e.counts }

// Err returns the error that stopped the Estimator (a prediction error,
// gradient or estimate that came out NaN or infinite), or nil. Once it
// is not nil every Update returns it, and the estimates stay at their
// last finite values.
func (e *Estimator) Err() error { return e.broken }

// LastError returns the one-step prediction error of the last sample
// (with the estimates before that sample's update), NaN before the
// first sample.
func (e *Estimator) LastError() float64 {
	if e.counts.Samples == 0 {
		return math.NaN()
	}
	return e.lastErr
}

// Sigma2 returns the running variance of the one-step prediction
// errors, sum_t lambda^(n-t) eps_t^2 / sum_t lambda^(n-t), NaN before
// the first sample.
func (e *Estimator) Sigma2() float64 {
	if e.sumW == 0 {
		return math.NaN()
	}
	return e.sumE2 / e.sumW
}

// Trace returns the trace of P, NaN during the warm-up.
func (e *Estimator) Trace() float64 {
	if e.counts.Samples < e.set.Warmup {
		return math.NaN()
	}
	return trace(e.p, len(e.x))
}

// Params appends the current estimates to dst and returns it, in the
// order of Names: Value the estimate, Start the start value, SE the
// standard error (NaN during the warm-up) and T = Value/SE. With a dst
// of capacity len(Names()) it does not allocate.
//
// The standard error is
//
//	SE_k = sqrt(sigma2 P_kk (1 + lambda^n) / (1 + lambda))
//
// with sigma2 from Sigma2 and n the samples fed: P is the inverse of
// the weighted information sum_t lambda^(n-t) psi_t psi_t', and the
// covariance of weighted least squares with weights w_t = lambda^(n-t)
// is sigma2 (sum w psi psi')^-1 (sum w^2 psi psi') (sum w psi psi')^-1,
// which for stationary gradients is sigma2 P times sum w^2 / sum w =
// (1 + lambda^n) / (1 + lambda): sigma2 P without forgetting, sigma2 P /
// (1 + lambda), about half, once lambda^n is small. It is the
// asymptotic (Gauss-Newton) approximation, as for the batch fit, and
// is understated after P was scaled down by the trace bound.
func (e *Estimator) Params(dst []Param) []Param {
	k := len(e.x)
	lam := e.set.Forgetting
	s2 := e.Sigma2() * (1 + e.lamT) / (1 + lam)
	warm := e.counts.Samples >= e.set.Warmup
	for i := range k {
		se := math.NaN()
		if warm {
			se = math.Sqrt(s2 * e.p[i*k+i])
		}
		dst = append(dst, Param{Name: e.names[i], Value: e.x[i], Start: e.start[i], SE: se, T: e.x[i] / se})
	}
	return dst
}

// Model returns the model with every estimated coefficient at its
// current estimate (still free, as in the start model); it shares
// nothing with the Estimator. It allocates; call it when the model is
// wanted, not every sample.
func (e *Estimator) Model() tf.Model {
	for k, cs := range e.coefs {
		for _, c := range cs {
			c.Value = e.x[k]
		}
	}
	return e.work.Clone()
}

// trace returns the trace of the k by k matrix p.
func trace(p []float64, k int) float64 {
	t := 0.0
	for i := range k {
		t += p[i*k+i]
	}
	return t
}
