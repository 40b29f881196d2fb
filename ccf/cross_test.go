package ccf

import (
	"errors"
	"math"
	"math/big"
	"math/rand/v2"
	"sync"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// naiveCross is the definition written out, for the agreement checks.
func naiveCross(x, y []float64, K int) []float64 {
	n := len(x)
	mx, my := 0.0, 0.0
	for i := range x {
		mx += x[i]
		my += y[i]
	}
	mx /= float64(n)
	my /= float64(n)
	// Second pass: the correction that makes the mean accurate for series
	// with a large offset.
	var ex, ey float64
	for i := range x {
		ex += x[i] - mx
		ey += y[i] - my
	}
	mx += ex / float64(n)
	my += ey / float64(n)
	var sxx, syy float64
	for i := range x {
		sxx += (x[i] - mx) * (x[i] - mx)
		syy += (y[i] - my) * (y[i] - my)
	}
	r := make([]float64, 2*K+1)
	for k := -K; k <= K; k++ {
		s := 0.0
		for t := 0; t < n; t++ {
			if t+k >= 0 && t+k < n {
				s += (x[t] - mx) * (y[t+k] - my)
			}
		}
		r[K+k] = s / math.Sqrt(sxx*syy)
	}
	return r
}

// bigCross is the definition evaluated with 200-bit floats.
func bigCross(x, y []float64, K int) []float64 {
	const prec = 200
	n := len(x)
	nf := func() *big.Float { return new(big.Float).SetPrec(prec) }
	mean := func(v []float64) *big.Float {
		s := nf()
		for _, a := range v {
			s.Add(s, nf().SetFloat64(a))
		}
		return s.Quo(s, nf().SetInt64(int64(n)))
	}
	mx, my := mean(x), mean(y)
	xc := make([]*big.Float, n)
	yc := make([]*big.Float, n)
	for i := range x {
		xc[i] = nf().Sub(nf().SetFloat64(x[i]), mx)
		yc[i] = nf().Sub(nf().SetFloat64(y[i]), my)
	}
	dot := func(a, b []*big.Float, k int) *big.Float {
		s := nf()
		for t := 0; t < n; t++ {
			if t+k >= 0 && t+k < n {
				s.Add(s, nf().Mul(a[t], b[t+k]))
			}
		}
		return s
	}
	sxx, _ := dot(xc, xc, 0).Float64()
	syy, _ := dot(yc, yc, 0).Float64()
	r := make([]float64, 2*K+1)
	for k := -K; k <= K; k++ {
		c, _ := dot(xc, yc, k).Float64()
		r[K+k] = c / math.Sqrt(sxx*syy)
	}
	return r
}

func TestCrossAgainstR(t *testing.T) {
	// Source: R 4.2.2 stats::ccf(a, b, lag.max = 20, plot = FALSE), written
	// by testdata/ccf/reference.R. R's lag k estimates cor(a[t+k], b[t]);
	// ours at lag k is cor(a[t], b[t+k]), so r_ours(k) = r_R(-k).
	// Tolerance 1e-10 (absolute, on correlations of magnitude <= 1): both
	// sides sum the same 200 products in double precision.
	cols := readColumns(t, "../testdata/ccf/series.csv", "x", "y", "z")
	series := map[byte][]float64{'x': cols[0], 'y': cols[1], 'z': cols[2]}
	ref := testutil.ReadCSV(t, "testdata/ccf/ccf.csv", "pair")
	lags, rs := ref.Column(t, "lag"), ref.Column(t, "r")
	want := map[string]map[int]float64{}
	for i, pair := range ref.Text["pair"] {
		if want[pair] == nil {
			want[pair] = map[int]float64{}
		}
		want[pair][int(lags[i])] = rs[i]
	}
	if len(want) != 3 {
		t.Fatalf("ccf.csv holds %d series pairs, want 3 (xy, yx, zy)", len(want))
	}
	for pair, w := range want {
		for _, m := range []Method{Direct, FFT, Auto} {
			c, err := Cross(series[pair[0]], series[pair[1]], 20, &Settings{Method: m})
			if err != nil {
				t.Fatal(err)
			}
			for k := -20; k <= 20; k++ {
				if got := c.At(k); math.Abs(got-w[-k]) > 1e-10 {
					t.Errorf("%s %v lag %d: got %.15g, R ccf at lag %d gives %.15g", pair, m, k, got, -k, w[-k])
				}
			}
		}
	}
}

func TestCrossDirectFFTAgree(t *testing.T) {
	// Both paths against the definition, to 1e-12 absolute in r.
	rng := rand.New(rand.NewPCG(1, 2))
	for _, tc := range []struct{ n, K int }{
		{2, 0}, {2, 1}, {3, 2}, {10, 9}, {50, 7}, {257, 40}, {1000, 3}, {3000, 500}, {5000, 2000}, {20011, 130},
	} {
		x := make([]float64, tc.n)
		y := make([]float64, tc.n)
		for i := range x {
			x[i] = 5 + rng.NormFloat64()
			y[i] = -3 + 0.5*rng.NormFloat64()
			if i > 2 {
				y[i] += 0.8 * x[i-3]
			}
		}
		want := naiveCross(x, y, tc.K)
		for _, m := range []Method{Direct, FFT} {
			c, err := Cross(x, y, tc.K, &Settings{Method: m})
			if err != nil {
				t.Fatal(err)
			}
			for i, w := range want {
				if d := math.Abs(c.R[i] - w); d > 1e-12 {
					t.Fatalf("n=%d K=%d %v lag %d: got %.16g want %.16g (diff %g)", tc.n, tc.K, m, i-tc.K, c.R[i], w, d)
				}
			}
		}
	}
}

// TestCrossAwkwardLevels checks the direct path's provisional centring
// (on the mean of the first 4096 samples) on series whose head is far
// from their mean: a step after the head, a steep trend, and a large
// offset with small variation. Both paths against the definition
// evaluated in 200-bit floating point (math/big), to 1e-12.
func TestCrossAwkwardLevels(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 5))
	n := 6000
	cases := map[string]func(i int) float64{
		"step":   func(i int) float64 { return map[bool]float64{true: 50, false: 0}[i >= 4096] + rng.NormFloat64() },
		"trend":  func(i int) float64 { return 0.01*float64(i) + rng.NormFloat64() },
		"offset": func(i int) float64 { return 1e6 + 1e-3*rng.NormFloat64() },
	}
	for name, f := range cases {
		x := make([]float64, n)
		y := make([]float64, n)
		for i := range x {
			x[i] = f(i)
		}
		for i := range y {
			y[i] = rng.NormFloat64()
			if i >= 5 {
				y[i] += 0.3 * (x[i-5] - x[0])
			}
		}
		want := bigCross(x, y, 30)
		for _, m := range []Method{Direct, FFT} {
			c, err := Cross(x, y, 30, &Settings{Method: m})
			if err != nil {
				t.Fatal(err)
			}
			for i, w := range want {
				if d := math.Abs(c.R[i] - w); d > 1e-12 {
					t.Fatalf("%s %v lag %d: got %.16g want %.16g (diff %g)", name, m, i-30, c.R[i], w, d)
				}
			}
		}
	}
}

func TestCrossBands(t *testing.T) {
	x := []float64{1, 3, 2, 5, 4, 6, 5, 8, 7, 9, 8, 11, 10, 12, 11, 14}
	y := []float64{2, 1, 4, 3, 6, 5, 7, 6, 9, 8, 10, 9, 12, 11, 13, 12}
	c, err := Cross(x, y, 3, nil)
	if err != nil {
		t.Fatal(err)
	}
	// z_{0.975} = 1.959963984540054 (R 4.2.2 qnorm(0.975)); n = 16.
	if got, want := c.Band(0.95), 1.959963984540054/4; math.Abs(got-want) > 1e-14 {
		t.Errorf("Band(0.95) = %.16g, want %.16g", got, want)
	}
	if got := c.SE(); got != 0.25 {
		t.Errorf("SE = %g, want 0.25", got)
	}
	for _, k := range c.Significant(0.95) {
		if math.Abs(c.At(k)) <= c.Band(0.95) {
			t.Errorf("lag %d reported significant with r = %g", k, c.At(k))
		}
	}
}

func TestCrossBadInput(t *testing.T) {
	good := []float64{1, 2, 4, 3, 5, 7, 6}
	nan := append([]float64(nil), good...)
	nan[4] = math.NaN()
	inf := append([]float64(nil), good...)
	inf[2] = math.Inf(-1)
	names := &Settings{Names: [2]string{"burner", "temp"}}
	var le *SeriesError
	if _, err := Cross(good, good[:5], 2, names); !errors.As(err, &le) || !errors.Is(err, ErrLength) || le.Have != 5 || le.Need != 7 || le.Series != "temp" ||
		err.Error() != `ccf.Cross: series "temp" has 5 samples against 7 (the length of "burner"; the series must be of equal length)` {
		t.Errorf("unequal lengths: got %v", err)
	}
	var se *SeriesError
	if _, err := Cross(good, good, 7, names); !errors.As(err, &se) || !errors.Is(err, ErrShort) || se.Need != 8 || se.Series != "burner" ||
		err.Error() != `ccf.Cross: series "burner": 7 samples, at least 8 needed (for lags up to 7)` {
		t.Errorf("too short: got %v", err)
	}
	var ce *SeriesError
	if _, err := Cross(good, []float64{3, 3, 3, 3, 3, 3, 3}, 2, names); !errors.As(err, &ce) || !errors.Is(err, ErrConstant) || ce.Series != "temp" ||
		err.Error() != `ccf.Cross: series "temp" is constant (every sample is 3; its correlations are undefined)` {
		t.Errorf("constant: got %v", err)
	}
	var ve *SampleError
	if _, err := Cross(nan, good, 2, names); !errors.As(err, &ve) || ve.Index != 4 || ve.Series != "burner" || ve.Op != "ccf.Cross" {
		t.Errorf("NaN: got %v", err)
	}
	if _, err := Cross(good, inf, 2, names); !errors.As(err, &ve) || ve.Index != 2 || ve.Series != "temp" || !math.IsInf(ve.Value, -1) || !errors.Is(err, ErrSample) {
		t.Errorf("Inf: got %v", err)
	}
	var ae *SettingError
	if _, err := Cross(good, good, -1, nil); !errors.As(err, &ae) || ae.Setting != "maxLag" || err.Error() != "ccf.Cross: maxLag = -1: must be zero or positive" {
		t.Errorf("negative lag: got %v", err)
	}
	if _, err := Cross(good, good, 1, &Settings{Method: 9}); !errors.As(err, &ae) || ae.Setting != "Settings.Method" || !errors.Is(err, ErrSetting) {
		t.Errorf("bad method: got %v", err)
	}
	// The largest lag representable must not overflow the length check.
	for _, m := range []Method{Auto, Direct, FFT} {
		if _, err := Cross(good, good, math.MaxInt, &Settings{Method: m}); !errors.As(err, &se) || se.Need != math.MaxInt {
			t.Errorf("%v, maxLag = MaxInt: got %v", m, err)
		}
	}
	// Deviations whose squares underflow: an error, not infinite r.
	tiny := make([]float64, len(good))
	big := make([]float64, len(good))
	for i, v := range good {
		tiny[i] = v * 1e-300
		big[i] = v * 1e140
	}
	if _, err := Cross(tiny, good, 2, nil); !errors.As(err, &se) || !errors.Is(err, ErrOverflow) {
		t.Errorf("squares underflow: got %v", err)
	}
	// Both series near 1e140: each sum of squares is finite, their
	// product is not; r must still equal that of the unscaled series
	// (scale invariance of the definition), to 1e-14.
	want, err := Cross(good, good, 2, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range []Method{Direct, FFT} {
		got, err := Cross(big, big, 2, &Settings{Method: m})
		if err != nil {
			t.Fatalf("%v, series near 1e140: %v", m, err)
		}
		for i := range want.R {
			if math.Abs(got.R[i]-want.R[i]) > 1e-14 {
				t.Errorf("%v, series near 1e140, lag %d: r = %g, want %g", m, i-2, got.R[i], want.R[i])
			}
		}
	}
	if good[4] != 5 || !math.IsNaN(nan[4]) {
		t.Error("inputs modified")
	}
}

// TestConcurrentUse runs Cross (both paths), ImpulseWeights and Identify
// from several goroutines on shared inputs (run with -race) and checks
// that every goroutine gets the same results as a lone call.
func TestConcurrentUse(t *testing.T) {
	x, y := benchSeries(3000)
	for i := 3; i < len(y); i++ {
		y[i] += 0.8*x[i-3] + 0.5*y[i-1]
	}
	want := map[Method]*Correlation{}
	for _, m := range []Method{Direct, FFT} {
		c, err := Cross(x, y, 30, &Settings{Method: m})
		if err != nil {
			t.Fatal(err)
		}
		want[m] = c
	}
	w0, _ := ImpulseWeights(x, y, 20, "x", nil)
	id0, err := Identify(w0, nil)
	if err != nil {
		t.Fatal(err)
	}
	var wg sync.WaitGroup
	errs := make(chan string, 16)
	for g := 0; g < 8; g++ {
		wg.Add(1)
		go func(g int) {
			defer wg.Done()
			m := []Method{Direct, FFT}[g%2]
			c, err := Cross(x, y, 30, &Settings{Method: m})
			if err != nil {
				errs <- err.Error()
				return
			}
			for i := range c.R {
				if c.R[i] != want[m].R[i] {
					errs <- "Cross differs under concurrency"
					return
				}
			}
			w, _ := ImpulseWeights(x, y, 20, "x", nil)
			id, err := Identify(w, nil)
			if err != nil || id.DeadTime != id0.DeadTime || id.Forms[0].String() != id0.Forms[0].String() || id.Forms[0].Num[0] != id0.Forms[0].Num[0] {
				errs <- "Identify differs under concurrency"
			}
		}(g)
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
}
