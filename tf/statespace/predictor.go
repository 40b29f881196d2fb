package statespace

import (
	"math"
	"strconv"

	"gonum.org/v1/gonum/mat"
)

// Gain returns the n x 1 gain K of the innovations (Kalman predictor)
// form of the model,
//
//	x_{t+1} = A x_t + B u_t + K e_t
//	y_t     = C x_t + D u_t + e_t,
//
// with e_t = y_t - yhat_t the one-step prediction error. The observer
// form of the noise part already has this shape with e_t = a_t, so K = G:
// the rows of the noise part hold theta_j - Phi_j (Phi = phi D, the noise
// AR polynomial with the output differencing), every other row zero.
// This is exact for the model as written, differencing included, in the
// infinite-past sense: when the state is the model's own (the record
// started infinitely long ago, or from a state that agrees with it),
// e_t equals a_t, and it is the steady-state gain of the Kalman filter
// of this form (the Riccati equation has the solution P = 0 when A - K C
// has every eigenvalue inside the unit circle, which holds when theta has
// every root outside it and the input paths are stable). From any other
// start the error e_t - a_t decays as the roots of theta(B) (in the
// z-plane, the eigenvalues of A - K C on the noise part) and the poles of
// the input paths. A path that keeps a pole on the unit circle (an
// input integrated by the output's differencing, which its own does not
// cancel) never forgets its start in its own states, but the noise part,
// which holds the same differencing, takes up the difference, so that
// the errors e_t still converge to a_t; the split of the state between the two is then
// not determined by the data. A model without a noise term has no
// innovations form: a *ModelError.
func (r *Realisation) Gain() (*mat.Dense, error) {
	if !r.noise {
		return nil, noNoise("statespace.Realisation.Gain")
	}
	return r.G(), nil
}

func noNoise(op string) error {
	return &ModelError{Op: op, Part: "noise", Problem: "the model has no noise term, so it has no innovations form; add one (a for white noise) to the model"}
}

// Predictor is the one-step predictor of the innovations form: at each
// step it predicts yhat_t = C x_t + D u_t from the inputs up to t and
// the outputs before t, then takes the output y_t and moves its state
// by x_{t+1} = A x_t + B u_t + K (y_t - yhat_t).
//
// A Predictor holds the state of one run and is not safe for concurrent
// use; give each goroutine its own (NewPredictor is cheap; the
// Realisation is shared).
type Predictor struct {
	r     *Realisation
	x, xn []float64
	t     int
	err   error
}

// NewPredictor returns the one-step predictor of r started at x_0 = start
// (nil for the default start: every path at rest and the constant state
// at 1). The start is forgotten as described on Gain. Errors: a
// *ModelError for a model without a noise term; a *SeriesError or
// *SampleError for a start of the wrong length or with a NaN or
// infinite value.
func NewPredictor(r *Realisation, start []float64) (*Predictor, error) {
	const op = "statespace.NewPredictor"
	if !r.noise {
		return nil, noNoise(op)
	}
	if _, err := r.checkRun(op, make([][]float64, r.m), nil, start); err != nil {
		return nil, err
	}
	return &Predictor{r: r, x: r.start(start), xn: make([]float64, r.n)}, nil
}

// Step predicts the output from the inputs u_t (one value per input, in
// the order of Realisation.Inputs), takes the observed output y and
// returns the prediction yhat_t and the error e_t = y - yhat_t. It does
// not allocate. A u of the wrong length is a programmer error and
// panics. A NaN or infinite u or y, or a prediction that leaves float64
// range, is recorded and reported by Err; the state is then no longer
// meaningful (Reset starts again).
func (p *Predictor) Step(u []float64, y float64) (yhat, e float64) {
	if len(u) != p.r.m {
		panic("statespace: Predictor.Step: len(u) = " + strconv.Itoa(len(u)) + ", the model has " + strconv.Itoa(p.r.m) + " inputs")
	}
	yhat = p.r.observe(p.x, u)
	e = y - yhat
	if p.err == nil && (math.IsNaN(e) || math.IsInf(e, 0)) {
		p.err = p.stepError(u, y, yhat)
	}
	p.r.advance(p.xn, p.x, u, p.r.g, e)
	p.x, p.xn = p.xn, p.x
	p.t++
	return yhat, e
}

// stepError describes the first step whose prediction error is not
// finite.
func (p *Predictor) stepError(u []float64, y, yhat float64) error {
	const op = "statespace.Predictor.Step"
	for i, v := range u {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return &SampleError{Op: op, Series: p.r.inputs[i], Index: p.t, Value: v}
		}
	}
	if math.IsNaN(y) || math.IsInf(y, 0) {
		return &SampleError{Op: op, Series: p.r.output, Index: p.t, Value: y}
	}
	return outOfRange(op, "prediction", p.t, yhat)
}

// outOfRange is the *ModelError for a prediction or an output that
// came out NaN or infinite at step t: the state left float64 range.
func outOfRange(op, part string, t int, v float64) error {
	return &ModelError{Op: op, Part: part, Problem: "step " + strconv.Itoa(t) + " gave " + strconv.FormatFloat(v, 'g', -1, 64) + ": the state left float64 range (an unstable path, or data far beyond the model's scale)"}
}

// Err returns the first problem recorded by Step (a *SampleError naming
// the series and step, or a *ModelError for a prediction out of range),
// or nil.
func (p *Predictor) Err() error { return p.err }

// State returns a copy of the current state x_t.
func (p *Predictor) State() []float64 { return append([]float64(nil), p.x...) }

// Reset returns the predictor to the default start (every path at
// rest, the constant state at 1) and clears Err.
func (p *Predictor) Reset() {
	p.x = p.r.start(nil)
	p.t, p.err = 0, nil
}

// OneStep runs a fresh predictor started at start (nil for the default)
// over a whole record and returns the one-step predictions and errors,
// each of the length n of the record. inputs holds one series per input
// in the order of Inputs, output the observed outputs, all of length n.
// Errors: those of NewPredictor, a *SeriesError (ErrLength) for series
// of the wrong count or length, a *SampleError for a NaN or infinite
// sample, and a *ModelError (Part "prediction") naming the first step
// whose prediction left float64 range.
func (r *Realisation) OneStep(inputs [][]float64, output, start []float64) (pred, errs []float64, err error) {
	const op = "statespace.Realisation.OneStep"
	if !r.noise {
		return nil, nil, noNoise(op)
	}
	n, err := r.checkRun(op, inputs, nil, start)
	if err != nil {
		return nil, nil, err
	}
	if r.m > 0 && len(output) != n {
		return nil, nil, &SeriesError{Op: op, Series: r.output, Kind: ErrLength, Have: len(output), Need: n, Detail: "the length of the inputs"}
	}
	if err := finite(op, r.output, output); err != nil {
		return nil, nil, err
	}
	p := &Predictor{r: r, x: r.start(start), xn: make([]float64, r.n)}
	u := make([]float64, r.m)
	pred, errs = make([]float64, len(output)), make([]float64, len(output))
	for t, y := range output {
		for i, s := range inputs {
			u[i] = s[t]
		}
		pred[t], errs[t] = p.Step(u, y)
	}
	if p.err != nil {
		// The samples are finite (checked above): a prediction overflowed.
		p.err.(*ModelError).Op = op
		return nil, nil, p.err
	}
	return pred, errs, nil
}
