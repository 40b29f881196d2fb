package ccf

import (
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// fuzzPair turns fuzz bytes into two series of equal or unequal length
// with hostile values: NaN, +-Inf, 1e300, 1e-300, repeats (constant
// runs) and values scaled by 1e150 or 1e-150.
func fuzzPair(data []byte, cut uint8) (x, y []float64) {
	s := testutil.HostileSeries(data, testutil.Hostile{Max: 300, Div: 8, Up: 1e150, Down: 1e-150})
	h := len(s) / 2
	x, y = s[:h], s[h:]
	if cut%5 != 0 && len(y) > len(x) {
		y = y[:len(x)]
	}
	return x, y
}

// FuzzCross: Cross on hostile series, any lag and either method gives a
// typed error or correlations in [-1, 1] (to rounding), never a panic.
func FuzzCross(f *testing.F) {
	f.Add([]byte{11, 3, 11, 40, 11, 250, 11, 7, 11, 100, 11, 33, 11, 1, 11, 200, 11, 5, 11, 60, 11, 9, 11, 99}, uint8(1), 2, uint8(0))
	f.Add([]byte{5, 1, 5, 1, 5, 1, 5, 1, 11, 3, 11, 4, 11, 5, 11, 6}, uint8(1), 1, uint8(1))
	f.Add([]byte{11, 3, 3, 40, 11, 250, 11, 7, 9, 100, 11, 33, 11, 1, 10, 200}, uint8(1), 0, uint8(2))
	f.Add([]byte{11, 3, 11, 40, 11, 250, 11, 7}, uint8(0), -3, uint8(2))
	f.Fuzz(func(t *testing.T, data []byte, cut uint8, lag int, method uint8) {
		x, y := fuzzPair(data, cut)
		if lag > 1<<20 || lag < -(1<<20) {
			lag = lag % (1 << 20)
		}
		c, err := Cross(x, y, lag, &Settings{Method: Method(method % 4), Names: [2]string{"in", "out"}})
		if err != nil {
			var (
				se *SeriesError
				ve *SampleError
				ae *SettingError
			)
			if !errors.As(err, &se) && !errors.As(err, &ve) && !errors.As(err, &ae) {
				t.Fatalf("untyped error %T %v", err, err)
			}
			if !errors.Is(err, ErrLength) && !errors.Is(err, ErrShort) && !errors.Is(err, ErrConstant) && !errors.Is(err, ErrSample) &&
				!errors.Is(err, ErrSetting) && !errors.Is(err, ErrOverflow) {
				t.Fatalf("error of no kind %T %v", err, err)
			}
			if c != nil {
				t.Fatalf("result with error %v", err)
			}
			return
		}
		if len(c.R) != 2*lag+1 {
			t.Fatalf("%d correlations for lag %d", len(c.R), lag)
		}
		for k, r := range c.R {
			if !(math.Abs(r) <= 1+1e-9) {
				t.Fatalf("r(%d) = %v", k-lag, r)
			}
		}
		if !(c.SDX > 0) || !(c.SDY > 0) || math.IsInf(c.SDX, 0) || math.IsInf(c.SDY, 0) {
			t.Fatalf("SD %v %v", c.SDX, c.SDY)
		}
	})
}

// FuzzDistributedLag: DistributedLag on hostile series (the first half
// of the samples is the input, the second the output), any lag count
// and AR order, gives a typed error or finite weights, standard errors
// and variance, never a panic; its inputs are not modified.
func FuzzDistributedLag(f *testing.F) {
	f.Add([]byte{11, 3, 11, 40, 11, 250, 11, 7, 11, 100, 11, 33, 11, 1, 11, 200, 11, 5, 11, 60, 11, 9, 11, 99, 11, 17, 11, 80, 11, 2, 11, 41}, uint8(0), 1, 1)
	f.Add([]byte{11, 3, 11, 4, 11, 5, 11, 6, 11, 3, 11, 4, 11, 5, 11, 6, 11, 3, 11, 4, 11, 5, 11, 6, 11, 3, 11, 4, 11, 5, 11, 6}, uint8(0), 0, 2)
	f.Add([]byte{11, 3, 9, 40, 11, 250, 11, 7, 11, 100, 11, 33, 11, 1, 11, 200}, uint8(0), 2, -1)
	f.Fuzz(func(t *testing.T, data []byte, cut uint8, lags, arp int) {
		x, y := fuzzPair(data, cut)
		lags, arp = lags%64, arp%8
		x0, y0 := append([]float64(nil), x...), append([]float64(nil), y...)
		res, err := DistributedLag(y, [][]float64{x}, &DistributedLagSettings{Lags: lags, ARP: arp})
		for i := range x {
			if !same(x[i], x0[i]) {
				t.Fatalf("input modified at %d", i)
			}
		}
		for i := range y {
			if !same(y[i], y0[i]) {
				t.Fatalf("output modified at %d", i)
			}
		}
		if err != nil {
			var (
				se *SeriesError
				ve *SampleError
				ae *SettingError
				me *ModelError
			)
			if !errors.As(err, &se) && !errors.As(err, &ve) && !errors.As(err, &ae) && !errors.As(err, &me) {
				t.Fatalf("untyped error %T %v", err, err)
			}
			if res != nil {
				t.Fatalf("result with error %v", err)
			}
			return
		}
		w := res.Weights[0]
		for k := range w.V {
			if !finite(w.V[k]) || !finite(w.SE[k]) {
				t.Fatalf("v_%d = %v, se %v", k, w.V[k], w.SE[k])
			}
		}
		if !finite(res.Sigma2) || res.Sigma2 < 0 || !finite(res.Const) {
			t.Fatalf("sigma2 %v, constant %v", res.Sigma2, res.Const)
		}
	})
}

// same reports whether a and b are equal or both NaN.
func same(a, b float64) bool { return a == b || a != a && b != b }
