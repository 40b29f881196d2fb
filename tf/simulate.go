package tf

import (
	"errors"
	"math"
	"strconv"
	"time"
)

// MaxBurnIn is the largest SimSettings.BurnIn accepted by NewSystem and
// Model.Simulate. A burn-in only has to outlast the noise filter's
// transient, which decays as rho^k for the AR root of largest modulus
// rho: even rho = 1 - 1e-6 falls to 1e-7 of its start within about
// 1.6e7 draws, below 2^24. A burn-in of 2^24 draws was measured at about
// 0.3 s for an AR(1) and an ARMA(3,2) noise term (about 20 ns a draw),
// while BurnIn = math.MaxInt would run for centuries (and is repeated by
// every System.Reset).
const MaxBurnIn = 1 << 24

// Simulate returns the output series of the whole model,
//
//	D(B) y_t = c + sum_i Num_i(B)/Den_i(B) B^b_i D_i(B) x_i,t + theta(B)/phi(B) a_t,
//
// for the input series given by name (every input of m; other series in
// inputs are ignored; all the same length n, which is the length of the
// result). Every coefficient is taken at its Value.
//
// The record starts settled by default, as fit.Model assumes (see
// Conditioning in the doc of package tf/fit): each input is taken as held at its
// first sample x_0 before the record, so an undifferenced input's term
// starts at its steady output Gain() x_0 and a differenced input's
// difference starts at zero (System.SetSteady with the first samples).
// Simulating and then fitting with the defaults therefore agree.
// s.FromRest takes every pre-sample input as zero instead (a start-up
// transient when an input is far from zero). The output differencing and
// the noise start from rest, except for the noise's burn-in (automatic
// by default, see SimSettings.BurnIn). The
// innovations are s.Innovations, or Gaussian draws of standard deviation
// s.Sigma from the seeded source (none when Sigma is 0); s may be nil for
// the defaults, a noise-free run. Neither m nor the input series are
// modified.
//
// Simulate gives exactly the outputs of a System fed the same samples
// (after SetSteady with the first samples, unless FromRest), and, for a
// model without differencing or noise run FromRest, exactly the sum of c
// and each input's Rational().Filter.
//
// Errors (Op "tf.Model.Simulate"): a *SettingError from
// SimSettings.Validate (naming the field); a *ModelError from
// Model.Validate and NewSystem, and for an input term with a pole at
// z = 1 (an integrator) whose first sample is not zero, so that it has no
// settled start (use FromRest); a *SeriesError for a missing input series
// (ErrName) or series or Innovations of the wrong length (ErrLength); a
// *SimError for an output sample that comes out NaN or infinite (Part
// "output <name>"; the noise scale, the innovations, the inputs or an
// unstable term overflowed float64, for example Sigma near 1e308); a
// *SampleError naming the series and index of a NaN or infinite sample.
func (m Model) Simulate(inputs map[string][]float64, s *SimSettings) ([]float64, error) {
	var set SimSettings
	if s != nil {
		set = *s
	}
	const op = "tf.Model.Simulate"
	if err := set.validate(op); err != nil {
		return nil, err
	}
	if set.Innovations != nil {
		set.Sigma, set.BurnIn = 0, 0
	}
	sys, err := newSystem(op, m, &set) // checks BurnIn against MaxBurnIn too
	if err != nil {
		return nil, err
	}
	xs, n, err := m.simInputs(op, inputs, set.Start)
	if err != nil {
		return nil, err
	}
	if err := m.checkInnovations(op, set.Innovations, n); err != nil {
		return nil, err
	}
	y := make([]float64, n)
	if n == 0 {
		return y, nil
	}
	u := make([]float64, len(xs))
	if !set.FromRest {
		for i, x := range xs {
			u[i] = x[0]
		}
		if i, err := sys.setSteady(op, u); err != nil {
			var me *ModelError
			if errors.As(err, &me) && errors.As(err, new(*GainError)) {
				me.Problem += " (its first sample is " + strconv.FormatFloat(u[i], 'g', -1, 64) +
					", and Simulate starts each input settled at its first sample by default); set SimSettings.FromRest to start from rest, or write the integration as differencing of the output"
			}
			return nil, err
		}
	}
	for t := range y {
		for i, x := range xs {
			u[i] = x[t]
		}
		if set.Innovations != nil {
			y[t] = sys.StepWith(u, set.Innovations[t])
		} else {
			y[t] = sys.Step(u)
		}
		if v := y[t]; math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, simOverflow(m.Output, t, v, set.Sigma)
		}
	}
	return y, nil
}

// simInputs returns the model's input series from inputs, in the order
// of m.Inputs, and their common length (-1 without inputs), refusing a
// missing series, unequal lengths and a non-finite sample. An event
// input (step(T), pulse(T)) gets its indicator from the model over the
// length of the data inputs (Model.EventData, sample 0 at start).
func (m Model) simInputs(op string, inputs map[string][]float64, start time.Time) ([][]float64, int, error) {
	xs := make([][]float64, len(m.Inputs))
	n := -1
	first := ""
	for i, in := range m.Inputs {
		if in.Event != nil {
			continue
		}
		x, ok := inputs[in.Series]
		if !ok {
			return nil, 0, &SeriesError{Op: op, Series: in.Series, Kind: ErrName, Detail: "the model has an input of this name but the inputs map has no such series"}
		}
		if n >= 0 && len(x) != n {
			return nil, 0, &SeriesError{Op: op, Series: in.Series, Kind: ErrLength, Have: len(x), Need: n,
				Detail: "the length of series " + strconv.Quote(first)}
		}
		n, first = len(x), in.Series
		if err := simCheck(in.Series, x); err != nil {
			return nil, 0, withOp(op, err)
		}
		xs[i] = x
	}
	ev, err := m.EventData(n, start, Interval{})
	if err != nil {
		return nil, 0, withOp(op, err)
	}
	for i, in := range m.Inputs {
		if in.Event == nil {
			continue
		}
		if n < 0 {
			return nil, 0, &ModelError{Op: op, Part: "input " + in.Series,
				Problem: "every input of the model is an event, so the record's length is unknown; add a data input"}
		}
		if _, ok := inputs[in.Series]; ok {
			return nil, 0, &SeriesError{Op: op, Series: in.Series, Kind: ErrName,
				Detail: "the inputs map has a series named like the event input; the model builds that indicator itself: drop the series"}
		}
		xs[i] = ev[in.Series]
	}
	return xs, n, nil
}

// checkInnovations refuses given innovations (nil for none) of a length
// other than n, with a non-finite value, or for a model without noise.
func (m Model) checkInnovations(op string, innov []float64, n int) error {
	if innov == nil {
		return nil
	}
	if len(innov) != n {
		return &SeriesError{Op: op, Series: "innovations", Kind: ErrLength, Have: len(innov), Need: n,
			Detail: "SimSettings.Innovations needs one value per input sample"}
	}
	if err := simCheck("innovations", innov); err != nil {
		return withOp(op, err)
	}
	if m.Noise == nil {
		return &ModelError{Op: op, Part: "noise", Problem: "SimSettings.Innovations given but the model has no noise term (add a, or AR/MA/ARMA, to the spec)"}
	}
	return nil
}

// simOverflow returns the *SimError for the non-finite output v at
// sample t, naming the noise scale when there is one.
func simOverflow(output string, t int, v, sigma float64) error {
	p := "the output overflowed float64"
	if sigma > 0 {
		p += " (noise scale Sigma = " + strconv.FormatFloat(sigma, 'g', -1, 64) + ")"
	} else {
		p += " (the inputs, the innovations or an unstable term is too large)"
	}
	return &SimError{Op: "tf.Model.Simulate", Part: "output " + output, Step: t, Value: v, Problem: p}
}

// simCheck returns a *SampleError for the first NaN or infinite sample.
func simCheck(name string, x []float64) error {
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return &SampleError{Series: name, Index: i, Value: v}
		}
	}
	return nil
}
