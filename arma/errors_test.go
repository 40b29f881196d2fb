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
