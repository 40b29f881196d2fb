package fit

import (
	"context"
	"math"
	"math/bits"
	"runtime"
	"runtime/debug"
	"sort"
	"strconv"
	"sync"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/est"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/lm"
	"github.com/backshift/backshift/internal/vec"
	"github.com/backshift/backshift/tf"
)

// work is the working state of one fit; nothing in it is shared. Its
// fields come in three parts: the model binding (which coefficients the
// parameter vector sets), the data with its conditioning, and the work
// series and buffers the evaluations write. Its methods are all in this
// file, in the order of a fit: conditioning and allocation, evaluation
// of the residuals and of the Jacobian by blocks of rows, the search,
// start values, and the noise part of a forecast. Model, Check and
// Estimate.Forecast make one with newWork (at the end of the file, with
// the types of its parts).
type work struct {
	binding
	conditionedData
	evalBuffers
}

// condition sets the conditioning of a fit of n samples (see the package
// doc, Conditioning) and the per-input facts the evaluations read (the
// differencing degree, which parts are free); it refuses a dead time out
// of range and too few residuals for the free parameters.
func (w *work) condition(set Settings, n int) error {
	d := len(w.m.Diff.Coeffs()) - 1
	ts := d
	w.ins = make([]inputState, len(w.m.Inputs))
	for i := range w.m.Inputs {
		in := &w.m.Inputs[i]
		fi := &w.ins[i]
		fi.in = in
		fi.d = in.Diff.Degree()
		if in.Delay < 0 || in.Delay > tf.MaxDelay {
			return &tf.DelayError{Delay: in.Delay}
		}
		ts = max(ts, fi.d+in.Delay+in.Num.Degree())
		in.Num.Each(func(c *tf.Coef) {
			if w.idx(c.Name) >= 0 {
				fi.numFree = true
			}
		})
		in.Den.Each(func(c *tf.Coef) {
			if w.idx(c.Name) >= 0 {
				fi.denFree = true
			}
		})
	}
	p := w.ar.Degree()
	t0 := max(ts+p, set.First)
	w.cond = Conditioning{OutputDiff: d, NoiseStart: ts, First: t0, ZeroPreSample: set.ZeroPreSample, Start: set.Start, InputGaps: set.InputGaps}
	w.n = n
	if nres := n - t0; nres <= len(w.names) {
		return w.tooFewResiduals(nres)
	}
	return nil
}

// tooFewResiduals is the ErrShort error of a fit with nres residuals,
// naming the input whose dead time and degrees set the first residual
// index when one does.
func (w *work) tooFewResiduals(nres int) error {
	n, d, ts, t0 := w.n, w.cond.OutputDiff, w.cond.NoiseStart, w.cond.First
	p := w.ar.Degree()
	detail := "residuals are summed from index " + strconv.Itoa(t0) + " of " + strconv.Itoa(n) + " samples"
	for i := range w.m.Inputs {
		in := &w.m.Inputs[i]
		if ts > d && w.ins[i].d+in.Delay+in.Num.Degree() == ts && t0 == ts+p {
			detail += "; input " + strconv.Quote(in.Series) + " with dead time " + strconv.Itoa(in.Delay) + ", numerator degree " +
				strconv.Itoa(in.Num.Degree()) + " and differencing degree " + strconv.Itoa(w.ins[i].d) + " leaves its first " +
				strconv.Itoa(ts) + " samples without a residual: check the dead time (it counts samples)"
			break
		}
	}
	return errs.Series(w.m.Output, errs.ErrShort, max(nres, 0), len(w.names)+1, "counting residuals, one more than the "+strconv.Itoa(len(w.names))+" free coefficients; "+detail)
}

// allocate takes every work series from one slab, recycled between fits
// (see workSlab), forms the differenced output and inputs with the
// pre-sample levels of the conditioning, and clears what the evaluations
// rely on being zero. It refuses an input held at a non-zero first value
// through a fixed integrator, and an input with free coefficients that
// never moves. The caller releases w on an error.
func (w *work) allocate(y []float64, data map[string][]float64, set Settings) error {
	n, t0 := w.n, w.cond.First
	nres := n - t0
	size := 3 * n
	for i := range w.ins {
		fi := &w.ins[i]
		ext := fi.in.Num.Degree() + fi.in.Den.Degree()
		size += 4*n + nres + ext
		if fi.denFree {
			size += n + nres + ext
		}
	}
	w.slab = getSlab(size)
	buf := w.slab.buf
	take := func(m int) []float64 {
		out := buf[:m:m]
		buf = buf[m:]
		return out
	}
	// Differenced series (fixed), zero before the differencing degree.
	w.w = filter.Diff(take(n), y, w.m.Diff.Coeffs())
	w.y = y
	for i := range w.ins {
		fi := &w.ins[i]
		fi.x = data[fi.in.Series]
		fi.z = filter.Diff(take(n), fi.x, fi.in.Diff.Coeffs())
		fi.zc = take(n)
		if err := fi.centre(set.ZeroPreSample, n); err != nil {
			return err
		}
		fi.s = take(n)
		fi.u = take(n)
		ext := fi.in.Num.Degree() + fi.in.Den.Degree()
		fi.e = take(nres + ext)
		if fi.denFree {
			fi.q = take(n)
			fi.f = take(nres + ext)
		}
	}
	w.nn = take(n)
	w.a = take(n)
	clear(w.a[:t0])
	w.maFixedOne = w.ma.IsOne()
	return nil
}

// release returns the work series to the pool; w must not be used
// afterwards.
func (w *work) release() {
	if w.slab != nil {
		slabPools[bits.Len(uint(cap(w.slab.buf)-1))].Put(w.slab)
		w.slab = nil
		w.w, w.nn, w.a = nil, nil, nil
		for i := range w.ins {
			fi := &w.ins[i]
			fi.z, fi.zc, fi.s, fi.u, fi.q, fi.e, fi.f = nil, nil, nil, nil, nil, nil, nil
		}
	}
}

// noiseSeries computes u_i and n_t for the current values; it fills the
// polynomial coefficients and derivatives.
func (w *work) noiseSeries() {
	n := w.n
	ts := w.cond.NoiseStart
	k := len(w.names)
	for i := range w.ins {
		w.ins[i].runFilters(w.idx, k, n)
	}
	c := 0.0
	if w.m.Const != nil {
		c = w.m.Const.Value
	}
	nn := w.nn[ts:n]
	off := c
	for i := range w.ins {
		off += w.ins[i].gain * w.ins[i].z0
	}
	ww := w.w[ts:n]
	switch len(w.ins) {
	case 0:
		for t := range nn {
			nn[t] = ww[t] - off
		}
	case 1:
		u := w.ins[0].u[ts:n]
		u = u[:len(nn)]
		ww = ww[:len(nn)]
		for t := range nn {
			nn[t] = ww[t] - off - u[t]
		}
	default:
		for t := range nn {
			nn[t] = ww[t] - off
		}
		for i := range w.ins {
			u := w.ins[i].u[ts:n]
			u = u[:len(nn)]
			for t := range nn {
				nn[t] -= u[t]
			}
		}
	}
}

// resid computes a_t from n_t; it returns the sum of squares.
func (w *work) resid() float64 {
	k := len(w.names)
	w.arC, w.arD = w.ar.Grad(w.idx, k)
	w.maC, w.maD = w.ma.Grad(w.idx, k)
	ts, t0 := w.cond.NoiseStart, w.cond.First
	if isOne(w.maC) {
		fir(w.a[t0:], w.arC, w.nn, t0, false)
	} else {
		filter.RunInit(w.a[t0:], w.arC, w.maC, w.nn[t0:], w.nn[ts:t0], nil)
	}
	return vec.Dot(w.a[t0:], w.a[t0:])
}

// eval is the lm residual function.
func (w *work) eval(x, r []float64, jac [][]float64) error {
	w.set(x)
	w.noiseSeries()
	t0 := w.cond.First
	var f float64
	if w.maFixedOne {
		// No moving average: a_t = phi(B) n_t straight into r (a_t itself
		// is needed only by the MA columns).
		k := len(w.names)
		w.arC, w.arD = w.ar.Grad(w.idx, k)
		w.maC, w.maD = w.ma.Grad(w.idx, k)
		fir(r, w.arC, w.nn, t0, false)
		f = vec.Dot(r, r)
	} else {
		f = w.resid()
		copy(r, w.a[t0:])
	}
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return errFilter
	}
	if jac == nil {
		return nil
	}
	w.jacobian(jac)
	return nil
}

// jacobian fills the columns d a_t / d x_k for t >= First. Each column is
// (1/theta(B)) applied to a sum of moving-average filters of series
// already computed (see Estimation in the package doc):
//
//	-g_k (phi s_i), +g_k (phi q_i), -phi(1), +g_k n, -g_k a
//
// for numerator, denominator, constant, AR and MA parameters. phi s_i
// and phi q_i are formed once per evaluation over First - (s_i + r_i) ..
// n-1, so that a numerator or denominator column whose g_k is a single
// power of B (the usual case) is a shifted copy. The lm solver uses
// normalEval, which forms the same columns a block of rows at a time;
// jacobian is the stored form for the tests.
func (w *work) jacobian(jac [][]float64) {
	w.jacPrep()
	maOne := isOne(w.maC)
	var sc []float64 // bracket for the moving-average recursion
	if !maOne {
		sc = w.scratchN(len(jac[0]))
	}
	for k := range jac {
		dst := jac[k]
		if !maOne {
			dst = sc
		}
		w.colRows(k, 0, dst, jac[k], nil)
	}
}

// jacPrep forms, for the current values, what every Jacobian column
// reads: phi s_i and phi q_i, the constant part kappa_k of each column
// and the negated numerator and MA derivative polynomials.
func (w *work) jacPrep() {
	t0 := w.cond.First
	k := len(w.names)
	for i := range w.ins {
		fi := &w.ins[i]
		ext := len(fi.e) - (w.n - t0)
		if fi.numFree { // e is read only by numerator columns
			fir(fi.e, w.arC, fi.s, t0-ext, false)
		}
		if fi.denFree {
			fir(fi.f, w.arC, fi.q, t0-ext, false)
		}
		fi.negNum = negateAll(fi.negNum, fi.numD)
	}
	w.negMA = negateAll(w.negMA, w.maD)
	phi1 := 0.0
	for _, v := range w.arC {
		phi1 += v
	}
	if cap(w.kappa) < k {
		w.kappa = make([]float64, k)
	}
	w.kappa = w.kappa[:k]
	for j := range w.kappa {
		// kappa is the constant part of d n_t: -1 for the constant and,
		// for a steady pre-sample level z0, the derivative of
		// -omega(1)/delta(1) z0; the column's constant is kappa phi(1).
		kappa := 0.0
		if w.m.Const != nil && w.idx(w.m.Const.Name) == j {
			kappa = -1
		}
		for i := range w.ins {
			fi := &w.ins[i]
			if fi.z0 == 0 {
				continue
			}
			d1 := sumCoeffs(fi.denC)
			if g := fi.numD[j]; g != nil {
				kappa -= sumCoeffs(g) * fi.z0 / d1
			}
			if g := fi.denD[j]; g != nil {
				kappa += fi.gain * sumCoeffs(g) * fi.z0 / d1
			}
		}
		w.kappa[j] = kappa * phi1
	}
	w.prepViews()
}

// prepViews finds, for the current values, the columns that are shifted
// copies (times +-1) of one series (the usual numerator, denominator and
// AR columns of a model without a moving-average part): normalRows
// multiplies those in place instead of copying them. A column with a
// constant part, two contributions or a coefficient other than +-1 gets
// an empty view and is formed by colRows.
func (w *work) prepViews() {
	k := len(w.names)
	if cap(w.views) < k {
		w.views = make([]columnView, k)
	}
	w.views = w.views[:k]
	m := w.n - w.cond.First
	maOne := isOne(w.maC)
	for j := range w.views {
		w.views[j] = columnView{}
		if !maOne || w.kappa[j] != 0 {
			continue
		}
		var v columnView
		count := 0
		try := func(g, src []float64, at int) {
			if g == nil {
				return
			}
			count++
			l, c, ok := singlePower(g)
			if ok && (c == 1 || c == -1) && at-l >= 0 {
				v = columnView{src: src, at: at - l, sign: c}
			}
		}
		for i := range w.ins {
			fi := &w.ins[i]
			try(fi.negNum[j], fi.e, len(fi.e)-m)
			try(fi.denD[j], fi.f, len(fi.f)-m)
		}
		try(w.arD[j], w.nn, w.cond.First)
		if w.maD[j] != nil {
			count++
		}
		if count == 1 && v.src != nil {
			w.views[j] = v
		}
	}
}

// colRows computes rows r0 .. r0+len(out)-1 of Jacobian column k into
// out, with dst (the same length) holding the moving-average bracket when
// theta(B) is not 1 (dst may be out when it is). yHist holds the
// column's outputs before row r0 for the recursion 1/theta(B), oldest
// first (nil: the recursion starts at rest, as at row 0). After jacPrep
// it only reads shared state, so that disjoint rows or columns may run
// concurrently. Rows computed in blocks are bit for bit those of one
// pass over all rows.
func (w *work) colRows(k, r0 int, dst, out, yHist []float64) {
	t0 := w.cond.First + r0
	first := true
	if c := w.kappa[k]; c != 0 {
		for t := range dst {
			dst[t] = c
		}
		first = false
	}
	m := w.n - w.cond.First
	for i := range w.ins {
		fi := &w.ins[i]
		ext := len(fi.e) - m + r0
		// fi.e[j] holds (phi s)_{First-ext0+j}; filter it as a series
		// whose index origin is First-ext0.
		if g := fi.negNum[k]; g != nil {
			fir(dst, g, fi.e, ext, !first)
			first = false
		}
		if g := fi.denD[k]; g != nil {
			fir(dst, g, fi.f, ext, !first)
			first = false
		}
	}
	if g := w.arD[k]; g != nil {
		fir(dst, g, w.nn, t0, !first)
		first = false
	}
	if g := w.negMA[k]; g != nil {
		fir(dst, g, w.a, t0, !first)
		first = false
	}
	if first {
		clear(dst)
	}
	if !isOne(w.maC) {
		filter.RunInit(out, unitPoly, w.maC, dst, nil, yHist)
	}
}

// normalEval is the lm Normal function: the residuals as eval computes
// them, and J'J and J'r added into acc (lm's layout) a block of
// lm.NormalBlock rows at a time. The columns of a block are formed by
// colRows into a scratch block that stays in the first-level cache and
// multiplied there, so the Jacobian is never stored: per evaluation the
// series it is formed from are read once. The blocks are summed in the
// order lm sums stored columns (the halves of lm.SplitRow separately), so the result is that of eval and lm's own
// products bit for bit. Without a moving-average part the two halves run
// on two goroutines when GOMAXPROCS > 1; with one, the recursion
// 1/theta(B) carries each column's state from block to block.
func (w *work) normalEval(x, r, acc []float64) error {
	if err := w.eval(x, r, nil); err != nil {
		return err
	}
	w.jacPrep()
	m := len(r)
	h := lm.SplitRow(m)
	if h == 0 {
		w.normalRows(acc, r, 0, m, &w.blk[0])
		return nil
	}
	acc1 := w.scratchAcc(len(acc))
	if isOne(w.maC) && runtime.GOMAXPROCS(0) > 1 {
		var wg sync.WaitGroup
		var perr error
		wg.Add(1)
		go func() {
			defer wg.Done()
			// Last line of defence: a panic here would kill the caller's
			// process; it becomes a typed error that Model returns.
			defer func() {
				if v := recover(); v != nil {
					perr = &errs.InternalError{Value: v, Stack: debug.Stack()}
				}
			}()
			w.normalRows(acc1, r, h, m, &w.blk[1])
		}()
		w.normalRows(acc, r, 0, h, &w.blk[0])
		wg.Wait()
		if perr != nil {
			w.panicErr = perr
			return perr
		}
	} else {
		st := &w.blk[0]
		w.normalRows(acc, r, 0, h, st)
		w.normalRows(acc1, r, h, m, st)
	}
	for i := range acc {
		acc[i] += acc1[i]
	}
	return nil
}

// normalRows adds to acc the products of the Jacobian columns with
// themselves and with r over rows lo..hi-1, block by block. With a
// moving-average part the rows must come in order from row 0 through the
// same st, which carries the recursion histories.
func (w *work) normalRows(acc, r []float64, lo, hi int, st *blockScratch) {
	k := len(w.names)
	L := lm.NormalBlock
	st.size(k, L, len(w.maC)-1)
	signed := false
	for _, v := range w.views {
		if v.sign == -1 {
			signed = true
		}
	}
	if signed && len(st.tmp) != len(acc) {
		st.tmp = make([]float64, len(acc))
	}
	for b := lo; b < hi; b += L {
		e := min(b+L, hi)
		blk := w.formBlock(st, b, e)
		if !signed {
			lm.AddBlock(acc, blk, r[b:e])
			continue
		}
		// Products of negated columns: the block's products from zero,
		// then added with the signs; negation is exact, so this is what
		// AddBlock gives on negated copies, bit for bit.
		clear(st.tmp)
		lm.AddBlock(st.tmp, blk, r[b:e])
		for j := 0; j < k; j++ {
			sj := w.sign(j)
			row, trow := acc[j*(k+1):(j+1)*(k+1)], st.tmp[j*(k+1):(j+1)*(k+1)]
			for l := j; l < k; l++ {
				row[l] += sj * w.sign(l) * trow[l]
			}
			row[k] += sj * trow[k]
		}
	}
}

// formBlock returns rows b..e-1 of every Jacobian column: a view into a
// series already formed where there is one, else formed by colRows in
// the scratch (the moving-average recursion carrying its history from
// the block before).
func (w *work) formBlock(st *blockScratch, b, e int) [][]float64 {
	L := lm.NormalBlock
	maOne := isOne(w.maC)
	blk := st.cols
	for j := range blk {
		if v := w.views[j]; v.src != nil {
			blk[j] = v.src[v.at+b : v.at+e]
			continue
		}
		out := st.back[j*L : j*L+e-b]
		dst := out
		if !maOne {
			dst = st.brk[:e-b]
		}
		var yh []float64
		if !maOne && b > 0 {
			yh = st.hist[j]
		}
		w.colRows(j, b, dst, out, yh)
		if !maOne {
			pushHistory(st.hist[j], out)
		}
		blk[j] = out
	}
	return blk
}

// sign is the sign of Jacobian column j's view (1 for a column without).
func (w *work) sign(j int) float64 {
	if v := w.views[j]; v.src != nil {
		return v.sign
	}
	return 1
}

func (w *work) scratchAcc(m int) []float64 {
	if cap(w.acc1) < m {
		w.acc1 = make([]float64, m)
	}
	w.acc1 = w.acc1[:m]
	clear(w.acc1)
	return w.acc1
}

func (w *work) scratchN(m int) []float64 {
	if cap(w.scratch) < m {
		w.scratch = make([]float64, m)
	}
	return w.scratch[:m]
}

// run performs the starts, the refinements and builds the Estimate.
func (w *work) run(ctx context.Context, set Settings) (*Estimate, error) {
	maxIter := set.MaxIter
	if maxIter <= 0 {
		maxIter = 200
	}
	if w.n-w.cond.First >= stagedMin {
		auto := w.cond.NoiseStart + w.ar.Degree()
		sub := w.window(max(stagedWindow, stagedPerParam*len(w.names)) + auto)
		if ws, err := newWork(w.m, sub, Settings{IgnoreExtra: true, ZeroPreSample: set.ZeroPreSample, Start: set.Start}); err == nil {
			best, start, tried, err := ws.search(ctx, set, maxIter)
			ws.release()
			if ws.panicErr != nil {
				return nil, ws.panicErr
			}
			if err == nil {
				res, err := lm.Minimize(ctx, w.problem(), best.X, w.lmSettings(set, maxIter))
				if w.panicErr != nil {
					return nil, w.panicErr
				}
				if err == nil {
					return w.estimate(&res, start, tried), nil
				}
			}
		}
	}
	best, start, tried, err := w.search(ctx, set, maxIter)
	if w.panicErr != nil {
		return nil, w.panicErr
	}
	if err != nil {
		return nil, err
	}
	return w.estimate(best, start, tried), nil
}

// window returns the last m samples of every series of the fit.
func (w *work) window(m int) map[string][]float64 {
	out := map[string][]float64{}
	out[w.m.Output] = w.y[w.n-m:]
	for i := range w.ins {
		out[w.ins[i].in.Series] = w.ins[i].x[w.n-m:]
	}
	return out
}

func (w *work) lmSettings(set Settings, maxIter int) *lm.Settings {
	tol := set.Tol
	if tol <= 0 {
		r := float64(w.n-w.cond.First) / 1e4
		tol = min(max(1e-14*r*r*r*r*r, 1e-14), 1e-9)
	}
	return &lm.Settings{MaxIter: maxIter, FTol: tol}
}

func (w *work) problem() lm.Problem {
	return lm.Problem{M: w.n - w.cond.First, N: len(w.names), Eval: w.eval, Normal: w.normalEval, WritesAll: true}
}

// search computes the start candidates, screens them by their sum of
// squares and refines the best ones; it returns the best result, its
// start point and the number of candidates screened.
func (w *work) search(ctx context.Context, set Settings, maxIter int) (*lm.Result, []float64, int, error) {
	cands := w.startCandidates()
	nStarts := set.Starts
	if nStarts <= 0 {
		nStarts = 1
		if w.multimodal() {
			nStarts = 2
		}
	}
	type scored struct {
		x []float64
		f float64
	}
	var sc []scored
	for _, x := range cands {
		w.set(x)
		w.noiseSeries()
		f := w.resid()
		if math.IsNaN(f) || math.IsInf(f, 0) {
			continue
		}
		sc = append(sc, scored{x, f})
	}
	if len(sc) == 0 {
		// No candidate filters to finite values: fall back to all zeros.
		sc = append(sc, scored{make([]float64, len(w.names)), math.Inf(1)})
	}
	sort.SliceStable(sc, func(i, j int) bool { return sc[i].f < sc[j].f })
	prob := w.problem()
	var best *lm.Result
	var bestStart []float64
	var firstErr error
	for i := 0; i < len(sc) && i < nStarts; i++ {
		res, err := lm.Minimize(ctx, prob, sc[i].x, w.lmSettings(set, maxIter))
		if err != nil {
			if firstErr == nil {
				firstErr = err
			}
			continue
		}
		if best == nil || res.SSQ < best.SSQ {
			r := res
			best = &r
			bestStart = sc[i].x
		}
		if res.Reason == lm.Canceled {
			break
		}
	}
	if best == nil {
		return nil, nil, 0, errs.Series(w.m.Output, errs.ErrOverflow, 0, 0,
			"no start point gives finite residuals ("+firstErr.Error()+"); the coefficients held at fixed values may make a filter blow up on this data "+
				"(an unstable fixed denominator, or a fixed noise MA with a zero on or outside the unit circle), or the samples are too large: check the fixed values and the units, or give start values in the spec")
	}
	return best, bestStart, len(sc), nil
}

// multimodal reports whether the model has free denominator or MA
// coefficients.
func (w *work) multimodal() bool {
	for _, fi := range w.ins {
		if fi.denFree {
			return true
		}
	}
	found := false
	w.ma.Each(func(c *tf.Coef) {
		if w.idx(c.Name) >= 0 {
			found = true
		}
	})
	return found
}

// estimate builds the result from the best lm result.
func (w *work) estimate(res *lm.Result, start []float64, tried int) *Estimate {
	k := len(w.names)
	w.set(res.X)
	t0 := w.cond.First
	nres := w.n - t0
	// The residuals at the best point come from the solver (len N).
	ssq := 0.0
	for _, v := range res.Resid {
		ssq += v * v
	}
	e := &Estimate{
		Model:        w.m.Clone(),
		SSQ:          ssq,
		N:            nres,
		Conditioning: w.cond,
		Iter:         res.Iter,
		Evals:        res.Evals,
		StartsTried:  tried,
		Converged:    res.Reason.Converged(),
		Reason:       res.Reason.String(),
	}
	e.Sigma2 = est.Sigma2(ssq, nres, k)
	ml := ssq / float64(nres)
	e.LogLik = -0.5 * float64(nres) * (math.Log(2*math.Pi*ml) + 1)
	e.AIC = -2*e.LogLik + 2*float64(k+1)
	e.BIC = -2*e.LogLik + float64(k+1)*math.Log(float64(nres))
	e.Resid = make([]float64, w.n)
	for t := range e.Resid {
		if t < t0 {
			e.Resid[t] = math.NaN()
		} else {
			e.Resid[t] = res.Resid[t-t0]
		}
	}
	e.Cov = make([][]float64, k)
	for i := range e.Cov {
		e.Cov[i] = make([]float64, k)
		for j := range e.Cov[i] {
			if res.JTJInv != nil {
				e.Cov[i][j] = e.Sigma2 * res.JTJInv.At(i, j)
			} else {
				e.Cov[i][j] = math.NaN()
			}
		}
	}
	e.Params = make([]Param, k)
	for i, name := range w.names {
		se := math.Sqrt(e.Cov[i][i])
		if math.IsNaN(e.Cov[i][i]) || e.Cov[i][i] < 0 {
			se = math.NaN()
		}
		e.Params[i] = Param{Name: name, Value: res.X[i], Start: start[i], SE: se, T: res.X[i] / se}
	}
	w.noiseSeries() // n_t at the estimate, for the start-up transient test
	e.Warnings = append(warningsOf(e, res.JTJInv == nil, w.nn[t0:w.n]), w.screen(w.y[:w.n])...)
	return e
}

// needsStart reports whether p has free coefficients that are all zero.
func (w *work) needsStart(p tf.Poly) bool {
	free, nonzero := false, false
	p.Each(func(c *tf.Coef) {
		if w.idx(c.Name) >= 0 {
			free = true
			if c.Value != 0 {
				nonzero = true
			}
		}
	})
	return free && !nonzero
}

// startCandidates returns the candidate start vectors, the primary first.
func (w *work) startCandidates() [][]float64 {
	constStart := w.m.Const != nil && w.idx(w.m.Const.Name) >= 0 && w.m.Const.Value == 0
	needIn := constStart
	for i := range w.ins {
		in := w.ins[i].in
		if w.needsStart(in.Num) || w.needsStart(in.Den) {
			needIn = true
		}
	}
	if needIn {
		w.startInputs(constStart)
	}
	noiseFree := false
	w.ma.Each(func(c *tf.Coef) { noiseFree = noiseFree || w.idx(c.Name) >= 0 })
	w.ar.Each(func(c *tf.Coef) { noiseFree = noiseFree || w.idx(c.Name) >= 0 })
	if w.needsStart(w.ar) || w.needsStart(w.ma) {
		w.startNoise()
	}
	primary := w.params()
	cands := [][]float64{primary}
	if noiseFree {
		x := append([]float64(nil), primary...)
		zero := func(c *tf.Coef) {
			if k := w.idx(c.Name); k >= 0 {
				x[k] = 0
			}
		}
		w.ma.Each(zero)
		w.ar.Each(zero)
		cands = append(cands, x)
	}
	for _, f := range []float64{0.5, 1.5} {
		if x := w.scaledDenominators(primary, f); x != nil {
			cands = append(cands, x)
		}
	}
	w.set(primary)
	return cands
}

// scaledDenominators returns primary with the free denominator
// coefficients scaled by f, or nil when that changes nothing or leaves a
// pole at |z| >= 0.99. It leaves the values of w set to the result.
func (w *work) scaledDenominators(primary []float64, f float64) []float64 {
	x := append([]float64(nil), primary...)
	changed := false
	for i := range w.ins {
		if !w.ins[i].denFree {
			continue
		}
		w.ins[i].in.Den.Each(func(c *tf.Coef) {
			if k := w.idx(c.Name); k >= 0 {
				x[k] = primary[k] * f
				changed = changed || primary[k] != 0
			}
		})
	}
	if !changed {
		return nil
	}
	w.set(x)
	ok := true
	for i := range w.ins {
		if maxZ(w.ins[i].in.Den.Coeffs()) >= 0.99 {
			ok = false
		}
	}
	if !ok {
		return nil
	}
	return x
}

// startInputs sets start values of the inputs' polynomials (and the
// constant) from least-squares impulse-response weights.
func (w *work) startInputs(constStart bool) {
	n := w.n
	lags := make([]int, len(w.ins))
	for attempt := 0; attempt < 2; attempt++ {
		tr := w.cond.OutputDiff
		p := 0
		if w.m.Const != nil {
			p = 1
		}
		for i := range w.ins {
			in := w.ins[i].in
			s, r := in.Num.Degree(), in.Den.Degree()
			if attempt == 0 {
				lags[i] = min(s+3*r+2, 40)
			} else {
				lags[i] = s + r
			}
			tr = max(tr, w.ins[i].d+in.Delay+lags[i])
			p += lags[i] + 1
		}
		tr = max(tr, n-startWindow)
		if n-tr < p+5 {
			continue
		}
		coef, ok := ols(w, tr, lags, p)
		if !ok {
			continue
		}
		off := 0
		if w.m.Const != nil {
			if constStart {
				w.set(w.withValue(w.m.Const.Name, coef[0]))
			}
			off = 1
		}
		for i := range w.ins {
			in := w.ins[i].in
			v := coef[off : off+lags[i]+1]
			off += lags[i] + 1
			num, den := pade(v, in.Num.Degree(), in.Den.Degree())
			if w.needsStart(in.Den) {
				w.matchTarget(in.Den, den)
			}
			if w.needsStart(in.Num) {
				w.matchTarget(in.Num, num)
			}
		}
		return
	}
}

// withValue returns the parameter vector with parameter name set to v.
func (w *work) withValue(name string, v float64) []float64 {
	x := w.params()
	if k := w.idx(name); k >= 0 {
		x[k] = v
	}
	return x
}

// startNoise sets the noise polynomials' start values by
// Hannan-Rissanen on n_t implied by the current input values.
func (w *work) startNoise() {
	w.noiseSeries()
	lo := max(w.cond.NoiseStart, w.n-startWindow)
	x := w.nn[lo:w.n]
	mean := 0.0
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	xc := make([]float64, len(x))
	for i, v := range x {
		xc[i] = v - mean
	}
	phi, theta, err := hannanRissanen(xc, w.ar.Degree(), w.ma.Degree())
	if err != nil {
		return
	}
	before := w.params()
	if w.needsStart(w.ar) {
		w.matchTarget(w.ar, phi)
	}
	if w.needsStart(w.ma) {
		w.matchTarget(w.ma, theta)
	}
	if maxZ(w.ar.Coeffs()) >= 0.99 || maxZ(w.ma.Coeffs()) >= 0.99 {
		w.set(before)
	}
}

// matchTarget sets the free coefficients of p so that its expanded
// coefficients match target (index k = B^k) in least squares. Parameters
// not in p are unchanged.
func (w *work) matchTarget(p tf.Poly, target []float64) {
	local, ids := w.polyParams(p)
	if len(ids) == 0 {
		return
	}
	orig := w.params()
	x := w.params()
	x0 := make([]float64, len(ids))
	for j, k := range ids {
		x0[j] = x[k]
	}
	li := func(name string) int {
		if j, ok := local[name]; ok {
			return j
		}
		return -1
	}
	prob := lm.Problem{M: p.Degree() + 1, N: len(ids), Eval: func(xl, r []float64, jac [][]float64) error {
		for j, k := range ids {
			x[k] = xl[j]
		}
		w.set(x)
		c, d := p.Grad(li, len(ids))
		matchResiduals(r, jac, c, d, target)
		return nil
	}}
	res, err := lm.Minimize(context.Background(), prob, x0, &lm.Settings{MaxIter: 100})
	if err != nil {
		w.set(orig)
		return
	}
	for j, k := range ids {
		x[k] = res.X[j]
	}
	w.set(x)
}

// polyParams returns the parameter indices of the free coefficients of
// p in order of first appearance, and each name's position among them.
func (w *work) polyParams(p tf.Poly) (local map[string]int, ids []int) {
	local = map[string]int{}
	p.Each(func(c *tf.Coef) {
		k := w.idx(c.Name)
		if k < 0 {
			return
		}
		if _, ok := local[c.Name]; !ok {
			local[c.Name] = len(ids)
			ids = append(ids, k)
		}
	})
	return local, ids
}

// addNoiseForecast adds the forecast of the noise n_t to what, from
// phi(B) n_t = theta(B) a_t with future a_t = 0.
func (w *work) addNoiseForecast(what []float64) {
	n, h := w.n, len(what)
	L := n + h
	ts, t0 := w.cond.NoiseStart, w.cond.First
	ne := make([]float64, L)
	copy(ne[ts:n], w.nn[ts:n])
	ae := make([]float64, L)
	copy(ae[t0:n], w.a[t0:n])
	for t := n; t < L; t++ {
		v := 0.0
		for k := 1; k < len(w.arC) && t-k >= 0; k++ {
			v -= w.arC[k] * ne[t-k]
		}
		for k := 1; k < len(w.maC) && t-k >= 0; k++ {
			v += w.maC[k] * ae[t-k]
		}
		ne[t] = v / w.arC[0]
		what[t-n] += ne[t]
	}
}

// binding ties the parameter vector to the coefficients of a working
// clone of the model: parameter k is names[k] and sets every coefficient
// in coefs[k].
type binding struct {
	m     tf.Model // working clone whose coefficient values are set per evaluation
	names []string
	coefs [][]*tf.Coef
	index map[string]int // name -> k
}

// idx returns the parameter index of a coefficient name, -1 for a name
// that is not free.
func (w *binding) idx(name string) int {
	if k, ok := w.index[name]; ok {
		return k
	}
	return -1
}

// set writes the parameter vector into the working model.
func (w *binding) set(x []float64) {
	for k, cs := range w.coefs {
		for _, c := range cs {
			c.Value = x[k]
		}
	}
}

// params returns the current parameter vector.
func (w *binding) params() []float64 {
	x := make([]float64, len(w.names))
	for k, cs := range w.coefs {
		x[k] = cs[0].Value
	}
	return x
}

// inputState is the working state of one input term.
type inputState struct {
	in         *tf.Input // into the working model clone
	x          []float64 // the input as given (not modified)
	zc         []float64 // z - z0 from index d on, 0 before
	z0         float64   // pre-sample level of z: x_0 without differencing, else 0
	gain       float64   // omega(1)/delta(1) at the current values
	z          []float64
	s, u, q    []float64
	numC, denC []float64
	numD, denD [][]float64
	e, f       []float64   // phi(B) s and phi(B) q from First - ext on (Jacobian; ext = deg omega + deg delta)
	negNum     [][]float64 // -numD (Jacobian)
	numFree    bool        // a numerator coefficient is estimated: the Jacobian needs e
	denFree    bool
	d          int
}

// centre sets the pre-sample level z0 of the input (its first value
// without differencing unless zeroPre, else 0) and zc = z - z0 from the
// differencing degree on (0 before); it refuses an input that has no
// steady state to hold at z0 or that never moves while its coefficients
// are free.
func (fi *inputState) centre(zeroPre bool, n int) error {
	if !zeroPre && fi.d == 0 && n > 0 {
		fi.z0 = fi.z[fi.d]
	}
	clear(fi.zc[:min(fi.d, n)])
	moves := false
	for t := fi.d; t < n; t++ {
		fi.zc[t] = fi.z[t] - fi.z0
		moves = moves || fi.zc[t] != 0
	}
	if fi.z0 != 0 && !fi.denFree && sumCoeffs(fi.in.Den.Coeffs()) == 0 {
		return errs.Model("input "+strconv.Quote(fi.in.Series), "no settled start: its denominator has a pole at z = 1 (an integrator), so it has no steady state, "+
			"and fit.Model cannot take the input as held at its first value "+strconv.FormatFloat(fi.z0, 'g', 6, 64)+
			" before the record; set fit.Settings.ZeroPreSample to take it as zero before the record, or write the integration as differencing of the output")
	}
	if !moves && (fi.numFree || fi.denFree) {
		why := "every sample is " + strconv.FormatFloat(fi.x[0], 'g', 6, 64) + ", and fit.Model takes an input as held at its first value before the record"
		if fi.d > 0 {
			why = "its differenced values are all zero"
		}
		return errs.Series(fi.in.Series, errs.ErrConstant, 0, 0, "an input: "+why+
			", so the input never moves and its coefficients cannot be estimated; leave it out of the model (a constant level belongs in the constant) or hold its coefficients at known values")
	}
	return nil
}

// runFilters computes, for the current values, the input's polynomial
// coefficients and derivatives (k parameters, idx their index), s =
// B^b zc / delta, u = omega s and, with a free denominator, q = u /
// delta over the n samples, and the steady-state gain used with a
// non-zero pre-sample level.
func (fi *inputState) runFilters(idx func(string) int, k, n int) {
	fi.numC, fi.numD = fi.in.Num.Grad(idx, k)
	fi.denC, fi.denD = fi.in.Den.Grad(idx, k)
	b := fi.in.Delay
	clear(fi.s[:min(b, n)])
	switch {
	case b >= n:
		clear(fi.u)
		if fi.denFree {
			clear(fi.q)
		}
	case len(fi.denC) == 2 && fi.denC[0] == 1 && len(fi.numC) <= 3 && fi.denFree:
		// The common first-order denominator: s, u and q in one pass,
		// whose two recursions overlap in the pipeline.
		runFirstOrder(fi.s, fi.u, fi.q, fi.zc, b, fi.denC[1], fi.numC)
	default:
		if isOne(fi.denC) {
			copy(fi.s[b:], fi.zc[:n-b])
		} else {
			filter.Run(fi.s[b:], unitPoly, fi.denC, fi.zc[:n-b])
		}
		fir(fi.u, fi.numC, fi.s, 0, false)
		if fi.denFree {
			filter.Run(fi.q, unitPoly, fi.denC, fi.u)
		}
	}
	fi.gain = 0
	if fi.z0 != 0 {
		fi.gain = sumCoeffs(fi.numC) / sumCoeffs(fi.denC)
	}
}

// conditionedData is the data of one fit, its conditioning and the noise
// polynomials whose coefficients the evaluations read.
type conditionedData struct {
	n    int
	y    []float64 // the output as given (not modified)
	cond Conditioning
	w    []float64 // D(B) y, zero before the differencing degree
	ins  []inputState
	// ar and ma are phi(B) and theta(B) of the working model (empty
	// polynomials, that is 1, without a noise model).
	ar, ma tf.Poly
	// maFixedOne: theta(B) is 1 as written (no factors), so a_t is a
	// moving average of n_t and no column needs a_t.
	maFixedOne bool
	// obs is the output as given, NaN where missing, for an ExactML fit
	// (y then holds it with the gaps interpolated, for start values).
	obs []float64
	// filled lists the input gaps filled by Settings.InputGaps.
	filled []InputFill
}

// evalBuffers holds what the evaluations write: the noise polynomials'
// coefficients and derivatives at the current values, the series n_t
// and a_t, and the scratch of the Jacobian products, all from one slab
// recycled between fits.
type evalBuffers struct {
	arC     []float64
	maC     []float64
	arD     [][]float64
	maD     [][]float64
	nn, a   []float64
	scratch []float64
	kappa   []float64       // constant part of each Jacobian column
	negMA   [][]float64     // -maD
	acc1    []float64       // the second half's products (normalEval)
	blk     [2]blockScratch // block scratch of normalEval, one per goroutine
	views   []columnView    // columns multiplied in place (normalRows)
	slab    *workSlab
	// panicErr is a panic recovered in a goroutine of normalEval.
	panicErr error
}

// newWork validates m and data and builds the working state: the
// model checks and parameter binding (bindModel), the data checks
// (checkData), the conditioning (condition) and the work series
// (allocate).
func newWork(m tf.Model, data map[string][]float64, set Settings) (*work, error) {
	b, err := bindModel(m)
	if err != nil {
		return nil, err
	}
	data, err = withEvents(m, data, set.Start)
	if err != nil {
		return nil, err
	}
	data, obs, filled, err := prepareGaps(m, data, set)
	if err != nil {
		return nil, err
	}
	y, err := checkData(m, data, set)
	if err != nil {
		return nil, err
	}
	if err := checkConstTerms(b.m); err != nil {
		return nil, err
	}
	n := len(y)
	if set.First > 0 && set.First >= n {
		return nil, errs.Setting("Settings.First", strconv.Itoa(set.First),
			"must be below the number of samples, "+strconv.Itoa(n)+" (it is the index of the first residual summed)")
	}
	if n > 0 && isConstant(y) {
		return nil, errs.Series(m.Output, errs.ErrConstant, 0, 0, "the output: every sample is "+strconv.FormatFloat(y[0], 'g', 6, 64)+
			", there is nothing to explain; check that the right column was read")
	}
	w := &work{binding: b}
	w.filled = filled
	if set.Method == ExactML {
		w.obs = obs
	}
	if m.Noise != nil {
		w.ma, w.ar = w.m.Noise.MA, w.m.Noise.AR
	}
	if err := w.condition(set, n); err != nil {
		return nil, err
	}
	if err := eventsAfterFirst(m, data, w.cond.First); err != nil {
		return nil, err
	}
	if err := w.allocate(y, data, set); err != nil {
		w.release()
		return nil, err
	}
	return w, nil
}

// workSlab is the backing store of a fit's work series. Model returns its
// slab to slabPools when the Estimate no longer refers to it, so that
// repeated fits (many series, many candidate models) reuse the memory
// instead of allocating and clearing it again.
type workSlab struct{ buf []float64 }

// slabPools holds recycled slabs by size class: class c holds slabs of
// capacity 1<<c.
var slabPools [64]sync.Pool

// getSlab returns a slab of m values (contents undefined).
func getSlab(m int) *workSlab {
	c := bits.Len(uint(max(m-1, 1)))
	if s, ok := slabPools[c].Get().(*workSlab); ok {
		s.buf = s.buf[:m]
		return s
	}
	return &workSlab{buf: make([]float64, m, 1<<c)}
}

// columnView describes a Jacobian column that is a shifted copy, times +1 or
// -1, of a series already formed: row i is sign * src[at+i].
type columnView struct {
	src  []float64
	at   int
	sign float64
}

// blockScratch is the scratch of normalRows: one block of every column, the
// moving-average bracket and each column's recursion history.
type blockScratch struct {
	back []float64
	cols [][]float64
	brk  []float64
	hist [][]float64
	tmp  []float64 // one block's products (columns with sign -1)
}

// size makes the scratch hold k columns of blocks of L rows and a
// moving-average history of q values per column.
func (st *blockScratch) size(k, L, q int) {
	if len(st.cols) != k || len(st.back) < k*L {
		st.back = make([]float64, k*L)
		st.brk = make([]float64, L)
		st.cols = make([][]float64, k)
		st.hist = make([][]float64, k)
	}
	for j := range st.hist {
		if cap(st.hist[j]) < q {
			st.hist[j] = make([]float64, q)
		}
		st.hist[j] = st.hist[j][:q]
	}
}
