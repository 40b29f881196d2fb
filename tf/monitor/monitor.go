package monitor

import (
	"math"
	"math/bits"
	"strconv"
	"sync/atomic"

	"github.com/backshift/backshift/internal/errs"
)

// Kind says which test raised an alarm.
type Kind int

// The tests of a Monitor.
const (
	// Mean: the two-sided CUSUM on the standardised errors (a shift of
	// their mean: a bias, an unmodelled load, a sensor offset).
	Mean Kind = iota + 1
	// Variance: the two-sided CUSUM on the squared standardised errors
	// (noisier or quieter than the model says: a worn valve, a frozen
	// sensor).
	Variance
	// Correlation: the two-sided CUSUM on the errors signed by an input's
	// deviation at a stated lag (a change of gain or dead time).
	Correlation
)

// String returns the test's name in lower case.
func (k Kind) String() string {
	switch k {
	case Mean:
		return "mean"
	case Variance:
		return "variance"
	case Correlation:
		return "correlation"
	}
	return "kind(" + strconv.Itoa(int(k)) + ")"
}

// Alarm is one alarm of a Monitor.
type Alarm struct {
	// Kind is the test that alarmed.
	Kind Kind
	// Direction is +1 for an increase (the mean up, the variance up, a
	// positive correlation with the input) and -1 for a decrease.
	Direction int
	// Input and Lag name the watched pair of a Correlation alarm (the
	// input's index in Settings.Lags and the lag in samples); both are -1
	// for the other kinds.
	Input, Lag int
	// Index is the 0-based number of the sample that raised the alarm,
	// counted from New over every Update that returned no error.
	Index int64
	// Stamp is the caller's time stamp of that sample, as passed to
	// Update.
	Stamp int64
	// Statistic is the CUSUM value that crossed Threshold (in standard
	// deviations for Mean and Correlation, in squared standard
	// deviations for Variance).
	Statistic, Threshold float64
}

// String describes the alarm in one line, with the reminder that it is
// advice to an operator.
func (a Alarm) String() string {
	dir := "up"
	if a.Direction < 0 {
		dir = "down"
	}
	s := a.Kind.String() + " " + dir
	if a.Kind == Correlation {
		s += " (input " + strconv.Itoa(a.Input) + ", lag " + strconv.Itoa(a.Lag) + ")"
	}
	return s + " at sample " + strconv.FormatInt(a.Index, 10) + " (stamp " + strconv.FormatInt(a.Stamp, 10) +
		"): statistic " + strconv.FormatFloat(a.Statistic, 'f', 2, 64) + " > threshold " +
		strconv.FormatFloat(a.Threshold, 'f', 2, 64) + "; advice to an operator, not an interlock"
}

// Thresholds are the reference values (subtracted from each increment)
// and thresholds of a Monitor's tests, as set from Settings.
type Thresholds struct {
	// MeanReference and Mean: the mean test, both sides (Siegmund's
	// approximation, each side at twice the target run length).
	MeanReference, Mean float64
	// VarianceUpReference, VarianceUp, VarianceDownReference and
	// VarianceDown: the variance test's two sides (the Markov chain of
	// Brook and Evans, each side at twice the target run length).
	VarianceUpReference, VarianceUp, VarianceDownReference, VarianceDown float64
	// CorrelationReference and Correlation: every watched (input, lag)
	// pair, both sides (Siegmund's approximation, each side at 2 P times
	// the target run length for P pairs).
	CorrelationReference, Correlation float64
}

// pair is one watched (input, lag) pair of the correlation test.
type pair struct {
	input    int
	lag      int64
	off      int // input * ring, the start of the input's signs
	up, down float64
}

// Monitor watches a model's one-step prediction errors for drift. It is
// a stateful value: one goroutine at a time may call its methods
// (Dropped excepted, which is safe from any goroutine). Build it with
// New.
type Monitor struct {
	t        Thresholds
	invSigma float64
	alpha    float64

	meanUp, meanDown float64
	varUp, varDown   float64
	pairs            []pair

	level []float64 // running level of each input
	flip  []float64 // the sign given to an input equal to its level
	signs []float64 // ring of past input signs, input-major
	mask  int64
	ring  int

	started bool

	n       int64
	onAlarm func(Alarm)
	alarms  chan<- Alarm
	dropped atomic.Int64
}

// New returns a Monitor with the thresholds set from s (nil means every
// default), or a *SettingError naming the field that breaks its rule.
// Nothing in s is kept by reference except the callback and channel.
// The first New with a given VarianceRatio and TargetARL takes about
// 20 ms (the variance test's calibration); later ones reuse it and take
// microseconds.
func New(s *Settings) (*Monitor, error) {
	if err := s.Validate(); err != nil {
		errs.SetOp("monitor.New", err)
		return nil, err
	}
	var d Settings
	if s != nil {
		d = *s
	}
	d = d.withDefaults()
	m := &Monitor{invSigma: 1 / d.Sigma, alpha: 1 / float64(d.InputMemory), onAlarm: d.OnAlarm, alarms: d.Alarms}
	k := d.Shift / 2
	m.t.MeanReference, m.t.Mean = k, CusumThreshold(k, 2*d.TargetARL)
	m.t.VarianceUpReference, m.t.VarianceDownReference = varianceReference(d.VarianceRatio)
	m.t.VarianceUp, m.t.VarianceDown = varianceThresholds(d.VarianceRatio, 2*d.TargetARL)
	maxLag := 0
	for i, ls := range d.Lags {
		for _, l := range ls {
			m.pairs = append(m.pairs, pair{input: i, lag: int64(l)})
			maxLag = max(maxLag, l)
		}
	}
	if len(m.pairs) > 0 {
		kc := d.CorrelationShift / 2
		m.t.CorrelationReference = kc
		m.t.Correlation = CusumThreshold(kc, 2*float64(len(m.pairs))*d.TargetARL)
	}
	ring := int64(1) << bits.Len(uint(maxLag))
	m.mask = ring - 1
	m.ring = int(ring)
	for j := range m.pairs {
		m.pairs[j].off = m.pairs[j].input * int(ring)
	}
	nin := len(d.Lags)
	m.level = make([]float64, nin)
	m.flip = make([]float64, nin)
	m.signs = make([]float64, nin*int(ring))
	for i := range m.flip {
		m.flip[i] = 1
	}
	return m, nil
}

// Thresholds returns the reference values and thresholds in use.
func (m *Monitor) Thresholds() Thresholds { return m.t }

// Dropped returns the number of alarms dropped because Settings.Alarms
// was full. It is safe to call from any goroutine.
func (m *Monitor) Dropped() int64 { return m.dropped.Load() }

// Samples returns the number of samples taken so far (the Index the next
// sample will have).
func (m *Monitor) Samples() int64 { return m.n }

// Update takes the next sample: the caller's time stamp (any unit, for
// the alarms), the one-step prediction error e (output minus its
// one-step prediction, in the output's units; NaN when the output is
// missing for this sample: the tests then skip the sample, the inputs
// are still recorded) and the inputs' values u at this sample, one per
// entry of Settings.Lags. It returns the number of alarms the sample
// raised, each delivered through Settings.OnAlarm and Settings.Alarms.
// After an alarm the test that raised it starts again from zero (both
// sides; for the correlation test, the pair that alarmed); the other
// tests go on.
//
// An infinite e, an input that is not finite or beyond MaxInput, or a
// u of the wrong length is refused with a *SampleError or *SeriesError
// and leaves the monitor as it was. Update does not allocate (only a
// refused sample allocates its error).
func (m *Monitor) Update(stamp int64, e float64, u []float64) (int, error) {
	if len(u) != len(m.level) || math.IsInf(e, 0) {
		return 0, m.refuse(e, u)
	}
	for _, v := range u {
		if !(math.Abs(v) <= MaxInput) {
			return 0, m.refuse(e, u)
		}
	}
	idx := m.n
	m.n++
	if len(u) > 0 {
		m.record(idx, u)
	}
	if e != e {
		return 0, nil
	}
	z := min(max(e*m.invSigma, -MaxError), MaxError)
	mu := max(0, m.meanUp+z-m.t.MeanReference)
	md := max(0, m.meanDown-z-m.t.MeanReference)
	z2 := z * z
	vu := max(0, m.varUp+z2-m.t.VarianceUpReference)
	vd := max(0, m.varDown+m.t.VarianceDownReference-z2)
	m.meanUp, m.meanDown, m.varUp, m.varDown = mu, md, vu, vd
	fired := 0
	if max(mu, md) > m.t.Mean {
		fired += m.meanAlarm(idx, stamp)
	}
	if vu > m.t.VarianceUp || vd > m.t.VarianceDown {
		fired += m.varianceAlarm(idx, stamp)
	}
	if len(m.pairs) > 0 {
		fired += m.correlation(idx, stamp, z)
	}
	return fired, nil
}

// refuse returns the error for a sample Update refuses.
func (m *Monitor) refuse(e float64, u []float64) error {
	if len(u) != len(m.level) {
		return &SeriesError{Op: "monitor.Update", Series: "inputs", Kind: errs.ErrLength, Have: len(u), Need: len(m.level),
			Detail: "pass one value per entry of Settings.Lags"}
	}
	for i, v := range u {
		if !(math.Abs(v) <= MaxInput) {
			return m.sampleError("input "+strconv.Itoa(i), v, MaxInput)
		}
	}
	return m.sampleError("error", e, 0)
}

func (m *Monitor) sampleError(series string, v, limit float64) error {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		limit = 0
	}
	return &SampleError{Op: "monitor.Update", Series: series, Index: int(m.n), Value: v, Limit: limit}
}

// record stores the sign of each input's deviation from its running
// level (before the level takes the sample in, so that the sign depends
// on the input's past and present only) and updates the level. An input
// equal to its level gets alternating signs. The first sample sets the
// levels.
func (m *Monitor) record(idx int64, u []float64) {
	level, flip := m.level[:len(u)], m.flip[:len(u)]
	if !m.started {
		m.started = true
		copy(level, u)
	}
	slot := int(idx & m.mask)
	for i, v := range u {
		d := v - level[i]
		s := math.Copysign(1, d)
		if d == 0 {
			flip[i] = -flip[i]
			s = flip[i]
		}
		m.signs[i*m.ring+slot] = s
		level[i] += m.alpha * d
	}
}

// meanAlarm raises the mean test's alarm and resets the test.
func (m *Monitor) meanAlarm(idx, stamp int64) int {
	return m.sideAlarm(Alarm{Kind: Mean, Input: -1, Lag: -1, Index: idx, Stamp: stamp, Threshold: m.t.Mean}, &m.meanUp, &m.meanDown)
}

// sideAlarm raises the alarm a of a two-sided CUSUM whose sides share
// one threshold (the mean test, a pair of the correlation test): the
// larger side gives Direction and Statistic, and both sides restart
// from zero.
func (m *Monitor) sideAlarm(a Alarm, up, down *float64) int {
	a.Direction, a.Statistic = 1, *up
	if *down > *up {
		a.Direction, a.Statistic = -1, *down
	}
	*up, *down = 0, 0
	m.raise(a)
	return 1
}

// varianceAlarm raises the variance test's alarm and resets the test.
func (m *Monitor) varianceAlarm(idx, stamp int64) int {
	a := Alarm{Kind: Variance, Direction: 1, Input: -1, Lag: -1, Index: idx, Stamp: stamp, Statistic: m.varUp, Threshold: m.t.VarianceUp}
	if !(m.varUp > m.t.VarianceUp) {
		a.Direction, a.Statistic, a.Threshold = -1, m.varDown, m.t.VarianceDown
	}
	m.varUp, m.varDown = 0, 0
	m.raise(a)
	return 1
}

// correlation updates every watched pair with the signed error.
func (m *Monitor) correlation(idx, stamp int64, z float64) int {
	k, h := m.t.CorrelationReference, m.t.Correlation
	signs, mask := m.signs, m.mask
	fired := 0
	for j := range m.pairs {
		p := &m.pairs[j]
		w := signs[p.off+int((idx-p.lag)&mask)] * z
		up := max(0, p.up+w-k)
		down := max(0, p.down-w-k)
		p.up, p.down = up, down
		if max(up, down) > h {
			fired += m.pairAlarm(p, idx, stamp)
		}
	}
	return fired
}

// pairAlarm raises the alarm of one pair of the correlation test and
// resets the pair.
func (m *Monitor) pairAlarm(p *pair, idx, stamp int64) int {
	return m.sideAlarm(Alarm{Kind: Correlation, Input: p.input, Lag: int(p.lag), Index: idx, Stamp: stamp, Threshold: m.t.Correlation}, &p.up, &p.down)
}

// raise delivers an alarm: the callback first, then a send that never
// waits.
func (m *Monitor) raise(a Alarm) {
	if m.onAlarm != nil {
		m.onAlarm(a)
	}
	if m.alarms != nil {
		select {
		case m.alarms <- a:
		default:
			m.dropped.Add(1)
		}
	}
}

// Status is a snapshot of a Monitor's statistics, for display.
type Status struct {
	// Samples is the number of samples taken.
	Samples int64
	// MeanUp and MeanDown are the two sides of the mean test.
	MeanUp, MeanDown float64
	// VarianceUp and VarianceDown are the two sides of the variance test.
	VarianceUp, VarianceDown float64
	// CorrelationUp and CorrelationDown hold both sides of the
	// correlation test for each watched pair, in the order of
	// Settings.Lags (input by input, lag by lag).
	CorrelationUp, CorrelationDown []float64
}

// Status returns the current statistics (it allocates the correlation
// slices: call it for display, not per sample).
func (m *Monitor) Status() Status {
	s := Status{Samples: m.n, MeanUp: m.meanUp, MeanDown: m.meanDown, VarianceUp: m.varUp, VarianceDown: m.varDown}
	for _, p := range m.pairs {
		s.CorrelationUp = append(s.CorrelationUp, p.up)
		s.CorrelationDown = append(s.CorrelationDown, p.down)
	}
	return s
}

// Reset sets every statistic to zero, as after an operator has dealt
// with a change (or after the model was refitted); the sample count, the
// inputs' history and levels and the dropped count are kept.
func (m *Monitor) Reset() {
	m.meanUp, m.meanDown, m.varUp, m.varDown = 0, 0, 0, 0
	for j := range m.pairs {
		m.pairs[j].up, m.pairs[j].down = 0, 0
	}
}
