package tf

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"
)

// TestFitBadInput checks the typed errors of Fit and their messages.
func TestFitBadInput(t *testing.T) {
	y, x := fitMCSim(fitRand(9), 60)
	good := func() map[string][]float64 {
		return map[string][]float64{"y": append([]float64(nil), y...), "x": append([]float64(nil), x...)}
	}
	fixed := fitMCModel()
	fixed.Const = &Coef{Value: 2}
	fixed.Inputs[0].Num = fitP(fitFac(fitTerm(false, "", 1.5, 0)))
	fixed.Inputs[0].Den = fitP(fitFac(fitTerm(false, "", 1, 0), fitTerm(true, "", 0.6, 1)))
	fixed.Noise.AR = fitP(fitFac(fitTerm(false, "", 1, 0), fitTerm(true, "", 0.5, 1)))
	freeDiff := fitMCModel()
	freeDiff.Diff = fitOneMinus("k", 1)
	mixed := fitMCModel()
	mixed.Noise.AR = fitP(fitFac(fitTerm(false, "", 1, 0), Term{Neg: true, Coef: Coef{Name: "d1", Value: 0.5}, Power: 1}))
	zeroDen := fitMCModel()
	zeroDen.Inputs[0].Den = fitP(fitFac(fitTerm(false, "", 0, 0), fitTerm(true, "d1", 0, 1)))
	noOut := fitMCModel()
	noOut.Output = ""
	for _, tc := range []struct {
		name    string
		m       Model
		data    func() map[string][]float64
		problem FitProblem
		series  string
		msg     string
	}{
		{"missing output", fitMCModel(), func() map[string][]float64 { d := good(); delete(d, "y"); return d },
			MissingSeries, "y", `tf: series missing from the data: "y" (output)`},
		{"missing input", fitMCModel(), func() map[string][]float64 { d := good(); delete(d, "x"); return d },
			MissingSeries, "x", `tf: series missing from the data: "x" (input)`},
		{"extra series", fitMCModel(), func() map[string][]float64 { d := good(); d["xx"] = x; return d },
			ExtraSeries, "xx", `tf: series in the data not used by the model: "xx"`},
		{"unequal lengths", fitMCModel(), func() map[string][]float64 { d := good(); d["x"] = d["x"][:50]; return d },
			UnequalLengths, "x", `tf: series lengths differ: "x" has 50 samples, the output 60`},
		{"too few observations", fitMCModel(), func() map[string][]float64 {
			d := good()
			d["x"], d["y"] = d["x"][:9], d["y"][:9]
			return d
		}, TooFewObservations, "y", `tf: too few observations: "y": 4 residuals, at least 6 needed (residuals are summed from index 5 of 9 samples; input "x" with dead time 3, numerator degree 1 and differencing degree 0 leaves its first 4 samples without a residual: check the dead time (it counts samples))`},
		{"nothing free", fixed, good, NothingFree, "", `tf: nothing free to estimate`},
		{"free differencing", freeDiff, good, FixedDifferencing, "k", `tf: differencing must be fixed numbers: "k"`},
		{"mixed freedom", mixed, good, MixedFreedom, "d1", `tf: parameter is free in one place and held in another: "d1"`},
		{"zero denominator constant", zeroDen, good, BadDenominator, "x", `tf: constant term of a denominator is zero: "x"`},
		{"no output", noOut, good, NoOutput, "", `tf: model names no output series`},
	} {
		_, err := Fit(context.Background(), tc.m, tc.data(), nil)
		var fe *FitError
		if !errors.As(err, &fe) || fe.Problem != tc.problem || fe.Series != tc.series {
			t.Errorf("%s: got %v, want problem %v on %q", tc.name, err, tc.problem, tc.series)
			continue
		}
		if err.Error() != tc.msg {
			t.Errorf("%s: message\n%s\nwant\n%s", tc.name, err.Error(), tc.msg)
		}
	}
	// NaN and Inf give a *SampleError with the series and index.
	for _, tc := range []struct {
		series string
		index  int
		v      float64
	}{{"x", 7, math.NaN()}, {"y", 0, math.Inf(1)}, {"y", 59, math.Inf(-1)}} {
		d := good()
		d[tc.series][tc.index] = tc.v
		_, err := Fit(context.Background(), fitMCModel(), d, nil)
		var se *SampleError
		if !errors.As(err, &se) || se.Series != tc.series || se.Index != tc.index || !errors.Is(err, ErrSample) {
			t.Errorf("%v at %s[%d]: got %v", tc.v, tc.series, tc.index, err)
		}
	}
	// Extra series are accepted on request.
	d := good()
	d["xx"] = x
	if _, err := Fit(context.Background(), fitMCModel(), d, &FitSettings{IgnoreExtra: true}); err != nil {
		t.Errorf("IgnoreExtra: %v", err)
	}
}

// TestFitDoesNotModify checks that Fit leaves the model and the data as
// they were.
func TestFitDoesNotModify(t *testing.T) {
	y, x := fitMCSim(fitRand(10), 200)
	data := map[string][]float64{"y": append([]float64(nil), y...), "x": append([]float64(nil), x...)}
	m := fitMCModel()
	m0 := m.Clone()
	est, err := Fit(context.Background(), m, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !m.Equal(m0) {
		t.Error("model modified")
	}
	for i := range y {
		if data["y"][i] != y[i] || data["x"][i] != x[i] {
			t.Fatal("data modified")
		}
	}
	// The fitted model carries the estimates, still free, and prints as a spec.
	p, _ := est.Param("d1")
	if v := est.Model.Inputs[0].Den.Factors[0].Terms[1].Coef; v.Value != p.Value || !v.Free {
		t.Errorf("fitted model holds %+v, estimate %v", v, p.Value)
	}
	if s := est.Model.String(); !strings.Contains(s, "d1 ~ ") {
		t.Errorf("fitted spec %q lacks the estimate", s)
	}
}

// TestFitCancel checks that a done context stops the fit with the best
// point so far and says so, in the error (wrapping the context's error)
// as well as in the estimate.
func TestFitCancel(t *testing.T) {
	y, x := fitMCSim(fitRand(11), 400)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	est, err := Fit(ctx, fitMCModel(), map[string][]float64{"y": y, "x": x}, nil)
	var fe *FitError
	if !errors.Is(err, context.Canceled) || !errors.As(err, &fe) || fe.Problem != Interrupted || fe.Series != "y" ||
		!strings.Contains(err.Error(), "fit interrupted before converging") || !strings.Contains(err.Error(), "best point") {
		t.Fatalf("canceled fit: err = %v, want an Interrupted *FitError wrapping context.Canceled", err)
	}
	if est == nil {
		t.Fatal("canceled fit: no estimate (the best point so far must come with the error)")
	}
	if est.Converged || !strings.Contains(est.Reason, "cancel") || len(est.Warnings) == 0 || est.Warnings[0].Kind != NotConverged {
		t.Errorf("canceled fit: converged %v, reason %q, warnings %v", est.Converged, est.Reason, est.Warnings)
	}
}

// A dead time outside 0..MaxDelay in a model built in code is a typed
// *ModelError naming the input and the dead time, not an index panic.
func TestFitNegativeDelay(t *testing.T) {
	x := make([]float64, 300)
	y := make([]float64, 300)
	for i := range x {
		x[i] = float64(i % 7)
		y[i] = float64(i % 5)
	}
	m := Model{Output: "y", Inputs: []Input{{Series: "x", Delay: -1,
		Num: Poly{Factors: []Factor{{Exp: 1, Terms: []Term{{Coef: Coef{Name: "w0", Free: true}}}}}}}}}
	_, err := Fit(context.Background(), m, map[string][]float64{"y": y, "x": x}, nil)
	var me *ModelError
	if !errors.As(err, &me) || me.Part != `input "x" dead time` || !strings.Contains(err.Error(), "-1 samples is outside 0..10000") {
		t.Fatalf("Fit with dead time -1: err = %v, want a *ModelError", err)
	}
}

// Negative or NaN settings, and a sample so large that its square
// overflows, are *ArgError values naming the setting or the series and
// index (a huge sample used to surface as "too few observations").
func TestFitBadSettingsAndMagnitude(t *testing.T) {
	y, x := fitMCSim(fitRand(9), 80)
	data := map[string][]float64{"y": y, "x": x}
	for _, tc := range []struct {
		set FitSettings
		msg string
	}{
		{FitSettings{MaxIter: -5}, "tf: FitSettings.MaxIter = -5: must be zero (the default) or positive"},
		{FitSettings{Starts: -1}, "tf: FitSettings.Starts = -1: must be zero (the default) or positive"},
		{FitSettings{First: -3}, "tf: FitSettings.First = -3: must be zero (the default) or positive"},
		{FitSettings{Tol: math.NaN()}, "tf: FitSettings.Tol = NaN: must be zero (the default) or positive"},
	} {
		_, err := Fit(context.Background(), fitMCModel(), data, &tc.set)
		var ae *ArgError
		if !errors.As(err, &ae) || err.Error() != tc.msg {
			t.Errorf("settings %+v: err = %v, want *ArgError %q", tc.set, err, tc.msg)
		}
	}
	big := map[string][]float64{"y": append([]float64(nil), y...), "x": x}
	big["y"][40] = -2e150
	_, err := Fit(context.Background(), fitMCModel(), big, nil)
	var ae *ArgError
	if want := "tf: y[40] = -2e+150: magnitude above 1e150"; !errors.As(err, &ae) || !strings.HasPrefix(err.Error(), want) {
		t.Fatalf("sample -2e150: err = %v, want *ArgError starting %q", err, want)
	}
}
