package predict

import (
	"github.com/backshift/backshift/internal/errs"
)

// Warm starts the predictor from a stretch of history: it resets it and
// feeds every sample of data in order, as Update would, so that the
// history's first samples settle the states by the fit's start-up
// convention (see the package doc) and its last sample is the last one
// fed. data maps series names to samples (index 0 oldest), all of one
// length, with the output and every input series of Inputs() (event
// inputs are built by the predictor, not read); other series are
// ignored. The output may be NaN (missing) after the first First
// samples. On error the predictor is unchanged.
//
// Errors (Op "predict.Predictor.Warm"): a *SeriesError of kind ErrName
// for a missing series, of kind ErrLength for series of different
// lengths; the errors of Update, naming the sample's index.
func (p *Predictor) Warm(data map[string][]float64) error {
	const op = "predict.Predictor.Warm"
	pl := p.p
	y, ok := data[pl.output]
	if !ok {
		return &errs.SeriesError{Op: op, Series: pl.output, Kind: errs.ErrName, Detail: "the output is not in the history; check the series names"}
	}
	cols := make([][]float64, len(pl.names))
	for i, name := range pl.names {
		x, ok := data[name]
		if !ok {
			return &errs.SeriesError{Op: op, Series: name, Kind: errs.ErrName, Detail: "an input of the model is not in the history; check the series names"}
		}
		if len(x) != len(y) {
			return &errs.SeriesError{Op: op, Series: name, Kind: errs.ErrLength, Have: len(x), Need: len(y), Detail: "the length of the output " + pl.output}
		}
		cols[i] = x
	}
	w := p.Clone()
	w.Reset()
	row := make([]float64, len(cols))
	for t := range y {
		for i, x := range cols {
			row[i] = x[t]
		}
		if _, err := w.Update(row, y[t]); err != nil {
			errs.SetOp(op, err)
			if se, ok := err.(*errs.SeriesError); ok {
				se.Op = op
			}
			return err
		}
	}
	copy(p.s.st, w.s.st)
	copy(p.s.pos, w.s.pos)
	p.s.t, p.s.gap = w.s.t, w.s.gap
	return nil
}
