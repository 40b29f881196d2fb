package arma

import (
	"errors"
	"math"
	"strconv"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/sym"
)

// coefRef ties a free coefficient of the noise polynomials to its index
// k in the parameter vector.
type coefRef struct {
	c *sym.Coef
	k int
}

// engine holds one fit's data and scratch space; it is used by one
// goroutine. bind builds it.
type engine struct {
	n, t0, m int
	ar, ma   sym.Poly
	diff     []float64 // the differencing polynomial
	dd       int       // its degree
	refs     []coefRef
	index    map[string]int
	// names lists the free parameters in their order in x: ARMA
	// coefficients in written order, then "c", then the regressors.
	names          []string
	narma          int
	kmu            int // index of the mean in x, -1 when held
	mu             float64
	shift          float64 // level removed from wy when the mean is free (accuracy)
	kb             []int   // index in x of each regressor, -1 when held
	beta           []float64
	wy             []float64   // differenced y minus held regressors
	wx             [][]float64 // differenced free regressor columns
	w              []float64   // scratch: current w - mu
	one            []float64
	keepInvertible bool // refuse non-invertible MA polynomials in eval
	// scale is the working unit of the differenced series (a power of
	// two), pscale[k] that of parameter k (1 for ARMA coefficients).
	scale  float64
	pscale []float64
	// curvature scratch, allocated on first use
	hr, hlam []float64
	hjac     [][]float64
}

// checkInputs checks the settings, the samples of y and the lengths of
// the regressor columns.
func checkInputs(y []float64, o FitSettings) error {
	if err := o.validate(); err != nil {
		return err
	}
	if err := checkFinite(o.Name, y); err != nil {
		return err
	}
	for k, x := range o.Regressors {
		if len(x) != len(y) {
			return &SeriesError{Series: xName(o, k), Kind: errs.ErrLength, Have: len(x), Need: len(y), Detail: "a regressor needs the length of " + seriesName(o.Name)}
		}
	}
	return nil
}

// bind builds the engine of a fit of noise to y (checked by checkInputs):
// it applies FitSettings.Held, numbers the free parameters, fixes the
// first summed residual, differences the series and the free regressor
// columns and moves them to working units. noise is used in place (the
// caller passes a copy). The errors come in the order of the model's
// checks, then the sample size, then the data.
func bind(y []float64, noise Noise, diff []float64, differenced bool, o FitSettings) (*engine, error) {
	n := len(y)
	e := &engine{n: n, ar: noise.AR, ma: noise.MA, diff: diff, dd: poly.Degree(diff), index: map[string]int{}, kmu: -1, one: []float64{1}}
	used := map[string]bool{} // the names of o.Held that were applied
	if err := e.bindNoise(o.Held, used); err != nil {
		return nil, err
	}
	if o.First != 0 {
		if o.First < e.t0 {
			return nil, settingErr("FitSettings.First", itoa(o.First), "must be zero or at least "+itoa(e.t0)+" (AR degree plus differencing)")
		}
		e.t0 = o.First
	}
	if err := e.bindRegression(o, differenced, used); err != nil {
		return nil, err
	}
	for nm := range o.Held {
		if !used[nm] {
			return nil, settingErr("FitSettings.Held", strconv.Quote(nm), "names no parameter of the model")
		}
	}
	np := len(e.names)
	e.m = n - e.t0
	// At least two residuals: a single differenced sample would be
	// reported as "constant".
	if e.m < np+1 || e.m < 2 {
		return nil, shortErr(o.Name, n, addSat(e.t0, max(np+1, 2)), "a fit with "+itoa(np)+" parameters from index "+itoa(e.t0))
	}
	if err := e.difference(y, o); err != nil {
		return nil, err
	}
	e.toWorkingUnits()
	e.w = make([]float64, n)
	return e, nil
}

// bindNoise holds the noise coefficients that held names, marking those
// names in used, and numbers the free named coefficients of the AR and
// MA polynomials in written order (a name shared by several coefficients
// is one parameter). It checks the polynomials and sets the default first
// residual, the first index whose AR lags are all observed.
func (e *engine) bindNoise(held map[string]float64, used map[string]bool) error {
	badValue := false
	collect := func(c *sym.Coef) {
		if math.IsNaN(c.Value) || math.IsInf(c.Value, 0) {
			badValue = true
		}
		if c.Name == "" {
			return
		}
		if v, ok := held[c.Name]; ok {
			c.Value, c.Free = v, false
			used[c.Name] = true
			return
		}
		if !c.Free {
			return
		}
		k, ok := e.index[c.Name]
		if !ok {
			k = len(e.names)
			e.index[c.Name] = k
			e.names = append(e.names, c.Name)
		}
		e.refs = append(e.refs, coefRef{c: c, k: k})
	}
	e.ar.Each(collect)
	e.ma.Each(collect)
	e.narma = len(e.names)
	if badValue {
		return modelErr("noise", "coefficient values must be finite")
	}
	if _, dup := e.index["c"]; dup {
		return modelErr("noise", `coefficient name "c" is reserved for the constant`)
	}
	phi0 := e.ar.Coeffs()
	th0 := e.ma.Coeffs()
	if phi0[0] == 0 || th0[0] == 0 {
		return modelErr("noise", "AR and MA polynomials need a non-zero constant term")
	}
	degAR, degMA := len(phi0)-1, len(th0)-1
	if degAR > MaxLag || degMA > MaxLag {
		return modelErr("noise", "polynomial degree above MaxLag = "+itoa(MaxLag))
	}
	e.t0 = e.dd + degAR
	return nil
}

// bindRegression numbers the constant c (when the constant rule asks for
// it and FitSettings.Held does not hold it) and the free regressors after
// the ARMA coefficients, and takes the held values of c and of the
// regressors from FitSettings.Held, marking those names in used.
func (e *engine) bindRegression(o FitSettings, differenced bool, used map[string]bool) error {
	meanVal, meanFixed := o.Held["c"]
	hasMean := meanFixed || o.Constant == ConstantFree || (o.Constant == ConstantUnlessDifferenced && !differenced)
	if meanFixed {
		used["c"] = true
		e.mu = meanVal
	}
	if hasMean && !meanFixed {
		e.kmu = len(e.names)
		e.names = append(e.names, "c")
	}
	e.beta = make([]float64, len(o.Regressors))
	e.kb = make([]int, len(o.Regressors))
	for k := range o.Regressors {
		nm := xName(o, k)
		if _, dup := e.index[nm]; dup || nm == "c" {
			return settingErr("FitSettings.RegressorNames", strconv.Quote(nm), "is also a coefficient of the noise model; name the regressor otherwise")
		}
		e.index[nm] = -1
		if v, ok := o.Held[nm]; ok {
			used[nm] = true
			e.beta[k] = v
			e.kb[k] = -1
			continue
		}
		e.kb[k] = len(e.names)
		e.names = append(e.names, nm)
	}
	return nil
}

// difference forms wy, the differenced series minus the held regressors,
// and wx, the differenced free regressor columns (nil for held ones). A
// series without regressors that is constant, or constant after the
// differencing, is a *SeriesError of kind ErrConstant.
func (e *engine) difference(y []float64, o FitSettings) error {
	z := append([]float64(nil), y...)
	for k, x := range o.Regressors {
		if e.kb[k] < 0 {
			for t := range z {
				z[t] -= e.beta[k] * x[t]
			}
		}
	}
	e.wy = applyDiff(e.diff, z)
	for k, x := range o.Regressors {
		if e.kb[k] >= 0 {
			e.wx = append(e.wx, applyDiff(e.diff, x))
		} else {
			e.wx = append(e.wx, nil)
		}
	}
	if !constantFrom(e.wy, e.dd) || len(o.Regressors) > 0 {
		return nil
	}
	v := 0.0
	if e.dd < e.n {
		v = e.wy[e.dd]
	}
	vs := strconv.FormatFloat(v, 'g', 6, 64)
	ce := &SeriesError{Series: seriesName(o.Name), Kind: ErrConstant, Detail: "every sample is " + vs + " over its " + itoa(e.n) + " samples"}
	if e.dd > 0 {
		ce.Detail = "after the differencing " + diffText(e.diff) + ": every differenced sample is " + vs + " over its " + itoa(e.n) + " samples; its levels lie on a line or repeat; use less differencing"
	}
	return ce
}

// toWorkingUnits moves the differenced series to units of a power of two
// near the size of its deviations, and each free regressor column to its
// own such unit, and records in pscale the unit of each parameter. The
// normal equations of the optimiser then stay well scaled whatever the
// series' units (at deviations of 1e8 the mean's column of J'J would be
// 1e16 times smaller than the coefficients' and the search would stall).
// Powers of two scale every operation exactly; the results are scaled
// back (seriesUnits). With a free mean, the series is also taken as a
// deviation from its sample level, so that residuals of a series far
// from zero are not formed by cancelling large numbers.
func (e *engine) toWorkingUnits() {
	dd := e.dd
	e.scale = pow2Scale(e.wy[dd:])
	e.pscale = make([]float64, len(e.names))
	for k := range e.pscale {
		e.pscale[k] = 1
	}
	if e.scale != 1 {
		for t := range e.wy {
			e.wy[t] /= e.scale
		}
		e.mu /= e.scale
	}
	if e.kmu >= 0 {
		e.pscale[e.kmu] = e.scale
	}
	for k, b := range e.kb {
		if b < 0 {
			continue
		}
		c := pow2Scale(e.wx[k][dd:])
		if c != 1 {
			for t := range e.wx[k] {
				e.wx[k][t] /= c
			}
		}
		e.pscale[b] = e.scale / c
	}
	if e.kmu >= 0 {
		e.shift = meanOf(e.wy[dd:])
		for t := dd; t < e.n; t++ {
			e.wy[t] -= e.shift
		}
	}
}

// seriesUnits returns the parameter vector x of the working units in the
// series' units: the sample level added back to the mean, every
// parameter multiplied by its unit.
func (e *engine) seriesUnits(x []float64) []float64 {
	v := append([]float64(nil), x...)
	if e.kmu >= 0 {
		v[e.kmu] += e.shift
	}
	for k := range v {
		v[k] *= e.pscale[k]
	}
	return v
}

// xName is the name of regressor k: FitSettings.RegressorNames[k] or
// "x1", "x2", ...
func xName(o FitSettings, k int) string {
	if k < len(o.RegressorNames) {
		return o.RegressorNames[k]
	}
	return "x" + itoa(k+1)
}

// applyDiff returns diff(B) x with the first deg(diff) values (which need
// pre-sample data) set to zero; they are never used.
func applyDiff(diff, x []float64) []float64 {
	dd := poly.Degree(diff)
	w := make([]float64, len(x))
	for t := dd; t < len(x); t++ {
		s := 0.0
		for j, c := range diff[:dd+1] {
			if c != 0 {
				s += c * x[t-j]
			}
		}
		w[t] = s
	}
	return w
}

// pow2Scale returns the power of two nearest (in log scale) to the
// largest deviation of w from its mean, 1 when that is zero or not
// finite.
func pow2Scale(w []float64) float64 {
	if len(w) == 0 {
		return 1
	}
	m := meanOf(w)
	d := 0.0
	for _, v := range w {
		d = math.Max(d, math.Abs(v-m))
	}
	if !(d > 0) || math.IsInf(d, 0) {
		return 1
	}
	return math.Ldexp(1, int(math.Round(math.Log2(d))))
}

// diffText writes a differencing polynomial for messages, "(1 - B)".
func diffText(c []float64) string {
	out := "(1"
	for k, v := range c[1:] {
		if v == 0 {
			continue
		}
		sign := " + "
		if v < 0 {
			sign, v = " - ", -v
		}
		out += sign
		if v != 1 {
			out += strconv.FormatFloat(v, 'g', 6, 64) + " "
		}
		out += "B"
		if k+1 > 1 {
			out += "^" + itoa(k+1)
		}
	}
	return out + ")"
}

// constantFrom reports whether w[from:] holds one value (or nothing).
func constantFrom(w []float64, from int) bool {
	if from >= len(w) {
		return true
	}
	for _, v := range w[from:] {
		if v != w[from] {
			return false
		}
	}
	return true
}

// set writes x into the engine's coefficient values.
func (e *engine) set(x []float64) {
	for _, r := range e.refs {
		r.c.Value = x[r.k]
	}
}

// eval computes the residuals a_t0..a_{n-1} into r and, when jac is not
// nil, their derivatives by filtering (the Problem.Eval of internal/lm).
func (e *engine) eval(x, r []float64, jac [][]float64) error {
	e.set(x)
	phi, dphi := e.ar.Grad(e.lookup, e.narma)
	theta, dtheta := e.ma.Grad(e.lookup, e.narma)
	if e.keepInvertible && !schurStable(theta) {
		return errNonInvertible
	}
	e.centre(x)
	lagApply(r, phi, e.w, e.t0, 0)
	maOne := len(theta) == 1 && theta[0] == 1
	if !maOne {
		filter.Run(r, e.one, theta, r)
	}
	if jac == nil {
		return nil
	}
	for k := 0; k < e.narma; k++ {
		e.coefColumn(jac[k], dphi[k], dtheta[k], r)
		if !maOne {
			filter.Run(jac[k], e.one, theta, jac[k])
		}
	}
	e.regressionColumns(jac, phi, theta, maOne)
	return nil
}

// regressionColumns writes the derivatives of the residuals with respect
// to the free mean and regressors into their columns of jac: -theta*(B)^-1
// phi*(B) of the constant 1 or of the differenced column.
func (e *engine) regressionColumns(jac [][]float64, phi, theta []float64, maOne bool) {
	if e.kmu >= 0 {
		col := jac[e.kmu]
		s := 0.0
		for _, c := range phi {
			s += c
		}
		for i := range col {
			col[i] = -s
		}
		if !maOne {
			filter.Run(col, e.one, theta, col)
		}
	}
	for k, b := range e.kb {
		if b < 0 {
			continue
		}
		col := jac[b]
		lagApply(col, phi, e.wx[k], e.t0, 0)
		for i := range col {
			col[i] = -col[i]
		}
		if !maOne {
			filter.Run(col, e.one, theta, col)
		}
	}
}

// centre writes into e.w the differenced series less the mean and the
// free regressors at x, v = w - mu - X beta.
func (e *engine) centre(x []float64) {
	mu := e.mu
	if e.kmu >= 0 {
		mu = x[e.kmu]
	}
	w := e.w
	for t, v := range e.wy {
		w[t] = v - mu
	}
	for k, b := range e.kb {
		if b < 0 {
			continue
		}
		beta, col := x[b], e.wx[k]
		for t := range w {
			w[t] -= beta * col[t]
		}
	}
}

// coefColumn writes into col the derivative of the residuals r with
// respect to an ARMA coefficient whose derivatives of phi* and theta* are
// dphi and dtheta (nil when zero), before the MA filter: dphi(B) v -
// dtheta(B) a.
func (e *engine) coefColumn(col, dphi, dtheta, r []float64) {
	if dphi != nil {
		lagApply(col, dphi, e.w, e.t0, 0)
	} else {
		clear(col)
	}
	if dtheta != nil {
		lagSub(col, dtheta, r)
	}
}

// lookup returns the index of the parameter name in x, -1 for a name
// that is not a free parameter.
func (e *engine) lookup(name string) int {
	k, ok := e.index[name]
	if !ok {
		return -1
	}
	return k
}

// lagApply writes dst[i] = sum_j c_j src[t0+i-j] over the non-zero c_j;
// acc = 1 adds to dst instead of overwriting (dst was cleared). One, and
// three, non-zero terms have loops of their own (the common AR(1) and
// AR(2) cases).
func lagApply(dst, c, src []float64, t0 int, acc int) {
	var idx [MaxLag + 1]int
	var val [MaxLag + 1]float64
	nz := 0
	for j, v := range c {
		if v != 0 {
			idx[nz], val[nz] = j, v
			nz++
		}
	}
	m := len(dst)
	switch {
	case nz == 1 && idx[0] == 0 && val[0] == 1 && acc == 0:
		copy(dst, src[t0:t0+m])
	case nz == 1 && acc == 0:
		v, s := val[0], src[t0-idx[0]:t0-idx[0]+m]
		for i := range dst {
			dst[i] = v * s[i]
		}
	case nz == 3 && acc == 0:
		v0, v1, v2 := val[0], val[1], val[2]
		s0 := src[t0-idx[0] : t0-idx[0]+m]
		s1 := src[t0-idx[1] : t0-idx[1]+m]
		s2 := src[t0-idx[2] : t0-idx[2]+m]
		for i := range dst {
			dst[i] = v0*s0[i] + v1*s1[i] + v2*s2[i]
		}
	default:
		if acc == 0 {
			clear(dst)
		}
		for q := 0; q < nz; q++ {
			v, s := val[q], src[t0-idx[q]:t0-idx[q]+m]
			for i := range dst {
				dst[i] += v * s[i]
			}
		}
	}
}

// lagSub subtracts sum_j c_j a_{i-j} (a zero before index 0) from dst.
func lagSub(dst, c, a []float64) {
	m := len(dst)
	for j, v := range c {
		if v == 0 || j >= m {
			continue
		}
		d, s := dst[j:], a[:m-j]
		for i := range d {
			d[i] -= v * s[i]
		}
	}
}

// start returns the start vector: the written values of the coefficients,
// least squares for the mean and regressors (regressionStart) and, for an
// Order fit (ord not nil), Hannan-Rissanen for the ordinary ARMA part.
func (e *engine) start(ord *Order) ([]float64, error) {
	x0 := make([]float64, len(e.names))
	for _, r := range e.refs {
		x0[r.k] = r.c.Value
	}
	resid := e.regressionStart(x0)
	if ord == nil || ord.P+ord.Q == 0 {
		return x0, nil
	}
	// Start values need no more than the last hrMax samples.
	if len(resid) > hrMax {
		resid = resid[len(resid)-hrMax:]
	}
	phi, theta, err := hannanRissanen(resid, ord.P, ord.Q, 0)
	if err != nil {
		if errors.Is(err, ErrShort) || errors.Is(err, ErrConstant) {
			return x0, nil // too short for the long AR: start from zero
		}
		return nil, err
	}
	for j := 1; j <= ord.P; j++ {
		if k, ok := e.index["phi"+itoa(j)]; ok {
			x0[k] = -phi[j]
		}
	}
	for j := 1; j <= ord.Q; j++ {
		if k, ok := e.index["theta"+itoa(j)]; ok {
			x0[k] = -theta[j]
		}
	}
	return x0, nil
}

// regressionStart writes into x0 the least-squares start of the mean and
// the free regressors (ordinary least squares of the differenced series
// on the constant and the free differenced columns) and returns the
// series less that fit, from which the ARMA start values are found.
func (e *engine) regressionStart(x0 []float64) []float64 {
	w := e.wy[e.dd:]
	var cols [][]float64 // nil: the constant column
	var ks []int
	if e.kmu >= 0 {
		cols = append(cols, nil)
		ks = append(ks, e.kmu)
	}
	for k, b := range e.kb {
		if b >= 0 {
			cols = append(cols, e.wx[k][e.dd:])
			ks = append(ks, b)
		}
	}
	resid := append([]float64(nil), w...)
	for i := range resid {
		resid[i] -= e.mu // zero unless the mean is held at a value
	}
	if len(cols) == 1 && e.kmu >= 0 {
		// Mean only: the least-squares start is the average.
		mu := meanOf(resid)
		x0[e.kmu] = mu
		for i := range resid {
			resid[i] -= mu
		}
		return resid
	}
	if len(cols) == 0 || len(w) <= len(cols) {
		return resid
	}
	beta, ok := leastSquares(cols, resid)
	if !ok {
		return resid
	}
	for j, c := range cols {
		x0[ks[j]] = beta[j]
		for i := range resid {
			if c == nil {
				resid[i] -= beta[j]
			} else {
				resid[i] -= beta[j] * c[i]
			}
		}
	}
	return resid
}

// leastSquares solves min ||y - A beta|| by QR, A's columns cols (nil is
// the constant column); ok is false when A is rank deficient.
func leastSquares(cols [][]float64, y []float64) (beta []float64, ok bool) {
	a := mat.NewDense(len(y), len(cols), nil)
	for j, c := range cols {
		for i := range y {
			if c == nil {
				a.Set(i, j, 1)
			} else {
				a.Set(i, j, c[i])
			}
		}
	}
	var qr mat.QR
	qr.Factorize(a)
	var b mat.VecDense
	if err := qr.SolveVecTo(&b, false, mat.NewVecDense(len(y), append([]float64(nil), y...))); err != nil {
		return nil, false
	}
	beta = make([]float64, len(cols))
	for j := range beta {
		beta[j] = b.AtVec(j)
	}
	return beta, true
}

// applyStartValues writes FitSettings.StartValues into x0 (in working
// units); a name that is no free parameter is a *SettingError.
func (e *engine) applyStartValues(o FitSettings, x0 []float64) error {
	for nm, v := range o.StartValues {
		k, ok := e.index[nm]
		if nm == "c" && e.kmu >= 0 {
			k, ok = e.kmu, true
		}
		for j, b := range e.kb {
			if b >= 0 && xName(o, j) == nm {
				k, ok = b, true
			}
		}
		if !ok || k < 0 {
			return settingErr("FitSettings.StartValues", strconv.Quote(nm), "names no free parameter of the model")
		}
		v /= e.pscale[k]
		if k == e.kmu {
			v -= e.shift
		}
		x0[k] = v
	}
	return nil
}

// hrMax bounds the samples used for Hannan-Rissanen start values.
const hrMax = 20000

var errNonInvertible = errors.New("arma: MA polynomial not invertible")

// schurStable reports whether every root in B of a (a[0] != 0) lies
// strictly outside the unit circle (every z-plane root strictly inside),
// by the Schur-Cohn step-down recursion: the reflection coefficients must
// all have modulus below 1. It allocates only for degrees above 32.
func schurStable(a []float64) bool {
	m := len(a) - 1
	for m > 0 && a[m] == 0 {
		m--
	}
	if m == 0 {
		return true
	}
	// The stack buffer serves degrees up to 32; the size is checked
	// before slicing.
	var buf [2][33]float64
	var cur, nxt []float64
	if m < len(buf[0]) {
		cur, nxt = buf[0][:m+1], buf[1][:m+1]
	} else {
		cur, nxt = make([]float64, m+1), make([]float64, m+1)
	}
	for j := 0; j <= m; j++ {
		cur[j] = a[j] / a[0]
	}
	for k := m; k >= 1; k-- {
		kap := cur[k]
		if !(math.Abs(kap) < 1) {
			return false
		}
		d := 1 - kap*kap
		nxt[0] = 1
		for j := 1; j < k; j++ {
			nxt[j] = (cur[j] - kap*cur[k-j]) / d
		}
		cur, nxt = nxt, cur
	}
	return true
}
