package arma

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/sym"
)

// hostileCase is one hostile call: err is its error, want the type's name
// and sub a substring the message must hold.
type hostileCase struct {
	name string
	err  error
	want string // "setting", "model", "overflow", "short", "data"
	sub  string
}

func checkHostile(t *testing.T, cases []hostileCase) {
	t.Helper()
	for _, c := range cases {
		kinds := map[string]error{"setting": ErrSetting, "model": ErrModel, "overflow": ErrOverflow, "short": ErrShort, "data": ErrSample}
		ok := c.err != nil && kindOf(c.err) == kinds[c.want]
		if !ok || !strings.Contains(c.err.Error(), c.sub) {
			t.Errorf("%s: got %T %v, want a %s error containing %q", c.name, c.err, c.err, c.want, c.sub)
		}
	}
}

// catch runs f and turns a panic into an error, so that a table row
// fails instead of the whole test.
func catch(f func() error) (err error) {
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("panic: %v", r)
		}
	}()
	return f()
}

// TestHostileOrders: orders whose degree overflows int (SP*Period wraps
// negative), negative differencing and huge periods in a Model are
// typed errors, with no panic and no attempt to allocate them.
func TestHostileOrders(t *testing.T) {
	y := make([]float64, 100)
	for i := range y {
		y[i] = math.Sin(float64(i) * 0.7)
	}
	checkHostile(t, []hostileCase{
		{"Order SP*Period overflow", catch(func() error { return Order{SP: 2, Period: 1 << 62}.validate() }), "setting", "order = (0,0,0)x(2,0,0)_4611686018427387904: a polynomial's degree is above MaxLag = 256"},
		{"Order P MaxInt + seasonal", catch(func() error { return Order{P: math.MaxInt, SP: 1, Period: 2}.validate() }), "setting", "a polynomial's degree is above MaxLag = 256"},
		{"Simulate overflow", catch(func() error {
			_, err := Simulate(Model{SAR: []float64{0.1, 0.1}, Period: 1 << 62}, 3, nil)
			return err
		}), "setting", "arma.Simulate: order = (0,0,0)x(2,0,0)_4611686018427387904: a polynomial's degree is above MaxLag"},
		{"Select overflow", catch(func() error { _, err := Select(nil, y, Grid{SP: 2, Period: 1 << 62}, nil); return err }), "setting", "arma.Select: Grid = (0,0,0)x(2,0,0)_4611686018427387904: a polynomial's degree is above MaxLag"},
		{"Model.Psi D<0", catch(func() error { _, err := Model{D: -1}.Psi(3); return err }), "setting", "arma.Model.Psi: order = (0,-1,0): orders must not be negative"},
		{"Model.Psi huge D", catch(func() error { _, err := Model{D: 1 << 40}.Psi(3); return err }), "setting", "arma.Model.Psi: order = (0,1099511627776,0): a polynomial's degree is above MaxLag"},
		{"Model.Pi huge Period", catch(func() error { _, err := Model{SAR: []float64{0.5}, Period: 1 << 40}.Pi(3); return err }), "setting", "arma.Model.Pi: order = (0,0,0)x(1,0,0)_1099511627776: a polynomial's degree is above MaxLag"},
		{"Stationary huge Period", catch(func() error {
			_, _, err := Model{SAR: []float64{0.5}, Period: 1 << 40}.Stationary()
			return err
		}), "setting", "arma.Model.Stationary: order = (0,0,0)x(1,0,0)_1099511627776: a polynomial's degree is above MaxLag"},
		{"Stationary Period<0", catch(func() error { _, _, err := Model{SAR: []float64{0.5}, Period: -3}.Stationary(); return err }), "setting", "arma.Model.Stationary: order = (0,0,0)x(1,0,0)_-3: a seasonal part needs Period >= 2"},
		{"Invertible Period<0", catch(func() error { _, _, err := Model{SMA: []float64{0.5}, Period: -3}.Invertible(); return err }), "setting", "arma.Model.Invertible: order = (0,0,0)x(0,0,1)_-3: a seasonal part needs Period >= 2"},
	})
	for name, p := range map[string][]float64{
		"DiffPoly D<0":       catchPoly(func() []float64 { return Model{D: -1}.DiffPoly() }),
		"DiffPoly Period<0":  catchPoly(func() []float64 { return Model{SD: 1, Period: -2}.DiffPoly() }),
		"ARPoly Period<0":    catchPoly(func() []float64 { return Model{SAR: []float64{1}, Period: -2}.ARPoly() }),
		"MAPoly huge Period": catchPoly(func() []float64 { return Model{SMA: []float64{1}, Period: 1 << 40}.MAPoly() }),
	} {
		if p != nil {
			t.Errorf("%s = %v, want nil for invalid orders", name, p)
		}
	}
	if c := (Model{D: -1, Mean: 1}).EquationConstant(); !math.IsNaN(c) {
		t.Errorf("Constant of an invalid model = %v, want NaN", c)
	}
}

func catchPoly(f func() []float64) (p []float64) {
	defer func() {
		if recover() != nil {
			p = []float64{math.NaN()} // a panic: not nil, so the row fails
		}
	}()
	return f()
}

// TestHostileLags: huge lags, orders and starts give ShortErrors with
// the right positive Need (no overflow of lag+1), Hannan-Rissanen with p
// or q = MaxInt gives a typed error and names a negative longAR, and an
// unknown ConstantRule is a *SettingError.
func TestHostileLags(t *testing.T) {
	y := make([]float64, 200)
	for i := range y {
		y[i] = math.Sin(float64(i)*0.7) + 0.1*float64(i%5)
	}
	maxS := itoa(math.MaxInt)
	short := func(err error) error {
		var e *SeriesError
		if errors.As(err, &e) && e.Need <= e.Have {
			return errors.New("Need " + itoa(e.Need) + " not above N: " + err.Error())
		}
		return err
	}
	hr := func(p, q, long int) error {
		return catch(func() error { _, _, err := HannanRissanen(y, p, q, long); return short(err) })
	}
	checkHostile(t, []hostileCase{
		{"ACF MaxInt", short(catch(func() error { _, err := ACF(y, math.MaxInt); return err })), "short", "at least " + maxS + " needed"},
		{"PACF MaxInt", short(catch(func() error { _, err := PACF(y, math.MaxInt); return err })), "short", "at least " + maxS + " needed"},
		{"LjungBox MaxInt", short(catch(func() error { _, err := LjungBox(y, math.MaxInt, 0); return err })), "short", "at least " + maxS + " needed"},
		{"HR p MaxInt", hr(math.MaxInt, 1, 0), "short", "at least " + maxS + " needed (needed for a Hannan-Rissanen start of an ARMA(" + maxS + ",1))"},
		{"HR q MaxInt", hr(1, math.MaxInt, 0), "short", "at least " + maxS + " needed"},
		{"HR longAR MaxInt", hr(1, 1, math.MaxInt), "short", "at least " + maxS + " needed"},
		{"HR longAR < 0", hr(1, 1, -5), "setting", "arma.HannanRissanen: longAR = -5: must not be negative (zero means the default)"},
		{"Fit Start MaxInt", short(catch(func() error { _, err := Fit(nil, y, Order{P: 1}, &FitSettings{First: math.MaxInt}); return err })), "short", "at least " + maxS + " needed"},
		{"Fit Mean 99", catch(func() error { _, err := Fit(nil, y, Order{P: 1}, &FitSettings{Constant: 99}); return err }), "setting", "arma.Fit: FitSettings.Constant = 99: unknown ConstantRule"},
		{"Fit Mean -1", catch(func() error { _, err := Fit(nil, y, Order{P: 1}, &FitSettings{Constant: -1}); return err }), "setting", "arma.Fit: FitSettings.Constant = -1: unknown ConstantRule"},
	})
}

// TestHostileSizes: horizons, weight counts and sample counts of 1<<40
// or math.MaxInt are typed errors (no attempt to allocate them), the
// largest horizon, MaxHorizon, is accepted (the integration of the state
// is O(h)), and Forecast on a nil or zero Result is a typed error.
func TestHostileSizes(t *testing.T) {
	y := make([]float64, 200)
	for i := range y {
		y[i] = math.Sin(float64(i)*0.7) + 0.1*float64(i%5)
	}
	res, err := Fit(nil, y, Order{P: 1, D: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	fc := func(r *Result, h int) error {
		return catch(func() error { _, err := r.Forecast(h, 0, nil); return err })
	}
	longDiff := make([]float64, 1<<12)
	longDiff[0], longDiff[len(longDiff)-1] = 1, -1
	checkHostile(t, []hostileCase{
		{"Forecast 1<<40", fc(res, 1<<40), "setting", "arma.Result.Forecast: steps = 1099511627776: must be in 1..MaxHorizon = 65536"},
		{"Forecast MaxInt", fc(res, math.MaxInt), "setting", "MaxHorizon"},
		{"Forecast nil", fc(nil, 3), "model", "arma.Result.Forecast: result: Forecast needs a result of Fit or FitNoise"},
		{"Forecast zero", fc(&Result{}, 3), "model", "arma.Result.Forecast: result: Forecast needs a result of Fit or FitNoise"},
		{"Psi 1<<40", catch(func() error { _, err := Psi([]float64{1}, nil, 1<<40); return err }), "setting", "arma.Psi: n = 1099511627776: must be in 0..MaxHorizon = 65536"},
		{"Pi MaxInt", catch(func() error { _, err := Pi(nil, []float64{1}, math.MaxInt); return err }), "setting", "arma.Pi: n = 9223372036854775807: must be in 0..MaxHorizon"},
		{"Psi long ar", catch(func() error { _, err := Psi(longDiff, nil, 3); return err }), "model", "arma.Psi: ar/ma: polynomial degree above 2 MaxLag = 512"},
		{"Simulate 1<<40", catch(func() error { _, err := Simulate(Model{Sigma2: 1}, 1<<40, nil); return err }), "setting", "arma.Simulate: n = 1099511627776: must be in 0..MaxSamples = 67108864"},
		{"Simulate MaxInt", catch(func() error { _, err := Simulate(Model{Sigma2: 1}, math.MaxInt, nil); return err }), "setting", "MaxSamples"},
		{"Simulate BurnIn MaxInt", catch(func() error {
			_, err := Simulate(Model{Sigma2: 1}, 5, &SimSettings{BurnIn: math.MaxInt})
			return err
		}), "setting", "arma.Simulate: SimSettings.BurnIn = " + itoa(math.MaxInt) + ": above MaxSamples"},
		{"FitNoise long diff", catch(func() error { _, err := FitNoise(nil, y, Noise{}, longDiff, nil); return err }), "model", "arma.FitNoise: diff: degree 4095 above MaxLag = 256"},
	})
	// The largest horizon itself is accepted (its cost, O(h), is
	// measured by BenchmarkForecastMaxHorizon, not timed here).
	if err := fc(res, MaxHorizon); err != nil {
		t.Fatal(err)
	}
}

// TestHostileOverflow: explosive polynomials, a non-stationary
// simulation without burn-in, a huge mean and a forecast from an
// explosive fitted AR part are typed errors, never +-Inf results.
func TestHostileOverflow(t *testing.T) {
	_, res := hostileExplosive(t)
	checkHostile(t, []hostileCase{
		// 10^309 overflows: weight 309 of 1/(1 - 10B) is the first +Inf.
		{"Psi explosive", catch(func() error { _, err := Psi([]float64{1, -10}, nil, 400); return err }), "overflow", "arma.Psi: series \"weights\": result out of float64 range (weight 309 of ar overflows"},
		// By hand: the pi weights of 1/(1 - 2B) are 2^j, and 2^1024 is the
		// first power of two above MaxFloat64 = (2 - 2^-52) 2^1023.
		{"Pi non-invertible", catch(func() error { _, err := Pi([]float64{1}, []float64{1, -2}, 2000); return err }), "overflow", "weight 1024 of ma overflows"},
		{"Model.Psi explosive", catch(func() error { _, err := (Model{AR: []float64{10}}).Psi(400); return err }), "overflow", "arma.Model.Psi: series \"weights\": result out of float64 range (weight 309 of ar overflows"},
		{"Simulate explosive", catch(func() error {
			_, err := Simulate(Model{AR: []float64{1.5}, Sigma2: 1}, 5000, &SimSettings{BurnIn: -1})
			return err
		}), "overflow", "the simulated series overflows at sample"},
		// By hand: with D = 2, y_1 = w_1 + 2 y_0 holds about 3e308.
		{"Simulate huge mean", catch(func() error { _, err := Simulate(Model{Mean: 1e308, D: 2, Sigma2: 1}, 50, nil); return err }), "overflow", "overflows at sample 1 "},
		{"Forecast explosive", fc1000(res), "overflow", "arma.Result.Forecast: series \"forecast\": result out of float64 range (the forecast overflows at step"},
	})
	// Finite requests are unchanged.
	if _, err := Psi([]float64{1, -10}, nil, 300); err != nil {
		t.Errorf("Psi of 300 weights: %v", err)
	}
	if _, err := res.Forecast(10, 0, nil); err != nil {
		t.Errorf("Forecast of 10 steps: %v", err)
	}
}

func fc1000(r *Result) error {
	return catch(func() error { _, err := r.Forecast(1000, 0, nil); return err })
}

// TestHostileStructs: an ARFit or Result built by hand (or nil) made Poly,
// Residuals, LjungBox, String and Constant panic with an index out of
// range or a nil dereference.
func TestHostileStructs(t *testing.T) {
	var poly, resid []float64
	err := catch(func() error {
		poly = ARFit{Order: 0, Phi: []float64{0.5, 0.2}}.Poly()
		resid = ARFit{Order: 0, Phi: []float64{0.5}}.Residuals([]float64{1, 2})
		_ = ARFit{Order: -1}.Poly()
		return nil
	})
	// By hand: e_1 = x_1 - 0.5 x_0 = 2 - 0.5 = 1.5 (Mean 0).
	if err != nil || len(poly) != 3 || poly[1] != -0.5 || poly[2] != -0.2 || !math.IsNaN(resid[0]) || resid[1] != 1.5 {
		t.Errorf("hand-built ARFit: err %v, Poly %v, Residuals %v; want {1, -0.5, -0.2} and {NaN, 1.5}", err, poly, resid)
	}
	var nilRes *Result
	checkHostile(t, []hostileCase{
		{"LjungBox nil", catch(func() error { _, err := nilRes.LjungBox(3); return err }), "model", "arma.Result.LjungBox: result: LjungBox needs a result of Fit or FitNoise"},
		{"LjungBox Start", catch(func() error { _, err := (&Result{Start: 5}).LjungBox(3); return err }), "model", "arma.Result.LjungBox: result: LjungBox needs a result of Fit or FitNoise"},
	})
	if err := catch(func() error {
		if s := nilRes.String(); s != "<nil arma.Result>" {
			return errors.New("String = " + s)
		}
		if c, se := nilRes.EquationConstant(); !math.IsNaN(c) || !math.IsNaN(se) {
			return errors.New("Constant not NaN")
		}
		return nil
	}); err != nil {
		t.Error("nil Result:", err)
	}
}

// The overflow step is the first non-finite value of any field: here the
// interval overflows long before the mean (by hand, for phi1 = 3: the mean
// grows as 3^h and overflows near h = 308/log10(3) = 646, the variance
// sums 9^j and overflows near half that).
func TestHostileForecastFirstStep(t *testing.T) {
	_, res := hostileExplosive(t)
	f, err := res.Forecast(1000, 0, nil)
	want := -1
	for h := range f.SE {
		if math.IsInf(f.SE[h], 0) || math.IsInf(f.Mean[h], 0) || math.IsNaN(f.Mean[h]) || math.IsNaN(f.SE[h]) ||
			math.IsInf(f.Lower[h], 0) || math.IsInf(f.Upper[h], 0) || math.IsNaN(f.Lower[h]) || math.IsNaN(f.Upper[h]) {
			want = h + 1
			break
		}
	}
	if want < 0 || err == nil || !strings.Contains(err.Error(), "overflows at step "+itoa(want)+" ") {
		t.Errorf("got %v, want the overflow at step %d", err, want)
	}
}

// TestHostileScale: a series scaled to 1e-200 (by hand: squares near
// 1e-400, below the smallest subnormal float64, 4.9e-324, so they are 0)
// would give Sigma2 = 0 and LogLik = +Inf, and a diff coefficient of
// 1e300 Sigma2 = +Inf: each is a typed error.
func TestHostileScale(t *testing.T) {
	y, err := Simulate(Model{AR: []float64{0.5}, Sigma2: 1}, 500, &SimSettings{Seed1: 1})
	if err != nil {
		t.Fatal(err)
	}
	tiny := make([]float64, len(y))
	for i := range y {
		tiny[i] = y[i] * 1e-200
	}
	checkHostile(t, []hostileCase{
		{"Fit 1e-200", catch(func() error { _, err := Fit(nil, tiny, Order{P: 1}, &FitSettings{Name: "tiny"}); return err }), "model", "arma.Fit: fit of tiny: residual sum of squares is 0"},
		{"FitNoise diff 1e300", catch(func() error { _, err := FitNoise(nil, y, Noise{}, []float64{1, 1e300}, nil); return err }), "overflow", "arma.FitNoise: series \"series\": result out of float64 range (the residual sum of squares overflows"},
	})
}

// hostileExplosive is a short series and its fit with phi1 held at 3 (an
// explosive AR part).
func hostileExplosive(t *testing.T) ([]float64, *Result) {
	t.Helper()
	y := make([]float64, 200)
	for i := range y {
		y[i] = math.Sin(float64(i)*0.7) + 0.1*float64(i%5)
	}
	res, err := Fit(nil, y, Order{P: 1}, &FitSettings{Held: map[string]float64{"phi1": 3}})
	if err != nil {
		t.Fatal(err)
	}
	return y, res
}

// TestForecastDiffScale: FitNoise accepts a differencing polynomial
// whose constant term is not 1. By hand: 2(1-B) z_t = w_t is (1-B) z_t =
// w_t/2, so diff {2, -2} must give the forecasts and standard errors of
// diff {1, -1} (w, its mean and Sigma2 scale by 2, 2 and 4). The z
// forecasts doubled at every step before both forecast paths divided by
// the constant term.
func TestForecastDiffScale(t *testing.T) {
	y, err := Simulate(Model{AR: []float64{0.5}, D: 1, Mean: 0.3, Sigma2: 1}, 300, &SimSettings{Seed1: 1})
	if err != nil {
		t.Fatal(err)
	}
	noise := Noise{AR: sym.Poly{Factors: []sym.Factor{{Exp: 1, Terms: []sym.Term{
		{Coef: sym.Coef{Value: 1}},
		{Neg: true, Power: 1, Coef: sym.Coef{Name: "a1", Value: 0.3, Free: true}},
	}}}}}
	var fits [2]*Result
	for i, d := range [][]float64{{1, -1}, {2, -2}} {
		if fits[i], err = FitNoise(nil, y, noise, d, &FitSettings{Constant: ConstantFree}); err != nil {
			t.Fatal(err)
		}
	}
	near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-6*(1+math.Abs(a)) }
	for _, exact := range []bool{true, false} {
		var f [2]Forecast
		for i, r := range fits {
			if exact {
				if f[i], err = r.Forecast(8, 0, nil); err != nil || !f[i].Exact {
					t.Fatalf("exact forecast: %v (Exact %v)", err, f[i].Exact)
				}
			} else {
				f[i] = r.conditionalForecast(8, 0.95, nil)
			}
		}
		for h := range f[0].Mean {
			if !near(f[0].Mean[h], f[1].Mean[h]) || !near(f[0].SE[h], f[1].SE[h]) {
				t.Errorf("exact %v, step %d: diff {2,-2} gives %v (se %v), diff {1,-1} %v (se %v)",
					exact, h+1, f[1].Mean[h], f[1].SE[h], f[0].Mean[h], f[0].SE[h])
			}
		}
	}
	// A short series with a near-unit MA root keeps the state uncertain,
	// so the integrated state term of the exact SE matters (it too was
	// scaled wrongly).
	short := []float64{0.3, 1.2, 0.7, 2.1, 1.5, 2.9, 2.2, 3.6}
	ma := Noise{MA: sym.Poly{Factors: []sym.Factor{{Exp: 1, Terms: []sym.Term{
		{Coef: sym.Coef{Value: 1}},
		{Neg: true, Power: 1, Coef: sym.Coef{Name: "m1", Value: 0.95}},
	}}}}}
	var se [2][]float64
	for i, d := range [][]float64{{1, -1}, {2, -2}} {
		r, err := FitNoise(nil, short, ma, d, &FitSettings{Constant: ConstantFree})
		if err != nil {
			t.Fatal(err)
		}
		f, err := r.Forecast(4, 0, nil)
		if err != nil || !f.Exact {
			t.Fatalf("short series: %v (Exact %v)", err, f.Exact)
		}
		se[i] = f.SE
	}
	for h := range se[0] {
		if !near(se[0][h], se[1][h]) {
			t.Errorf("short series, step %d: se %v with diff {2,-2}, %v with {1,-1}", h+1, se[1][h], se[0][h])
		}
	}
}
