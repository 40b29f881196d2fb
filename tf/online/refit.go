package online

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime/debug"
	"slices"
	"strconv"
	"sync"
	"sync/atomic"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/tf"
)

// RefitFunc re-estimates a model from a window of recent samples: m is
// the live model, window maps the output and every input series to its
// samples (oldest first, all of one length, the caller's to keep). It
// returns the new model, or an error, and should stop early when ctx is
// done. The batch fit wrapped to this shape (fit the model from its
// current values, return the fitted model) is the usual function.
type RefitFunc func(ctx context.Context, m tf.Model, window map[string][]float64) (tf.Model, error)

// RefitSettings tunes a Refitter. The zero value (or a nil pointer)
// gives the defaults.
type RefitSettings struct {
	// Window is the number of latest samples kept and handed to each
	// refit. Zero means 2000: about 100 residuals for each of up to 20
	// coefficients, and a batch fit of well under a second (a window
	// long enough for the fit's standard errors to be small, short
	// enough to follow a plant that drifts over days of minute samples;
	// choose it from the plant's own time scales).
	Window int
	// Every is the cadence: a refit starts once Window samples have been
	// added and then every Every samples. A refit that is due while the
	// previous one still runs is skipped (RefitCounts.Skipped) and the
	// next is due Every samples later. Zero means Window/4 (at least 1),
	// so that each refit sees three quarters of the samples of the last.
	Every int
	// MissingOutputs stores a NaN output as a missing sample: it stays
	// in the window, in its place, and the refit function receives it as
	// NaN. Set it only with a refit function that takes missing outputs:
	// the batch fit by exact likelihood does (fit.Model with Settings.Method
	// fit.ExactML, which carries the noise across the gap); the
	// least-squares fit refuses a NaN output, so a function over it should
	// switch to ExactML when its window holds one
	// (slices.ContainsFunc(window[m.Output], math.IsNaN)). False (the
	// default) refuses a NaN output in Add, and the window restarts after
	// it (see Add).
	MissingOutputs bool
	// Report, when not nil, is called in the refit's goroutine after
	// every refit with its outcome. It must not block for long (the next
	// refit waits for it) and may be called while Add runs.
	Report func(RefitReport)
}

// Validate checks the settings by the library's settings rule and
// returns a *SettingError naming the field, or nil. Window must be at
// least 2 and at most 2^24 (a window of 16 million samples, 128 MB per
// series) when given.
func (s RefitSettings) Validate() error {
	err := s.validate()
	errs.SetOp("online.RefitSettings.Validate", err)
	return err
}

func (s RefitSettings) validate() error {
	if err := errs.Count("", "RefitSettings.Window", s.Window, "0 means 2000"); err != nil {
		return err
	}
	if err := errs.Count("", "RefitSettings.Every", s.Every, "0 means Window/4"); err != nil {
		return err
	}
	if s.Window == 1 || s.Window > 1<<24 {
		return &SettingError{Setting: "RefitSettings.Window", Value: strconv.Itoa(s.Window), Rule: "must lie in 2..2^24 samples (0 means 2000)"}
	}
	return nil
}

// RefitReport is the outcome of one refit.
type RefitReport struct {
	// Sample is the number of samples added when the refit started; its
	// window ends with sample Sample-1.
	Sample int
	// Swapped reports that the refit's model became the live model.
	Swapped bool
	// Err is the refit's error, nil on success: the function's own; a
	// *ModelError for a model of another shape, or one that New or
	// predict.New would refuse (an unstable input denominator, a noise
	// AR polynomial that is not stationary or a noise MA polynomial that
	// is not invertible), which is not swapped in; or, when the
	// function panicked, an error saying so that wraps an
	// *InternalError with the panic's value and stack (errors.As).
	Err error
}

// RefitCounts tallies a Refitter's refits.
type RefitCounts struct {
	// Started counts the refits started, Swapped those whose model
	// became live, Failed those that ended in an error, Skipped those
	// that were due while another still ran.
	Started, Swapped, Failed, Skipped int64
}

// Refitter keeps a live model and refits it periodically in the
// background from a window of the latest samples. Model and Counts may
// be called from any goroutine at any time; Add from one goroutine at a
// time.
type Refitter struct {
	live   atomic.Pointer[tf.Model]
	fn     RefitFunc
	set    RefitSettings
	output string
	series []string
	ring   [][]float64 // one ring per series: the inputs, then the output
	pos    int         // index of the next sample in the rings
	added  int
	due    int // sample count at which the next refit is due

	ctx                               context.Context
	cancel                            context.CancelFunc
	wg                                sync.WaitGroup
	running                           atomic.Bool
	launch                            sync.Mutex // guards closed and the start of a refit against Close
	closed                            bool
	mu                                sync.Mutex
	lastErr                           error
	started, swapped, failed, skipped atomic.Int64
}

// NewRefitter returns a Refitter whose live model starts as a copy of
// m and which refits it with fn (see RefitSettings for the cadence).
// Every refit runs under a context derived from ctx: cancelling ctx, or
// Close, stops the refits. m is not modified.
//
// Errors (Op "online.NewRefitter"): a *SettingError from
// RefitSettings.Validate or for a nil fn or ctx; a *ModelError from
// tf.Model.Validate, for a model without output, or for an event input
// (step(T), pulse(T)), as New refuses it.
func NewRefitter(ctx context.Context, m tf.Model, fn RefitFunc, s *RefitSettings) (_ *Refitter, err error) {
	defer func() { setOp("online.NewRefitter", err) }()
	var set RefitSettings
	if s != nil {
		set = *s
	}
	if err := set.validate(); err != nil {
		return nil, err
	}
	if fn == nil || ctx == nil {
		return nil, &SettingError{Setting: "fn and ctx", Value: "nil", Rule: "a refit function and a context are required"}
	}
	if err := checkModel(m); err != nil {
		return nil, err
	}
	if set.Window == 0 {
		set.Window = 2000
	}
	if set.Every == 0 {
		set.Every = max(set.Window/4, 1)
	}
	r := &Refitter{fn: fn, set: set, output: m.Output, series: inputSeries(m), due: set.Window}
	r.ctx, r.cancel = context.WithCancel(ctx)
	r.ring = make([][]float64, len(r.series)+1)
	for i := range r.ring {
		r.ring[i] = make([]float64, set.Window)
	}
	c := m.Clone()
	r.live.Store(&c)
	return r, nil
}

// inputSeries lists the input series of m, each once, in order of first
// use.
func inputSeries(m tf.Model) []string {
	var out []string
	for _, in := range m.Inputs {
		if !slices.Contains(out, in.Series) {
			out = append(out, in.Series)
		}
	}
	return out
}

// Inputs returns the input series in the order Add takes their samples.
func (r *Refitter) Inputs() []string { return slices.Clone(r.series) }

// Model returns a copy of the live model. It is safe to call from any
// goroutine.
func (r *Refitter) Model() tf.Model { return r.live.Load().Clone() }

// Counts returns the tallies of the refits so far.
func (r *Refitter) Counts() RefitCounts {
	return RefitCounts{Started: r.started.Load(), Swapped: r.swapped.Load(), Failed: r.failed.Load(), Skipped: r.skipped.Load()}
}

// Err returns the error of the last refit that ended, nil when it
// succeeded or none has ended.
func (r *Refitter) Err() error {
	r.mu.Lock()
	defer r.mu.Unlock()
	return r.lastErr
}

// Add stores one sample (x the inputs in the order of Inputs, y the
// output) in the window and starts a refit in a new goroutine when one
// is due. It allocates only when it starts a refit (the copy of the
// window handed to it). After Close, or once the context is done, it
// still stores samples but starts no refit.
//
// A NaN output is a missing sample: with RefitSettings.MissingOutputs
// it is stored as NaN and handed to the refit function in its place.
//
// Errors (Op "online.Refitter.Add"), after which the sample is not
// stored: a *SeriesError (ErrLength) for a wrong number of inputs; a
// *SampleError (errors.As) for a NaN output without MissingOutputs, a
// NaN or infinite input, an infinite output, or a value above
// MaxMagnitude. A refused value leaves a hole in the record: the
// samples on its two sides are not adjacent, and a refit that took them
// as adjacent would fit a jump that the plant never made. So after a
// *SampleError the window restarts: the samples before the hole are
// dropped from later refits, and the next refit is due once Window
// samples have been added after it (RefitCounts and the reports show the
// delay).
func (r *Refitter) Add(x []float64, y float64) error {
	cy := y
	if r.set.MissingOutputs && math.IsNaN(y) {
		cy = 0 // a missing output: stored as NaN
	}
	if err := checkSample("online.Refitter.Add", "Refitter", r.series, r.output, r.added, x, cy); err != nil {
		var se *SampleError
		if errors.As(err, &se) {
			// The window restarts after the hole: it is full of samples
			// added after it once Window more have been stored.
			r.due = r.added + r.set.Window
			if se.Series == r.output && math.IsNaN(y) {
				return fmt.Errorf("%w; a missing output (set RefitSettings.MissingOutputs with a refit by exact likelihood to keep it in the window): the window restarts after it, the next refit is due in %d samples", err, r.set.Window)
			}
			return fmt.Errorf("%w; the window restarts after it (the samples on its two sides are not adjacent), the next refit is due in %d samples", err, r.set.Window)
		}
		return err
	}
	for i, v := range x {
		r.ring[i][r.pos] = v
	}
	r.ring[len(x)][r.pos] = y
	r.pos = (r.pos + 1) % r.set.Window
	r.added++
	if r.added < r.due {
		return nil
	}
	r.due = r.added + r.set.Every
	r.start()
	return nil
}

// start starts a refit unless the Refitter is closed or one is running.
func (r *Refitter) start() {
	r.launch.Lock()
	defer r.launch.Unlock()
	if r.closed || r.ctx.Err() != nil {
		return
	}
	if !r.running.CompareAndSwap(false, true) {
		r.skipped.Add(1)
		return
	}
	r.started.Add(1)
	r.wg.Add(1)
	go r.refit(r.added, r.window(), r.live.Load().Clone())
}

// window copies the rings into series oldest first.
func (r *Refitter) window() map[string][]float64 {
	w := make(map[string][]float64, len(r.ring))
	for i, ring := range r.ring {
		s := make([]float64, 0, len(ring))
		s = append(s, ring[r.pos:]...)
		s = append(s, ring[:r.pos]...)
		name := r.output
		if i < len(r.series) {
			name = r.series[i]
		}
		w[name] = s
	}
	return w
}

// refit runs one refit and swaps its model in; it never panics.
func (r *Refitter) refit(sample int, window map[string][]float64, m tf.Model) {
	defer r.wg.Done()
	defer r.running.Store(false)
	rep := RefitReport{Sample: sample}
	func() {
		defer errs.Recover("online.Refitter", &rep.Err)
		nm, err := r.call(m, window)
		if err == nil {
			err = r.sameShape(nm)
		}
		if err == nil {
			err = liveUsable(nm)
		}
		if err != nil {
			rep.Err = err
			return
		}
		c := nm.Clone()
		r.live.Store(&c)
		rep.Swapped = true
	}()
	if rep.Swapped {
		r.swapped.Add(1)
	} else {
		r.failed.Add(1)
	}
	r.mu.Lock()
	r.lastErr = rep.Err
	r.mu.Unlock()
	if r.set.Report != nil {
		func() {
			var err error
			defer errs.Recover("online.Refitter report", &err)
			r.set.Report(rep)
		}()
	}
}

// call runs the refit function, turning its panic into a *refitPanic
// (the caller's function panicked, not the library).
func (r *Refitter) call(m tf.Model, window map[string][]float64) (nm tf.Model, err error) {
	defer func() {
		if v := recover(); v != nil {
			err = &refitPanic{ie: &InternalError{Op: "online.Refitter (the caller's RefitFunc)", Value: v, Stack: debug.Stack()}}
		}
	}()
	return r.fn(r.ctx, m, window)
}

// refitPanic is a refit's error when the caller's RefitFunc panicked. It
// unwraps to the *InternalError that carries the panic's value and
// stack.
type refitPanic struct{ ie *InternalError }

// Error says that the refit function panicked, and with what.
func (e *refitPanic) Error() string {
	return fmt.Sprintf("online.Refitter: the refit function panicked: %v (a panic in the caller's RefitFunc, not in the library; the stack is in the wrapped *InternalError)", e.ie.Value)
}

// Unwrap returns the *InternalError with the panic's value and stack.
func (e *refitPanic) Unwrap() error { return e.ie }

// liveUsable refuses a refitted model that New and predict.New would
// refuse for its values: an input denominator with a pole on or outside
// the unit circle (unstable), a noise AR polynomial with a root there
// (not stationary) or a noise MA polynomial with a zero there (not
// invertible), as a *ModelError naming the part.
func liveUsable(m tf.Model) error {
	for _, in := range m.Inputs {
		if err := stableCoeffs(in.Den.Coeffs(), "input "+strconv.Quote(in.Series)+" denominator", "the term is unstable (its response grows without bound)"); err != nil {
			return err
		}
	}
	if m.Noise == nil {
		return nil
	}
	if err := stableCoeffs(m.Noise.AR.Coeffs(), "noise AR", "the noise is not stationary"); err != nil {
		return err
	}
	return stableCoeffs(m.Noise.MA.Coeffs(), "noise MA", "the noise is not invertible (the one-step predictor divides by the MA polynomial)")
}

// stableCoeffs reports a polynomial c in B with a z-plane root on or
// outside the unit circle, by tf.Rational.Stable, as a *ModelError of
// the refitted model's part.
func stableCoeffs(c []float64, part, why string) error {
	part = "refitted model, " + part
	rat, err := tf.NewRational([]float64{1}, c, 0)
	if err != nil {
		return &ModelError{Op: "online.Refitter", Part: part, Problem: "it cannot be used (" + err.Error() + "); the live model is kept", Err: err}
	}
	if !rat.Stable() {
		return &ModelError{Op: "online.Refitter", Part: part, Problem: "it has a root on or outside the unit circle (largest |z| = " +
			strconv.FormatFloat(rat.MaxPoleMagnitude(), 'g', 6, 64) + "): " + why + "; the live model is kept"}
	}
	return nil
}

// sameShape refuses a refitted model that is not a valid model of the
// same output and input series as the live one.
func (r *Refitter) sameShape(m tf.Model) error {
	if err := m.Validate(); err != nil {
		return err
	}
	if m.Output != r.output || !slices.Equal(inputSeries(m), r.series) {
		return &ModelError{Op: "online.Refitter", Part: "refitted model",
			Problem: "its output or input series differ from the live model's (" + r.output + " from " + strconv.Quote(joinNames(r.series)) + "); the refit function must return a model of the same series"}
	}
	return nil
}

func joinNames(s []string) string {
	out := ""
	for i, n := range s {
		if i > 0 {
			out += ", "
		}
		out += n
	}
	return out
}

// Wait blocks until no refit is running.
func (r *Refitter) Wait() { r.wg.Wait() }

// Close cancels a refit in progress, waits for it to end and starts no
// more refits. It is safe to call more than once.
func (r *Refitter) Close() {
	r.launch.Lock()
	r.closed = true
	r.launch.Unlock()
	r.cancel()
	r.wg.Wait()
}
