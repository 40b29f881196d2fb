package monitor

import (
	"encoding/binary"
	"math"

	"github.com/backshift/backshift/internal/errs"
)

// ModelError reports a snapshot that does not fit the monitor it is
// restored into, or that is damaged (the shared shape of internal/errs;
// it matches ErrFormat as well as ErrModel).
type ModelError = errs.ModelError

// ErrFormat is the kind of a damaged snapshot, for errors.Is.
var ErrFormat = errs.ErrFormat

// snapshotVersion is the first byte of a snapshot; a change of layout
// gets a new number.
const snapshotVersion = 1

// MarshalBinary returns a snapshot of the monitor's state: the sample
// count, every statistic, the inputs' levels and their recent signs,
// with the thresholds and the watched pairs that the state belongs to,
// so that a service can restart without losing its monitors (restore
// with UnmarshalBinary into a monitor built with the same settings). It
// implements encoding.BinaryMarshaler and never fails.
func (m *Monitor) MarshalBinary() ([]byte, error) {
	b := []byte{snapshotVersion}
	b = binary.AppendUvarint(b, uint64(len(m.level)))
	b = binary.AppendUvarint(b, uint64(len(m.pairs)))
	b = binary.AppendUvarint(b, uint64(m.ring))
	for _, p := range m.pairs {
		b = binary.AppendUvarint(b, uint64(p.input))
		b = binary.AppendUvarint(b, uint64(p.lag))
	}
	t := m.t
	for _, v := range []float64{t.MeanReference, t.Mean, t.VarianceUpReference, t.VarianceUp,
		t.VarianceDownReference, t.VarianceDown, t.CorrelationReference, t.Correlation, m.invSigma, m.alpha} {
		b = appendFloat(b, v)
	}
	b = binary.AppendUvarint(b, uint64(m.n))
	started := byte(0)
	if m.started {
		started = 1
	}
	b = append(b, started)
	for _, v := range []float64{m.meanUp, m.meanDown, m.varUp, m.varDown} {
		b = appendFloat(b, v)
	}
	for _, p := range m.pairs {
		b = appendFloat(appendFloat(b, p.up), p.down)
	}
	for i := range m.level {
		b = appendFloat(appendFloat(b, m.level[i]), m.flip[i])
	}
	for _, s := range m.signs {
		b = append(b, byte(int8(s)))
	}
	return b, nil
}

func appendFloat(b []byte, v float64) []byte {
	return binary.LittleEndian.AppendUint64(b, math.Float64bits(v))
}

// reader reads a snapshot, remembering the first failure.
type reader struct {
	b   []byte
	bad bool
}

func (r *reader) uvarint() uint64 {
	v, n := binary.Uvarint(r.b)
	if n <= 0 {
		r.bad = true
		return 0
	}
	r.b = r.b[n:]
	return v
}

func (r *reader) float() float64 {
	if len(r.b) < 8 {
		r.bad = true
		return 0
	}
	v := math.Float64frombits(binary.LittleEndian.Uint64(r.b))
	r.b = r.b[8:]
	return v
}

func (r *reader) byte() byte {
	if len(r.b) < 1 {
		r.bad = true
		return 0
	}
	v := r.b[0]
	r.b = r.b[1:]
	return v
}

// UnmarshalBinary restores a snapshot made by MarshalBinary into m,
// which must have been built with the same settings (the same
// thresholds, Sigma, InputMemory and watched pairs): a snapshot of
// another monitor, or a damaged one, is refused with a *ModelError
// (matching ErrFormat) and leaves m as it was. The callback, the channel
// and the dropped count are m's own and are kept. It implements
// encoding.BinaryUnmarshaler.
func (m *Monitor) UnmarshalBinary(data []byte) error {
	fail := func(problem string) error {
		return &ModelError{Op: "monitor.UnmarshalBinary", Part: "snapshot", Problem: problem, Err: ErrFormat}
	}
	r := &reader{b: data}
	if r.byte() != snapshotVersion {
		return fail("not a monitor snapshot of this version (" + formatFloat(snapshotVersion) + ")")
	}
	if r.uvarint() != uint64(len(m.level)) || r.uvarint() != uint64(len(m.pairs)) || r.uvarint() != uint64(m.ring) {
		return fail("made by a monitor watching other inputs or lags: build the monitor with the settings of the one that made it")
	}
	for _, p := range m.pairs {
		if r.uvarint() != uint64(p.input) || r.uvarint() != uint64(p.lag) {
			return fail("made by a monitor watching other lags: build the monitor with the settings of the one that made it")
		}
	}
	t := m.t
	for _, v := range []float64{t.MeanReference, t.Mean, t.VarianceUpReference, t.VarianceUp,
		t.VarianceDownReference, t.VarianceDown, t.CorrelationReference, t.Correlation, m.invSigma, m.alpha} {
		if r.float() != v {
			return fail("made by a monitor with other thresholds, Sigma or InputMemory: build the monitor with the settings of the one that made it")
		}
	}
	st, ok := readState(r, len(m.pairs), len(m.level), len(m.signs))
	if !ok {
		return fail("damaged: truncated, too long, or holding values a monitor cannot have")
	}
	m.n, m.started = st.n, st.started
	m.meanUp, m.meanDown, m.varUp, m.varDown = st.stats[0], st.stats[1], st.stats[2], st.stats[3]
	for j := range m.pairs {
		m.pairs[j].up, m.pairs[j].down = st.pairs[2*j], st.pairs[2*j+1]
	}
	for i := range m.level {
		m.level[i], m.flip[i] = st.inputs[2*i], st.inputs[2*i+1]
	}
	copy(m.signs, st.signs)
	return nil
}

// state is the variable part of a snapshot, read and checked before any
// of it is applied.
type state struct {
	n       int64
	started bool
	stats   [4]float64
	pairs   []float64
	inputs  []float64
	signs   []float64
}

// readState reads the variable part of a snapshot and checks every value
// (statistics finite and not negative, levels within MaxInput, signs and
// flips of -1, 0 or 1), and that nothing follows it.
func readState(r *reader, pairs, inputs, signs int) (state, bool) {
	var s state
	n := r.uvarint()
	s.n = int64(n)
	started := r.byte()
	s.started = started == 1
	okStat := func(v float64) bool { return v >= 0 && v <= math.MaxFloat64 }
	for i := range s.stats {
		s.stats[i] = r.float()
	}
	s.pairs = make([]float64, 2*pairs)
	for i := range s.pairs {
		s.pairs[i] = r.float()
	}
	s.inputs = make([]float64, 2*inputs)
	for i := range s.inputs {
		s.inputs[i] = r.float()
	}
	s.signs = make([]float64, signs)
	for i := range s.signs {
		s.signs[i] = float64(int8(r.byte()))
	}
	ok := !r.bad && len(r.b) == 0 && n <= math.MaxInt64 && started <= 1
	for _, v := range append(s.stats[:], s.pairs...) {
		ok = ok && okStat(v)
	}
	for i := 0; i < len(s.inputs); i += 2 {
		ok = ok && math.Abs(s.inputs[i]) <= MaxInput && math.Abs(s.inputs[i+1]) == 1
	}
	for _, v := range s.signs {
		ok = ok && math.Abs(v) <= 1
	}
	return s, ok
}
