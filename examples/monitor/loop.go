package main

import (
	"fmt"
	"math"
	"sync"

	"github.com/backshift/backshift/tf/monitor"
	"github.com/backshift/backshift/tf/predict"
)

// maxKept is the number of a loop's latest alarms kept for GET.
const maxKept = 100

// loop is one monitored loop: the model's predictor and the drift
// monitor on its standardised one-step errors, behind a mutex (neither is
// safe for concurrent use; requests for one loop take turns, loops run
// in parallel).
type loop struct {
	spec   loopSpec
	inputs []string       // the predictor's input order
	col    map[string]int // series name -> input index, -1 for the output

	// watchFrom is the number of samples after which the monitor
	// watches the errors: the predictor's start-up takes the inputs as
	// held before the first sample, and the plant was not, so the first
	// errors carry a transient (see settle).
	watchFrom int

	mu        sync.Mutex
	pred      *predict.Predictor
	mon       *monitor.Monitor
	x         []float64 // one sample's inputs
	samples   int64     // samples taken
	missing   int64     // of them without an output
	last      predict.Step
	alarms    []monitor.Alarm // the latest maxKept
	total     int64           // alarms raised since the loop started (or its snapshot was taken)
	forgotten int64           // alarms pushed out of alarms
}

// newLoop builds the predictor and the monitor of one loop; arl is the
// monitor's in-control average run length per test, out receives its
// alarms (by a send that never waits).
func newLoop(spec loopSpec, arl float64, out chan<- monitor.Alarm) (*loop, error) {
	m := spec.Live
	if m.Output == "" {
		m = spec.Model
	}
	p, err := predict.New(m, spec.Sigma*spec.Sigma, nil)
	if err != nil {
		return nil, fmt.Errorf("loop %q: %w", spec.Name, err)
	}
	l := &loop{spec: spec, pred: p, inputs: p.Inputs(), col: map[string]int{spec.Model.Output: -1}}
	for i, s := range l.inputs {
		l.col[s] = i
	}
	l.x = make([]float64, len(l.inputs))
	l.watchFrom = p.First() + settle(spec)
	l.last = predict.Step{Point: predict.Point{Mean: math.NaN(), SE: math.NaN(), Lower: math.NaN(), Upper: math.NaN()},
		Index: -1, Error: math.NaN(), Innov: math.NaN()}
	l.mon, err = monitor.New(&monitor.Settings{TargetARL: arl, Lags: l.lags(), OnAlarm: l.keep, Alarms: out})
	if err != nil {
		return nil, &UsageError{fmt.Errorf("-arl: %w", err)}
	}
	return l, nil
}

// settleTol is the fraction of its start to which the start-up transient
// of the input paths decays before the monitor watches the errors.
const settleTol = 1e-3

// maxSettle caps the settling time, in samples.
const maxSettle = 10000

// settle returns the number of samples in which the slowest pole of the
// model's input paths decays to settleTol of its start, |z|^n = settleTol.
func settle(spec loopSpec) int {
	n := 0
	for _, in := range spec.Model.Inputs {
		r, err := in.Rational()
		if err != nil {
			continue
		}
		if z := r.MaxPoleMagnitude(); z > 0 && z < 1 {
			n = max(n, int(math.Ceil(math.Log(settleTol)/math.Log(z))))
		}
	}
	return min(n, maxSettle)
}

// lags returns the lags the correlation test watches for each input: its
// dead time b and b + 1 (where a change of gain shows first, and a dead
// time longer by one), at least 1: the greenhouse valve is moved from
// the previous minute's measurement, and under feedback lag 0 would
// alarm falsely (monitor.Settings.Lags).
func (l *loop) lags() [][]int {
	out := make([][]int, len(l.inputs))
	for i, s := range l.inputs {
		b := -1
		for _, in := range l.spec.Model.Inputs {
			if in.Series == s && (b < 0 || in.Delay < b) {
				b = in.Delay
			}
		}
		b = max(b, 1)
		out[i] = []int{b, b + 1}
	}
	return out
}

// keep records an alarm; it runs inside take, under l.mu.
func (l *loop) keep(a monitor.Alarm) {
	l.total++
	if len(l.alarms) == maxKept {
		copy(l.alarms, l.alarms[1:])
		l.alarms = l.alarms[:maxKept-1]
		l.forgotten++
	}
	l.alarms = append(l.alarms, a)
}

// take feeds one sample (l.x, the output y or NaN) to the predictor and
// its standardised error to the monitor; l.mu must be held. The monitor
// is given Error/SE, which is N(0, 1) while the plant behaves as its
// model, also for the first output after a gap (whose error is a forecast
// error over the gap, with a larger SE). It returns the number of alarms
// raised. A sample the predictor refuses leaves both as they were; the
// monitor accepts every sample the predictor accepts (the same limits on
// the inputs, 1e150), so an error from it is a fault of the service.
func (l *loop) take(stamp int64, y float64) (int, error) {
	st, err := l.pred.Update(l.x, y)
	if err != nil {
		return 0, err
	}
	e := math.NaN()
	if !math.IsNaN(st.Error) && st.Index >= l.watchFrom {
		e = st.Error / st.SE
	}
	n, err := l.mon.Update(stamp, e, l.x)
	if err != nil {
		return 0, fmt.Errorf("internal: the monitor refused a sample the predictor took: %w", err)
	}
	l.samples++
	if math.IsNaN(y) {
		l.missing++
	}
	l.last = st
	return n, nil
}

// forecast predicts the next steps outputs, the inputs following plan
// (by series name; an input without a plan is held at its last value).
// It returns the points and the index of the first.
func (l *loop) forecast(steps int, plan map[string][]float64) ([]predict.Point, int, error) {
	pl := make([][]float64, len(l.inputs))
	for s, v := range plan {
		i, ok := l.col[s]
		if !ok || i < 0 {
			return nil, 0, &fieldError{Field: "plan." + s, Msg: fmt.Sprintf("%q is not an input of the loop (its inputs: %s)", s, quoted(l.inputs))}
		}
		pl[i] = v
	}
	l.mu.Lock()
	defer l.mu.Unlock()
	pts := make([]predict.Point, steps)
	if err := l.pred.Forecast(pts, pl); err != nil {
		return nil, 0, err
	}
	return pts, l.pred.Count(), nil
}
