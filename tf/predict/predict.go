package predict

import (
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/tf"
	"gonum.org/v1/gonum/stat/distuv"
)

// MaxMagnitude is the largest sample magnitude a predictor accepts, the
// fit's limit fit.MaxMagnitude (1e150): beyond it the states can
// overflow float64. Rescale such series (change units).
const MaxMagnitude = 1e150

// Point is the prediction of one output sample: the minimum-mean-square
// prediction Mean, its standard error SE and the interval Lower..Upper
// = Mean -/+ z SE at the predictor's Level (z the normal quantile). The
// interval assumes Gaussian innovations and known parameters (the
// uncertainty of the estimates is not in it).
type Point struct {
	Mean, SE, Lower, Upper float64
}

// Step is what Update returns for one sample: the one-step prediction of
// the output y_t from the inputs through t and the outputs through t-1
// (Point; NaN while the predictor settles, before First), the sample
// Index t (0 for the first sample fed since New, Reset or Warm), the
// prediction error Error = y_t - Mean, the standardised error Z =
// Error / SE and the innovation Innov = a_t, the fit's residual (all
// three NaN when the output is missing or the predictor settles). With
// constant terms 1 in D(B), phi(B) and theta(B) (as specs write them)
// Error and Innov are equal up to rounding while every output is
// observed; in general Error = theta_0 / (phi_0 d_0) Innov.
//
// Z is what a drift monitor should watch (monitor.Settings.Sigma = 1):
// under the model, with Gaussian innovations and known parameters, the
// Z of successive samples are independent standard normal, also after
// missing outputs. Error is not: the first error after a gap of g
// missing outputs is a (g+1)-step forecast error, with the larger SE
// that comes with it, and the errors that follow have an SE above the
// steady one until the uncertainty the gap left has died out (see
// Update). After a gap, Innov is the innovation's conditional mean
// given the outputs observed (the Kalman filter's estimate), not a
// residual of the fit's recursion.
type Step struct {
	Point
	Index        int
	Error, Innov float64
	Z            float64
}

// inputPlan is the compiled form of one input term: its polynomials as
// coefficient slices and where its state lives.
type inputPlan struct {
	col   int // index of its series in the sample slice
	diff  []float64
	num   []float64
	den   []float64
	delay int
	d     int        // differencing degree
	hold  bool       // z0 = x_0 at the first sample (no differencing, not ZeroPreSample)
	plain bool       // diff is {1}
	gain  float64    // omega(1)/delta(1)
	k     [5]float64 // small kernel: omega_0..2, delta_1..2, zero padded
	// Offsets into the state: off holds x_{t-1} (the last value), off+1
	// z0, then xh (d values, x_{t-1}..x_{t-d}), the dead-time ring
	// (delay values) and sh (ls values, s_{t-1}..s_{t-ls}).
	off, xh, ring, sh, ls int
}

// plan is the compiled model shared (read only) by a predictor and its
// clones.
type plan struct {
	output  string
	names   []string // distinct input series, in order of first appearance
	events  []event  // distinct event inputs, their columns after the series'
	evNames []string // their spec text
	last    []int    // per series, the state offset of its last value fed
	ins     []inputPlan
	dc      []float64 // D(B)
	plainD  bool
	c       float64 // the constant
	ar, ma  []float64
	maOne   bool
	cc      []float64 // phi(B) D(B)
	psi0    float64
	ts      int // NoiseStart
	first   int
	zeroPre bool
	sd, z   float64 // innovation standard deviation, normal quantile
	se0     float64 // sd |psi_0|, the one-step standard error
	level   float64
	// small: every term fits the kernel of advanceSmall (inputs without
	// differencing, numerators and denominators of degree <= 2, D, phi
	// and theta of degree <= 2 with constant terms 1); nk holds D's,
	// phi's and theta's coefficients of B and B^2, zero padded.
	small bool
	nk    [6]float64
	terms []smallTerm
	// State layout: off (c + sum gain z0), yh (d values), nh (p values),
	// ah (q values), unc (1 while the held history is uncertain after a
	// missing output, else 0), cov (its covariance P, gp.m^2 values, see
	// gap.go), size in all.
	offC, yh, nh, ah, unc, cov, size int
	gp                               gapPlan
	lyh, lnh, lah                    int    // lengths of yh, nh, ah (padded to 2 for small)
	fp, shape                        uint64 // fingerprint, and without the events' placement
}

// Predictor is the running state of a model fed one sample at a time:
// the transfer and noise states (differencing included), giving the
// one-step prediction of each sample (Update) and k-step-ahead
// predictions with intervals (Forecast).
//
// A Predictor is not safe for concurrent use: give each goroutine its
// own (Clone). Building many predictors from one model, concurrently or
// not, is safe; clones share the read-only compiled model.
type Predictor struct {
	p *plan
	s state
	// scratch (not state): the forecast's copy of the state, per-term
	// values of a step, the inputs of a forecast step.
	f     state
	tmp   []float64
	xrow  []float64
	xfull []float64
	kf    []float64
}

// state is what a predictor carries from sample to sample.
type state struct {
	st  []float64 // the values, layout in plan
	pos []int     // dead-time ring positions, one per input term
	t   int       // samples fed
	gap int       // consecutive missing outputs at the end
}

// New returns a predictor at rest (no sample fed) for the model m, every
// coefficient of which must be set (held, not free: pass Held() of a
// fitted estimate), with innovation variance sigma2 (the estimate's
// Sigma2). s may be nil for the defaults; to reproduce a fit's
// residuals give its Conditioning.First and ZeroPreSample in s. m is not
// kept or modified.
//
// Errors (Op "predict.New"): a *SettingError for a bad Settings field or
// a sigma2 that is not positive and finite ("sigma2"); a *ModelError
// naming the part for a model Model.Validate refuses, a model without an
// output, a free coefficient, a zero constant term, an input denominator
// with a pole on or outside the unit circle (unstable), a noise AR
// polynomial with a root there (not stationary: write differencing as
// D(B)) or a noise MA polynomial with a zero there (not invertible: the
// innovations would not forget their start), or an event input given as
// a time that cannot be placed (no sample interval in the model).
func New(m tf.Model, sigma2 float64, s *Settings) (*Predictor, error) {
	const op = "predict.New"
	var set Settings
	if s != nil {
		set = *s
	}
	if err := set.validate(op); err != nil {
		return nil, err
	}
	if !(sigma2 > 0) || math.IsInf(sigma2, 0) {
		return nil, settingErr(op, "sigma2", strconv.FormatFloat(sigma2, 'g', -1, 64), "the innovation variance must be positive and finite (the estimate's Sigma2)")
	}
	if set.Level == 0 {
		set.Level = 0.95
	}
	pl, err := compile(m, sigma2, set)
	if err != nil {
		setModelOp(op, err)
		return nil, err
	}
	p := &Predictor{p: pl}
	p.alloc()
	p.Reset()
	return p, nil
}

// setModelOp names op in a *ModelError or *SeriesError.
func setModelOp(op string, err error) {
	if me, ok := err.(*errs.ModelError); ok {
		me.Op = op
		return
	}
	errs.SetOp(op, err)
}

// alloc makes the state and scratch slices of p for its plan.
func (p *Predictor) alloc() {
	n := len(p.p.ins)
	p.s.st = make([]float64, p.p.size)
	p.s.pos = make([]int, n)
	p.tmp = make([]float64, 4*n)
	p.xrow = make([]float64, len(p.p.names)+len(p.p.events))
	p.xfull = make([]float64, len(p.p.names)+len(p.p.events))
	p.f.st = make([]float64, p.p.size)
	p.f.pos = make([]int, n)
	p.kf = make([]float64, p.p.kfSize())
}

// Reset returns the predictor to rest, as New left it: the next sample
// fed is index 0 and sets the start-up levels.
func (p *Predictor) Reset() {
	clear(p.s.st)
	clear(p.s.pos)
	p.s.t, p.s.gap = 0, 0
	p.s.st[p.p.offC] = p.p.c
}

// Clone returns an independent copy of p in its current state, for
// another goroutine or to try a what-if without disturbing p.
func (p *Predictor) Clone() *Predictor {
	c := &Predictor{p: p.p, s: state{t: p.s.t, gap: p.s.gap}}
	c.alloc()
	copy(c.s.st, p.s.st)
	copy(c.s.pos, p.s.pos)
	return c
}

// Inputs returns the names of the input series in the order Update and
// Forecast take their values: each series once, in order of first
// appearance in the model. Event inputs (step(T), pulse(T)) are not
// among them: the predictor builds their indicators itself (see the
// package doc, Events).
func (p *Predictor) Inputs() []string { return append([]string(nil), p.p.names...) }

// Output returns the name of the output series.
func (p *Predictor) Output() string { return p.p.output }

// First returns the index of the first sample with a prediction: the
// fit's Conditioning.First for the same model and settings, NoiseStart +
// p (or Settings.First when larger). The samples before it settle the
// states; their output must be present.
func (p *Predictor) First() int { return p.p.first }

// Count returns the number of samples fed since New, Reset or Warm.
func (p *Predictor) Count() int { return p.s.t }

// Missing returns the number of consecutive samples, up to the last one
// fed, whose output was missing.
func (p *Predictor) Missing() int { return p.s.gap }

// Level returns the coverage of the intervals.
func (p *Predictor) Level() float64 { return p.p.level }

// newPoint returns the point with mean m and standard error se.
func (pl *plan) newPoint(m, se float64) Point {
	return Point{Mean: m, SE: se, Lower: m - pl.z*se, Upper: m + pl.z*se}
}

// quantile returns the normal quantile of a two-sided interval of
// coverage level.
func quantile(level float64) float64 {
	return distuv.UnitNormal.Quantile(0.5 + level/2)
}
