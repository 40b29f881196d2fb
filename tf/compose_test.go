package tf_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
)

// TestCancel: a controller zero placed on the plant pole at 0.8 cancels
// it (by hand: 0.5 B^2/((1 - 0.8 B)(1 - 0.5 B)) times 2 (1 - 0.8 B)/(1 - B)
// is B^2/((1 - 0.5 B)(1 - B)) = B^2/(1 - 1.5 B + 0.5 B^2)), and a
// cancelled complex pair leaves the impulse response unchanged.
func TestCancel(t *testing.T) {
	p := tf.MustRational([]float64{0.5}, []float64{1, -1.3, 0.4}, 2)
	c := tf.MustRational([]float64{2, -1.6}, []float64{1, -1}, 0)
	pc, err := p.Times(c)
	if err != nil {
		t.Fatal(err)
	}
	min, err := pc.Cancel(1e-9)
	if err != nil {
		t.Fatal(err)
	}
	num, den := min.Num(), min.Den()
	if len(num) != 1 || math.Abs(num[0]-1) > 1e-12 || len(den) != 3 ||
		math.Abs(den[1]+1.5) > 1e-12 || math.Abs(den[2]-0.5) > 1e-12 || min.Delay() != 2 {
		t.Errorf("cancelled %v, want (1) / (1 - 1.5 B + 0.5 B^2) B^2", min)
	}
	// Complex pair 0.6 +- 0.3i in both numerator and denominator, with a
	// leading zero numerator coefficient (extra delay) that is kept.
	pair := []float64{1, -1.2, 0.45}
	g := tf.MustRational([]float64{0, 0.3, -0.36, 0.135}, poly.Mul(pair, []float64{1, -0.9}), 1)
	h, err := g.Cancel(1e-9)
	if err != nil {
		t.Fatal(err)
	}
	if h.DenDegree() != 1 || h.NumDegree() != 1 {
		t.Errorf("complex pair not cancelled: %v", h)
	}
	if e := testutil.RunningRelErr(h.Impulse(80), g.Impulse(80)); e > 1e-12 {
		t.Errorf("impulse changed by cancellation: %.3g", e)
	}
	// Nothing within tolerance: r itself.
	same, _ := p.Cancel(1e-9)
	if same.String() != p.String() {
		t.Errorf("Cancel changed %v to %v", p, same)
	}
	var se *tf.SettingError
	if _, err := p.Cancel(-1); !errors.As(err, &se) || se.Setting != "tol" || !errors.Is(err, tf.ErrSetting) ||
		err.Error() != "tf.Rational.Cancel: tol = -1: must lie in [0, 1): the largest distance of a cancelled pole-zero pair, relative to max(1, |pole|)" {
		t.Errorf("negative tol: %v", err)
	}
}

// TestFeedbackLoop checks the closed loop G/(1 + G H) against a direct
// simulation of the loop with two plants, e = u - H y, y = G e, where the
// loop dead time of at least one sample makes the loop computable in
// time order.
func TestFeedbackLoop(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	for trial := 0; trial < 100; trial++ {
		g := randomStable(rng)
		h := randomStable(rng)
		if g.Delay()+h.Delay() == 0 {
			g = tf.MustRational(g.Num(), g.Den(), 1)
		}
		cl, err := g.CloseLoop(h)
		if err != nil {
			t.Fatal(err)
		}
		x := randomSeries(rng, 150)
		want, _ := cl.Filter(x)
		pg, ph := tf.NewPlant(g), tf.NewPlant(h)
		// With loop delay >= 1 either the feedback (b_h >= 1) or the
		// forward path (b_g >= 1) needs only past values of its input.
		var y []float64
		if h.Delay() >= 1 {
			// The feedback output at t depends on y up to t - b_h <= t - 1:
			// keep it as the plant output fed with y_{t-1}; emulate the
			// delay of one by shifting: H = B * H' with H' of delay b_h - 1.
			h1 := tf.MustRational(h.Num(), h.Den(), h.Delay()-1)
			ph1 := tf.NewPlant(h1)
			yPrev := 0.0
			for _, u := range x {
				fb := ph1.Step(yPrev) // = (H y)_t since H = H' B
				yt := pg.Step(u - fb)
				y = append(y, yt)
				yPrev = yt
			}
		} else {
			// b_g >= 1: y_t from G's state, then the feedback H y_t.
			g1 := tf.MustRational(g.Num(), g.Den(), g.Delay()-1)
			pg1 := tf.NewPlant(g1)
			ePrev := 0.0
			for _, u := range x {
				yt := pg1.Step(ePrev) // = (G e)_t since G = G' B
				fb := ph.Step(yt)
				ePrev = u - fb
				y = append(y, yt)
			}
		}
		if e := testutil.RunningRelErr(y, want); !(e <= 1e-10) {
			t.Fatalf("trial %d: loop simulation vs Feedback error %.3g", trial, e)
		}
	}
}
