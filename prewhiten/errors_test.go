package prewhiten_test

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/prewhiten"
)

func TestBadInput(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	x := make([]float64, 80)
	y := make([]float64, 80)
	for i := range x {
		x[i] = rng.NormFloat64()
		y[i] = rng.NormFloat64()
	}
	keep := append([]float64(nil), x...)
	s := &prewhiten.Settings{Name: "burner"}

	var le *prewhiten.SeriesError
	if _, err := prewhiten.Pair(x, y[:70], "temp", s); !errors.As(err, &le) || !errors.Is(err, prewhiten.ErrLength) || le.Series != "temp" || le.Have != 70 || le.Need != 80 ||
		err.Error() != `prewhiten.Pair: series "temp" has 70 samples, 80 expected (the length of input "burner"; input and output must be of equal length)` {
		t.Errorf("unequal lengths: %v", err)
	}
	nan := append([]float64(nil), y...)
	nan[33] = math.NaN()
	var ve *prewhiten.SampleError
	if _, err := prewhiten.Pair(x, nan, "temp", s); !errors.As(err, &ve) || ve.Series != "temp" || ve.Index != 33 || ve.Op != "prewhiten.Pair" || !errors.Is(err, prewhiten.ErrSample) {
		t.Errorf("NaN in output: %v", err)
	}
	inf := append([]float64(nil), x...)
	inf[5] = math.Inf(1)
	if _, err := prewhiten.Fit(inf, s); !errors.As(err, &ve) || ve.Series != "burner" || ve.Index != 5 || ve.Op != "prewhiten.Fit" {
		t.Errorf("Inf in input: %v", err)
	}
	var se *prewhiten.SeriesError
	if _, err := prewhiten.Fit(x[:6], &prewhiten.Settings{Name: "burner", MaxOrder: 5}); !errors.As(err, &se) || se.Series != "burner" || !errors.Is(err, prewhiten.ErrShort) ||
		err.Error() != `prewhiten.Fit: series "burner": 6 samples, at least 7 needed (for the prewhitening autoregression)` {
		t.Errorf("too short: %v", err)
	}
	var ce *prewhiten.SeriesError
	ramp := make([]float64, 50)
	for i := range ramp {
		ramp[i] = 3 + 2*float64(i)
	}
	if _, err := prewhiten.Fit(ramp, &prewhiten.Settings{Name: "ramp", Diff: []float64{1, -1}}); !errors.As(err, &ce) || ce.Series != "ramp" || !errors.Is(err, prewhiten.ErrConstant) ||
		err.Error() != `prewhiten.Fit: series "ramp" is constant (after the differencing (1 - B) every sample is 2: its levels lie on a straight line or repeat; use less differencing)` {
		t.Errorf("constant after differencing: %v", err)
	}
	var ae *prewhiten.SettingError
	if _, err := prewhiten.Fit(x, &prewhiten.Settings{Diff: []float64{2, -1}}); !errors.As(err, &ae) ||
		err.Error() != `prewhiten.Fit: Settings.Diff = "(2 - B)": must be a polynomial with constant term 1` {
		t.Errorf("bad differencing: %v", err)
	}
	if _, err := prewhiten.Fit(x, &prewhiten.Settings{MaxOrder: -1}); !errors.As(err, &ae) || ae.Setting != "Settings.MaxOrder" || !errors.Is(err, prewhiten.ErrSetting) {
		t.Errorf("negative order: %v", err)
	}
	bad := arma.Model{MA: []float64{1.5}}
	if _, err := prewhiten.Fit(x, &prewhiten.Settings{ARMA: &bad}); !errors.As(err, &ae) || ae.Setting != "Settings.ARMA" {
		t.Errorf("non-invertible MA filter: %v", err)
	}
	f, err := prewhiten.Fit(x, s)
	if err != nil {
		t.Fatal(err)
	}
	if _, _, err := f.Apply(nan, "temp"); !errors.As(err, &ve) || ve.Index != 33 || ve.Op != "prewhiten.Filter.Apply" {
		t.Errorf("Apply NaN: %v", err)
	}
	if _, err := prewhiten.IdentifyNoise(context.Background(), nan, nil); !errors.As(err, &ve) || ve.Index != 33 || ve.Op != "prewhiten.IdentifyNoise" {
		t.Errorf("IdentifyNoise NaN: %v", err)
	}
	lead := append([]float64{math.NaN(), math.NaN()}, y[:10]...)
	if _, err := prewhiten.IdentifyNoise(context.Background(), lead, nil); !errors.As(err, &se) {
		t.Errorf("IdentifyNoise short: %v", err)
	}
	for i := range keep {
		if keep[i] != x[i] {
			t.Fatal("input modified")
		}
	}
}

// TestNotWhite: an AR(2) input with the order bound held at 1 is not
// whitened, and Pair says so with the result attached.
func TestNotWhite(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 1))
	n := 600
	x := make([]float64, n)
	for i := 2; i < n; i++ {
		x[i] = 1.2*x[i-1] - 0.6*x[i-2] + rng.NormFloat64()
	}
	// 1.2, -0.6: an AR(1) fit leaves strong lag-2 correlation.
	res, err := prewhiten.Pair(x, x, "y", &prewhiten.Settings{MaxOrder: 1, KeepAR: true})
	var nw *prewhiten.NotWhiteError
	if !errors.As(err, &nw) || res == nil || res.White || !errors.Is(err, prewhiten.ErrModel) || nw.Op != "prewhiten.Pair" ||
		!strings.HasPrefix(err.Error(), `prewhiten.Pair: series "x" is not white after prewhitening: Ljung-Box Q = `) {
		t.Fatalf("want a NotWhiteError with the result, got %v", err)
	}
	t.Log(err)
	if res, err := prewhiten.Pair(x, x, "y", nil); err != nil || !res.White || res.Filter.Order() < 2 {
		t.Errorf("default order bound: %v", err)
	}
}

// TestARMAFilter: a caller-given ARMA(1,1) filter applied to the series
// it describes returns (nearly) the innovations: after the start-up, the
// filtered series equals the innovations the series was built from.
func TestARMAFilter(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 4))
	n := 300
	a := make([]float64, n)
	x := make([]float64, n)
	for i := range a {
		a[i] = rng.NormFloat64()
	}
	// (1 - 0.6 B) x = (1 - 0.3 B) a  (Box-Jenkins signs: phi1 0.6, theta1 0.3)
	for i := range x {
		x[i] = a[i]
		if i > 0 {
			x[i] += 0.6*x[i-1] - 0.3*a[i-1]
		}
	}
	m := arma.Model{AR: []float64{0.6}, MA: []float64{0.3}}
	f, err := prewhiten.Fit(x, &prewhiten.Settings{ARMA: &m})
	if err != nil {
		t.Fatal(err)
	}
	out, start, err := f.Apply(x, "x")
	if err != nil {
		t.Fatal(err)
	}
	// Apply removes the sample mean and starts the MA recursion at zero;
	// both effects decay as 0.3^t (and the mean offset is tiny), so after
	// 40 samples the difference is below 1e-2 of the innovation scale.
	mean := 0.0
	for _, v := range x {
		mean += v
	}
	mean /= float64(n)
	shift := mean * (1 - 0.6) / (1 - 0.3)
	for i := start + 40; i < n; i++ {
		if math.Abs(out[i]+shift-a[i]) > 1e-2 {
			t.Fatalf("index %d: filtered %g, innovation %g", i, out[i]+shift, a[i])
		}
	}
	if got := f.String(); got != "(1 - 0.6 B) / (1 - 0.3 B) x" {
		t.Errorf("String() = %q", got)
	}
}

// TestARIMAFallback: an integrated input with a strong MA term,
// (1 - B) x = (1 - 0.85 B) a, is not whitened by an AR of order <= 2; Pair
// falls back to an ARIMA(1,1,1) filter that whitens it, and with KeepAR
// reports the failure instead.
func TestARIMAFallback(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 8))
	n := 800
	x := make([]float64, n)
	prev := 0.0
	for i := 1; i < n; i++ {
		a := rng.NormFloat64()
		x[i] = x[i-1] + a - 0.85*prev
		prev = a
	}
	var nw *prewhiten.NotWhiteError
	if _, err := prewhiten.Pair(x, x, "y", &prewhiten.Settings{MaxOrder: 2, KeepAR: true}); !errors.As(err, &nw) {
		t.Fatalf("AR(<=2) only: want NotWhiteError, got %v", err)
	}
	res, err := prewhiten.Pair(x, x, "y", &prewhiten.Settings{MaxOrder: 2})
	if err != nil {
		t.Fatalf("with the ARIMA fallback: %v", err)
	}
	// Either fallback may win (ARIMA(1,1,1), or ARIMA(1,0,1) with its AR
	// root near 1): both carry the MA term the AR could not.
	if len(res.Filter.MA) != 2 || !res.White {
		t.Errorf("fallback filter %v, white %v", res.Filter, res.White)
	}
	t.Logf("fallback filter %v (Ljung-Box p = %.3f)", res.Filter, res.Check.P)
}

// TestHostileSettings feeds settings and hand-built filters that used to
// panic or give unbounded numbers: each must come back as a typed error,
// and the series must be left as they were.
func TestHostileSettings(t *testing.T) {
	x := make([]float64, 200)
	y := make([]float64, 200)
	for i := 1; i < len(x); i++ {
		x[i] = 0.7*x[i-1] + math.Sin(float64(i)*1.3)
		y[i] = 0.5*x[i-1] + 0.2*math.Cos(float64(i)*0.7)
	}
	x0 := append([]float64(nil), x...)
	y0 := append([]float64(nil), y...)
	var se *prewhiten.SeriesError
	long := make([]float64, 300) // (1 - B^299), longer than the series
	long[0], long[299] = 1, -1
	if _, err := prewhiten.Fit(x, &prewhiten.Settings{Diff: long}); !errors.As(err, &se) || se.Need != 302 {
		t.Errorf("differencing longer than the series: %v", err)
	}
	if _, err := prewhiten.Fit(x, &prewhiten.Settings{MaxOrder: math.MaxInt}); !errors.As(err, &se) || se.Need < len(x) {
		t.Errorf("MaxOrder = MaxInt: %v", err)
	}
	if _, err := prewhiten.Pair(x, y, "y", &prewhiten.Settings{Lags: math.MaxInt}); !errors.As(err, &se) || se.Need < len(x) {
		t.Errorf("Lags = MaxInt: %v", err)
	}
	var ae *prewhiten.SettingError
	if _, err := prewhiten.Fit(x, &prewhiten.Settings{ARMA: &arma.Model{AR: []float64{math.NaN()}}}); !errors.As(err, &ae) ||
		err.Error() != "prewhiten.Fit: Settings.ARMA = a NaN or infinite coefficient, Mean or Sigma2: must be finite values" {
		t.Errorf("caller's ARMA with a NaN coefficient: %v", err)
	}
	f, err := prewhiten.Fit(x, nil)
	if err != nil {
		t.Fatal(err)
	}
	for name, g := range map[string]prewhiten.Filter{
		"zero value":        {},
		"NaN in AR":         {Diff: []float64{1}, AR: []float64{1, math.NaN()}, MA: []float64{1}},
		"AR leading 2":      {Diff: []float64{1}, AR: []float64{2, 0.5}, MA: []float64{1}},
		"non-invertible MA": {Diff: []float64{1}, AR: f.AR, MA: []float64{1, 3}}, // root B = -1/3
	} {
		if _, _, err := g.Apply(y, "y"); !errors.As(err, &ae) {
			t.Errorf("Apply with a filter %s: %v", name, err)
		}
	}
	for i := range x {
		if x[i] != x0[i] || y[i] != y0[i] {
			t.Fatalf("series modified at %d", i)
		}
	}
}

// TestZeroFilter: the zero Filter reports order 0 and start 0 (nil
// polynomials count as {1}, as documented; was -1 and -2), and Apply
// rejects it with a *SettingError naming Filter.Diff.
func TestZeroFilter(t *testing.T) {
	var f prewhiten.Filter
	if f.Order() != 0 || f.Start() != 0 {
		t.Errorf("zero Filter: order %d, start %d; want 0 and 0", f.Order(), f.Start())
	}
	f.AR = []float64{1, -0.5}
	if f.Order() != 1 || f.Start() != 1 {
		t.Errorf("AR only: order %d, start %d; want 1 and 1", f.Order(), f.Start())
	}
	var ae *prewhiten.SettingError
	if _, _, err := (prewhiten.Filter{}).Apply([]float64{1, 2, 3}, "y"); !errors.As(err, &ae) || ae.Setting != "Filter.Diff" ||
		err.Error() != "prewhiten.Filter.Apply: Filter.Diff = nil: must be a polynomial with constant term 1 ({1} for none)" {
		t.Errorf("Apply of the zero Filter: %v", err)
	}
}
