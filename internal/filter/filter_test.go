package filter

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// naive is the difference equation written out directly, with pre-sample
// values from the histories (oldest first) or zero, and the sums in the
// documented order.
func naive(b, a, x, xh, yh []float64) []float64 {
	y := make([]float64, len(x))
	// at returns v[t], or for t < 0 the value of history h that far back
	// (h oldest first), or zero before the history.
	at := func(v, h []float64, t int) float64 {
		if t >= 0 {
			return v[t]
		}
		if k := len(h) + t; k >= 0 {
			return h[k]
		}
		return 0
	}
	for t := range x {
		s := 0.0
		for k := range b {
			s += b[k] * at(x, xh, t-k)
		}
		for k := len(a) - 1; k >= 1; k-- {
			s -= a[k] * at(y, yh, t-k)
		}
		y[t] = s / a[0]
	}
	return y
}

func randPoly(rng *rand.Rand, n int, scale float64) []float64 {
	c := make([]float64, n)
	for i := range c {
		c[i] = scale * (2*rng.Float64() - 1)
	}
	return c
}

func randStableDen(rng *rand.Rand, p int) []float64 {
	// Product of first-order factors 1 - z B with |z| < 0.9 keeps the
	// recursion stable, so comparisons stay meaningful over long series.
	a := []float64{1}
	for i := 0; i < p; i++ {
		z := 1.8*rng.Float64() - 0.9
		n := make([]float64, len(a)+1)
		for k, v := range a {
			n[k] += v
			n[k+1] -= z * v
		}
		a = n
	}
	return a
}

// TestRunMatchesNaive checks every kernel (orders up to 1, 2, 4 and the
// general stream) against the written-out equation, with and without
// histories, and in place. The reference is naive above (by hand: the
// difference equation as documented). Bit for bit when a_0 = 1 (same
// operations in the same order, zero padding adds exact zeros). When
// a_0 != 1 the kernels divide by a_0 as naive does and were measured
// bit for bit too with this seed; the check allows 1e-13 relative to
// 1 + |y| so that a kernel scaling by 1/a_0 once (one extra rounding per
// coefficient, carried through at most 300 steps of a recursion whose
// poles lie inside |z| < 0.9) still passes.
func TestRunMatchesNaive(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for trial := 0; trial < 400; trial++ {
		q, p := rng.IntN(8), rng.IntN(8)
		b := randPoly(rng, q+1, 1)
		if rng.IntN(8) == 0 {
			b = nil // empty numerator: output zero
		}
		a := randStableDen(rng, p)
		if rng.IntN(3) == 0 {
			// Seasonal-looking sparse polynomials: (1 + c1 B)(1 + c12 B^s).
			sp := 2 + rng.IntN(13)
			a = make([]float64, sp+2)
			c1, cs := 0.8*(2*rng.Float64()-1), 0.8*(2*rng.Float64()-1)
			a[0], a[1], a[sp], a[sp+1] = 1, c1, cs, c1*cs
			if rng.IntN(2) == 0 {
				b = make([]float64, sp+1)
				b[0], b[sp] = 1, -0.5
			}
		}
		if rng.IntN(4) == 0 {
			s := 0.5 + rng.Float64()
			for k := range a {
				a[k] *= s
			}
		}
		x := randPoly(rng, 1+rng.IntN(300), 3)
		var xh, yh []float64
		if rng.IntN(2) == 0 {
			xh = randPoly(rng, rng.IntN(10), 1)
			yh = randPoly(rng, rng.IntN(10), 1)
		}
		want := naive(b, a, x, xh, yh)
		got := make([]float64, len(x))
		RunInit(got, b, a, x, xh, yh)
		exact := a[0] == 1
		check := func(what string, got []float64) {
			for i := range want {
				if exact && got[i] != want[i] || !exact && !(math.Abs(got[i]-want[i]) <= 1e-13*(1+math.Abs(want[i]))) {
					t.Fatalf("trial %d (b=%v a=%v) %s: y[%d] = %v, want %v", trial, b, a, what, i, got[i], want[i])
				}
			}
		}
		check("RunInit", got)
		inPlace := append([]float64(nil), x...)
		RunInit(inPlace, b, a, inPlace, xh, yh)
		check("in place", inPlace)
		if xh == nil {
			Run(got, b, a, x)
			check("Run", got)
		}
		s := NewStream(b, a, 0)
		s.SetHistory(xh, yh)
		for i, v := range x {
			got[i] = s.Step(v)
		}
		check("Stream", got)
	}
}

// TestRunScipy compares Run with scipy.signal.lfilter 1.10.1 on the
// models of testdata/scipy/golden.json (made by testdata/scipy/
// make_golden.py; delay as leading zeros of b). Tolerance as in package
// tf (respTol): 1e-12 relative to the largest value so far, because
// lfilter evaluates the same recursion in another order (transposed
// direct form II), so the two differ by rounding that grows with the
// output. Measured worst: 4.4e-15 (the high-order model), 3.3e-15 for
// the unstable one, so the margin is above 200.
func TestRunScipy(t *testing.T) {
	var g struct {
		Models []struct {
			Name   string    `json:"name"`
			Num    []float64 `json:"num"`
			Den    []float64 `json:"den"`
			Delay  int       `json:"delay"`
			Input  []float64 `json:"input"`
			Output []float64 `json:"output"`
		} `json:"models"`
	}
	testutil.ReadJSON(t, "testdata/scipy/golden.json", &g)
	// The file holds 11 models; an empty or renamed list must not pass.
	if len(g.Models) < 8 {
		t.Fatalf("golden file has %d models, want >= 8", len(g.Models))
	}
	for _, m := range g.Models {
		b := append(make([]float64, m.Delay), m.Num...)
		y := make([]float64, len(m.Input))
		Run(y, b, m.Den, m.Input)
		if e := testutil.RunningRelErr(y, m.Output); !(e <= 1e-12) {
			t.Errorf("%s: error %.3g vs scipy.signal.lfilter", m.Name, e)
		}
	}
}

func TestRunPanics(t *testing.T) {
	for name, f := range map[string]func(){
		"zero a0":      func() { Run(make([]float64, 2), []float64{1}, []float64{0, 1}, make([]float64, 2)) },
		"empty a":      func() { Run(make([]float64, 2), []float64{1}, nil, make([]float64, 2)) },
		"length":       func() { Run(make([]float64, 2), []float64{1}, []float64{1}, make([]float64, 3)) },
		"stream a0":    func() { NewStream([]float64{1}, []float64{0}, 0) },
		"stream delay": func() { NewStream([]float64{1}, []float64{1}, -1) },
	} {
		if !testutil.Panics(f) {
			t.Errorf("%s: no panic", name)
		}
	}
}

// BenchmarkRunSeasonal filters through the sparse seasonal denominator
// (1 - 0.5 B)(1 - 0.4 B^12), the shape of seasonal ARMA residual filters.
func BenchmarkRunSeasonal(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	x := randPoly(rng, 1_000_000, 1)
	y := make([]float64, len(x))
	a := make([]float64, 14)
	a[0], a[1], a[12], a[13] = 1, -0.5, -0.4, 0.2
	for n := 1000; n <= len(x); n *= 10 {
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				Run(y[:n], []float64{1}, a, x[:n])
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/sample")
		})
	}
}

// benchOrders are the benchmarked (numerator, denominator) degrees with
// stable coefficients of our own.
var benchOrders = []struct {
	name string
	b, a []float64
}{
	{"1,1", []float64{0.4, 0.2}, []float64{1, -0.7}},
	{"2,2", []float64{0.2, 0.1, 0.05}, []float64{1, -1.2, 0.5}},
	{"4,4", []float64{0.1, 0.05, -0.02, 0.01, 0.003}, []float64{1, -1.9, 1.35, -0.42, 0.048}},
}

// BenchmarkRun filters 10^3..10^7 samples; ns/sample is reported.
func BenchmarkRun(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	x := randPoly(rng, 10_000_000, 1)
	y := make([]float64, len(x))
	for _, o := range benchOrders {
		for n := 1000; n <= len(x); n *= 10 {
			b.Run(o.name+"/"+strconv.Itoa(n), func(b *testing.B) {
				b.ReportAllocs()
				b.SetBytes(int64(16 * n))
				for b.Loop() {
					Run(y[:n], o.b, o.a, x[:n])
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/sample")
			})
		}
	}
}
