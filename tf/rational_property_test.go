package tf_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
)

// randomStable returns a random stable term: r poles inside radius 0.95
// (real, or complex pairs), a numerator of degree s with coefficients in
// [-1, 1] and a dead time in 0..5.
func randomStable(rng *rand.Rand) tf.Rational {
	r := rng.IntN(7)
	var zs []complex128
	for len(zs) < r {
		m := 0.95 * math.Sqrt(rng.Float64())
		if r-len(zs) >= 2 && rng.IntN(2) == 0 {
			phi := math.Pi * rng.Float64()
			z := complex(m*math.Cos(phi), m*math.Sin(phi))
			zs = append(zs, z, complex(real(z), -imag(z)))
		} else {
			zs = append(zs, complex(2*m-0.95, 0))
		}
	}
	den := poly.FromInverseRoots(zs)
	num := make([]float64, 1+rng.IntN(5))
	for k := range num {
		num[k] = 2*rng.Float64() - 1
	}
	return tf.MustRational(num, den, rng.IntN(6))
}

func randomSeries(rng *rand.Rand, n int) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64()
	}
	return x
}

// Tolerance for identities between two different evaluation orders of
// the same recursion (power-series division against the filter loop, or
// a running sum): rounding of a few ulps per step, amplified by the
// recursion (denominators of degree 6 with poles up to 0.95 have
// coefficients up to ~6 and amplify rounding by up to ~1e3), so 1e-12
// relative to the largest value so far (observed up to ~2e-13).
const propTol = 1e-12

// propTrial is one random draw of TestRationalProperties: a stable term
// g, a second term q, a dead-time shift, an input series, a history
// length and a steady input level.
type propTrial struct {
	g, q tf.Rational
	sh   int
	x    []float64
	m    int
	u    float64
}

// propTrials draws the 300 trials of TestRationalProperties from one
// seeded generator.
func propTrials() []propTrial {
	rng := rand.New(rand.NewPCG(20261201, 2))
	trials := make([]propTrial, 300)
	for i := range trials {
		tr := &trials[i]
		tr.g = randomStable(rng)
		tr.sh = rng.IntN(9)
		tr.q = randomStable(rng)
		tr.x = randomSeries(rng, 300)
		tr.m = 1 + rng.IntN(40)
		tr.u = rng.NormFloat64()
	}
	return trials
}

// propN is the length of the impulse responses compared.
const propN = 120

// TestRationalProperties checks identities of random stable terms, one
// subtest per identity, each over every trial (it stops at the first
// trial that breaks it).
func TestRationalProperties(t *testing.T) {
	trials := propTrials()
	for _, p := range []struct {
		name  string
		check func(t *testing.T, trial int, tr propTrial)
	}{
		{"step is the running sum of the impulse response", propStepSum},
		{"a filtered unit pulse is the impulse response", propPulse},
		{"dead time shifts exactly", propShift},
		{"series is convolution, parallel is sum", propSeriesParallel},
		{"gain is the impulse sum within the BIBO tail", propGain},
		{"plant equals batch filtering, clone and reset", propPlant},
		{"a history continues the whole series", propHistory},
		{"a steady start holds gain times input", propSteady},
		{"frequency response at 0 is the gain", propZeroFrequency},
	} {
		t.Run(p.name, func(t *testing.T) {
			for i, tr := range trials {
				p.check(t, i, tr)
			}
		})
	}
}

// propStepSum: step response = cumulative sum of the impulse response.
func propStepSum(t *testing.T, trial int, tr propTrial) {
	h := tr.g.Impulse(propN)
	cs := make([]float64, propN)
	acc := 0.0
	for k, v := range h {
		acc += v
		cs[k] = acc
	}
	if e := testutil.RunningRelErr(tr.g.Step(propN), cs); !(e <= propTol) {
		t.Fatalf("trial %d %v: step vs cumsum(impulse) error %.3g", trial, tr.g, e)
	}
}

// propPulse: filtering a unit pulse gives the impulse response.
func propPulse(t *testing.T, trial int, tr propTrial) {
	pulse := make([]float64, propN)
	pulse[0] = 1
	y, _ := tr.g.Filter(pulse)
	if e := testutil.RunningRelErr(y, tr.g.Impulse(propN)); !(e <= propTol) {
		t.Fatalf("trial %d: filtered pulse vs impulse error %.3g", trial, e)
	}
}

// propShift: a dead time longer by sh shifts the impulse response by sh
// samples, exactly.
func propShift(t *testing.T, trial int, tr propTrial) {
	g, sh := tr.g, tr.sh
	h := g.Impulse(propN)
	hs := tf.MustRational(g.Num(), g.Den(), g.Delay()+sh).Impulse(propN)
	for k := range hs {
		want := 0.0
		if k >= sh {
			want = h[k-sh]
		}
		if hs[k] != want {
			t.Fatalf("trial %d: shift by %d: h[%d] = %v, want %v exactly", trial, sh, k, hs[k], want)
		}
	}
}

// propSeriesParallel: series impulse response = convolution of the
// impulse responses; parallel = sum. The product denominator has degree
// up to 12 and amplifies rounding further: 10 propTol (observed up to
// ~4e-12).
func propSeriesParallel(t *testing.T, trial int, tr propTrial) {
	h, hq := tr.g.Impulse(propN), tr.q.Impulse(propN)
	ser, err := tr.g.Times(tr.q)
	if err != nil {
		t.Fatal(err)
	}
	conv := make([]float64, propN)
	for i := 0; i < propN; i++ {
		for j := 0; j <= i; j++ {
			conv[i] += h[j] * hq[i-j]
		}
	}
	if e := testutil.RunningRelErr(ser.Impulse(propN), conv); !(e <= 10*propTol) {
		t.Fatalf("trial %d: series vs convolution error %.3g", trial, e)
	}
	par, err := tr.g.Plus(tr.q)
	if err != nil {
		t.Fatal(err)
	}
	sum := make([]float64, propN)
	for i := range sum {
		sum[i] = h[i] + hq[i]
	}
	if e := testutil.RunningRelErr(par.Impulse(propN), sum); !(e <= 10*propTol) {
		t.Fatalf("trial %d: parallel vs sum error %.3g", trial, e)
	}
}

// propGain: steady-state gain = sum of the impulse response, within the
// BIBO tail bound (|sum_{k>=N} h_k| <= sum_{k>=N} |h_k| <= Tail).
func propGain(t *testing.T, trial int, tr propTrial) {
	g := tr.g
	bound, err := g.BIBOBound()
	if err != nil {
		t.Fatal(err)
	}
	total, abs := 0.0, 0.0
	for _, v := range g.Impulse(bound.Terms) {
		total += v
		abs += math.Abs(v)
	}
	gain, err := g.Gain()
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(gain-total) > bound.Tail+1e-12*abs {
		t.Fatalf("trial %d: gain %v, sum of impulse %v, tail bound %v", trial, gain, total, bound.Tail)
	}
	if math.Abs(abs-bound.Sum) > 1e-12*abs {
		t.Fatalf("trial %d: BIBO sum %v, want %v", trial, bound.Sum, abs)
	}
}

// propPlant: the streaming plant equals batch filtering sample for
// sample, bit for bit (same summation order); a clone continues
// identically; Reset returns to rest.
func propPlant(t *testing.T, trial int, tr propTrial) {
	x := tr.x
	yb, _ := tr.g.Filter(x)
	p := tf.NewPlant(tr.g)
	for i, v := range x {
		if got := p.Step(v); got != yb[i] {
			t.Fatalf("trial %d: plant y[%d] = %v, batch %v", trial, i, got, yb[i])
		}
	}
	c := p.Clone()
	for i := 0; i < 20; i++ {
		if a, b := p.Step(x[i]), c.Step(x[i]); a != b {
			t.Fatalf("trial %d: clone diverged at %d: %v vs %v", trial, i, a, b)
		}
	}
	p.Reset()
	if got := p.Step(x[0]); got != yb[0] {
		t.Fatalf("trial %d: after Reset y[0] = %v, want %v", trial, got, yb[0])
	}
}

// propHistory: filtering from a history equals filtering the whole
// series (the first m samples provide the past of the rest), and a plant
// given the same history continues the same way.
func propHistory(t *testing.T, trial int, tr propTrial) {
	x, m := tr.x, tr.m
	yb, _ := tr.g.Filter(x)
	yr, err := tr.g.FilterFrom(x[m:], tf.Past{Input: x[:m], Output: yb[:m]})
	if err != nil {
		t.Fatal(err)
	}
	for i := range yr {
		if yr[i] != yb[m+i] {
			t.Fatalf("trial %d: FilterFrom y[%d] = %v, whole-series %v", trial, i, yr[i], yb[m+i])
		}
	}
	ph := tf.NewPlant(tr.g)
	if err := ph.SetHistory(x[:m], yb[:m]); err != nil {
		t.Fatal(err)
	}
	for i := m; i < len(x); i++ {
		if got := ph.Step(x[i]); got != yb[i] {
			t.Fatalf("trial %d: plant from history y[%d] = %v, want %v", trial, i, got, yb[i])
		}
	}
}

// propSteady: a steady start with a constant input keeps the output at
// gain*u, within 1e-12 of the output's scale (rounding of the steady
// history).
func propSteady(t *testing.T, trial int, tr propTrial) {
	g, u := tr.g, tr.u
	gain, err := g.Gain()
	if err != nil {
		t.Fatal(err)
	}
	bound, err := g.BIBOBound()
	if err != nil {
		t.Fatal(err)
	}
	past, err := g.SteadyPast(u)
	if err != nil {
		t.Fatal(err)
	}
	cu := make([]float64, 50)
	for i := range cu {
		cu[i] = u
	}
	ys, _ := g.FilterFrom(cu, past)
	ps := tf.NewPlant(g)
	if err := ps.SetSteady(u); err != nil {
		t.Fatal(err)
	}
	for i, v := range ys {
		if math.Abs(v-gain*u) > 1e-12*(math.Abs(gain*u)+bound.Sum*math.Abs(u)) {
			t.Fatalf("trial %d: steady start y[%d] = %v, want %v", trial, i, v, gain*u)
		}
		if got := ps.Step(u); got != v {
			t.Fatalf("trial %d: steady plant y[%d] = %v, batch %v", trial, i, got, v)
		}
	}
}

// propZeroFrequency: the frequency response at w = 0 is the gain (phase
// 0 or pi by its sign), to 1e-12.
func propZeroFrequency(t *testing.T, trial int, tr propTrial) {
	gain, err := tr.g.Gain()
	if err != nil {
		t.Fatal(err)
	}
	mag, ph0, err := tr.g.GainPhase([]float64{0})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(mag[0]-math.Abs(gain)) > 1e-12*math.Max(1, math.Abs(gain)) {
		t.Fatalf("trial %d: |G(1)| = %v, gain %v", trial, mag[0], gain)
	}
	if wantPh := map[bool]float64{true: 0, false: math.Pi}[gain >= 0]; math.Abs(math.Abs(ph0[0])-wantPh) > 1e-12 {
		t.Fatalf("trial %d: phase at 0 = %v for gain %v", trial, ph0[0], gain)
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
