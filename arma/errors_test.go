package arma

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"
)

// TestBadInput checks that hostile data and settings give the
// documented typed error, with the facts (index, value) where the type
// carries them, and never a panic or a silent result. Its length is the
// table of cases (one line each) and the bad inputs they share.
func TestBadInput(t *testing.T) {
	ctx := context.Background()
	nan, inf := math.NaN(), math.Inf(-1)
	good, err := Simulate(Model{AR: []float64{0.5}, Sigma2: 1}, 200, &SimSettings{Seed1: 1, Seed2: 2})
	if err != nil {
		t.Fatal(err)
	}
	withNaN := slices.Clone(good)
	withNaN[17] = nan
	huge := slices.Clone(good)
	huge[5] = 1e300 // finite, but its square overflows
	constant := make([]float64, 50)
	for i := range constant {
		constant[i] = 3
	}
	canceled, cancel := context.WithCancel(ctx)
	cancel()
	dataAt := func(idx int) func(error) bool {
		return func(err error) bool {
			var e *SampleError
			return errors.As(err, &e) && e.Index == idx
		}
	}
	isArg := func(err error) bool { var e *SettingError; return errors.As(err, &e) && errors.Is(err, ErrSetting) }
	isModel := func(err error) bool { var e *ModelError; return errors.As(err, &e) && errors.Is(err, ErrModel) }
	isShort := func(err error) bool { var e *SeriesError; return errors.As(err, &e) && errors.Is(err, ErrShort) }
	isConst := func(err error) bool { var e *SeriesError; return errors.As(err, &e) && errors.Is(err, ErrConstant) }
	isCanceled := func(err error) bool {
		var e *ConvergenceError
		return errors.As(err, &e) && errors.Is(err, context.Canceled) && errors.Is(err, ErrConvergence) && e.Op == "arma.Fit"
	}
	selectErr := func(y []float64, g Grid) error { _, err := Select(ctx, y, g, nil); return err }
	fitErr := func(y []float64, o Order, opt *FitSettings) error { _, err := Fit(ctx, y, o, opt); return err }
	cases := []struct {
		name string
		err  error
		ok   func(error) bool
	}{
		{"Fit NaN", fitErr(withNaN, Order{P: 1}, nil), dataAt(17)},
		{"Fit -Inf", fitErr(append(slices.Clone(good), inf), Order{P: 1}, nil), dataAt(200)},
		{"Fit huge", fitErr(huge, Order{P: 1}, nil), dataAt(5)},
		{"Fit nil", fitErr(nil, Order{P: 1}, nil), isShort},
		{"Fit short", fitErr(good[:3], Order{P: 1, Q: 1}, nil), isShort},
		{"Fit constant", fitErr(constant, Order{P: 1}, nil), isConst},
		{"Fit negative order", fitErr(good, Order{P: -1}, nil), isArg},
		{"Fit huge order", fitErr(good, Order{Q: 1 << 30}, nil), isArg},
		{"Fit huge period", fitErr(good, Order{SP: 1, Period: 1 << 40}, nil), isArg},
		{"Fit MaxIter < 0", fitErr(good, Order{P: 1}, &FitSettings{MaxIter: -1}), isArg},
		{"Fit Tol NaN", fitErr(good, Order{P: 1}, &FitSettings{Tol: nan}), isArg},
		{"Fit Fixed NaN", fitErr(good, Order{P: 1}, &FitSettings{Held: map[string]float64{"phi1": nan}}), isArg},
		{"Fit Fixed unknown", fitErr(good, Order{P: 1}, &FitSettings{Held: map[string]float64{"phi7": 0}}), isArg},
		{"Fit X length", fitErr(good, Order{P: 1}, &FitSettings{Regressors: [][]float64{nil}}), func(err error) bool { return errors.Is(err, ErrLength) }},
		{"Fit X NaN", fitErr(good, Order{P: 1}, &FitSettings{Regressors: [][]float64{withNaN}}), dataAt(17)},
		{"Fit canceled", func() error { _, err := Fit(canceled, good, Order{P: 1}, nil); return err }(), isCanceled},
		{"FitNoise diff NaN", func() error { _, err := FitNoise(ctx, good, Noise{}, []float64{1, nan}, nil); return err }(), isModel},
		{"Select NaN", selectErr(withNaN, Grid{MaxP: 1, MaxQ: 1}), dataAt(17)},
		{"Select constant", selectErr(constant, Grid{MaxP: 1, MaxQ: 1}), isConst},
		{"Select empty", selectErr(nil, Grid{MaxP: 1}), isShort},
		{"Select criterion", selectErr(good, Grid{MaxP: 1, Criterion: 9}), isArg},
		{"ACF NaN", func() error { _, err := ACF(withNaN, 5); return err }(), dataAt(17)},
		{"ACF huge", func() error { _, err := ACF(huge, 5); return err }(), dataAt(5)},
		{"ACF lag", func() error { _, err := ACF(good, 1<<30); return err }(), isShort},
		{"PACF constant", func() error { _, err := PACF(constant, 5); return err }(), isConst},
		{"LjungBox lag", func() error { _, err := LjungBox(good, -1, 0); return err }(), isArg},
		{"LjungBox fitted", func() error { _, err := LjungBox(good, 5, 1<<30); return err }(), isArg},
		{"YuleWalker NaN", func() error { _, err := YuleWalker(withNaN, 3); return err }(), dataAt(17)},
		{"HannanRissanen short", func() error { _, _, err := HannanRissanen(good[:5], 1, 1, 3); return err }(), isShort},
		{"Stationary NaN", func() error { _, _, err := Model{AR: []float64{nan}}.Stationary(); return err }(), isModel},
		{"Invertible Inf", func() error { _, _, err := Model{SMA: []float64{inf}, Period: 4}.Invertible(); return err }(), isModel},
		{"Psi NaN", func() error { _, err := Psi([]float64{nan}, nil, 5); return err }(), isModel},
		{"Simulate Sigma2", func() error { _, err := Simulate(Model{Sigma2: -1}, 5, nil); return err }(), isModel},
		{"Simulate innovations NaN", func() error {
			_, err := Simulate(Model{Sigma2: 1}, 3, &SimSettings{Innovations: []float64{0, nan, 0}})
			return err
		}(), dataAt(1)},
	}
	for _, c := range cases {
		if c.err == nil || !c.ok(c.err) {
			t.Errorf("%s: got %T %v", c.name, c.err, c.err)
		}
	}
}

// TestBadInputNoPanic sweeps hostile series through every data entry
// point: each call must return (no panic), and series that cannot be
// analysed must give an error.
func TestBadInputNoPanic(t *testing.T) {
	ctx := context.Background()
	series := map[string][]float64{
		"nil": nil, "one": {1}, "two": {1, 2}, "NaN": {1, 2, math.NaN(), 4, 5, 6, 7, 8, 9, 10},
		"constant":  {3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3, 3},
		"max":       {math.MaxFloat64, -math.MaxFloat64, 1, 2, 3, 4, 5, 6, 7, 8},
		"subnormal": {1e-310, 2e-310, -1e-310, 0, 1e-310, 3e-310, 0, 0, 1e-310, 2e-310, 5e-311, 0},
	}
	mustFail := map[string]bool{"nil": true, "one": true, "NaN": true, "constant": true, "max": true}
	orders := []Order{{}, {P: 1}, {Q: 1}, {P: 2, Q: 2}, {P: 1, D: 1, Q: 1}, {P: 60}, {SP: 1, Period: 4}, {SD: 1, Period: 12}}
	for name, y := range series {
		before := slices.Clone(y)
		try := func(what string, f func() error) {
			t.Helper()
			defer func() {
				if r := recover(); r != nil {
					t.Errorf("%s on %s: panic %v", what, name, r)
				}
			}()
			if err := f(); err == nil && mustFail[name] {
				t.Errorf("%s on %s: no error", what, name)
			}
		}
		for _, o := range orders {
			try(fmt.Sprint("Fit ", o), func() error { _, err := Fit(ctx, y, o, nil); return err })
		}
		try("Select", func() error { _, err := Select(ctx, y, Grid{MaxP: 2, MaxQ: 1}, nil); return err })
		try("ACF", func() error { _, err := ACF(y, 3); return err })
		try("PACF", func() error { _, err := PACF(y, 3); return err })
		try("LjungBox", func() error { _, err := LjungBox(y, 3, 1); return err })
		try("YuleWalker", func() error { _, err := YuleWalker(y, 3); return err })
		try("HannanRissanen", func() error { _, _, err := HannanRissanen(y, 1, 1, 3); return err })
		if !slices.EqualFunc(y, before, func(a, b float64) bool { return a == b || (a != a && b != b) }) {
			t.Errorf("%s: input series modified", name)
		}
	}
}

// TestInputsNotModified fits with every caller-owned input in use and
// checks each is unchanged afterwards.
func TestInputsNotModified(t *testing.T) {
	ctx := context.Background()
	y, err := Simulate(Model{AR: []float64{0.6}, MA: []float64{0.3}, Mean: 5, Sigma2: 1}, 300, &SimSettings{Seed1: 3, Seed2: 4})
	if err != nil {
		t.Fatal(err)
	}
	trend := make([]float64, len(y))
	for i := range trend {
		trend[i] = float64(i)
		y[i] += 0.01 * trend[i]
	}
	yc, xc := slices.Clone(y), slices.Clone(trend)
	fixed := map[string]float64{"theta1": -0.3}
	init := map[string]float64{"phi1": 0.5}
	opt := &FitSettings{Regressors: [][]float64{trend}, RegressorNames: []string{"slope"}, Held: fixed, StartValues: init}
	optc := *opt
	res, err := Fit(ctx, y, Order{P: 1, Q: 1}, opt)
	if err != nil {
		t.Fatal(err)
	}
	future := [][]float64{{300, 301, 302}}
	futc := slices.Clone(future[0])
	if _, err := res.Forecast(3, 0.9, future); err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(y, yc) || !slices.Equal(trend, xc) || !slices.Equal(future[0], futc) {
		t.Error("series, regressor or future regressor modified")
	}
	if len(fixed) != 1 || fixed["theta1"] != -0.3 || len(init) != 1 || init["phi1"] != 0.5 {
		t.Errorf("Fixed/Init maps modified: %v %v", fixed, init)
	}
	if opt.Regressors[0][0] != optc.Regressors[0][0] || len(opt.RegressorNames) != 1 || opt.RegressorNames[0] != "slope" {
		t.Error("Options modified")
	}
	noise := res.Noise.Clone()
	if _, err := FitNoise(ctx, y, noise, []float64{1}, nil); err != nil {
		t.Fatal(err)
	}
	if !noise.Equal(res.Noise) {
		t.Error("FitNoise modified its noise argument")
	}
	ar, ma := []float64{0.5}, []float64{0.2}
	if _, err := Psi(ar, ma, 10); err != nil || ar[0] != 0.5 || ma[0] != 0.2 {
		t.Errorf("Psi modified its polynomials or failed: %v", err)
	}
}

// An order of math.MaxInt is an error whose Need is not negative.
func TestYuleWalkerHugeOrder(t *testing.T) {
	_, err := YuleWalkerOrder([]float64{1, 2, 3, 2, 1}, math.MaxInt)
	var se *SeriesError
	if !errors.As(err, &se) || se.Kind != ErrShort || se.Need <= 0 {
		t.Fatalf("YuleWalkerOrder(MaxInt) = %v, want a *SeriesError of kind ErrShort with a positive Need", err)
	}
}

// TestErrorKindsAndOps: every exported function's error matches one of
// the library's kinds with errors.Is and names, as Op, the function the
// caller called (issue 12: one vocabulary).
func TestErrorKindsAndOps(t *testing.T) {
	ctx := context.Background()
	y, err := Simulate(Model{AR: []float64{0.5}, Sigma2: 1}, 100, &SimSettings{Seed1: 3})
	if err != nil {
		t.Fatal(err)
	}
	res, err := Fit(ctx, y, Order{P: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	nan := math.NaN()
	cases := []struct {
		op   string
		kind error
		err  error
	}{
		{"arma.Fit", ErrSetting, second(Fit(ctx, y, Order{P: -1}, nil))},
		{"arma.FitNoise", ErrModel, second(FitNoise(ctx, y, Noise{}, []float64{0, 1}, nil))},
		{"arma.Select", ErrSample, second(Select(ctx, []float64{1, nan, 3}, Grid{}, nil))},
		{"arma.ACF", ErrShort, second(ACF(y[:2], 5))},
		{"arma.PACF", ErrSetting, second(PACF(y, 0))},
		{"arma.LjungBox", ErrSetting, second(LjungBox(y, 0, 0))},
		{"arma.YuleWalker", ErrSample, second(YuleWalker([]float64{1, 2, nan, 4}, 1))},
		{"arma.YuleWalkerOrder", ErrSetting, second(YuleWalkerOrder(y, -1))},
		{"arma.HannanRissanen", ErrShort, func() error { _, _, err := HannanRissanen(y[:6], 2, 2, 0); return err }()},
		{"arma.Psi", ErrModel, second(Psi(nil, nil, 3))},
		{"arma.Pi", ErrSetting, second(Pi(nil, nil, -1))},
		{"arma.Simulate", ErrSetting, second(Simulate(Model{}, -1, nil))},
		{"arma.Model.Stationary", ErrModel, func() error { _, _, err := Model{AR: []float64{nan}}.Stationary(); return err }()},
		{"arma.Model.Invertible", ErrSetting, func() error { _, _, err := Model{MA: []float64{0.1}, D: -1}.Invertible(); return err }()},
		{"arma.Model.Psi", ErrModel, second(Model{MA: []float64{nan}}.Psi(3))},
		{"arma.Model.Pi", ErrModel, second(Model{AR: []float64{nan}}.Pi(3))},
		{"arma.Result.Forecast", ErrSetting, second(res.Forecast(0, 0, nil))},
		{"arma.Result.LjungBox", ErrSetting, second(res.LjungBox(0))},
		{"arma.Order.Validate", ErrSetting, Order{Q: -2}.Validate()},
		{"arma.FitSettings.Validate", ErrSetting, (&FitSettings{MaxIter: -1}).Validate()},
		{"arma.SimSettings.Validate", ErrSample, (&SimSettings{Innovations: []float64{nan}}).Validate()},
		{"arma.Grid.Validate", ErrSetting, Grid{MaxP: -1}.Validate()},
	}
	for _, c := range cases {
		if c.err == nil {
			t.Errorf("%s: no error", c.op)
			continue
		}
		if k := kindOf(c.err); k != c.kind {
			t.Errorf("%s: %v matches kind %v, want %v", c.op, c.err, k, c.kind)
		}
		if !strings.HasPrefix(c.err.Error(), c.op+": ") {
			t.Errorf("%s: message %q does not start with its Op", c.op, c.err)
		}
	}
}

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

// TestBadInputOrders: orders whose degree overflows int (SP*Period wraps
// negative), negative differencing and huge periods in a Model are
// typed errors, with no panic and no attempt to allocate them.
func TestBadInputOrders(t *testing.T) {
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

// TestBadInputLags: huge lags, orders and starts give ShortErrors with
// the right positive Need (no overflow of lag+1), Hannan-Rissanen with p
// or q = MaxInt gives a typed error and names a negative longAR, and an
// unknown ConstantRule is a *SettingError.
func TestBadInputLags(t *testing.T) {
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

// TestBadInputSizes: horizons, weight counts and sample counts of 1<<40
// or math.MaxInt are typed errors (no attempt to allocate them), the
// largest horizon, MaxHorizon, is accepted (the integration of the state
// is O(h)), and Forecast on a nil or zero Result is a typed error.
func TestBadInputSizes(t *testing.T) {
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

// TestBadInputOverflow: explosive polynomials, a non-stationary
// simulation without burn-in, a huge mean and a forecast from an
// explosive fitted AR part are typed errors, never +-Inf results.
func TestBadInputOverflow(t *testing.T) {
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

// TestBadInputStructs: an ARFit or Result built by hand (or nil) gives
// Poly, Residuals, LjungBox, String and EquationConstant a defined answer
// or a typed error, never a panic (index out of range, nil dereference).
func TestBadInputStructs(t *testing.T) {
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

// TestBadInputScale: a series scaled to 1e-200 (by hand: squares near
// 1e-400, below the smallest subnormal float64, 4.9e-324, so they are 0)
// would give Sigma2 = 0 and LogLik = +Inf, and a diff coefficient of
// 1e300 Sigma2 = +Inf: each is a typed error.
func TestBadInputScale(t *testing.T) {
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
