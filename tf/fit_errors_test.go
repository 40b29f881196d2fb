package tf

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/errs"
)

// TestFitBadInput checks the typed errors of Fit and their messages.
func TestFitBadInput(t *testing.T) {
	y, x := mcSim(newRand(9), 60)
	good := func() map[string][]float64 {
		return map[string][]float64{"y": append([]float64(nil), y...), "x": append([]float64(nil), x...)}
	}
	fixed := mcModel()
	fixed.Const = &Coef{Value: 2}
	fixed.Inputs[0].Num = mkPoly(mkFactor(mkTerm(false, "", 1.5, 0)))
	fixed.Inputs[0].Den = mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, "", 0.6, 1)))
	fixed.Noise.AR = mkPoly(mkFactor(mkTerm(false, "", 1, 0), mkTerm(true, "", 0.5, 1)))
	freeDiff := mcModel()
	freeDiff.Diff = oneMinus("k", 1)
	mixed := mcModel()
	mixed.Noise.AR = mkPoly(mkFactor(mkTerm(false, "", 1, 0), Term{Neg: true, Coef: Coef{Name: "d1", Value: 0.5}, Power: 1}))
	zeroDen := mcModel()
	zeroDen.Inputs[0].Den = mkPoly(mkFactor(mkTerm(false, "", 0, 0), mkTerm(true, "d1", 0, 1)))
	noOut := mcModel()
	noOut.Output = ""
	for _, tc := range []struct {
		name   string
		m      Model
		data   func() map[string][]float64
		kind   error
		series string // the SeriesError's series, "" for a *ModelError
		msg    string
	}{
		{"missing output", mcModel(), func() map[string][]float64 { d := good(); delete(d, "y"); return d },
			ErrName, "y", `tf.Fit: series "y" is not known (the model's output is not in the data; check the series names)`},
		{"missing input", mcModel(), func() map[string][]float64 { d := good(); delete(d, "x"); return d },
			ErrName, "x", `tf.Fit: series "x" is not known (an input of the model is not in the data; check the series names)`},
		{"extra series", mcModel(), func() map[string][]float64 { d := good(); d["xx"] = x; return d },
			ErrName, "xx", `tf.Fit: series "xx" is not known (it is in the data but not used by the model, often a misspelt input name; set FitSettings.IgnoreExtra to allow extra series)`},
		{"unequal lengths", mcModel(), func() map[string][]float64 { d := good(); d["x"] = d["x"][:50]; return d },
			ErrLength, "x", `tf.Fit: series "x" has 50 samples, 60 expected (the length of the output "y"; every series of one fit has one length)`},
		{"too few observations", mcModel(), func() map[string][]float64 {
			d := good()
			d["x"], d["y"] = d["x"][:9], d["y"][:9]
			return d
		}, ErrShort, "y", `tf.Fit: series "y": 4 samples, at least 6 needed (counting residuals, one more than the 5 free coefficients; residuals are summed from index 5 of 9 samples; input "x" with dead time 3, numerator degree 1 and differencing degree 0 leaves its first 4 samples without a residual: check the dead time (it counts samples))`},
		{"nothing free", fixed, good, ErrModel, "", `tf.Fit: model: nothing is free to estimate (every coefficient is held); mark at least one coefficient free`},
		{"free differencing", freeDiff, good, ErrModel, "", `tf.Fit: differencing coefficient k: differencing must be given as fixed numbers, not estimated (write the value, or hold it with =)`},
		{"mixed freedom", mixed, good, ErrModel, "", `tf.Fit: coefficient d1: it is free in one place and held in another; one name is one parameter, so mark it the same way everywhere (or rename one)`},
		{"zero denominator constant", zeroDen, good, ErrModel, "", `tf.Fit: input "x" denominator: the constant term is zero, so the term is not causal; write it as 1 + ... (or move the dead time to the input's delay)`},
		{"no output", noOut, good, ErrModel, "", `tf.Fit: model: it names no output series (Model.Output is empty)`},
	} {
		_, err := Fit(context.Background(), tc.m, tc.data(), nil)
		if !errors.Is(err, tc.kind) {
			t.Errorf("%s: got %v, want kind %v", tc.name, err, tc.kind)
			continue
		}
		var se *SeriesError
		var me *errs.ModelError
		if tc.series != "" && (!errors.As(err, &se) || se.Series != tc.series || se.Op != "tf.Fit") ||
			tc.series == "" && (!errors.As(err, &me) || me.Op != "tf.Fit") {
			t.Errorf("%s: got %T %v, want the shared shape naming %q", tc.name, err, err, tc.series)
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
		_, err := Fit(context.Background(), mcModel(), d, nil)
		var se *errs.SampleError
		if !errors.As(err, &se) || se.Op != "tf.Fit" || se.Series != tc.series || se.Index != tc.index || !errors.Is(err, ErrSample) {
			t.Errorf("%v at %s[%d]: got %v", tc.v, tc.series, tc.index, err)
		}
	}
	// Extra series are accepted on request.
	d := good()
	d["xx"] = x
	if _, err := Fit(context.Background(), mcModel(), d, &FitSettings{IgnoreExtra: true}); err != nil {
		t.Errorf("IgnoreExtra: %v", err)
	}
}

// TestFitDoesNotModify checks that Fit leaves the model and the data as
// they were.
func TestFitDoesNotModify(t *testing.T) {
	y, x := mcSim(newRand(10), 200)
	data := map[string][]float64{"y": append([]float64(nil), y...), "x": append([]float64(nil), x...)}
	m := mcModel()
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
	y, x := mcSim(newRand(11), 400)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	est, err := Fit(ctx, mcModel(), map[string][]float64{"y": y, "x": x}, nil)
	var ie *InterruptedError
	if !errors.Is(err, context.Canceled) || !errors.Is(err, ErrConvergence) || !errors.As(err, &ie) || ie.Series != "y" || ie.Op != "tf.Fit" ||
		!strings.HasPrefix(err.Error(), `tf.Fit: fit of "y" interrupted after `) || !strings.Contains(err.Error(), "best point") ||
		!strings.HasSuffix(err.Error(), "context canceled") {
		t.Fatalf("canceled fit: err = %v, want an *InterruptedError wrapping context.Canceled", err)
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

// Negative or NaN settings are *SettingError values naming the field,
// and a sample so large that its square overflows is a *SampleError
// with its limit (not an error about the number of observations).
func TestFitBadSettingsAndMagnitude(t *testing.T) {
	y, x := mcSim(newRand(9), 80)
	data := map[string][]float64{"y": y, "x": x}
	for _, tc := range []struct {
		set FitSettings
		msg string
	}{
		{FitSettings{MaxIter: -5}, "tf.Fit: FitSettings.MaxIter = -5: must be zero or positive (0 means 200 iterations)"},
		{FitSettings{Starts: -1}, "tf.Fit: FitSettings.Starts = -1: must be zero or positive (0 means 2 with a free denominator or MA coefficient, 1 otherwise)"},
		{FitSettings{First: -3}, "tf.Fit: FitSettings.First = -3: must be zero or positive (0 means the automatic first residual index)"},
		{FitSettings{Tol: math.NaN()}, "tf.Fit: FitSettings.Tol = NaN: must be a finite number, zero or positive (0 means 1e-14 up to 10^4 residuals, rising to 1e-9 at 10^5)"},
		{FitSettings{Tol: 1}, "tf.Fit: FitSettings.Tol = 1: must be below 1 (a relative reduction of the sum of squares; 0 means the default)"},
	} {
		_, err := Fit(context.Background(), mcModel(), data, &tc.set)
		var se *SettingError
		if !errors.As(err, &se) || !errors.Is(err, ErrSetting) || err.Error() != tc.msg {
			t.Errorf("settings %+v: err = %v, want *SettingError %q", tc.set, err, tc.msg)
		}
	}
	// Validate called by the user names itself as Op.
	if err := (FitSettings{MaxIter: -1}).Validate(); err == nil || !strings.HasPrefix(err.Error(), "tf.FitSettings.Validate: FitSettings.MaxIter = -1") {
		t.Errorf("Validate: %v", err)
	}
	big := map[string][]float64{"y": append([]float64(nil), y...), "x": x}
	big["y"][40] = -2e150
	_, err := Fit(context.Background(), mcModel(), big, nil)
	var se *errs.SampleError
	if want := `tf.Fit: series "y" sample 40 is -2e+150, beyond the largest magnitude accepted, 1e+150 (rescale the series: change its units)`; !errors.As(err, &se) || se.Index != 40 || err.Error() != want {
		t.Fatalf("sample -2e150: err = %v, want *SampleError %q", err, want)
	}
}
