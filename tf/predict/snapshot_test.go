package predict_test

import (
	"errors"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf/predict"
)

// TestSnapshotRoundTrip: a snapshot restored into a fresh predictor of
// the same model (another sigma2 and Level are allowed) continues
// exactly as the original, over missing outputs too.
func TestSnapshotRoundTrip(t *testing.T) {
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := fixture.MustModel(t, c.true)
			data := record(t, c.true, 300, 8)
			set := &predict.Settings{First: c.fit.First, ZeroPreSample: c.fit.ZeroPreSample}
			p := mustPredictor(t, m, 1, set)
			warm(t, p, data, 200)
			p.Update(row(p, data, 200), nan)
			snap, err := p.MarshalBinary()
			if err != nil {
				t.Fatal(err)
			}
			q := mustPredictor(t, m, 1, &predict.Settings{First: set.First, ZeroPreSample: set.ZeroPreSample, Level: 0.9})
			if err := q.UnmarshalBinary(snap); err != nil {
				t.Fatal(err)
			}
			if q.Count() != p.Count() || q.Missing() != 1 {
				t.Fatalf("restored Count %d Missing %d, want %d and 1", q.Count(), q.Missing(), p.Count())
			}
			for i := 201; i < 300; i++ {
				sp, _ := p.Update(row(p, data, i), data["y"][i])
				sq, _ := q.Update(row(q, data, i), data["y"][i])
				if sp.Mean != sq.Mean || sp.SE != sq.SE || sp.Innov != sq.Innov {
					t.Fatalf("sample %d: restored %+v, original %+v", i, sq, sp)
				}
			}
		})
	}
}

// TestSnapshotBadInput: a snapshot of another model, of another version
// or cut short is refused with its typed error and the predictor is
// unchanged.
func TestSnapshotBadInput(t *testing.T) {
	m := fixture.MustModel(t, benchSpec)
	data := record(t, benchSpec, 100, 8)
	p := mustPredictor(t, m, 1, nil)
	warm(t, p, data, 100)
	snap, _ := p.MarshalBinary()
	other := mustPredictor(t, fixture.MustModel(t, "y = 1.5 + (0.8 + 0.3 B) / (1 - 1.2 B + 0.4 B^2) B^2 u1 + (-0.5 + 0.2 B) / (1 - 0.5 B - 0.2 B^2) B u2 + (1 + 0.5 B) / (1 - 0.6 B) a"), 1, nil)
	moved := mustPredictor(t, m, 1, &predict.Settings{First: 10})
	fresh := mustPredictor(t, m, 1, nil)
	before, _ := fresh.MarshalBinary()
	for _, c := range []struct {
		name string
		into *predict.Predictor
		data []byte
		kind error
	}{
		{"another MA coefficient", other, snap, predict.ErrOtherModel},
		{"another first index", moved, snap, predict.ErrOtherModel},
		{"empty", fresh, nil, predict.ErrFormat},
		{"another version", fresh, append([]byte{1}, snap[1:]...), predict.ErrFormat},
		{"cut short", fresh, snap[:len(snap)-3], predict.ErrFormat},
		{"a byte too many", fresh, append(append([]byte{}, snap...), 0), predict.ErrFormat},
	} {
		err := c.into.UnmarshalBinary(c.data)
		if !errors.Is(err, c.kind) || !errors.Is(err, predict.ErrModel) {
			t.Errorf("%s: %v, want %v", c.name, err, c.kind)
		}
	}
	if after, _ := fresh.MarshalBinary(); string(after) != string(before) {
		t.Error("a refused snapshot changed the predictor")
	}
	if p.Fingerprint() == other.Fingerprint() || p.Fingerprint() != fresh.Fingerprint() {
		t.Error("fingerprints: equal models must agree and different ones differ")
	}
	err := other.UnmarshalBinary(snap)
	const want = "predict.Predictor.UnmarshalBinary: snapshot: it was taken from another model (fingerprint "
	if err == nil || len(err.Error()) < len(want) || err.Error()[:len(want)] != want {
		t.Errorf("message %q", err)
	}
}
