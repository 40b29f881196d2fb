package prewhiten_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/prewhiten"
)

// TestBadInput: bad series and settings through Fit, Pair and Apply give
// the package's typed errors naming the series, index or setting.
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
		err.Error() != `prewhiten.Pair: series "temp" has 70 samples against 80 (the length of input "burner"; input and output must be of equal length)` {
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

// TestConstantMessages: a constant input or output is refused before
// filtering, and each message names the user's series (not "output
// (filtered)"), mentions differencing only when there was one, and
// prints a rounded value (not rounding noise such as -2.22e-15).
func TestConstantMessages(t *testing.T) {
	flat := make([]float64, 60)
	ramp := make([]float64, 60)
	for i := range flat {
		flat[i] = 0.1 + 0.2 // 0.30000000000000004
		ramp[i] = 5 + 0.5*float64(i)
	}
	x := walk(60, 3)
	cases := []struct {
		name string
		err  error
		want []string
		not  []string
	}{
		{"Fit constant", second(prewhiten.Fit(flat, &prewhiten.Settings{Name: "valve"})),
			[]string{`series "valve" is constant (every sample is 0.3;`}, []string{"differenc", "0.30000000000000004"}},
		{"Fit constant with Diff", second(prewhiten.Fit(flat, &prewhiten.Settings{Name: "valve", Diff: []float64{1, -1}})),
			[]string{`series "valve" is constant (every sample is 0.3;`}, []string{"differenc"}},
		{"Fit ramp with Diff", second(prewhiten.Fit(ramp, &prewhiten.Settings{Name: "valve", Diff: []float64{1, -1}})),
			[]string{`prewhiten.Fit: series "valve" is constant (after the differencing (1 - B) every sample is 0.5: its levels lie on a straight line or repeat; use less differencing)`}, nil},
		{"Fit ramp with Order", second(prewhiten.Fit(ramp, &prewhiten.Settings{Name: "valve", Order: &arma.Order{D: 1, Q: 1}})),
			[]string{`"valve" is constant (after the differencing (1 - B) every sample is 0.5`}, nil},
		{"Pair constant output", second(prewhiten.Pair(x, flat, "flow", &prewhiten.Settings{Name: "valve"})),
			[]string{`prewhiten.Pair: series "flow" is constant (every sample is 0.3; a constant series carries no information to prewhiten or correlate)`}, []string{"filtered", "e-1"}},
		{"IdentifyNoise constant", second(prewhiten.IdentifyNoise(context.Background(), flat, &prewhiten.NoiseSettings{Name: "level"})),
			[]string{`prewhiten.IdentifyNoise: series "level" is constant (every sample is 0.3;`}, []string{"differenc"}},
	}
	for _, c := range cases {
		var ce *prewhiten.SeriesError
		if !errors.As(c.err, &ce) || !errors.Is(c.err, prewhiten.ErrConstant) {
			t.Errorf("%s: %T %v, want a *SeriesError of kind ErrConstant", c.name, c.err, c.err)
			continue
		}
		testutil.CheckWords(t, c.name, c.err.Error(), c.want, c.not)
	}
}

// try runs f, failing on a panic or an error that is not one of the
// packages' typed errors (a pointer type of arma, prewhiten or ccf, or
// one of the shared shapes); an error of prewhiten or ccf must also
// match one of the shared kinds.
func try(t *testing.T, name string, f func() error) {
	t.Helper()
	defer func() {
		if r := recover(); r != nil {
			t.Errorf("%s: panic %v", name, r)
		}
	}()
	err := f()
	if err == nil {
		return
	}
	typ := fmt.Sprintf("%T", err)
	if !strings.HasPrefix(typ, "*arma.") && !strings.HasPrefix(typ, "*prewhiten.") && !strings.HasPrefix(typ, "*ccf.") && !strings.HasPrefix(typ, "*errs.") {
		t.Errorf("%s: untyped error %s %v", name, typ, err)
	}
	if strings.HasPrefix(typ, "*arma.") {
		return // arma's own errors (its migration to the shared kinds is its own)
	}
	for _, k := range []error{prewhiten.ErrSample, prewhiten.ErrShort, prewhiten.ErrConstant, prewhiten.ErrLength, prewhiten.ErrSetting,
		prewhiten.ErrModel, prewhiten.ErrConvergence, prewhiten.ErrInternal, ccf.ErrOverflow} {
		if errors.Is(err, k) {
			return
		}
	}
	t.Errorf("%s: error of no kind %s %v", name, typ, err)
}

// TestBadInputCalls calls every exported function and method of arma,
// prewhiten and ccf that takes series with nil, one- and two-sample,
// NaN, infinite, constant and 1e300 series, and lags -1, 0, 3 and
// MaxInt: each returns a typed error or a result, never a panic.
// (arma.AutocovTo is left out: it documents a panic for more lags than
// samples, a programmer error, and does not check its input.) This
// probe found prewhiten.Fit passing a 1e300 sample to arma, whose error
// named "series" instead of the input, a one-sample input reported as
// "constant", the zero arma.Result's LjungBox blaming its series, and a
// nil *ccf.Identification panicking in String.
func TestBadInputCalls(t *testing.T) {
	ctx := context.Background()
	nan := math.NaN()
	sets := map[string][]float64{"nil": nil, "one": {1}, "two": {1, 2}, "nan": {1, nan, 3, 4, 5, 6}, "inf": {1, 2, math.Inf(1), 4, 5}, "const": {2, 2, 2, 2, 2, 2, 2, 2}, "big": {1e300, -1e300, 1, 2, 3, 4, 5, 6, 7, 8}}
	for nm, x := range sets {
		for _, lag := range []int{-1, 0, 3, math.MaxInt} {
			try(t, fmt.Sprint("ACF ", nm, lag), func() error { _, err := arma.ACF(x, lag); return err })
			try(t, fmt.Sprint("PACF ", nm, lag), func() error { _, err := arma.PACF(x, lag); return err })
			try(t, fmt.Sprint("LjungBox ", nm, lag), func() error { _, err := arma.LjungBox(x, lag, 0); return err })
			try(t, fmt.Sprint("YW ", nm, lag), func() error { _, err := arma.YuleWalker(x, lag); return err })
			try(t, fmt.Sprint("YWO ", nm, lag), func() error { _, err := arma.YuleWalkerOrder(x, lag); return err })
			try(t, fmt.Sprint("HR ", nm, lag), func() error { _, _, err := arma.HannanRissanen(x, lag, 1, 0); return err })
			try(t, fmt.Sprint("ImpulseWeights ", nm, lag), func() error { _, err := ccf.ImpulseWeights(x, x, lag, "", nil); return err })
		}
		try(t, "PACFFromACF "+nm, func() error { arma.PACFFromACF(x); return nil })
		try(t, "pw Fit "+nm, func() error { _, err := prewhiten.Fit(x, nil); return err })
		try(t, "pw Pair "+nm, func() error { _, err := prewhiten.Pair(x, x, "", nil); return err })
		try(t, "pw IdentifyNoise "+nm, func() error { _, err := prewhiten.IdentifyNoise(ctx, x, nil); return err })
		try(t, "pw Apply "+nm, func() error {
			_, _, err := prewhiten.Filter{Diff: []float64{1}, AR: []float64{1, -0.5}, MA: []float64{1}}.Apply(x, "")
			return err
		})
		try(t, "NoiseSeries "+nm, func() error {
			_, _, err := ccf.NoiseSeries(x, [][]float64{x}, []*ccf.Weights{{V: []float64{1, 0.5}}})
			return err
		})
		try(t, "DL "+nm, func() error { _, err := ccf.DistributedLag(x, [][]float64{x}, nil); return err })
		try(t, "Identify "+nm, func() error {
			_, err := ccf.Identify(&ccf.Weights{V: x, SE: x}, nil)
			return err
		})
		try(t, "Corner "+nm, func() error { ccf.Corner(&ccf.Weights{V: x, SE: x}, 5, 5); return nil })
		try(t, "Psi "+nm, func() error { _, err := arma.Psi(x, x, 5); return err })
		try(t, "Select "+nm, func() error { _, err := arma.Select(ctx, x, arma.Grid{MaxP: 1, MaxQ: 1}, nil); return err })
		try(t, "FitNoise "+nm, func() error {
			_, err := arma.FitNoise(ctx, x, arma.Model{AR: []float64{0.3}}.Noise(), nil, nil)
			return err
		})
	}
	try(t, "Corner nil", func() error { ccf.Corner(nil, 5, 5); return nil })
	try(t, "Corner neg", func() error { ccf.Corner(&ccf.Weights{V: []float64{1, 2}, SE: []float64{1, 1}}, -5, -5); return nil })
	var r *arma.Result
	try(t, "nil Result LjungBox", func() error { _, err := r.LjungBox(5); return err })
	try(t, "nil Result String", func() error { _ = r.String(); return nil })
	try(t, "nil Result Constant", func() error { r.EquationConstant(); return nil })
	try(t, "zero Result", func() error {
		_ = (&arma.Result{}).String()
		(&arma.Result{}).EquationConstant()
		_, err := (&arma.Result{}).LjungBox(3)
		return err
	})
	var id *ccf.Identification
	try(t, "nil Identification String", func() error { _ = id.String(); return nil })
	try(t, "zero Identification String", func() error { _ = (&ccf.Identification{}).String(); return nil })
	try(t, "Form String", func() error { _ = ccf.Form{}.String(); return nil })
	try(t, "ARFit zero", func() error { _ = arma.ARFit{}.Poly(); _ = arma.ARFit{}.Residuals([]float64{1, 2}); return nil })
	try(t, "ARFit nil resid", func() error {
		f, _ := arma.YuleWalker([]float64{1, 3, 2, 5, 4, 6, 3, 7}, 2)
		_ = f.Residuals(nil)
		return nil
	})
	try(t, "Filter String zero", func() error { _ = prewhiten.Filter{}.String(); return nil })
	try(t, "ApplyInput zero", func() error { _, _, err := prewhiten.Filter{}.ApplyInput([]float64{1, 2, 3}); return err })
	// The fixes this probe led to.
	var ve *prewhiten.SampleError
	if _, err := prewhiten.Fit(sets["big"], &prewhiten.Settings{Name: "valve"}); !errors.As(err, &ve) || ve.Series != "valve" || ve.Index != 0 || ve.Limit != arma.MaxAbs ||
		err.Error() != `prewhiten.Fit: series "valve" sample 0 is 1e+300, beyond the largest magnitude accepted, 1e+140 (rescale the series: change its units)` {
		t.Errorf("1e300 sample: %T %v", err, err)
	}
	var se *prewhiten.SeriesError
	if _, err := prewhiten.Fit(sets["one"], nil); !errors.As(err, &se) || se.Need != 3 || !errors.Is(err, prewhiten.ErrShort) {
		t.Errorf("one sample: %T %v", err, err)
	}
	if _, err := (&arma.Result{}).LjungBox(3); err == nil || !strings.Contains(err.Error(), "needs a result of Fit or FitNoise") {
		t.Errorf("zero Result: %v", err)
	}
	if got := id.String(); got != "<nil ccf.Identification>" {
		t.Errorf("nil Identification: %q", got)
	}
}
