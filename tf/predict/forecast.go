package predict

import (
	"math"

	"github.com/backshift/backshift/internal/errs"
)

// Forecast writes into dst the predictions of the next len(dst) outputs,
// at indices Count() .. Count()+len(dst)-1, with their intervals, without
// changing the predictor. plan holds the inputs' known or planned future
// values, one slice per input series in the order of Inputs(): plan[i][j]
// is input i at index Count()+j. An input whose plan is shorter than the
// horizon is held at its last planned value, or at its last value fed
// when its plan is empty; plan may be nil to hold every input. Forecast
// does not allocate.
//
// The means are the minimum-mean-square-error forecasts of the model
// with future innovations zero and the differencing integrated with the
// outputs (the batch forecast of the fit); the standard error of step h
// is sigma sqrt(sum_{j<g+h} psi_j^2), psi_j the weights of
// theta(B)/(phi(B) D(B)) and g the missing outputs at the end
// (Missing), the intervals normal quantiles at Level. They assume
// Gaussian innovations and known parameters, and take the inputs as
// known: the uncertainty of a plan is not in them.
//
// Errors (Op "predict.Predictor.Forecast"): a *SeriesError of kind
// ErrShort before First samples have been fed, or before any sample
// when an input has no plan to take its values from; of kind ErrLength
// when plan is not nil and does not hold one slice per input series; a
// *SampleError for a planned value that is NaN, infinite or beyond
// MaxMagnitude (Series "plan[name]"); a *SeriesError of kind
// ErrOverflow when a prediction leaves float64 range.
func (p *Predictor) Forecast(dst []Point, plan [][]float64) error {
	const op = "predict.Predictor.Forecast"
	pl := p.p
	if err := pl.checkPlan(plan, p.s.t); err != nil {
		errs.SetOp(op, err)
		return err
	}
	if len(dst) == 0 {
		return nil
	}
	copy(p.f.st, p.s.st)
	copy(p.f.pos, p.s.pos)
	p.f.t, p.f.gap = p.s.t, p.s.gap
	for j := range dst {
		pl.plannedInputs(p.xrow, p.f.st, plan, j)
		pl.fillEvents(p.xrow[len(pl.names):], p.f.t)
		step, ok := pl.advance(&p.f, p.tmp, p.kf, p.xrow, math.NaN())
		if !ok {
			return &errs.SeriesError{Op: op, Series: pl.output, Kind: errs.ErrOverflow,
				Detail: "the forecast left float64 range at step " + itoa(j+1) + "; shorten the horizon or check the plan"}
		}
		dst[j] = step.Point
	}
	return nil
}

// checkPlan checks a forecast's plan and that the predictor, having fed
// t samples, can forecast.
func (pl *plan) checkPlan(plan [][]float64, t int) error {
	if t < pl.first {
		return &errs.SeriesError{Series: pl.output, Kind: errs.ErrShort, Have: t, Need: pl.first,
			Detail: "samples fed; forecasts start once the start-up samples have settled the states (Predictor.First)"}
	}
	if plan != nil && len(plan) != len(pl.names) {
		return &errs.SeriesError{Series: "plan", Kind: errs.ErrLength, Have: len(plan), Need: len(pl.names),
			Detail: "one slice per input series, in the order of Predictor.Inputs() (nil holds every input at its last value)"}
	}
	for i, name := range pl.names {
		var xs []float64
		if plan != nil {
			xs = plan[i]
		}
		if len(xs) == 0 && t == 0 {
			return &errs.SeriesError{Series: name, Kind: errs.ErrShort, Have: 0, Need: 1,
				Detail: "no sample fed and no plan: there is no value to hold the input at"}
		}
		for j, v := range xs {
			if !(math.Abs(v) <= MaxMagnitude) {
				return badSample("plan["+name+"]", j, v)
			}
		}
	}
	return nil
}

// plannedInputs writes into row the inputs at forecast step j: the plan,
// its last value beyond it, or the last value fed (from st).
func (pl *plan) plannedInputs(row, st []float64, plan [][]float64, j int) {
	for i := range pl.names {
		var xs []float64
		if plan != nil {
			xs = plan[i]
		}
		switch {
		case j < len(xs):
			row[i] = xs[j]
		case len(xs) > 0:
			row[i] = xs[len(xs)-1]
		default:
			row[i] = st[pl.last[i]]
		}
	}
}
