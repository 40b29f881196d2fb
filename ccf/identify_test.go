package ccf

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestIdentifyBadInput(t *testing.T) {
	v := []float64{0, 0, 1, 0.5, 0.25, 0.12, 0.06, 0.03}
	se := []float64{0.05, 0.05, 0.05, 0.05, 0.05, 0.05, 0.05, 0.05}
	var ae *SettingError
	if _, err := Identify(nil, nil); !errors.As(err, &ae) || ae.Setting != "w" || ae.Op != "ccf.Identify" {
		t.Errorf("nil weights: %v", err)
	}
	if _, err := Identify(&Weights{V: v, SE: se}, &IdentifySettings{Level: 1.5}); !errors.As(err, &ae) || ae.Setting != "IdentifySettings.Level" {
		t.Errorf("level: %v", err)
	}
	var sh *SeriesError
	if _, err := Identify(&Weights{V: v[:1], SE: se[:1]}, nil); !errors.As(err, &sh) || !errors.Is(err, ErrShort) ||
		err.Error() != `ccf.Identify: series "x weights": 1 samples, at least 2 needed (lags 0 and 1 at least)` {
		t.Errorf("short: %v", err)
	}
	bad := append([]float64(nil), v...)
	bad[3] = math.NaN()
	var ve *SampleError
	if _, err := Identify(&Weights{Input: "valve", V: bad, SE: se}, nil); !errors.As(err, &ve) || ve.Index != 3 || ve.Series != "valve weights" {
		t.Errorf("NaN weight: %v", err)
	}
	zse := append([]float64(nil), se...)
	zse[5] = 0
	if _, err := Identify(&Weights{Input: "valve", V: v, SE: zse}, nil); !errors.As(err, &sh) || !errors.Is(err, ErrSample) ||
		err.Error() != `ccf.Identify: series "valve weight standard errors": bad sample (lag 5 holds 0; standard errors must be positive finite numbers)` {
		t.Errorf("zero standard error: %v", err)
	}
	var nr *NoResponseError
	flat := []float64{0.01, -0.02, 0.03, 0.0, 0.01, -0.01, 0.02, 0.0}
	if _, err := Identify(&Weights{Input: "valve", V: flat, SE: se}, nil); !errors.As(err, &nr) || nr.Input != "valve" || !errors.Is(err, ErrModel) ||
		!strings.HasPrefix(err.Error(), `ccf.Identify: no significant response of the output to input "valve" at lags 0..7 (level 0.99; largest |t| = 0.60 at lag 2)`) {
		t.Errorf("no response: %v", err)
	}
	// A lone moderate spike at lag 1 (t = 3, below the lone-spike
	// threshold 3.29 at Level 0.99) before the real response at lag 4.
	spike := []float64{0, 0.15, 0, 0, 1, 0.6, 0.36, 0.2, 0.1, 0.05}
	se10 := make([]float64, len(spike))
	for i := range se10 {
		se10[i] = 0.05
	}
	id, err := Identify(&Weights{V: spike, SE: se10}, nil)
	if err != nil || id.DeadTime != 4 {
		t.Errorf("lone spike: dead time %v, %v; want 4", id, err)
	}
	// Exactly rational weights: the fit and the corner method recover them.
	exact := []float64{0, 0, 2, 1.6, 0.96, 0.576, 0.3456, 0.20736, 0.124416, 0.0746496, 0.04478976}
	se11 := make([]float64, len(exact))
	for i := range se11 {
		se11[i] = 0.01
	}
	id, err = Identify(&Weights{V: exact, SE: se11}, nil)
	if err != nil {
		t.Fatal(err)
	}
	c := id.Forms[0]
	// 2 (1 + 0.2 B) / (1 - 0.6 B) B^2: v_2 = 2, v_3 = 0.6*2 + 0.4 = 1.6, then *0.6.
	if c.R != 1 || c.S != 1 || math.Abs(c.Num[0]-2) > 1e-8 || math.Abs(c.Num[1]-0.4) > 1e-8 || math.Abs(c.Den[1]+0.6) > 1e-8 {
		t.Errorf("exact weights: got r=%d s=%d num %v den %v", c.R, c.S, c.Num, c.Den)
	}
	if id.CornerR != 1 || id.CornerS != 1 {
		t.Errorf("corner method on exact weights: (%d,%d), want (1,1)", id.CornerR, id.CornerS)
	}
	// Order bounds far beyond the weights are cut to the lags after the
	// dead time (9 here): the best form is still (1, 1), and the call
	// returns after those few forms (not 2^40 x 2^40 of them).
	id, err = Identify(&Weights{V: exact, SE: se11}, &IdentifySettings{MaxR: 1 << 40, MaxS: 1 << 40})
	if err != nil || id.Forms[0].R != 1 || id.Forms[0].S != 1 || id.Forms[0].String() != "b=2 (r=1, s=1)" {
		t.Errorf("huge order bounds: %v, %v", id, err)
	}
	if _, err := Identify(&Weights{V: exact, SE: se11}, &IdentifySettings{Penalty: math.Inf(1)}); !errors.As(err, &ae) {
		t.Errorf("infinite penalty: %v", err)
	}
	var le *SeriesError
	if _, err := Identify(&Weights{V: exact, SE: se11[:3]}, nil); !errors.As(err, &le) || !errors.Is(err, ErrLength) || le.Have != 3 || le.Need != 11 {
		t.Errorf("standard errors shorter than the weights: %v", err)
	}
}

func TestNoiseSeries(t *testing.T) {
	x := []float64{1, 2, 0, -1, 3, 2, 1, 0}
	y := make([]float64, len(x))
	for i := range y {
		y[i] = 5
		if i >= 1 {
			y[i] += 0.5 * x[i-1]
		}
		if i >= 2 {
			y[i] += 0.25 * x[i-2]
		}
	}
	w := &Weights{Input: "x", V: []float64{0, 0.5, 0.25}, SE: []float64{1, 1, 1}}
	n, start, err := NoiseSeries(y, [][]float64{x}, []*Weights{w})
	if err != nil || start != 2 {
		t.Fatal(err, start)
	}
	for i := start; i < len(n); i++ {
		if math.Abs(n[i]-5) > 1e-14 {
			t.Errorf("noise[%d] = %g, want 5", i, n[i])
		}
	}
	if !math.IsNaN(n[0]) || !math.IsNaN(n[1]) {
		t.Error("noise before start must be NaN")
	}
	var le *SeriesError
	if _, _, err := NoiseSeries(y, [][]float64{x[:5]}, []*Weights{w}); !errors.As(err, &le) || le.Series != "x" || !errors.Is(err, ErrLength) || le.Op != "ccf.NoiseSeries" {
		t.Errorf("lengths: %v", err)
	}
	var ae *SettingError
	if _, _, err := NoiseSeries(y, [][]float64{x}, nil); !errors.As(err, &ae) || err.Error() != "ccf.NoiseSeries: len(ws) = 0: must equal len(xs) = 1" {
		t.Errorf("missing weights: %v", err)
	}
	var sh *SeriesError
	long := &Weights{V: make([]float64, 12), SE: make([]float64, 12)}
	if _, _, err := NoiseSeries(y, [][]float64{x}, []*Weights{long}); !errors.As(err, &sh) || !errors.Is(err, ErrShort) {
		t.Errorf("short: %v", err)
	}
	// A NaN weight is an error naming the lag, not a NaN noise series.
	var ve *SampleError
	nanw := &Weights{Input: "x", V: []float64{0, math.NaN(), 0.25}, SE: []float64{1, 1, 1}}
	if _, _, err := NoiseSeries(y, [][]float64{x}, []*Weights{nanw}); !errors.As(err, &ve) || ve.Index != 1 {
		t.Errorf("NaN weight: %v", err)
	}
}

func TestImpulseWeightsScale(t *testing.T) {
	// v_k = r(k) s_y / s_x: for y = 3 x delayed by one (x white-ish),
	// v_1 = 3 exactly up to end effects of the divisor-n estimate.
	x := []float64{1, -1, 2, 0, -2, 1, 1, -1, 0, 2, -1, -1}
	y := make([]float64, len(x))
	for i := 1; i < len(x); i++ {
		y[i] = 3 * x[i-1]
	}
	w, err := ImpulseWeights(x, y, 3, "x", &Settings{Method: Direct})
	if err != nil {
		t.Fatal(err)
	}
	c, _ := Cross(x, y, 3, nil)
	if got, want := w.V[1], c.At(1)*c.SDY/c.SDX; math.Abs(got-want) > 1e-14 {
		t.Errorf("v_1 = %g, want r(1) s_y/s_x = %g", got, want)
	}
	if got, want := w.SE[0], c.SDY/c.SDX/math.Sqrt(12); math.Abs(got-want) > 1e-14 {
		t.Errorf("se = %g, want %g", got, want)
	}
	var ce *SeriesError
	if _, err := ImpulseWeights(x, make([]float64, len(x)), 2, "x", nil); !errors.As(err, &ce) || !errors.Is(err, ErrConstant) || ce.Op != "ccf.ImpulseWeights" {
		t.Errorf("constant output: %v", err)
	}
}

func TestPattern(t *testing.T) {
	for _, tc := range []struct {
		den  []float64
		want string
	}{
		{[]float64{1}, "cut-off"},
		{[]float64{1, -0.6}, "exponential decay"},
		{[]float64{1, 0.6}, "alternating decay"},
		{[]float64{1, -1.0, 0.5}, "damped oscillation"}, // poles 0.5 +- 0.5i
		{[]float64{1, -1.1, 0.28}, "two-pole decay"},    // poles 0.7, 0.4
	} {
		if got := pattern(tc.den); got != tc.want {
			t.Errorf("pattern(%v) = %q, want %q", tc.den, got, tc.want)
		}
	}
}

func TestNearCancel(t *testing.T) {
	// (1 - 0.9 B)/(1 - 0.92 B): zero 0.9, pole 0.92 in the z-plane.
	if !nearCancel([]float64{1, -0.9}, []float64{1, -0.92}, 0.05) {
		t.Error("zero 0.9 and pole 0.92 not flagged")
	}
	// (1 + 0.7 B)/(1 - 0.6 B): zero -0.7, pole 0.6.
	if nearCancel([]float64{1, 0.7}, []float64{1, -0.6}, 0.05) {
		t.Error("zero -0.7 and pole 0.6 flagged")
	}
	// The numerator 1 - 1.02 B + 0.5101 B^2 has zeros 0.51 +- 0.5i, within
	// 0.05 of the poles 0.5 +- 0.5i of 1 - B + 0.5 B^2.
	if !nearCancel([]float64{1, -1.02, 0.5101}, []float64{1, -1, 0.5}, 0.05) {
		t.Error("complex pair not flagged")
	}
	if nearCancel([]float64{2}, []float64{1, -0.5}, 0.05) {
		t.Error("a constant numerator has no zeros")
	}
}

func TestCornerEdges(t *testing.T) {
	if Corner(nil, 5, 3) != nil {
		t.Error("nil weights")
	}
	if Corner(&Weights{V: []float64{1}, SE: []float64{1}}, 5, 3) != nil {
		t.Error("one weight cannot fill a 3-column table")
	}
	// Identify with the response at the last lag: only (0,0) fits.
	id, err := Identify(&Weights{V: []float64{0, 0, 0, 5}, SE: []float64{0.1, 0.1, 0.1, 0.1}}, nil)
	if err != nil || id.DeadTime != 3 || len(id.Forms) != 1 || id.Forms[0].String() != "b=3 (r=0, s=0)" || id.Forms[0].Num[0] != 5 {
		t.Errorf("response at the last lag: %+v, %v", id, err)
	}
}

// TestNegativeLagLevel: a prewhitened cross-correlation that sits at
// -0.1 at every lag before the response at lag 4 (a common level left by
// incomplete prewhitening, n = 1000, band 0.062). Without removing that
// level, lag 0 would pass the dead-time rule; Identify measures the
// weights from the negative-lag median and finds lag 4.
func TestNegativeLagLevel(t *testing.T) {
	const n, K = 1000, 12
	c := &Correlation{N: n, MaxLag: K, R: make([]float64, 2*K+1), SDX: 1, SDY: 2}
	for k := -K; k <= K; k++ {
		r := -0.1
		if k >= 4 {
			r += 0.5 * math.Pow(0.6, float64(k-4))
		}
		c.R[K+k] = r
	}
	w := &Weights{Input: "valve", V: make([]float64, K+1), SE: make([]float64, K+1), N: n, Corr: c}
	for k := 0; k <= K; k++ {
		w.V[k] = c.At(k) * 2
		w.SE[k] = 2 / math.Sqrt(n)
	}
	id, err := Identify(w, nil)
	if err != nil {
		t.Fatal(err)
	}
	if id.DeadTime != 4 || math.Abs(id.Offset+0.2) > 1e-12 {
		t.Errorf("dead time %d, offset %g; want 4 and -0.2 (-0.1 times s_y/s_x = 2)", id.DeadTime, id.Offset)
	}
	if c := id.Forms[0]; c.R != 1 || c.S != 0 || math.Abs(c.Den[1]+0.6) > 1e-6 {
		t.Errorf("top form r=%d s=%d den %v, want 1 - 0.6 B", c.R, c.S, c.Den)
	}
	// The same weights without the cross-correlation (no negative lags to
	// read the level from) give the wrong dead time.
	w.Corr = nil
	if id, err := Identify(w, nil); err != nil || id.DeadTime != 0 {
		t.Errorf("without the level: dead time %v, %v; want the misleading 0", id, err)
	}
}

// TestCornerZeroSE: with zero standard errors the t-values are +Inf for
// a non-zero determinant and 0 for a zero one, as documented (closed
// form: for v = (0, 2, 1) C(0, 1) = v_0 = 0, C(1, 1) = v_1 = 2,
// C(1, 2) = v_1^2 - v_0 v_2 = 4).
func TestCornerZeroSE(t *testing.T) {
	c := Corner(&Weights{V: []float64{0, 2, 1}, SE: []float64{0, 0, 0}}, 2, 2)
	if c == nil {
		t.Fatal("nil table")
	}
	if c.T[0][0] != 0 || !c.Zero(0, 1) {
		t.Errorf("C(0,1) = %g, T = %g; want 0 and 0 (zero)", c.Det[0][0], c.T[0][0])
	}
	if c.Det[1][0] != 2 || !math.IsInf(c.T[1][0], 1) || c.Zero(1, 1) {
		t.Errorf("C(1,1) = %g, T = %g; want 2 and +Inf (non-zero)", c.Det[1][0], c.T[1][0])
	}
	if c.Det[1][1] != 4 || !math.IsInf(c.T[1][1], 1) {
		t.Errorf("C(1,2) = %g, T = %g; want 4 and +Inf", c.Det[1][1], c.T[1][1])
	}
}
