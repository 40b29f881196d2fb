package arma

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/sym"
)

// TestForecastBadInputOverflowStep: an explosive model's forecast is an overflow
// error naming the first step at which any field stops being finite:
// here the interval overflows long before the mean (by hand, for
// phi1 = 3: the mean grows as 3^h and overflows near h = 308/log10(3) =
// 646, the variance sums 9^j and overflows near half that).
func TestForecastBadInputOverflowStep(t *testing.T) {
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

// TestForecastDiffScale: FitNoise accepts a differencing polynomial
// whose constant term is not 1. By hand: 2(1-B) z_t = w_t is (1-B) z_t =
// w_t/2, so diff {2, -2} must give the forecasts and standard errors of
// diff {1, -1} (w, its mean and Sigma2 scale by 2, 2 and 4). Both
// forecast paths divide by the constant term; without that division the
// z forecasts would double at every step.
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
	// so the integrated state term of the exact SE matters (it too must
	// be scaled by the constant term).
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

// TestForecastBadInput: bad horizons, levels and future regressor values
// are typed errors naming the argument, with the package prefix once
// (not "arma: futureX: arma: futureX sample 3 is NaN").
func TestForecastBadInput(t *testing.T) {
	y, err := Simulate(Model{AR: []float64{0.5}, Sigma2: 1}, 120, &SimSettings{Seed1: 8})
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, len(y))
	for i := range x {
		x[i] = float64(i % 7)
	}
	res, err := Fit(context.Background(), y, Order{P: 1}, &FitSettings{Regressors: [][]float64{x}})
	if err != nil {
		t.Fatal(err)
	}
	col := func(v float64) [][]float64 { return [][]float64{{1, 2, 3, v, 5}} }
	isArg := func(err error) bool { var e *SettingError; return errors.As(err, &e) && e.Op == "arma.Result.Forecast" }
	cases := []struct {
		name  string
		steps int
		level float64
		fx    [][]float64
		ok    func(error) bool
		want  string
	}{
		{"steps 0", 0, 0.9, col(4), isArg, "arma.Result.Forecast: steps = 0: must be in 1..MaxHorizon = 65536"},
		{"steps -1", -1, 0.9, col(4), isArg, "steps = -1: "},
		{"steps huge", math.MaxInt, 0.9, col(4), isArg, "MaxHorizon"},
		{"level 1", 5, 1, col(4), isArg, "level = 1: must be in (0, 1) (zero means 0.95)"},
		{"level NaN", 5, math.NaN(), col(4), isArg, "level = NaN"},
		{"futureX missing", 5, 0.9, nil, isArg, "futureX = 0 columns: needs 1 regressor columns"},
		{"futureX short", 5, 0.9, [][]float64{{1}}, isArg, "futureX column 1 = 1 values: needs 5 values"},
		{"futureX NaN", 5, 0.9, col(math.NaN()), func(err error) bool {
			var e *SampleError
			return errors.As(err, &e) && e.Index == 3 && e.Series == "futureX column 1"
		}, `arma.Result.Forecast: series "futureX column 1" sample 3 is NaN`},
		{"futureX huge", 5, 0.9, col(1e300), func(err error) bool { var e *SampleError; return errors.As(err, &e) }, "beyond the largest magnitude accepted, 1e+140"},
	}
	for _, c := range cases {
		_, err := res.Forecast(c.steps, c.level, c.fx)
		if err == nil || !c.ok(err) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %T %v, want %q", c.name, err, err, c.want)
		}
	}
	var zero *Result
	if _, err := zero.Forecast(3, 0, nil); !errors.Is(err, ErrModel) || err.Error() != "arma.Result.Forecast: result: Forecast needs a result of Fit or FitNoise" {
		t.Errorf("nil result: %v", err)
	}
}
