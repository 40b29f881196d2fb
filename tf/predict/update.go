package predict

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
)

// Update feeds the sample with index Count(): x holds the inputs' values
// at that sample, one per series in the order of Inputs(), and y the
// output's, or NaN when the output is missing for that sample. It
// returns the one-step prediction of y made from the inputs through
// this sample and the outputs before it, with its interval, and, when y
// is given, the prediction error and the innovation (the fit's residual
// at this index, computed with the fit's recursion and start-up; see the
// package doc). Update does not allocate.
//
// A missing output is replaced in the states by its prediction and the
// innovation by zero, its expectation, so that the predictions that
// follow are forecasts from the last observed output with the inputs
// as they come, exactly as a batch forecast from that sample with these
// inputs known; their standard errors grow accordingly (the psi
// weights of theta(B)/(phi(B) D(B)) summed over the missing stretch).
// The first output observed after a gap has the forecast error over the
// gap as its Error (with the matching SE); it updates the states as the
// Kalman filter of the model does: the outputs, noise values and
// innovations held for the gap move to their conditional means given
// that output, and the predictor carries the remaining uncertainty, so
// that the next errors are the filter's, with SEs above the steady one
// until it has died out. Step.Z = Error/SE is standard normal under the
// model throughout (see Step and the package doc).
//
// Errors (Op "predict.Predictor.Update"), after which the state is
// unchanged: a *SeriesError of kind ErrLength when len(x) is not the
// number of input series; a *SampleError for an input value that is
// NaN, infinite or beyond MaxMagnitude, for an output that is infinite
// or beyond MaxMagnitude, and for a missing output before First (the
// start-up samples must be complete: they settle the states); a
// *SeriesError of kind ErrOverflow when a state leaves float64 range.
func (p *Predictor) Update(x []float64, y float64) (Step, error) {
	pl := p.p
	ok := len(x) == len(pl.names) && (math.Abs(y) <= MaxMagnitude || y != y && p.s.t >= pl.first)
	for _, v := range x {
		ok = ok && math.Abs(v) <= MaxMagnitude
	}
	if !ok {
		err := pl.checkSample(x, y, p.s.t)
		errs.SetOp("predict.Predictor.Update", err)
		return Step{}, err
	}
	x = p.withEvents(x, p.s.t)
	if pl.fast(&p.s, y) {
		t := p.s.t
		if mean, se, a, ok := pl.advanceSmall(&p.s, p.tmp, x, y); ok {
			// Built here from registers: returning a Step through one more
			// call costs a copy through memory.
			return Step{Point: Point{Mean: mean, SE: se, Lower: mean - pl.z*se, Upper: mean + pl.z*se}, Index: t, Error: y - mean, Innov: a, Z: (y - mean) / se}, nil
		}
	} else if step, ok := pl.advance(&p.s, p.tmp, p.kf, x, y); ok {
		return step, nil
	}
	return Step{}, &errs.SeriesError{Op: "predict.Predictor.Update", Series: pl.output, Kind: errs.ErrOverflow,
		Detail: "a state left float64 range at sample " + itoa(p.s.t) + "; the samples or the model's coefficients are too large (rescale the series)"}
}

// checkSample checks one sample of the inputs and the output at index t.
func (pl *plan) checkSample(x []float64, y float64, t int) error {
	if len(x) != len(pl.names) {
		return &errs.SeriesError{Series: "inputs", Kind: errs.ErrLength, Have: len(x), Need: len(pl.names),
			Detail: "one value per input series, in the order of Predictor.Inputs()"}
	}
	for i, v := range x {
		if !(math.Abs(v) <= MaxMagnitude) {
			return badSample(pl.names[i], t, v)
		}
	}
	switch {
	case math.IsNaN(y):
		if t < pl.first {
			return &startupMissing{se: &errs.SampleError{Series: pl.output, Index: t, Value: y}, first: pl.first}
		}
	case math.IsInf(y, 0):
		return &errs.SampleError{Series: pl.output, Index: t, Value: y}
	case math.Abs(y) > MaxMagnitude:
		return &errs.SampleError{Series: pl.output, Index: t, Value: y, Limit: MaxMagnitude}
	}
	return nil
}

// badSample returns the *SampleError of a sample v that is NaN, infinite
// or beyond MaxMagnitude, with Limit MaxMagnitude for a finite one.
func badSample(series string, index int, v float64) error {
	lim := 0.0
	if !math.IsNaN(v) && !math.IsInf(v, 0) {
		lim = MaxMagnitude
	}
	return &errs.SampleError{Series: series, Index: index, Value: v, Limit: lim}
}

// startupMissing reports a missing output before First: a
// *SampleError naming the output series and the index (errors.As), with
// the reason in its message.
type startupMissing struct {
	se    *errs.SampleError
	first int
}

// Error names the sample and why it must be present.
func (e *startupMissing) Error() string {
	return errs.Prefix(e.se.Op) + "series " + strconv.Quote(e.se.Series) + " sample " + itoa(e.se.Index) +
		" is missing (NaN) before the first prediction, index " + itoa(e.first) + ": the start-up samples settle the states and must have their output"
}

// Unwrap returns the *SampleError.
func (e *startupMissing) Unwrap() error { return e.se }

// advance feeds the next sample (inputs x, output y or NaN for missing)
// to the state s, using tmp and kf as scratch. It returns the step and
// true, or false with the state untouched when a value left float64
// range. While the held history is exact (no gap) the recursions are
// those of the fit (fit's work.noiseSeries and resid), operation for
// operation, so that the innovations equal its residuals; after a
// missing output the covariance update of gap.go runs beside them.
//
// Over 60 lines: one step of the predictor's recursion, kept operation for
// operation in the order of the fit's, so that the two can be read side
// by side.
func (pl *plan) advance(s *state, tmp, kf []float64, x []float64, y float64) (Step, bool) {
	st, pos, t, gap := s.st, s.pos, s.t, s.gap
	off := st[pl.offC]
	if t == 0 {
		off = pl.startOffset(x)
	}
	bad := pl.inputTerms(st, pos, tmp, t, x)
	missing := math.IsNaN(y)
	uncertain := t >= pl.first && (missing || gap > 0 || st[pl.unc] != 0)
	var n, a float64
	if !missing && !uncertain {
		w := 0.0
		if t >= len(pl.dc)-1 {
			w = pl.difference(st, y)
		}
		n = w - off
		for i := range pl.ins {
			n -= tmp[3*i+2]
		}
	}
	step := Step{Index: t, Error: math.NaN(), Innov: math.NaN(), Z: math.NaN()}
	step.Point = Point{math.NaN(), math.NaN(), math.NaN(), math.NaN()}
	if t >= pl.first {
		nhat := pl.noisePrediction(st)
		pred := pl.outputPrediction(st, tmp, off, nhat)
		se := pl.se0
		if uncertain {
			se = math.Sqrt(pl.spread(st, kf))
		}
		step.Point = pl.newPoint(pred, se)
		switch {
		case missing:
			n, y = nhat, pred
		case uncertain:
			e := y - pred
			dn, da := pl.gain(kf, e)
			n, a = nhat+dn, da
			step.Error, step.Innov, step.Z = e, a, e/se
		default:
			a = pl.innovation(st, n)
			step.Error, step.Innov, step.Z = y-pred, a, (y-pred)/se
		}
		bad |= finiteBits(pred) | finiteBits(step.Upper) | finiteBits(step.Lower)
	}
	bad |= finiteBits(n) | finiteBits(a) | finiteBits(off)
	if bad>>63 != 0 {
		return Step{}, false
	}
	if uncertain && !missing {
		pl.condition(st, kf, step.Error)
	}
	pl.commit(st, pos, tmp, t, x, y, off, n, a)
	if uncertain {
		pl.settle(st, pl.shift(st, kf))
	}
	if missing {
		gap++
	} else {
		gap = 0
	}
	s.t, s.gap = t+1, gap
	return step, true
}

// outputPrediction returns the prediction of y_t from the input terms'
// outputs u (in tmp), the constant part off and the noise prediction
// nhat: (off + sum_i u_i + nhat - sum_k d_k y_{t-k}) / d_0, summed in
// the small kernel's order.
func (pl *plan) outputPrediction(st, tmp []float64, off, nhat float64) float64 {
	pred := off
	for i := range pl.ins {
		pred += tmp[3*i+2]
	}
	pred += nhat
	if !pl.plainD {
		yh := st[pl.yh : pl.yh+len(pl.dc)-1]
		for k := 1; k < len(pl.dc); k++ {
			pred -= pl.dc[k] * yh[k-1]
		}
		pred /= pl.dc[0]
	}
	return pred
}

// startOffset returns c + sum_i gain_i z0_i, the constant part of n_t
// fixed by the first sample x (the fit's off).
func (pl *plan) startOffset(x []float64) float64 {
	off := pl.c
	for i := range pl.ins {
		ip := &pl.ins[i]
		if z0 := x[ip.col]; ip.hold && z0 != 0 {
			off += ip.gain * z0
		}
	}
	return off
}

// inputTerms computes, for every input term at sample t, zc_t (the
// differenced input less its pre-sample level), s_t = B^b zc_t /
// delta(B) and u_t = omega(B) s_t into tmp[3i..3i+2], and returns the
// OR of finiteBits over s and u.
func (pl *plan) inputTerms(st []float64, pos []int, tmp []float64, t int, x []float64) uint64 {
	var bad uint64
	for i := range pl.ins {
		ip := &pl.ins[i]
		xv := x[ip.col]
		z0 := st[ip.off+1]
		if t == 0 && ip.hold {
			z0 = xv
		}
		zc := 0.0
		if t >= ip.d {
			z := xv
			if !ip.plain {
				xh := st[ip.xh : ip.xh+ip.d]
				z = 0.0
				z += ip.diff[0] * xv
				for k := 1; k < len(ip.diff); k++ {
					z += ip.diff[k] * xh[k-1]
				}
			}
			zc = z - z0
		}
		v := zc
		if ip.delay > 0 {
			v = st[ip.ring+pos[i]]
		}
		sh := st[ip.sh : ip.sh+ip.ls]
		s := v
		for k := len(ip.den) - 1; k >= 1; k-- {
			s -= ip.den[k] * sh[k-1]
		}
		if ip.den[0] != 1 {
			s /= ip.den[0]
		}
		u := 0.0
		u += ip.num[0] * s
		for k := 1; k < len(ip.num); k++ {
			u += ip.num[k] * sh[k-1]
		}
		tmp[3*i], tmp[3*i+1], tmp[3*i+2] = zc, s, u
		bad |= finiteBits(s) | finiteBits(u)
	}
	return bad
}

// difference returns w_t = D(B) y_t with y_t = y and the earlier outputs
// from the state.
func (pl *plan) difference(st []float64, y float64) float64 {
	if pl.plainD {
		return y
	}
	yh := st[pl.yh : pl.yh+len(pl.dc)-1]
	w := 0.0
	w += pl.dc[0] * y
	for k := 1; k < len(pl.dc); k++ {
		w += pl.dc[k] * yh[k-1]
	}
	return w
}

// noisePrediction returns the prediction of n_t from the past noise and
// innovations, (sum_k theta_k a_{t-k} - sum_k phi_k n_{t-k}) / phi_0.
func (pl *plan) noisePrediction(st []float64) float64 {
	nh := st[pl.nh : pl.nh+len(pl.ar)-1]
	ah := st[pl.ah : pl.ah+len(pl.ma)-1]
	v := 0.0
	for k := len(pl.ma) - 1; k >= 1; k-- {
		v += pl.ma[k] * ah[k-1]
	}
	for k := len(pl.ar) - 1; k >= 1; k-- {
		v -= pl.ar[k] * nh[k-1]
	}
	if pl.ar[0] != 1 {
		v /= pl.ar[0]
	}
	return v
}

// innovation returns a_t = (phi(B) n_t - sum_k theta_k a_{t-k}) /
// theta_0, sums in the order of the fit's filter (numerator by rising
// power, denominator by falling power).
func (pl *plan) innovation(st []float64, n float64) float64 {
	nh := st[pl.nh : pl.nh+len(pl.ar)-1]
	a := 0.0
	a += pl.ar[0] * n
	for k := 1; k < len(pl.ar); k++ {
		a += pl.ar[k] * nh[k-1]
	}
	if pl.maOne {
		return a
	}
	ah := st[pl.ah : pl.ah+len(pl.ma)-1]
	for k := len(pl.ma) - 1; k >= 1; k-- {
		a -= pl.ma[k] * ah[k-1]
	}
	if pl.ma[0] != 1 {
		a /= pl.ma[0]
	}
	return a
}

// commit writes the values of sample t into the state.
func (pl *plan) commit(st []float64, pos []int, tmp []float64, t int, x []float64, y, off, n, a float64) {
	for i := range pl.ins {
		ip := &pl.ins[i]
		xv := x[ip.col]
		st[ip.off] = xv
		if t == 0 && ip.hold {
			st[ip.off+1] = xv
		}
		push(st[ip.xh:ip.xh+ip.d], xv)
		if ip.delay > 0 {
			r := pos[i]
			st[ip.ring+r] = tmp[3*i]
			r++
			if r == ip.delay {
				r = 0
			}
			pos[i] = r
		}
		push(st[ip.sh:ip.sh+ip.ls], tmp[3*i+1])
	}
	st[pl.offC] = off
	push(st[pl.yh:pl.yh+len(pl.dc)-1], y)
	push(st[pl.nh:pl.nh+len(pl.ar)-1], n)
	push(st[pl.ah:pl.ah+len(pl.ma)-1], a)
}

// push shifts the history h (most recent first) by one and puts v first.
func push(h []float64, v float64) {
	for k := len(h) - 1; k > 0; k-- {
		h[k] = h[k-1]
	}
	if len(h) > 0 {
		h[0] = v
	}
}

// expMask selects the exponent bits of a float64.
const expMask = 0x7ff0000000000000

// finiteBits returns a value whose top bit is set exactly when v is NaN
// or infinite (internal/filter's test).
func finiteBits(v float64) uint64 {
	return math.Float64bits(v)&expMask + 1<<52
}
