package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"net/url"
	"os"
	"path/filepath"

	"github.com/backshift/backshift/tf/monitor"
	"github.com/backshift/backshift/tf/predict"
)

// snapshot is a loop's state in its file: the predictor's and the
// monitor's own snapshots (their MarshalBinary, base64 in JSON) and the
// service's counts and kept alarms.
type snapshot struct {
	Loop      string          `json:"loop"`
	Samples   int64           `json:"samples"`
	Missing   int64           `json:"missing_outputs"`
	Total     int64           `json:"alarms_total"`
	Forgotten int64           `json:"alarms_forgotten"`
	Alarms    []monitor.Alarm `json:"alarms"`
	// Last is the last sample's step: its index, then the bits of Mean,
	// SE, Lower, Upper, Error and Innov (NaN has no JSON number).
	Last      []uint64 `json:"last"`
	Predictor []byte   `json:"predictor"`
	Monitor   []byte   `json:"monitor"`
}

// snapshotFile is the file of the loop named name in dir: the name
// escaped as a URL path segment (no slash, no NUL), with ".state".
func snapshotFile(dir, name string) string {
	return filepath.Join(dir, url.PathEscape(name)+".state")
}

// save writes every loop's snapshot into dir, each through a temporary
// file renamed over the last one, so that a crash while saving leaves the
// previous snapshot whole. Call it when no request runs any more.
func (s *service) save(dir string) error {
	var errs []error
	for _, l := range s.loops {
		l.mu.Lock()
		snap := snapshot{Loop: l.spec.Name, Samples: l.samples, Missing: l.missing, Total: l.total,
			Forgotten: l.forgotten, Alarms: l.alarms, Last: stepBits(l.last)}
		snap.Predictor, _ = l.pred.MarshalBinary() // never fails
		snap.Monitor, _ = l.mon.MarshalBinary()    // never fails
		l.mu.Unlock()
		raw, err := json.Marshal(snap)
		if err == nil {
			err = writeFile(snapshotFile(dir, l.spec.Name), raw)
		}
		if err != nil {
			errs = append(errs, fmt.Errorf("loop %q: %w", l.spec.Name, err))
		}
	}
	return errors.Join(errs...)
}

func writeFile(name string, raw []byte) error {
	tmp := name + ".tmp"
	if err := os.WriteFile(tmp, raw, 0o600); err != nil {
		return err
	}
	return os.Rename(tmp, name)
}

// restore reads the snapshots of dir into the loops. A loop without a
// file starts afresh (a loop new in the config); a file that cannot be
// read, or the snapshot of another model or of a monitor with other
// settings (another -arl), is an error naming the file, and nothing is
// restored into that loop.
func (s *service) restore(dir string) (restored int, err error) {
	for _, l := range s.loops {
		name := snapshotFile(dir, l.spec.Name)
		raw, err := os.ReadFile(name)
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err == nil {
			err = l.restore(raw)
		}
		if err != nil {
			return restored, fmt.Errorf("-restore: %s: %w (start without -restore, or remove the file, to start the loop afresh)", name, err)
		}
		restored++
	}
	return restored, nil
}

// restore sets the loop's state from a snapshot, or leaves it as it was.
func (l *loop) restore(raw []byte) error {
	var snap snapshot
	if err := json.Unmarshal(raw, &snap); err != nil {
		return fmt.Errorf("not a snapshot of this service: %w", err)
	}
	if snap.Loop != l.spec.Name {
		return fmt.Errorf("the snapshot is of loop %q, not %q", snap.Loop, l.spec.Name)
	}
	last, err := bitsStep(snap.Last)
	if err != nil {
		return err
	}
	// Each refuses a snapshot that is not its own and is then left as
	// it was; the predictor's is tried on a clone, so that a monitor
	// refusing its part leaves the loop whole.
	p := l.pred.Clone()
	if err := p.UnmarshalBinary(snap.Predictor); err != nil {
		if errors.Is(err, predict.ErrOtherModel) && len(l.spec.Events) > 0 {
			return fmt.Errorf("predictor: %w; the model's events are placed on the stream by -from (or its default): give the -from the state was saved with", err)
		}
		return fmt.Errorf("predictor: %w", err)
	}
	if err := l.mon.UnmarshalBinary(snap.Monitor); err != nil {
		return fmt.Errorf("monitor: %w", err)
	}
	l.pred, l.last = p, last
	l.samples, l.missing, l.total, l.forgotten = snap.Samples, snap.Missing, snap.Total, snap.Forgotten
	l.alarms = snap.Alarms
	if len(l.alarms) > maxKept {
		l.alarms = l.alarms[len(l.alarms)-maxKept:]
	}
	return nil
}

// stepBits stores a step for a snapshot.
func stepBits(st predict.Step) []uint64 {
	out := []uint64{uint64(int64(st.Index))}
	for _, f := range []float64{st.Mean, st.SE, st.Lower, st.Upper, st.Error, st.Innov} {
		out = append(out, math.Float64bits(f))
	}
	return out
}

// bitsStep reads a step stored by stepBits.
func bitsStep(b []uint64) (predict.Step, error) {
	if len(b) != 7 {
		return predict.Step{}, fmt.Errorf("not a snapshot of this service: the last step has %d values, not 7", len(b))
	}
	f := func(i int) float64 { return math.Float64frombits(b[i]) }
	return predict.Step{Index: int(int64(b[0])), Point: predict.Point{Mean: f(1), SE: f(2), Lower: f(3), Upper: f(4)},
		Error: f(5), Innov: f(6)}, nil
}
