package predict

import (
	"encoding/binary"
	"hash/fnv"
	"math"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
)

// snapshotVersion is the first byte of every snapshot; a snapshot of
// another version is refused (ErrFormat).
const snapshotVersion = 3

// Snapshot layout, little endian: the version byte, the model's
// fingerprint (8 bytes), the count of samples fed and the missing
// outputs at the end (8 bytes each), the fingerprint with the events'
// placement left out (8 bytes, so that a refusal can say whether only
// the placement differs), the number of ring positions (4 bytes) and
// each (8 bytes), the number of state values (4 bytes) and each as its
// IEEE 754 bits (8 bytes). Version 2 had no second fingerprint; its
// snapshots are still read.
const snapshotHeader = 1 + 8 + 8 + 8 + 8

// Fingerprint returns the 64-bit FNV-1a hash of what the predictor's
// state depends on: the output and input names, the samples of event
// inputs as placed (so Settings.Offset and Start for a model with
// events), every polynomial's coefficients (their exact bits), the dead
// times, the constant, the first prediction index and the pre-sample
// rule. sigma2 and Level do not enter (they change the intervals, not
// the state). Two predictors with equal fingerprints accept each
// other's snapshots.
func (p *Predictor) Fingerprint() uint64 { return p.p.fp }

// fingerprint hashes the plan's state-defining facts, the events'
// samples only when placed is true.
func fingerprint(pl *plan, placed bool) uint64 {
	h := fnv.New64a()
	var b []byte
	str := func(s string) {
		b = binary.LittleEndian.AppendUint64(b, uint64(len(s)))
		b = append(b, s...)
	}
	num := func(v float64) { b = binary.LittleEndian.AppendUint64(b, math.Float64bits(v)) }
	poly := func(c []float64) {
		b = binary.LittleEndian.AppendUint64(b, uint64(len(c)))
		for _, v := range c {
			num(v)
		}
	}
	str("backshift predict state v1")
	str(pl.output)
	poly(pl.dc)
	num(pl.c)
	for _, ip := range pl.ins {
		if ip.col < len(pl.names) {
			str(pl.names[ip.col])
		} else {
			e := pl.events[ip.col-len(pl.names)]
			str(pl.evNames[ip.col-len(pl.names)])
			if placed {
				b = binary.LittleEndian.AppendUint64(b, uint64(e.at))
			}
		}
		poly(ip.diff)
		poly(ip.num)
		poly(ip.den)
		b = binary.LittleEndian.AppendUint64(b, uint64(ip.delay))
	}
	poly(pl.ar)
	poly(pl.ma)
	b = binary.LittleEndian.AppendUint64(b, uint64(pl.first))
	if pl.zeroPre {
		b = append(b, 1)
	} else {
		b = append(b, 0)
	}
	h.Write(b)
	return h.Sum64()
}

// MarshalBinary returns a snapshot of the predictor's state (see
// encoding.BinaryMarshaler), for a service to store and restore with
// UnmarshalBinary after a restart. It carries a version byte and the
// model's Fingerprint. It never fails.
func (p *Predictor) MarshalBinary() ([]byte, error) {
	return p.AppendBinary(make([]byte, 0, snapshotHeader+4+8*len(p.s.pos)+4+8*len(p.s.st)))
}

// AppendBinary appends the snapshot of MarshalBinary to b (see
// encoding.BinaryAppender). It never fails.
func (p *Predictor) AppendBinary(b []byte) ([]byte, error) {
	le := binary.LittleEndian
	b = append(b, snapshotVersion)
	b = le.AppendUint64(b, p.p.fp)
	b = le.AppendUint64(b, uint64(p.s.t))
	b = le.AppendUint64(b, uint64(p.s.gap))
	b = le.AppendUint64(b, p.p.shape)
	b = le.AppendUint32(b, uint32(len(p.s.pos)))
	for _, v := range p.s.pos {
		b = le.AppendUint64(b, uint64(v))
	}
	b = le.AppendUint32(b, uint32(len(p.s.st)))
	for _, v := range p.s.st {
		b = le.AppendUint64(b, math.Float64bits(v))
	}
	return b, nil
}

// UnmarshalBinary restores a snapshot made by MarshalBinary into p,
// which must have been built by New from the same model and
// Settings.First, ZeroPreSample, and, for a model with events, Offset
// and Start (its Fingerprint); sigma2 and Level may differ. Snapshots of
// the previous version (2) are read too. On error p is unchanged.
//
// Errors (Op "predict.Predictor.UnmarshalBinary"): a *ModelError with
// Err ErrOtherModel when the snapshot was taken from another model or
// with the model's events placed otherwise (the message says which), and
// with Err ErrFormat when data is not a snapshot of this version (empty,
// another version byte, the wrong length, or values a predictor cannot
// hold: a position outside its ring, a count below zero, a state value
// that is not finite, a covariance of the history after a gap that
// cannot be one).
func (p *Predictor) UnmarshalBinary(data []byte) error {
	if err := p.restore(data); err != nil {
		err.Op = "predict.Predictor.UnmarshalBinary"
		return err
	}
	return nil
}

// restore is UnmarshalBinary without the Op.
func (p *Predictor) restore(data []byte) *errs.ModelError {
	bad := func(why string) *errs.ModelError {
		return &errs.ModelError{Part: "snapshot", Problem: why, Err: errs.ErrFormat}
	}
	le := binary.LittleEndian
	header := snapshotHeader
	if len(data) > 0 && data[0] == 2 {
		header -= 8 // version 2: no fingerprint without the placement
	}
	if len(data) < header+4 {
		return bad(strconv.Itoa(len(data)) + " bytes, too short for a predictor snapshot")
	}
	if data[0] != snapshotVersion && data[0] != 2 {
		return bad("version " + strconv.Itoa(int(data[0])) + ", not " + strconv.Itoa(snapshotVersion) + " or 2 (a snapshot of another release, or not a snapshot)")
	}
	if fp := le.Uint64(data[1:]); fp != p.p.fp {
		return p.p.otherModel(fp, data[0] == snapshotVersion && le.Uint64(data[25:]) == p.p.shape)
	}
	t, gap := le.Uint64(data[9:]), le.Uint64(data[17:])
	if t > math.MaxInt64 || gap > t {
		return bad("the counts of samples (" + strconv.FormatUint(t, 10) + ") and missing outputs (" + strconv.FormatUint(gap, 10) + ") are not possible")
	}
	rest := data[header:]
	np := int(le.Uint32(rest))
	rest = rest[4:]
	if np != len(p.s.pos) || len(rest) != 8*np+4+8*len(p.s.st) || int(le.Uint32(rest[8*np:])) != len(p.s.st) {
		return bad("its length does not fit this model's state (" + strconv.Itoa(len(data)) + " bytes)")
	}
	pos := make([]int, np)
	for i := range pos {
		v := le.Uint64(rest[8*i:])
		if v >= uint64(max(p.p.ins[i].delay, 1)) {
			return bad("dead-time position " + strconv.FormatUint(v, 10) + " of input term " + strconv.Itoa(i+1) + " is outside its ring")
		}
		pos[i] = int(v)
	}
	rest = rest[8*np+4:]
	st := make([]float64, len(p.s.st))
	for i := range st {
		st[i] = math.Float64frombits(le.Uint64(rest[8*i:]))
		if math.IsNaN(st[i]) || math.IsInf(st[i], 0) {
			return bad("state value " + strconv.Itoa(i) + " is not finite")
		}
	}
	if u := st[p.p.unc]; u != 0 && u != 1 {
		return bad("the flag of an uncertain history is " + strconv.FormatFloat(u, 'g', -1, 64) + ", not 0 or 1")
	}
	if err := p.p.checkCov(st); err != "" {
		return bad(err)
	}
	copy(p.s.st, st)
	copy(p.s.pos, pos)
	p.s.t, p.s.gap = int(t), int(gap)
	return nil
}

// otherModel is the refusal of a snapshot with fingerprint fp; placed
// tells that only the placement of the model's events differs.
func (pl *plan) otherModel(fp uint64, placed bool) *errs.ModelError {
	fps := " (fingerprint " + strconv.FormatUint(fp, 16) + ", this predictor's " + strconv.FormatUint(pl.fp, 16) + ")"
	if placed {
		return &errs.ModelError{Part: "snapshot", Err: ErrOtherModel, Problem: "it was taken from the same model with its events placed otherwise" + fps +
			": the stream started at another record sample (Settings.Offset) or time (Settings.Start); restore it into a predictor built with the Offset and Start it was taken with"}
	}
	return &errs.ModelError{Part: "snapshot", Err: ErrOtherModel, Problem: "it was taken from another model" + fps +
		"; restore it into a predictor built from the same model with the same Settings.First, ZeroPreSample, Offset and Start"}
}

// checkCov returns why the covariance of the history's errors in st
// cannot be one (a variance below zero, a covariance beyond the
// product of standard deviations, values while the flag says the
// history is exact), or "".
func (pl *plan) checkCov(st []float64) string {
	m := pl.gp.m
	P := st[pl.cov : pl.cov+m*m]
	for i := range m {
		for j := range m {
			v := P[i*m+j]
			switch {
			case st[pl.unc] == 0 && v != 0:
				return "the history is marked exact but has a covariance"
			case i == j && v < 0:
				return "a variance of the history after a gap is " + strconv.FormatFloat(v, 'g', -1, 64) + ", negative"
			case P[j*m+i] != v || v*v > P[i*m+i]*P[j*m+j]*(1+1e-12):
				return "the covariance of the history after a gap is not symmetric, or not a covariance"
			}
		}
	}
	return ""
}
