package control

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
)

// TestQuantilesReference checks quantiles against numpy.quantile (method
// "linear") in testdata/control/quantiles.json, to 1e-12.
func TestQuantilesReference(t *testing.T) {
	var ref struct {
		X      []float64 `json:"x"`
		Levels []float64 `json:"levels"`
		Q      []float64 `json:"q"`
	}
	testutil.ReadJSON(t, "testdata/control/quantiles.json", &ref)
	got := quantiles(append([]float64(nil), ref.X...), ref.Levels)
	for i := range got {
		near(t, "quantile", got[i], ref.Q[i], 1e-12)
	}
	if q := quantiles([]float64{1, math.Inf(1)}, []float64{0.5, 0}); !math.IsInf(q[0], 1) || q[1] != 1 {
		t.Errorf("quantiles towards +Inf: %v", q)
	}
}

// gainDraw draws the plant K g (1 - a) B^d/(1 - a B) with g uniform on
// [0.5, 3), so that under proportional control the loop is stable
// exactly when K g Kc < ultimateGain(a, d) (derived in loop_test.go).
func gainDraw(K, a float64, d int) (Draw, *[]float64) {
	var gs []float64
	return func(rng *rand.Rand) (tf.Rational, error) {
		g := 0.5 + 2.5*rng.Float64()
		gs = append(gs, g)
		return tf.NewRational([]float64{K * g * (1 - a)}, []float64{1, -a}, d)
	}, &gs
}

// TestRobustCountsStable checks the fraction stable exactly against the
// closed-form stability limit applied to the same draws, and that the
// result is deterministic for a seed.
func TestRobustCountsStable(t *testing.T) {
	const K, a, d, kc = 2.0, 0.9, 3, 2.0
	ku := ultimateGain(a, d)
	draw, gs := gainDraw(K, a, d)
	ctl, _ := tf.Constant(kc)
	r, err := Robust(context.Background(), ctl, draw, RobustSettings{Draws: 300, Seed: 7, Loop: LoopSettings{Horizon: 50}})
	if err != nil {
		t.Fatal(err)
	}
	want := 0
	for _, g := range *gs {
		if K*g*kc < ku {
			want++
		}
	}
	if r.Stable != want || r.Draws != 300 || r.FractionStable != float64(want)/300 {
		t.Errorf("stable %d of %d, the closed form says %d", r.Stable, r.Draws, want)
	}
	if want == 0 || want == 300 {
		t.Fatalf("the test needs both stable and unstable draws (%d stable)", want)
	}
	draw2, _ := gainDraw(K, a, d)
	r2, err := Robust(context.Background(), ctl, draw2, RobustSettings{Draws: 300, Seed: 7, Loop: LoopSettings{Horizon: 50}})
	if err != nil || r2.Stable != r.Stable || r2.SensitivityPeak.Values[1] != r.SensitivityPeak.Values[1] {
		t.Errorf("not deterministic for a seed: %v %v", r2.SensitivityPeak, r.SensitivityPeak)
	}
}

// TestRobustSpread checks the spreads and bands against the loops
// analysed one by one (Analyze) and quantiles: the median Ms and the
// median set-point output at one sample equal those computed directly.
func TestRobustSpread(t *testing.T) {
	p := fopdt(t, 2, 10, 3)
	tu, err := Tune(p, tf.Interval{}, TuneSettings{})
	if err != nil {
		t.Fatal(err)
	}
	draw := func(rng *rand.Rand) (tf.Rational, error) {
		return tf.NewRational(poly1(p.Num(), 0.7+0.6*rng.Float64()), p.Den(), p.Delay()+rng.IntN(2))
	}
	r, err := Robust(context.Background(), tu.Controller, draw, RobustSettings{Draws: 101, Seed: 3, Loop: LoopSettings{Horizon: 80}})
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(3, 0))
	var ms, y20 []float64
	for range 101 {
		q, _ := draw(rng)
		lp, err := Analyze(tu.Controller, q, LoopSettings{Horizon: 80})
		if err != nil {
			t.Fatal(err)
		}
		if lp.Stable {
			ms = append(ms, lp.SensitivityPeak)
			y20 = append(y20, lp.Setpoint.Output[20])
		}
	}
	if len(ms) != r.Stable {
		t.Fatalf("%d stable one by one, Robust says %d", len(ms), r.Stable)
	}
	near(t, "median Ms", r.SensitivityPeak.Values[1], quantiles(ms, []float64{0.5})[0], 1e-12)
	near(t, "median y[20]", r.SetpointBand[1][20], quantiles(y20, []float64{0.5})[0], 1e-12)
	if !(r.SetpointBand[0][20] <= r.SetpointBand[1][20] && r.SetpointBand[1][20] <= r.SetpointBand[2][20]) {
		t.Errorf("band not ordered at sample 20: %v %v %v", r.SetpointBand[0][20], r.SetpointBand[1][20], r.SetpointBand[2][20])
	}
}

func poly1(c []float64, g float64) []float64 {
	out := make([]float64, len(c))
	for i, v := range c {
		out[i] = g * v
	}
	return out
}

// TestRobustBadInput checks the traps of Robust.
func TestRobustBadInput(t *testing.T) {
	ctl, _ := tf.Constant(1)
	ok := func(*rand.Rand) (tf.Rational, error) { return tf.NewRational([]float64{0.1}, []float64{1, -0.9}, 1) }
	boom := errors.New("no plant")
	for _, c := range []struct {
		name string
		d    Draw
		s    RobustSettings
		kind error
	}{
		{"negative draws", ok, RobustSettings{Draws: -1}, ErrSetting},
		{"level 1", ok, RobustSettings{Levels: []float64{0.5, 1}}, ErrSetting},
		{"draw error", func(*rand.Rand) (tf.Rational, error) { return tf.Rational{}, boom }, RobustSettings{Draws: 3}, boom},
	} {
		if _, err := Robust(context.Background(), ctl, c.d, c.s); !errors.Is(err, c.kind) {
			t.Errorf("%s: %v", c.name, err)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Robust(ctx, ctl, ok, RobustSettings{}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
	// A panic in the caller's draw function is the caller's fault: a
	// *SettingError naming the draw number (here the third, number 2),
	// not an internal fault of the library; a nil draw is refused.
	n := 0
	panicky := func(*rand.Rand) (tf.Rational, error) {
		if n++; n == 3 {
			panic("draw fault")
		}
		return ok(nil)
	}
	_, err := Robust(context.Background(), ctl, panicky, RobustSettings{Draws: 5})
	if !errors.Is(err, ErrSetting) || errors.Is(err, errs.ErrInternal) || !strings.Contains(err.Error(), "panicked at draw 2: draw fault") || strings.Contains(err.Error(), "please report") {
		t.Errorf("a panic in the draw: %v", err)
	}
	if _, err := Robust(context.Background(), ctl, nil, RobustSettings{Draws: 1}); !errors.Is(err, ErrSetting) || !strings.Contains(err.Error(), "draw = nil") {
		t.Errorf("nil draw: %v", err)
	}
	// A nil context is the caller's slip, named as such, not an internal
	// fault of the library.
	draw := func(*rand.Rand) (tf.Rational, error) { return ctl, nil }
	if _, err := Robust(nil, ctl, draw, RobustSettings{Draws: 1}); !errors.Is(err, ErrSetting) || errors.Is(err, errs.ErrInternal) || !strings.Contains(err.Error(), "ctx = nil") {
		t.Errorf("nil ctx: %v", err)
	}
}

// BenchmarkRobust is the speed target of the robustness check: 1000 drawn
// first-order-plus-dead-time plants, a 2-hour closed-loop simulation at
// 1-minute samples (120 samples, set point and load), one core.
func BenchmarkRobust(b *testing.B) {
	p, _ := tf.FOPDT{Gain: 2, TimeConstant: 10, DeadTime: 3}.Discretize(1)
	tu, err := Tune(p, tf.Interval{Value: 1, Unit: "min"}, TuneSettings{})
	if err != nil {
		b.Fatal(err)
	}
	draw := func(rng *rand.Rand) (tf.Rational, error) {
		f := tf.FOPDT{Gain: 2 * (1 + 0.1*rng.NormFloat64()), TimeConstant: 10 * (1 + 0.1*rng.NormFloat64()), DeadTime: 3 + rng.Float64()}
		return f.Discretize(1)
	}
	s := RobustSettings{Draws: 1000, Seed: 1, Loop: LoopSettings{Horizon: 120, Interval: tf.Interval{Value: 1, Unit: "min"}}}
	b.ResetTimer()
	for range b.N {
		if _, err := Robust(context.Background(), tu.Controller, draw, s); err != nil {
			b.Fatal(err)
		}
	}
}

// TestRobustMemoryBound checks that settings whose bands would not fit
// in memory are refused up front with a *SettingError naming both
// settings and the bound (before: Draws 1000 x Horizon 10^7
// ended the process with a fatal out-of-memory error), and that the
// bound itself is accepted. The figures are 3 x 8 bytes per draw and
// sample (three float64 responses kept per stable draw).
func TestRobustMemoryBound(t *testing.T) {
	for _, s := range []RobustSettings{
		{Draws: 1000, Loop: LoopSettings{Horizon: 10_000_000}},
		{Draws: 1_000_000},                    // the default horizon 200
		{Loop: LoopSettings{Horizon: 10_001}}, // the default 1000 draws
	} {
		err := s.Validate()
		var se *errs.SettingError
		if !errors.As(err, &se) || !strings.Contains(se.Setting, "Draws") || !strings.Contains(se.Setting, "Horizon") || !strings.Contains(err.Error(), "10^7") {
			t.Errorf("%+v: got %v, want a *SettingError naming Draws, Horizon and the bound", s, err)
		}
		ctl, _ := tf.Constant(1)
		draw, _ := gainDraw(1, 0.5, 1)
		if _, err := Robust(context.Background(), ctl, draw, s); !errors.As(err, &se) {
			t.Errorf("Robust %+v: got %v, want the *SettingError", s, err)
		}
	}
	for _, s := range []RobustSettings{{Draws: 50_000}, {Loop: LoopSettings{Horizon: 10_000}}, {Draws: 1, Loop: LoopSettings{Horizon: 10_000_000}}} {
		if err := s.Validate(); err != nil {
			t.Errorf("%+v at the bound: %v", s, err)
		}
	}
}
