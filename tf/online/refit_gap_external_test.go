package online_test

import (
	"context"
	"errors"
	"math"
	"slices"
	"strings"
	"sync"
	"testing"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
	"github.com/backshift/backshift/tf/online"
)

// windowKeeper is a refit function that keeps every window it is handed
// and returns the model unchanged.
type windowKeeper struct {
	mu      sync.Mutex
	windows []map[string][]float64
}

func (k *windowKeeper) refit(_ context.Context, m tf.Model, w map[string][]float64) (tf.Model, error) {
	k.mu.Lock()
	defer k.mu.Unlock()
	k.windows = append(k.windows, w)
	return m, nil
}

// A refused NaN output restarts the window (before: a service
// that skips the refused sample splices the window across the dropout,
// and the refit fits the two sides as adjacent samples). Window 100:
// with the NaN at record index 80, no refit may start until 100 samples
// have been stored after it, and the first window is exactly record
// samples 81..180 (by construction of the record, no outside source
// needed: the check is of the window's contents).
func TestRefitterRestartsAfterRefusedOutput(t *testing.T) {
	m := fixture.MustModel(t, eightSpec)
	data := record(t, m, 200, 0.3, 41)
	data["y"] = slices.Clone(data["y"])
	data["y"][80] = math.NaN()
	k := &windowKeeper{}
	r, err := online.NewRefitter(context.Background(), m, k.refit, &online.RefitSettings{Window: 100, Every: 50})
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	addAll(t, r, data, "y", 0, 80)
	err = r.Add([]float64{data["x1"][80], data["x2"][80]}, data["y"][80])
	var se *errs.SampleError
	if !errors.As(err, &se) || se.Series != "y" || !strings.Contains(err.Error(), "MissingOutputs") || !strings.Contains(err.Error(), "window restarts") {
		t.Fatalf("NaN output: %v, want a *SampleError naming MissingOutputs and the restart", err)
	}
	addAll(t, r, data, "y", 81, 180)
	r.Wait()
	if c := r.Counts(); c.Started != 0 {
		t.Fatalf("a refit started %d samples after the hole (counts %+v): its window would span it", 99, c)
	}
	addAll(t, r, data, "y", 180, 181)
	r.Wait()
	if c := r.Counts(); c.Started != 1 || len(k.windows) != 1 {
		t.Fatalf("counts %+v after 100 samples past the hole, want one refit", c)
	}
	for _, s := range []string{"x1", "x2", "y"} {
		if !slices.Equal(k.windows[0][s], data[s][81:181]) {
			t.Errorf("window of %s is not record samples 81..180", s)
		}
	}
}

// With MissingOutputs a NaN output is kept in its place (the window's
// sample 20 of 300 is NaN, its neighbours the record's), and a refit by
// exact likelihood (fit.ExactML, which takes missing outputs) over that
// window succeeds and is swapped in; the same window refused by the
// least-squares fit shows why the doc says to switch.
func TestRefitterMissingOutputs(t *testing.T) {
	m := fixture.MustModel(t, eightSpec)
	data := record(t, m, 300, 0.3, 43)
	data["y"] = slices.Clone(data["y"])
	data["y"][20] = math.NaN()
	var got map[string][]float64
	var lsErr error
	fn := func(ctx context.Context, m tf.Model, w map[string][]float64) (tf.Model, error) {
		got = w
		_, lsErr = fit.Model(ctx, m, w, nil)
		set := &fit.Settings{}
		if slices.ContainsFunc(w[m.Output], math.IsNaN) {
			set.Method = fit.ExactML
		}
		est, err := fit.Model(ctx, m, w, set)
		if err != nil {
			return tf.Model{}, err
		}
		return est.Model, nil
	}
	r, err := online.NewRefitter(context.Background(), m, fn, &online.RefitSettings{Window: 300, MissingOutputs: true})
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	addAll(t, r, data, "y", 0, 300)
	r.Wait()
	if c := r.Counts(); c.Started != 1 || c.Swapped != 1 || r.Err() != nil {
		t.Fatalf("counts %+v, err %v: want one refit swapped", c, r.Err())
	}
	if !math.IsNaN(got["y"][20]) || got["y"][19] != data["y"][19] || got["y"][21] != data["y"][21] || len(got["y"]) != 300 {
		t.Errorf("the missing output is not kept in its place")
	}
	if lsErr == nil {
		t.Errorf("the least-squares fit took a NaN output; the doc says it refuses it")
	}
	// An infinite output is still refused.
	if err := r.Add([]float64{0, 0}, math.Inf(1)); !errors.As(err, new(*errs.SampleError)) {
		t.Errorf("infinite output: %v", err)
	}
}
