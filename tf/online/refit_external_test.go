package online_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"
	"sync"
	"testing"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/online"
)

// A refit by the batch fit (tf.Fit) over the window of the latest 2000
// samples replaces a live model whose gain of x2 is stale: after the
// planted change (w2 from -0.8 to -1.2 at sample 3000) the live model,
// read concurrently while samples arrive, ends with w2 within 4 batch
// SEs of the batch fit of the same window, which is the refit's
// result: the swap hands over exactly what the function returned.
func TestRefitterSwapsModel(t *testing.T) {
	m := fixture.MustModel(t, eightSpec)
	m2 := m.Clone()
	m2.Inputs[1].Num.Each(func(c *tf.Coef) {
		if c.Name == "w2" {
			c.Value = -1.2
		}
	})
	data := spliced(t, m, m2, 6000, 3000, 0.3, 31)
	var mu sync.Mutex
	var reports []online.RefitReport
	r, err := online.NewRefitter(context.Background(), m, refitByFit, &online.RefitSettings{Window: 2000, Every: 1000,
		Report: func(rep online.RefitReport) { mu.Lock(); reports = append(reports, rep); mu.Unlock() }})
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	done := make(chan struct{})
	go func() { // a reader on another goroutine, for the race detector
		defer close(done)
		for i := 0; i < 200; i++ {
			_ = r.Model().Inputs[1].Num.Coeffs()
		}
	}()
	for lo := 0; lo < 6000; lo += 1000 {
		addAll(t, r, data, "y", lo, lo+1000)
		r.Wait() // a deterministic test: each refit ends before the next is due
	}
	<-done
	c := r.Counts()
	if c.Started != 5 || c.Swapped != 5 || c.Failed != 0 || c.Skipped != 0 {
		t.Errorf("counts %+v, want 5 refits started and swapped (at 2000, 3000, ..., 6000 samples)", c)
	}
	if len(reports) != 5 || reports[4].Sample != 6000 || !reports[4].Swapped || reports[4].Err != nil {
		t.Errorf("reports %+v", reports)
	}
	window := map[string][]float64{}
	for k, v := range data {
		window[k] = v[4000:]
	}
	_, batch := batchFit(t, m, window) // the last refit started from another live model: close, not equal
	w2 := r.Model().Inputs[1].Num.Coeffs()[0]
	if math.Abs(w2-batch[4].Value) > 4*batch[4].SE {
		t.Errorf("live w2 = %.4f, batch fit of the last window %.4f (SE %.2g)", w2, batch[4].Value, batch[4].SE)
	}
	if r.Err() != nil {
		t.Errorf("Err = %v", r.Err())
	}
}

// Errors of the refit function, a model of another shape and a panic
// are reported (Err, Report, Counts.Failed), never raised, and leave the
// live model as it was; a refit due while one runs is skipped; Close
// cancels the running refit's context and waits for it.
func TestRefitterFailures(t *testing.T) {
	m := fixture.MustModel(t, eightSpec)
	data := record(t, m, 400, 0.3, 37)
	boom := errors.New("no data today")
	for _, tc := range []struct {
		name string
		fn   online.RefitFunc
		kind error
	}{
		{"error", func(context.Context, tf.Model, map[string][]float64) (tf.Model, error) { return tf.Model{}, boom }, boom},
		{"other shape", func(_ context.Context, m tf.Model, _ map[string][]float64) (tf.Model, error) {
			m.Output = "z"
			return m, nil
		}, errs.ErrModel},
		{"panic", func(context.Context, tf.Model, map[string][]float64) (tf.Model, error) { panic("refit bug") }, errs.ErrInternal},
		// d1 = 1.5 puts the pole of x1's term at z = 1.5, outside the unit
		// circle (the pole of 1/(1 - d B) is z = d: DESIGN.md's convention).
		{"unstable", func(_ context.Context, m tf.Model, _ map[string][]float64) (tf.Model, error) {
			return fixture.MustModel(t, strings.Replace(eightSpec, "d1 ~ 0.7", "d1 ~ 1.5", 1)), nil
		}, errs.ErrModel},
		// t1 = -1.25: the MA zero at z = 1.25 is outside the unit circle.
		{"not invertible", func(_ context.Context, m tf.Model, _ map[string][]float64) (tf.Model, error) {
			return fixture.MustModel(t, strings.Replace(eightSpec, "t1 ~ 0.4", "t1 ~ -1.25", 1)), nil
		}, errs.ErrModel},
		// p1 = 1: the AR root on the unit circle (not stationary).
		{"not stationary", func(_ context.Context, m tf.Model, _ map[string][]float64) (tf.Model, error) {
			return fixture.MustModel(t, strings.Replace(eightSpec, "p1 ~ 0.6", "p1 ~ 1", 1)), nil
		}, errs.ErrModel},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var got error
			r, err := online.NewRefitter(context.Background(), m, tc.fn, &online.RefitSettings{Window: 100,
				Report: func(rep online.RefitReport) { got = rep.Err }})
			if err != nil {
				t.Fatal(err)
			}
			addAll(t, r, data, "y", 0, 100)
			r.Close()
			if !errors.Is(r.Err(), tc.kind) || !errors.Is(got, tc.kind) {
				t.Errorf("Err %v, reported %v, want kind %v", r.Err(), got, tc.kind)
			}
			want := map[string]string{"panic": "the refit function panicked: refit bug", "unstable": "input \"x1\" denominator",
				"not invertible": "noise MA", "not stationary": "noise AR"}[tc.name]
			if got != nil && !strings.Contains(got.Error(), want) || got != nil && strings.Contains(got.Error(), "fault of the library") {
				t.Errorf("reported %q, want it to name %q and not blame the library", got, want)
			}
			if c := r.Counts(); c.Failed != 1 || c.Swapped != 0 {
				t.Errorf("counts %+v", c)
			}
			if !r.Model().Equal(m) {
				t.Error("the live model changed after a failed refit")
			}
		})
	}
	t.Run("skip and cancel", func(t *testing.T) {
		started := make(chan struct{})
		r, err := online.NewRefitter(context.Background(), m, func(ctx context.Context, m tf.Model, _ map[string][]float64) (tf.Model, error) {
			close(started)
			<-ctx.Done()
			return m, ctx.Err()
		}, &online.RefitSettings{Window: 100, Every: 50})
		if err != nil {
			t.Fatal(err)
		}
		addAll(t, r, data, "y", 0, 100)
		<-started
		addAll(t, r, data, "y", 100, 300) // due at 150, 200, 250, 300 while the first runs
		r.Close()
		c := r.Counts()
		if c.Started != 1 || c.Skipped != 4 || c.Failed != 1 {
			t.Errorf("counts %+v, want 1 started (and failed, cancelled) and 4 skipped", c)
		}
		if !errors.Is(r.Err(), context.Canceled) {
			t.Errorf("Err %v, want context.Canceled", r.Err())
		}
		addAll(t, r, data, "y", 300, 400) // stored, no refit after Close
		if r.Counts().Started != 1 {
			t.Error("a refit started after Close")
		}
	})
}

// Bad settings, a nil function and bad samples are refused by name.
func TestRefitterBadInput(t *testing.T) {
	m := fixture.MustModel(t, eightSpec)
	for _, tc := range []struct {
		name string
		set  online.RefitSettings
		fn   online.RefitFunc
		want string
	}{
		{"negative window", online.RefitSettings{Window: -1}, refitByFit, "RefitSettings.Window = -1"},
		{"window of one", online.RefitSettings{Window: 1}, refitByFit, "RefitSettings.Window = 1"},
		{"negative cadence", online.RefitSettings{Every: -5}, refitByFit, "RefitSettings.Every = -5"},
		{"no function", online.RefitSettings{}, nil, "refit function"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := online.NewRefitter(context.Background(), m, tc.fn, &tc.set)
			if !errors.Is(err, errs.ErrSetting) {
				t.Fatalf("error %v, want a setting error", err)
			}
			testutilWords(t, err, tc.want, "online.NewRefitter")
		})
	}
	ev := fixture.MustModel(t, "y = w B x + k step(10) + a; where w ~ 0.5, k ~ 1")
	if _, err := online.NewRefitter(context.Background(), ev, refitByFit, nil); !errors.Is(err, errs.ErrModel) || !strings.Contains(fmt.Sprint(err), `input "step(10)"`) {
		t.Errorf("event model: %v, want a *ModelError naming the event input", err)
	}
	// The model checks New makes (checkModel), named by NewRefitter.
	if _, err := online.NewRefitter(context.Background(), tf.Model{}, refitByFit, nil); !errors.Is(err, errs.ErrModel) {
		t.Errorf("a model without output: %v, want a *ModelError", err)
	} else {
		testutilWords(t, err, "Model.Output is empty", "online.NewRefitter")
	}
	bad := m.Clone()
	bad.Inputs[0].Delay = -1
	if _, err := online.NewRefitter(context.Background(), bad, refitByFit, nil); !errors.Is(err, errs.ErrModel) {
		t.Errorf("a negative dead time: %v, want a *ModelError from tf.Model.Validate", err)
	} else {
		testutilWords(t, err, `"x1"`, "online.NewRefitter")
	}
	r, err := online.NewRefitter(context.Background(), m, refitByFit, nil)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	if err := r.Add([]float64{1}, 0); !errors.Is(err, errs.ErrLength) {
		t.Errorf("short sample: %v", err)
	}
	if err := r.Add([]float64{1, math.NaN()}, 0); !errors.Is(err, errs.ErrSample) {
		t.Errorf("NaN sample: %v", err)
	} else {
		testutilWords(t, err, `"x2"`, "online.Refitter.Add")
	}
	// A finite sample beyond MaxMagnitude, which the batch fit refuses,
	// is refused when added rather than stored in the window of every
	// refit to come.
	var se *online.SampleError
	if err := r.Add([]float64{1, 2}, 1e200); !errors.As(err, &se) || se.Limit != online.MaxMagnitude || se.Series != "y" {
		t.Errorf("huge output: %v, want a *SampleError for y with Limit MaxMagnitude", err)
	} else {
		testutilWords(t, err, "online.Refitter.Add", "1e+200", "largest magnitude accepted, 1e+150")
	}
}
