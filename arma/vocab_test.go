package arma

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/est"
)

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

// TestParamsAndCovariance: Params, Cov and Corr agree with each other
// and with the variance convention (worked from the definitions in
// internal/est: Sigma2 = SSQ/(N-k), SE^2 = Cov diagonal, Corr =
// est.Corr(Cov)); the log-likelihood keeps SSQ/N inside. Tolerance 1e-12
// relative: the same numbers by two routes of a few operations.
func TestParamsAndCovariance(t *testing.T) {
	y, err := Simulate(Model{AR: []float64{0.6}, MA: []float64{-0.3}, Mean: 4, Sigma2: 1}, 400, &SimSettings{Seed1: 11, Seed2: 12})
	if err != nil {
		t.Fatal(err)
	}
	res, err := Fit(context.Background(), y, Order{P: 1, Q: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	k := len(res.Params)
	if k != 3 || res.Params[2].Name != "c" || names(res)[0] != "phi1" || names(res)[1] != "theta1" {
		t.Fatalf("params %v, want phi1, theta1, c", names(res))
	}
	if res.Sigma2 != res.SSQ/float64(res.NUsed-k) || res.Model.Sigma2 != res.Sigma2 {
		t.Errorf("Sigma2 %v, want SSQ/(N-k) = %v", res.Sigma2, res.SSQ/float64(res.NUsed-k))
	}
	if want := -float64(res.NUsed) / 2 * (math.Log(2*math.Pi*res.SSQ/float64(res.NUsed)) + 1); !closeTo(res.LogLik, want, 1e-12, 0) {
		t.Errorf("LogLik %v, want %v (SSQ/N inside)", res.LogLik, want)
	}
	corr := est.Corr(res.Cov)
	for i, p := range res.Params {
		if !closeTo(p.SE, math.Sqrt(res.Cov[i][i]), 1e-12, 0) || p.T != p.Value/p.SE {
			t.Errorf("%s: SE %v, sqrt(Cov) %v, T %v", p.Name, p.SE, math.Sqrt(res.Cov[i][i]), p.T)
		}
		if math.IsNaN(p.Start) || p.Start == 0 && p.Name != "theta1" {
			t.Errorf("%s: start value %v", p.Name, p.Start)
		}
		for j := range res.Params {
			if !closeTo(res.Corr[i][j], corr[i][j], 1e-12, 1e-15) || res.Cov[i][j] != res.Cov[j][i] {
				t.Errorf("Corr[%d][%d] = %v, est.Corr gives %v", i, j, res.Corr[i][j], corr[i][j])
			}
		}
	}
	if c := res.Params[2]; c.Value != res.Model.Mean {
		t.Errorf("c = %v, Model.Mean = %v", c.Value, res.Model.Mean)
	}
}

// TestConstantRule: by default c is estimated without differencing and
// held at zero with it; ConstantFree estimates a drift; ConstantZero
// leaves it out; Held["c"] holds it at a value.
func TestConstantRule(t *testing.T) {
	ctx := context.Background()
	y, err := Simulate(Model{AR: []float64{0.4}, D: 1, Mean: 0.2, Sigma2: 1}, 300, &SimSettings{Seed1: 4})
	if err != nil {
		t.Fatal(err)
	}
	has := func(r *Result) bool {
		for _, nm := range names(r) {
			if nm == "c" {
				return true
			}
		}
		return false
	}
	for _, c := range []struct {
		name string
		ord  Order
		set  *FitSettings
		want bool
	}{
		{"level default", Order{P: 1}, nil, true},
		{"differenced default", Order{P: 1, D: 1}, nil, false},
		{"differenced free", Order{P: 1, D: 1}, &FitSettings{Constant: ConstantFree}, true},
		{"level zero", Order{P: 1}, &FitSettings{Constant: ConstantZero}, false},
	} {
		r, err := Fit(ctx, y, c.ord, c.set)
		if err != nil || has(r) != c.want {
			t.Errorf("%s: params %v (%v), want c estimated %v", c.name, names(r), err, c.want)
		}
	}
	r, err := Fit(ctx, y, Order{P: 1, D: 1}, &FitSettings{Held: map[string]float64{"c": 0.25}})
	if err != nil || has(r) || r.Model.Mean != 0.25 {
		t.Errorf("held c: %v %v", r, err)
	}
}

// TestSelectDefaultBIC: the zero Grid ranks by BIC, and each OrderFit
// prints its criterion by name.
func TestSelectDefaultBIC(t *testing.T) {
	y, err := Simulate(Model{AR: []float64{0.7}, Sigma2: 1}, 300, &SimSettings{Seed1: 5})
	if err != nil {
		t.Fatal(err)
	}
	fits, err := Select(context.Background(), y, Grid{MaxP: 2, MaxQ: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, f := range fits {
		if f.Criterion != ByBIC || f.Score != f.Result.BIC || i > 0 && f.Score < fits[0].Score && len(f.Result.Boundary) == 0 && len(fits[0].Result.Boundary) == 0 {
			t.Errorf("%v: criterion %v score %v BIC %v", f.Order, f.Criterion, f.Score, f.Result.BIC)
		}
	}
	want := "ARIMA" + fits[0].Order.String() + " BIC "
	if s := fits[0].String(); !strings.HasPrefix(s, want) || strings.Contains(s, "score") {
		t.Errorf("String() = %q, want the prefix %q", s, want)
	}
	failed := OrderFit{Order: Order{P: 1}, Criterion: ByAICc, Score: math.Inf(1), Err: errors.New("too short")}
	if s := failed.String(); s != "ARIMA(1,0,0) failed: too short" {
		t.Errorf("failed String() = %q", s)
	}
	aicc := OrderFit{Order: Order{Q: 1}, Criterion: ByAICc, Score: 12.345, Result: &Result{}}
	if s := aicc.String(); s != "ARIMA(0,0,1) AICc 12.35" {
		t.Errorf("AICc String() = %q", s)
	}
}

// TestBurnInMeaning: a positive BurnIn is that many draws discarded, the
// same series as simulating without burn-in and dropping them (the same
// seed draws the same innovations); zero is automatic, so it differs from
// none.
func TestBurnInMeaning(t *testing.T) {
	m := Model{AR: []float64{0.9}, MA: []float64{0.2}, Mean: 1, Sigma2: 1}
	got, err := Simulate(m, 50, &SimSettings{Seed1: 9, BurnIn: 30})
	if err != nil {
		t.Fatal(err)
	}
	all, err := Simulate(m, 80, &SimSettings{Seed1: 9, BurnIn: -1})
	if err != nil {
		t.Fatal(err)
	}
	for i := range got {
		if got[i] != all[30+i] {
			t.Fatalf("sample %d: %v with BurnIn 30, %v after dropping 30 draws", i, got[i], all[30+i])
		}
	}
	auto, _ := Simulate(m, 50, &SimSettings{Seed1: 9})
	none, _ := Simulate(m, 50, &SimSettings{Seed1: 9, BurnIn: -1})
	if auto[0] == none[0] {
		t.Error("automatic burn-in gave the series without burn-in")
	}
}
