package arma

import (
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/sym"
	"github.com/backshift/backshift/internal/testutil"
)

// ar1Noise and ma1Noise are the noise models phi(B) = 1 - phi B and
// theta(B) = 1 - theta B (Box-Jenkins signs).
func ar1Noise(phi float64) Noise   { return Noise{AR: sym.FromCoeffs([]float64{1, -phi})} }
func ma1Noise(theta float64) Noise { return Noise{MA: sym.FromCoeffs([]float64{1, -theta})} }

// simNoise simulates n samples of AR(1) (ar) or MA(1) noise with unit
// innovation variance, after a burn-in of 200 samples.
func simNoise(rng *rand.Rand, ar bool, coef float64, n int) []float64 {
	y := make([]float64, n)
	prevY, prevA := 0.0, 0.0
	for t := -200; t < n; t++ {
		a := rng.NormFloat64()
		v := a - coef*prevA
		if ar {
			v = coef*prevY + a
		}
		prevY, prevA = v, a
		if t >= 0 {
			y[t] = v
		}
	}
	return y
}

// residuals returns the residuals of y under the true AR(1) or MA(1)
// model, conditional on zero pre-sample values, with the first one
// NaN (the conditioning start, as a conditional least-squares fit
// leaves it).
func residuals(ar bool, coef float64, y []float64) []float64 {
	e := make([]float64, len(y))
	for t := range y {
		switch {
		case ar && t > 0:
			e[t] = y[t] - coef*y[t-1]
		case !ar && t > 0:
			e[t] = y[t] + coef*e[t-1]
		default:
			e[t] = y[t]
		}
	}
	e[0] = math.NaN()
	return e
}

// TestOutlierPatternsAR1 checks the residual patterns and the sizes of
// the four kinds for AR(1) noise against the formulas worked by hand
// from Chang, Tiao & Chen (1988, sec. 2) and Chen & Liu (1993, eq. 6-9).
//
// For phi(B) = 1 - phi B the pi weights are pi_0 = 1, pi_1 = -phi, and
// 0 beyond, so the effect x_(T+j) of a unit outlier at T on the
// residuals e_t = phi(B) y_t is:
//
//	IO: pi(B) psi(B) = 1             x = 1, 0, 0, ...
//	AO: pi(B)                        x = 1, -phi, 0, 0, ...
//	LS: pi(B) / (1 - B)              x = 1, 1 - phi, 1 - phi, ...
//	TC: pi(B) / (1 - d B)            x = 1, d - phi, d (d - phi), d^2 (d - phi), ...
//
// and the least-squares size w(T) = sum_j x_j e_(T+j) / sum_j x_j^2
// over the samples left, so (m = n - 1 - T samples after T):
//
//	IO: w = e_T                                     (CTC eq. 2.5)
//	AO: w = (e_T - phi e_(T+1)) / (1 + phi^2)        (CTC eq. 2.4, rho^2 = 1/(1 + phi^2))
//	LS: w = (e_T + (1 - phi) sum_{j=1..m} e_(T+j)) / (1 + m (1 - phi)^2)
//	TC: w = (e_T + (d - phi) sum_{j=1..m} d^(j-1) e_(T+j)) / (1 + (d - phi)^2 sum_{j<m} d^(2j))
func TestOutlierPatternsAR1(t *testing.T) {
	const phi, d, n = 0.6, 0.7, 40
	pi := []float64{1, -phi}
	rng := rand.New(rand.NewPCG(3, 4))
	e := make([]float64, n)
	for i := range e {
		e[i] = rng.NormFloat64()
	}
	sc := newScanner(e, pi, allKinds, d)
	sc.scan(1, make([]bool, n))
	hand := func(k OutlierKind, T int) float64 {
		m := n - 1 - T
		num, den := e[T], 1.0
		switch k {
		case Additive:
			if m > 0 {
				num, den = e[T]-phi*e[T+1], 1+phi*phi
			}
		case LevelShift:
			for j := 1; j <= m; j++ {
				num += (1 - phi) * e[T+j]
			}
			den += float64(m) * (1 - phi) * (1 - phi)
		case TemporaryChange:
			for j := 1; j <= m; j++ {
				x := (d - phi) * math.Pow(d, float64(j-1))
				num += x * e[T+j]
				den += x * x
			}
		}
		return num / den
	}
	for _, p := range sc.pats {
		for _, T := range []int{0, 7, 20, n - 2, n - 1} {
			got := p.num[T] / p.den[T]
			// Tolerance 1e-12 relative: the same sums in another order
			// (rounding only).
			if want := hand(p.kind, T); math.Abs(got-want) > 1e-12*math.Max(1, math.Abs(want)) {
				t.Errorf("%v at %d: size %.15g, by hand %.15g", p.kind, T, got, want)
			}
		}
	}
	// The patterns themselves, lag by lag, as in the comment above.
	want := map[OutlierKind][]float64{
		Innovational:    {1, 0, 0, 0},
		Additive:        {1, -phi, 0, 0},
		LevelShift:      {1, 1 - phi, 1 - phi, 1 - phi},
		TemporaryChange: {1, d - phi, d * (d - phi), d * d * (d - phi)},
	}
	for _, p := range sc.pats {
		for j, w := range want[p.kind] {
			if got := p.at(j); math.Abs(got-w) > 1e-15 {
				t.Errorf("%v pattern lag %d = %v, by hand %v", p.kind, j, got, w)
			}
		}
	}
}

// TestOutlierEffects checks Effect on the series scale against the
// definitions of OutlierKind (Chen & Liu 1993, eq. 2-5): AO a pulse, LS
// a step, TC d^(t-T), IO the psi weights of the noise model, here
// ARIMA(1,1,0) with psi(B) = 1 / ((1 - 0.5 B)(1 - B)), whose weights
// are psi_j = 2 - 0.5^j (partial sums of 0.5^j; by hand). Filtering an
// effect through pi(B) gives back the residual pattern times the size
// (the identity the search rests on).
func TestOutlierEffects(t *testing.T) {
	const n = 30
	r := &OutlierReport{n: n, Decay: 0.7, psiNum: []float64{1}, psiDen: []float64{1, -1.5, 0.5},
		Outliers: []Outlier{{Index: 3, Kind: Additive, Size: 2}, {Index: 5, Kind: LevelShift, Size: -1},
			{Index: 8, Kind: TemporaryChange, Size: 3}, {Index: 10, Kind: Innovational, Size: 0.5}}}
	for k, o := range r.Outliers {
		eff := r.Effect(k)
		for tt, v := range eff {
			var want float64
			j := tt - o.Index
			switch {
			case j < 0:
			case o.Kind == Additive && j == 0, o.Kind == LevelShift:
				want = o.Size
			case o.Kind == TemporaryChange:
				want = o.Size * math.Pow(0.7, float64(j))
			case o.Kind == Innovational:
				want = o.Size * (2 - math.Pow(0.5, float64(j)))
			}
			// 1e-13: a recursion of 30 steps against a closed form.
			if math.Abs(v-want) > 1e-13 {
				t.Errorf("%v effect at %d = %v, want %v", o.Kind, tt, v, want)
			}
		}
	}
	sum := r.Effects()
	if math.Abs(sum[12]-(-1+3*math.Pow(0.7, 4)+0.5*(2-0.25))) > 1e-13 {
		t.Errorf("Effects at 12 = %v", sum[12])
	}
}

// TestOutliersPlanted plants one outlier of each kind, 10 innovation
// standard deviations, in AR(1) noise and checks that each is found at
// its time with its kind and a size within 3 standard errors. (phi is
// kept away from the decay 0.7 of a temporary change: with phi near d an
// innovational outlier, psi(B) = 1/(1 - phi B), and a temporary change,
// 1/(1 - d B), have nearly the same pattern and cannot be told apart.)
func TestOutliersPlanted(t *testing.T) {
	const n, phi = 400, 0.3
	y := simNoise(rand.New(rand.NewPCG(11, 12)), true, phi, n)
	plant := []Outlier{{Index: 60, Kind: Additive, Size: 10}, {Index: 150, Kind: LevelShift, Size: -10},
		{Index: 250, Kind: TemporaryChange, Size: 10}, {Index: 330, Kind: Innovational, Size: -10}}
	psiAR := &OutlierReport{n: n, Decay: 0.7, psiNum: []float64{1}, psiDen: []float64{1, -phi}, Outliers: plant}
	eff := psiAR.Effects()
	for i := range y {
		y[i] += eff[i]
	}
	r, err := Outliers(residuals(true, phi, y), ar1Noise(phi), Poly{}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Outliers) != len(plant) {
		t.Fatalf("found %+v, planted %+v", r.Outliers, plant)
	}
	for i, o := range r.Outliers {
		p := plant[i]
		se := math.Abs(o.Size / o.T)
		if o.Index != p.Index || o.Kind != p.Kind || math.Abs(o.Size-p.Size) > 3*se {
			t.Errorf("found %+v, planted %+v (SE %.3g)", o, p, se)
		}
		if o.AtStart || o.AtEnd || o.NearGap {
			t.Errorf("%+v marked", o)
		}
	}
	if r.Critical < 4.2 || r.Critical > 4.6 || r.Tests != 4*(n-1) || !r.Robust {
		t.Errorf("critical %v tests %d robust %v", r.Critical, r.Tests, r.Robust)
	}
	// The adjusted residuals carry no outlier: a second search finds none.
	again, err := Outliers(r.Adjusted, ar1Noise(phi), Poly{}, nil)
	if err != nil || len(again.Outliers) != 0 {
		t.Errorf("second search: %+v, %v", again, err)
	}
}

// TestOutliersCritical checks the critical value against the Bonferroni
// bound of OutlierSettings.Rate, q(1 - 0.05/(2 m K)), K = 4 kinds, m
// residuals: with the robust scale q is Student's t with 0.37 m degrees
// of freedom, with Sigma given the standard normal. The reference values
// are scipy 1.10.1's t.isf and norm.isf (testdata/outliers/quantiles.json,
// made by make_quantiles.py there). Tolerances: 1e-6 where gonum's t
// quantile is used (up to 2000 degrees of freedom: two implementations
// inverting the incomplete beta function), 1e-8 beyond, where the
// Cornish-Fisher expansion is (its first omitted term is below 1e-9
// there), 1e-12 for the normal quantile. Outliers itself is run for
// m = 200 and 1000 to check that the report carries the value.
func TestOutliersCritical(t *testing.T) {
	var ref []struct {
		M, Tests int
		Rate     float64
		Robust   bool
		Value    float64
	}
	testutil.ReadJSON(t, "testdata/outliers/quantiles.json", &ref)
	if len(ref) < 10 {
		t.Fatalf("%d reference values", len(ref))
	}
	for _, c := range ref {
		tol := 1e-12
		switch {
		case c.Robust && madEfficiency*float64(c.M) <= 2000:
			tol = 1e-6
		case c.Robust:
			tol = 1e-8
		}
		if got := critical(c.Rate, c.Tests, c.M, c.Robust); math.Abs(got-c.Value) > tol {
			t.Errorf("m = %d robust %v: critical %.15g, scipy %.15g", c.M, c.Robust, got, c.Value)
		}
		if c.M > 1000 {
			continue
		}
		e := simNoise(rand.New(rand.NewPCG(1, 1)), false, 0, c.M)
		set := &OutlierSettings{}
		if !c.Robust {
			set.Sigma = 1
		}
		r, err := Outliers(e, Noise{}, Poly{}, set)
		if err != nil {
			t.Fatal(err)
		}
		if r.Tests != c.Tests || math.Abs(r.Critical-c.Value) > tol || r.Robust != c.Robust {
			t.Errorf("m = %d robust %v: report critical %.12g over %d tests, want %.12g over %d", c.M, c.Robust, r.Critical, r.Tests, c.Value, c.Tests)
		}
	}
}

// TestOutliersFFT checks the FFT path of the cross-correlations against
// direct sums, for MA(1) noise with theta = 0.95, whose pi weights 0.95^j
// need about 450 lags to fall below 1e-10 (far beyond directMax), with
// gaps in the residuals.
func TestOutliersFFT(t *testing.T) {
	const n, theta = 700, 0.95
	rng := rand.New(rand.NewPCG(5, 6))
	e := make([]float64, n)
	for i := range e {
		e[i] = rng.NormFloat64()
		if i%97 == 13 || (i > 300 && i < 310) {
			e[i] = math.NaN()
		}
	}
	pi := make([]float64, n)
	for j := range pi {
		pi[j] = math.Pow(theta, float64(j))
	}
	sc := newScanner(e, pi, allKinds, 0.7)
	if sc.fft == nil {
		t.Fatalf("trunc %d: FFT path not taken", sc.trunc)
	}
	sc.scan(1, make([]bool, n))
	for _, p := range sc.pats {
		for _, T := range []int{0, 1, 150, 299, 310, n - 3, n - 1} {
			num, den := 0.0, 0.0
			for tt := T; tt < n; tt++ {
				if !math.IsNaN(e[tt]) {
					h := p.at(tt - T)
					num += h * e[tt]
					den += h * h
				}
			}
			// 1e-10: FFT rounding (about 1e-16 times log2 of the size
			// times the norms) against sums of magnitude 1 to 100.
			if math.Abs(p.num[T]-num) > 1e-10*math.Max(1, math.Abs(num)) || math.Abs(p.den[T]-den) > 1e-10*den {
				t.Errorf("%v at %d: FFT %v / %v, direct %v / %v", p.kind, T, p.num[T], p.den[T], num, den)
			}
		}
	}
}

// TestOutliersEdges: an outlier in the last samples is marked AtEnd (and
// one beside a gap NearGap), and the kind there is the stronger one.
func TestOutliersEdges(t *testing.T) {
	const n, phi = 300, 0.5
	y := simNoise(rand.New(rand.NewPCG(21, 22)), true, phi, n)
	y[n-2] += 10
	y[120] -= 10
	e := residuals(true, phi, y)
	for i := 123; i < 130; i++ {
		e[i] = math.NaN()
	}
	r, err := Outliers(e, ar1Noise(phi), Poly{}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Outliers) != 2 {
		t.Fatalf("found %+v", r.Outliers)
	}
	gap, end := r.Outliers[0], r.Outliers[1]
	if gap.Index != 120 || !gap.NearGap || gap.AtEnd || gap.Kind != Additive {
		t.Errorf("near the gap: %+v", gap)
	}
	if end.Index != n-2 || !end.AtEnd || end.NearGap {
		t.Errorf("at the end: %+v", end)
	}
	if !math.IsNaN(r.Adjusted[125]) || math.IsNaN(r.Adjusted[200]) {
		t.Errorf("adjusted residuals lose the gaps")
	}
}

// TestOutliersBadInput: each bad argument gets its typed error.
func TestOutliersBadInput(t *testing.T) {
	good := make([]float64, 50)
	for i := range good {
		good[i] = math.Sin(float64(i))
	}
	inf := append([]float64(nil), good...)
	inf[7] = math.Inf(1)
	cases := []struct {
		name  string
		run   func() error
		kind  error
		words string
	}{
		{"non-invertible MA", func() error { _, err := Outliers(good, ma1Noise(1.2), Poly{}, nil); return err }, ErrModel, "not invertible"},
		{"infinite residual", func() error { _, err := Outliers(inf, Noise{}, Poly{}, nil); return err }, ErrSample, "sample 7"},
		{"too few", func() error { _, err := Outliers(good[:9], Noise{}, Poly{}, nil); return err }, ErrShort, "9 samples, at least 10"},
		{"all zero", func() error { _, err := Outliers(make([]float64, 20), Noise{}, Poly{}, nil); return err }, ErrConstant, "no scale"},
		{"decay", func() error { _, err := Outliers(good, Noise{}, Poly{}, &OutlierSettings{Decay: 1}); return err }, ErrSetting, "OutlierSettings.Decay"},
		{"kind twice", func() error {
			_, err := Outliers(good, Noise{}, Poly{}, &OutlierSettings{Kinds: []OutlierKind{Additive, Additive}})
			return err
		}, ErrSetting, "Kinds[1]"},
		{"rate", func() error { _, err := Outliers(good, Noise{}, Poly{}, &OutlierSettings{Rate: 2}); return err }, ErrSetting, "OutlierSettings.Rate"},
		{"pi", func() error { _, err := OutliersPi(good, []float64{2}, nil); return err }, ErrModel, "pi_0 = 1"},
	}
	for _, c := range cases {
		err := c.run()
		if !errors.Is(err, c.kind) || !strings.Contains(err.Error(), c.words) || !strings.HasPrefix(err.Error(), "arma.Outliers") {
			t.Errorf("%s: %v", c.name, err)
		}
	}
	if _, err := Outliers(good, Noise{}, Poly{}, nil); err != nil {
		t.Errorf("good input: %v", err)
	}
}

// BenchmarkOutliers times the whole search (passes, joint stage) on
// ARMA(1,1) noise (phi = 0.7, theta = 0.6, so the TC pattern needs about
// 65 lags and the FFT path is taken) with five planted additive
// outliers of 10 innovation sd.
func BenchmarkOutliers(b *testing.B) {
	for _, n := range []int{1000, 10000, 100000} {
		rng := rand.New(rand.NewPCG(9, 9))
		y := simNoise(rng, false, 0.6, n) // MA(1) part, then the AR(1) filter
		for t := 1; t < n; t++ {
			y[t] += 0.7 * y[t-1]
		}
		for k := 1; k <= 5; k++ {
			y[k*n/6] += 10
		}
		e := make([]float64, n)
		for t := range y {
			e[t] = y[t]
			if t > 0 {
				e[t] += -0.7*y[t-1] + 0.6*e[t-1]
			}
		}
		noise := Noise{AR: sym.FromCoeffs([]float64{1, -0.7}), MA: sym.FromCoeffs([]float64{1, -0.6})}
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				r, err := Outliers(e, noise, Poly{}, nil)
				if err != nil || len(r.Outliers) < 5 {
					b.Fatalf("%d outliers found of 5 planted, %v", len(r.Outliers), err)
				}
			}
		})
	}
}

// FuzzOutliers: a short residual series with hostile values (NaN gaps,
// +-Inf, 1e300, constant runs) and a random ARMA(1,1) noise with
// differencing gives a typed error or a report whose sizes, t-statistics
// and adjusted residuals are finite (NaN only where the residuals are),
// never a panic; the residuals are not modified.
func FuzzOutliers(f *testing.F) {
	f.Add([]byte{10, 3, 10, 40, 10, 250, 10, 7, 10, 100, 10, 33, 10, 1, 10, 200, 10, 9, 10, 90, 10, 5, 10, 77}, int8(50), int8(-30), false)
	f.Add([]byte{5, 0, 5, 0, 5, 0, 5, 0, 5, 0, 5, 0, 0, 0, 10, 200, 10, 1, 10, 2, 10, 3, 10, 4}, int8(0), int8(0), true)
	f.Add([]byte{10, 3, 0, 40, 10, 250, 3, 7, 10, 100, 10, 33, 10, 3, 10, 4, 10, 5, 10, 6}, int8(127), int8(-128), true)
	f.Fuzz(func(t *testing.T, data []byte, ar, ma int8, diff bool) {
		e := fuzzSeries(data)
		keep := append([]float64(nil), e...)
		noise := Noise{AR: sym.FromCoeffs([]float64{1, float64(ar) / 100}), MA: sym.FromCoeffs([]float64{1, float64(ma) / 100})}
		var d Poly
		if diff {
			d = sym.FromCoeffs([]float64{1, -1})
		}
		r, err := Outliers(e, noise, d, &OutlierSettings{MaxCount: 5})
		for i := range e {
			if e[i] != keep[i] && !(math.IsNaN(e[i]) && math.IsNaN(keep[i])) {
				t.Fatalf("residuals modified at %d", i)
			}
		}
		if err != nil {
			for _, k := range []error{ErrModel, ErrSample, ErrShort, ErrConstant, ErrSetting} {
				if errors.Is(err, k) {
					return
				}
			}
			t.Fatalf("untyped error %T: %v", err, err)
		}
		for _, o := range r.Outliers {
			if math.IsNaN(o.Size) || math.IsInf(o.Size, 0) || math.IsNaN(o.T) || math.IsInf(o.T, 0) {
				t.Fatalf("outlier %+v not finite", o)
			}
		}
		for i, v := range r.Adjusted {
			if math.IsNaN(v) != math.IsNaN(e[i]) || math.IsInf(v, 0) {
				t.Fatalf("adjusted residual %d = %v (residual %v)", i, v, e[i])
			}
		}
		for k := range r.Outliers {
			for _, v := range r.Effect(k) {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("effect of %+v not finite", r.Outliers[k])
				}
			}
		}
	})
}
