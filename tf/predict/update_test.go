package predict_test

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"sync"
	"testing"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/predict"
)

// TestInnovationsEqualFitResiduals feeds each fitted record to the
// predictor of its estimate: the innovations must equal the fit's
// residuals (tf.Fit's Estimate.Resid, computed by the batch recursion
// with the same start-up), and the prediction errors y_t - Mean must
// equal them too, the one-step forecast error being the innovation
// (Box, Jenkins, Reinsel & Ljung 2015, Time Series Analysis, 5th ed.,
// the forecasting chapter: e_t(1) = a_{t+1}). Tolerance 1e-12 of the
// residuals' RMS: the two recursions sum the same terms in the same
// order, so they agree to rounding (about 1e-15 of the output's
// magnitude, which is at most 1e2 RMS residuals here).
func TestInnovationsEqualFitResiduals(t *testing.T) {
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			data, e, p := c.fitted(t, 600, 11)
			if p.First() != e.Conditioning.First {
				t.Fatalf("First = %d, fit's Conditioning.First = %d", p.First(), e.Conditioning.First)
			}
			scale := rms(e.Resid)
			y := data["y"]
			worst := 0.0
			for i := range y {
				s, err := p.Update(row(p, data, i), y[i])
				if err != nil {
					t.Fatal(err)
				}
				if i < e.Conditioning.First {
					if !math.IsNaN(s.Mean) || !math.IsNaN(s.Innov) {
						t.Fatalf("sample %d, before First %d: Mean %v, Innov %v, want NaN", i, e.Conditioning.First, s.Mean, s.Innov)
					}
					continue
				}
				if !near(s.Innov, e.Resid[i], 1e-12, scale) || !near(s.Error, e.Resid[i], 1e-12, scale) {
					t.Fatalf("sample %d: innovation %v, error %v, fit's residual %v", i, s.Innov, s.Error, e.Resid[i])
				}
				worst = max(worst, math.Abs(s.Innov-e.Resid[i])/scale)
			}
			t.Logf("largest difference from the fit's residuals: %.2g RMS", worst)
		})
	}
}

// TestStepInterval checks the one-step interval: SE is sigma psi_0 =
// sigma for constant terms 1 and the limits are Mean -/+ 1.959963984540054
// SE at Level 0.95 (scipy.stats.norm.ppf(0.975) = 1.959963984540054).
func TestStepInterval(t *testing.T) {
	m := fixture.MustModel(t, benchSpec)
	p := mustPredictor(t, m, 2.25, nil)
	data := record(t, benchSpec, 50, 3)
	var (
		s   predict.Step
		err error
	)
	for i := range data["y"] {
		if s, err = p.Update(row(p, data, i), data["y"][i]); err != nil {
			t.Fatal(err)
		}
	}
	const z = 1.959963984540054 // scipy.stats.norm.ppf(0.975)
	if s.SE != 1.5 || !near(s.Upper, s.Mean+z*1.5, 1e-15, math.Abs(s.Mean)+3) || !near(s.Lower, s.Mean-z*1.5, 1e-15, math.Abs(s.Mean)+3) {
		t.Errorf("step %+v: want SE 1.5 and limits Mean -/+ %v SE", s, z)
	}
	if s.Index != 49 || p.Count() != 50 {
		t.Errorf("Index %d, Count %d, want 49 and 50", s.Index, p.Count())
	}
}

// TestUpdateBadInput: each wrong sample is refused with its typed error
// and leaves the state as it was (the next good sample gives the same
// step as on an undisturbed clone).
func TestUpdateBadInput(t *testing.T) {
	m := fixture.MustModel(t, benchSpec)
	data := record(t, benchSpec, 40, 5)
	p := mustPredictor(t, m, 1, nil)
	for i := 0; i < 2; i++ {
		if _, err := p.Update(row(p, data, i), data["y"][i]); err != nil {
			t.Fatal(err)
		}
	}
	for _, c := range []struct {
		name string
		x    []float64
		y    float64
		kind error
		msg  string
	}{
		{"too few inputs", []float64{1}, 1, predict.ErrLength, `predict.Predictor.Update: series "inputs" has 1 samples against 2 (one value per input series, in the order of Predictor.Inputs())`},
		{"NaN input", []float64{math.NaN(), 1}, 1, predict.ErrSample, `predict.Predictor.Update: series "u1" sample 2 is NaN: samples must be finite numbers`},
		{"huge input", []float64{1, 1e200}, 1, predict.ErrSample, `predict.Predictor.Update: series "u2" sample 2 is 1e+200, beyond the largest magnitude accepted, 1e+150 (rescale the series: change its units)`},
		{"infinite output", []float64{1, 1}, math.Inf(1), predict.ErrSample, `predict.Predictor.Update: series "y" sample 2 is +Inf: samples must be finite numbers`},
		{"missing output in start-up", []float64{1, 1}, math.NaN(), predict.ErrSample, `predict.Predictor.Update: series "y" sample 2 is missing (NaN) before the first prediction, index 4: the start-up samples settle the states and must have their output`},
	} {
		t.Run(c.name, func(t *testing.T) {
			ref := p.Clone()
			_, err := p.Update(c.x, c.y)
			if !errors.Is(err, c.kind) || err.Error() != c.msg {
				t.Fatalf("error %v\nwant %s (kind %v)", err, c.msg, c.kind)
			}
			if p.Count() != ref.Count() {
				t.Fatalf("Count %d after a refused sample, want %d", p.Count(), ref.Count())
			}
			var se *predict.SampleError
			if c.kind == predict.ErrSample && (!errors.As(err, &se) || se.Index != 2 || strings.ContainsAny(se.Series, " (")) {
				t.Errorf("*SampleError %+v: want the bare series name and index 2", se)
			}
		})
	}
	a, b := p.Clone(), p.Clone()
	for i := 2; i < 40; i++ {
		sa, _ := a.Update(row(a, data, i), data["y"][i])
		sb, _ := b.Update(row(b, data, i), data["y"][i])
		if sa != sb && !(math.IsNaN(sa.Mean) && math.IsNaN(sb.Mean)) {
			t.Fatalf("sample %d: %+v against %+v", i, sa, sb)
		}
	}
}

// TestUpdateOverflow: a model whose states leave float64 range gives an
// ErrOverflow error, never a NaN or infinite prediction, and leaves the
// state as it was, at the first sample and later (dead-time ring and
// filter states included).
func TestUpdateOverflow(t *testing.T) {
	m := fixture.MustModel(t, "y = 1e300 u1 + 2 / (1 - 0.5 B) B^2 u2 + a")
	p := mustPredictor(t, m, 1, &predict.Settings{ZeroPreSample: true})
	if _, err := p.Update([]float64{1e100, 1}, 1); !errors.Is(err, predict.ErrOverflow) {
		t.Fatalf("error %v, want ErrOverflow", err)
	}
	if p.Count() != 0 {
		t.Fatalf("Count %d after the refused sample", p.Count())
	}
	for i := 0; i < 10; i++ {
		if _, err := p.Update([]float64{0, float64(i)}, float64(i)); err != nil {
			t.Fatal(err)
		}
	}
	before, _ := p.MarshalBinary()
	if _, err := p.Update([]float64{1e100, 3}, 1); !errors.Is(err, predict.ErrOverflow) {
		t.Fatalf("error %v, want ErrOverflow", err)
	}
	if after, _ := p.MarshalBinary(); string(after) != string(before) {
		t.Fatal("a refused sample changed the state")
	}
}

// TestNewBadInput: models and arguments New refuses, each with its
// typed error naming the part.
func TestNewBadInput(t *testing.T) {
	for _, c := range []struct {
		name, spec string
		sigma2     float64
		set        *predict.Settings
		kind       error
		msg        string
	}{
		{"free coefficient", "y = w0 u + a", 1, nil, predict.ErrModel,
			"predict.New: coefficient w0: it is free (to be estimated); a predictor needs every coefficient set: build it from the fitted model with the estimates held (Estimate.Held())"},
		{"zero sigma2", "y = 2 u + a", 0, nil, predict.ErrSetting,
			"predict.New: sigma2 = 0: the innovation variance must be positive and finite (the estimate's Sigma2)"},
		{"NaN sigma2", "y = 2 u + a", math.NaN(), nil, predict.ErrSetting,
			"predict.New: sigma2 = NaN: the innovation variance must be positive and finite (the estimate's Sigma2)"},
		{"bad level", "y = 2 u + a", 1, &predict.Settings{Level: 1}, predict.ErrSetting,
			"predict.New: Settings.Level = 1: must lie strictly between 0 and 1 (0 means 0.95)"},
		{"negative first", "y = 2 u + a", 1, &predict.Settings{First: -1}, predict.ErrSetting,
			"predict.New: Settings.First = -1: must be zero or positive (0 means the automatic first index NoiseStart + p)"},
		{"unstable input", "y = 2 / (1 - 1.5 B) u + a", 1, nil, predict.ErrModel,
			`predict.New: input "u" denominator: it has a root on or outside the unit circle (largest |z| = 1.5): the term is unstable, so its state would grow without bound; an integrating process is written as differencing of the output`},
		{"integrator", "y = 2 / (1 - B) u + a", 1, nil, predict.ErrModel,
			`predict.New: input "u" denominator: it has a root on or outside the unit circle (largest |z| = 1): the term is unstable, so its state would grow without bound; an integrating process is written as differencing of the output`},
		{"non-stationary noise", "y = 2 u + 1 / (1 - 1.01 B) a", 1, nil, predict.ErrModel,
			"predict.New: noise AR: it has a root on or outside the unit circle (largest |z| = 1.01): the noise is not stationary; write differencing as the output's D(B) instead"},
		{"non-invertible noise", "y = 2 u + (1 - 2 B) a", 1, nil, predict.ErrModel,
			"predict.New: noise MA: it has a root on or outside the unit circle (largest |z| = 2): the noise is not invertible, so the innovations would not forget their start-up values"},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := predict.New(fixture.MustModel(t, c.spec), c.sigma2, c.set)
			if !errors.Is(err, c.kind) || err == nil || err.Error() != c.msg {
				t.Fatalf("error %v\nwant %s", err, c.msg)
			}
		})
	}
	if _, err := predict.New(tf.Model{}, 1, nil); !errors.Is(err, predict.ErrModel) {
		t.Errorf("a model without output: error %v, want ErrModel", err)
	}
}

// TestWarm: Warm gives the state of feeding the history sample by
// sample, refuses a history without a series or with unequal lengths,
// and leaves the predictor unchanged on error.
func TestWarm(t *testing.T) {
	m := fixture.MustModel(t, benchSpec)
	data := record(t, benchSpec, 200, 9)
	a := mustPredictor(t, m, 1, nil)
	b := mustPredictor(t, m, 1, nil)
	for i := range data["y"] {
		if _, err := a.Update(row(a, data, i), data["y"][i]); err != nil {
			t.Fatal(err)
		}
	}
	if err := b.Warm(data); err != nil {
		t.Fatal(err)
	}
	sa, _ := a.MarshalBinary()
	sb, _ := b.MarshalBinary()
	if string(sa) != string(sb) {
		t.Fatal("Warm's state differs from feeding the samples one by one")
	}
	bad := window(data, 200)
	delete(bad, "u2")
	if err := b.Warm(bad); !errors.Is(err, predict.ErrName) {
		t.Errorf("missing u2: %v, want ErrName", err)
	}
	bad = window(data, 200)
	bad["u1"] = bad["u1"][:10]
	if err := b.Warm(bad); !errors.Is(err, predict.ErrLength) {
		t.Errorf("short u1: %v, want ErrLength", err)
	}
	bad = window(data, 200)
	bad["y"] = append([]float64{math.NaN()}, bad["y"][1:]...)
	if err := b.Warm(bad); !errors.Is(err, predict.ErrSample) {
		t.Errorf("missing first output: %v, want ErrSample", err)
	}
	if sc, _ := b.MarshalBinary(); string(sc) != string(sa) || b.Count() != 200 {
		t.Error("a refused Warm changed the predictor")
	}
}

// TestAllocs checks the zero-allocation claims of Update and Forecast
// with testing.AllocsPerRun.
func TestAllocs(t *testing.T) {
	m := fixture.MustModel(t, benchSpec)
	data := record(t, benchSpec, 100, 1)
	p := mustPredictor(t, m, 1, nil)
	warm(t, p, data, 100)
	x := row(p, data, 99)
	y := data["y"][99]
	if n := testing.AllocsPerRun(1000, func() { p.Update(x, y) }); n != 0 {
		t.Errorf("Update: %v allocations per sample, want 0", n)
	}
	if n := testing.AllocsPerRun(1000, func() { p.Update(x, math.NaN()) }); n != 0 {
		t.Errorf("Update with a missing output: %v allocations per sample, want 0", n)
	}
	dst := make([]predict.Point, 30)
	plan := [][]float64{{50, 51}, nil}
	if n := testing.AllocsPerRun(100, func() { p.Forecast(dst, plan) }); n != 0 {
		t.Errorf("Forecast: %v allocations, want 0", n)
	}
	// After a gap (the covariance update) and with event inputs.
	i := 0
	obs := func() float64 {
		i++
		if i%3 == 0 {
			return math.NaN()
		}
		return y
	}
	if n := testing.AllocsPerRun(1000, func() { p.Update(x, obs()) }); n != 0 {
		t.Errorf("Update across gaps: %v allocations per sample, want 0", n)
	}
	ev := mustPredictor(t, fixture.MustModel(t, "y = 0.5 B x + 2 step(10) + (1 - 0.4 B) a"), 1, nil)
	ev.Update([]float64{1}, 1)
	if n := testing.AllocsPerRun(1000, func() { ev.Update([]float64{1}, obs()) }); n != 0 {
		t.Errorf("Update of a model with an event: %v allocations per sample, want 0", n)
	}
}

// TestClone: a clone continues exactly as the original and does not
// share its state.
func TestClone(t *testing.T) {
	m := fixture.MustModel(t, benchSpec)
	data := record(t, benchSpec, 120, 2)
	p := mustPredictor(t, m, 1, nil)
	warm(t, p, data, 60)
	c := p.Clone()
	for i := 60; i < 120; i++ {
		sp, _ := p.Update(row(p, data, i), data["y"][i])
		sc, _ := c.Update(row(c, data, i), data["y"][i])
		if sp != sc {
			t.Fatalf("sample %d: clone %+v, original %+v", i, sc, sp)
		}
	}
	before, _ := p.MarshalBinary()
	c.Update([]float64{0, 0}, 0)
	if after, _ := p.MarshalBinary(); string(after) != string(before) {
		t.Fatal("updating the clone changed the original")
	}
}

// TestConcurrentUse: predictors built from one model in several
// goroutines, and clones of one predictor fed in several goroutines,
// give the same steps as one predictor fed alone (run with -race).
func TestConcurrentUse(t *testing.T) {
	m := fixture.MustModel(t, benchSpec)
	data := record(t, benchSpec, 300, 6)
	want := make([]predict.Step, 300)
	ref := mustPredictor(t, m, 1, nil)
	for i := range want {
		want[i], _ = ref.Update(row(ref, data, i), data["y"][i])
	}
	base := mustPredictor(t, m, 1, nil)
	warm(t, base, data, 100)
	const workers = 4
	errc := make(chan string, 2*workers)
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(2)
		go func() { // a predictor of its own from the shared model
			defer wg.Done()
			p, err := predict.New(m, 1, nil)
			if err != nil {
				errc <- err.Error()
				return
			}
			for i := range want {
				if s, _ := p.Update(row(p, data, i), data["y"][i]); !sameStep(s, want[i]) {
					errc <- fmt.Sprintf("own predictor, sample %d: %+v, want %+v", i, s, want[i])
					return
				}
			}
		}()
		go func(c *predict.Predictor) { // a clone of the warmed predictor
			defer wg.Done()
			for i := 100; i < 300; i++ {
				if s, _ := c.Update(row(c, data, i), data["y"][i]); !sameStep(s, want[i]) {
					errc <- fmt.Sprintf("clone, sample %d: %+v, want %+v", i, s, want[i])
					return
				}
			}
		}(base.Clone())
	}
	wg.Wait()
	close(errc)
	for e := range errc {
		t.Error(e)
	}
}
